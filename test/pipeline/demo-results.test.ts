import { describe, expect, it } from "vitest";
import { analyzeStudy } from "../../src/analysis/analyze-study.ts";
import { loadStudy } from "../../src/study/load-study.ts";
import { PROJECT_ROOT } from "../helpers/run-cli.ts";
import { join } from "node:path";
import { loadCoverageOutputStage } from "../../src/render/coverage-output-loader.ts";

// The demo study end to end (foundation issue §6, §8): results carry the keys of
// DESIGN.md, no NaN, and the scenario has ≥ 6 sites, ≥ 6 links and a missed target.

describe("demo study results", async () => {
  const { result } = await analyzeStudy(loadStudy(join(PROJECT_ROOT, "content/studies/kestrel-vale/study.yaml")), { coverageOutputs: loadCoverageOutputStage });

  it("has the results.json keys of the design contract", () => {
    expect(result.sites.length).toBeGreaterThanOrEqual(6);
    expect(result.links.length).toBeGreaterThanOrEqual(6);
    for (const s of result.sites) expect(Object.keys(s)).toEqual(expect.arrayContaining(["id", "name", "lat_deg", "lon_deg", "ground_m"]));
    for (const l of result.links) {
      expect(Object.keys(l)).toEqual(
        expect.arrayContaining(["id", "from", "to", "frequency_ghz", "distance_m", "azimuth_from_deg", "azimuth_to_deg", "profile", "clearance", "losses_db", "diffraction_db_by_method", "received_dbm", "fade_margin_db", "availability_pct", "target_met", "warnings"]),
      );
      expect(Object.keys(l.profile).sort()).toEqual(["samples", "source", "step_m"]);
      for (const c of l.clearance) expect(Object.keys(c)).toEqual(expect.arrayContaining(["k", "min_clearance_f1", "at_distance_m"]));
      expect(l.azimuth_from_deg).toBeGreaterThanOrEqual(0);
      expect(l.azimuth_from_deg).toBeLessThan(360);
      // Profile no coarser than the DEM: the synthetic grid is 1″ (≈ 30.9 m north–south).
      expect(l.profile.step_m).toBeLessThanOrEqual(31);
    }
    expect(result.provenance.inputs_sha256).toMatch(/^[0-9a-f]{64}$/);
    expect(Object.keys(result.provenance).sort()).toEqual(["git_commit", "git_dirty", "inputs_sha256", "tool_version"]);
  });

  it("carries no NaN, Infinity or null in the numbers a client reads", () => {
    for (const l of result.links) {
      for (const v of [l.distance_m, l.losses_db.free_space, l.losses_db.diffraction, l.losses_db.gases, l.received_dbm, l.fade_margin_db, l.availability_pct]) {
        expect(Number.isFinite(v), `${l.id}`).toBe(true);
      }
    }
    expect(JSON.stringify(result)).not.toMatch(/NaN|Infinity/);
  });

  it("labels the terrain as synthetic and has at least one link missing a target", () => {
    expect(result.terrain.synthetic).toBe(true);
    expect(result.warnings.join(" ")).toMatch(/synthetic/i);
    expect(result.links.some((l) => !l.target_met)).toBe(true);
    expect(result.links.some((l) => l.target_met)).toBe(true);
  });

  it("is reciprocal: the blocked hop's diffraction is the same from either end (P.526 §4.5 symmetry)", async () => {
    const study = loadStudy(join(PROJECT_ROOT, "content/studies/kestrel-vale/study.yaml"));
    const l = study.links.find((x) => x.id === "mill-aldr")!;
    const swapped = { ...study, links: [{ ...l, from: l.to, to: l.from }], coverage: [] }; // the link alone
    const back = (await analyzeStudy(swapped, { coverageOutputs: loadCoverageOutputStage })).result.links[0];
    const fwd = result.links.find((x) => x.id === "mill-aldr")!;
    expect(Math.abs(back.losses_db.diffraction! - fwd.losses_db.diffraction!)).toBeLessThan(0.05);
  });
});
