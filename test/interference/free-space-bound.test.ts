import { describe, expect, it } from "vitest";
import { analyzeStudy, openStudyTerrain } from "../../src/analysis/analyze-study.ts";
import { analyzeInterference } from "../../src/analysis/interference.ts";
import { loadStudy } from "../../src/study/load-study.ts";
import { expectClose } from "../helpers/expect-close.ts";

// The free-space bound leaves out pairs whose interference cannot matter. Regression guard
// for "a pruned pair would have changed a verdict": on the demo study, computing every pair
// in frequency range gives the same verdicts, and every pair the bound left out is more than
// 30 dB under its receiver's noise after P.452-18 (so adds under 0.005 dB of degradation).

describe("free-space bound of the interference matrix", () => {
  it("changes no verdict and no degradation by more than 0.005 dB on the demo study", async () => {
    const study = loadStudy("content/studies/kestrel-vale/study.yaml");
    study.coverage = [];
    const { result } = await analyzeStudy(study, { cache: null });
    const terrain = openStudyTerrain(study);
    const all = await analyzeInterference(study, result.links, { sites: result.sites, openTerrain: () => terrain, terrainKey: "t", noBound: true });
    const pruned = result.interference!;
    expect(pruned.paths.below_bound).toBeGreaterThan(0);
    expect(all.paths.below_bound).toBe(0);
    const byId = new Map(all.receivers.map((r) => [r.id, r]));
    for (const r of pruned.receivers) {
      const full = byId.get(r.id)!;
      expect(full.met, r.id).toBe(r.met);
      expectClose(r.threshold_degradation_long_term_db!, full.threshold_degradation_long_term_db!, { abs: 0.005 }, `${r.id} long term`);
      expectClose(r.threshold_degradation_short_term_db!, full.threshold_degradation_short_term_db!, { abs: 0.005 }, `${r.id} short term`);
    }
    const kept = new Set(pruned.entries.map((e) => `${e.receiver}|${e.transmitter}`));
    const noise = new Map(all.receivers.map((r) => [r.id, r.noise_dbm]));
    const left = all.entries.filter((e) => !kept.has(`${e.receiver}|${e.transmitter}`));
    expect(left.length).toBe(pruned.paths.below_bound);
    for (const e of left) {
      expect(e.interference_short_term_dbm! - e.filter_discrimination_db, `${e.receiver} ← ${e.transmitter}`).toBeLessThan(noise.get(e.receiver)! - 30);
      expect(e.met).toBe(true);
    }
  });
});
