import { beforeAll, describe, expect, it } from "vitest";
import { analyzeStudy, type AnalyzedStudy } from "../../src/analysis/analyze-study.ts";
import { loadStudy } from "../../src/study/load-study.ts";
import { linkPerformanceReport } from "../../src/site/link-performance-report.ts";
import { capacityCurveSvg, diversityCurveSvg } from "../../src/site/performance-figures.ts";
import { studyReport } from "../../src/site/study-report.ts";
import { PROJECT_ROOT, runCli } from "../helpers/run-cli.ts";
import { loadCoverageOutputStage } from "../../src/render/coverage-output-loader.ts";

// The demo study's microwave-performance hops (issue 13 acceptance): an adaptive-modulation
// hop with signatures, a space-diversity hop and a co-channel dual-polarised pair at one node.

let a: AnalyzedStudy;
beforeAll(async () => {
  const s = loadStudy(`${PROJECT_ROOT}content/studies/kestrel-vale/study.yaml`);
  s.coverage = []; // links only
  a = await analyzeStudy(s, { coverageOutputs: loadCoverageOutputStage });
}, 120_000);
const link = (id: string) => a.result.links.find((l) => l.id === id)!;

describe("demo microwave-performance hops", () => {
  it("the adaptive-modulation hop has a signature, time shares summing to 100 % and a capacity at its availability target", () => {
    const l = link("mill-thrn");
    expect(l.dispersive?.outage_worst_month_pct).toBeGreaterThan(0);
    const am = l.adaptive_modulation!;
    expect(am.modes.map((m) => m.name)).toEqual(["QPSK", "16-QAM", "64-QAM", "256-QAM", "1024-QAM"]);
    expect(am.modes.reduce((s, m) => s + m.time_share_pct, 0) + am.outage_pct).toBeCloseTo(100, 9);
    expect(am.capacity_at_availability_mbps).toBeGreaterThan(0);
    expect(am.target?.met).toBe(true);
    const svg = capacityCurveSvg(a, "mill-thrn");
    expect(svg).toMatch(/^<svg [^>]*role="img"/);
    expect(svg).toContain("target 99.99 %");
  });

  it("the space-diversity hop shows the improvement at the study's spacing and a curve over 3–23 m", () => {
    const l = link("lowf-oxle");
    const dv = l.diversity!;
    expect(dv.kind).toBe("space");
    expect(dv.improvement).toBeGreaterThan(1);
    expect(dv.outage_with_pct).toBeLessThan(dv.outage_without_pct);
    expect(dv.curve!.spacing_m[0]).toBe(3);
    expect(dv.curve!.spacing_m.at(-1)).toBe(23);
    expect(diversityCurveSvg(a, "lowf-oxle")).toContain("study: 12 m");
    expect(l.reflection).not.toHaveProperty("space_diversity_spacing_m");
  });

  it("the dual-polarised pair at Pellow Quarry carries XPD outages in both objectives", () => {
    for (const id of ["pell-kvtw", "pell-grey"]) {
      const l = link(id);
      expect(l.from === "PELL" || l.to === "PELL").toBe(true);
      expect(l.xpd!.clear_air_worst_month_pct).toBeGreaterThan(0);
      expect(l.xpd!.rain_annual_pct).toBeGreaterThan(0);
      const r = linkPerformanceReport(l);
      expect(r.performance!.rows.map((x) => x.mechanism)).toContain("Cross-polar discrimination, clear air");
      expect(r.availability!.rows.map((x) => x.mechanism)).toContain("Cross-polar discrimination, rain");
    }
  });

  it("regression: a rain XPD outage below 0.001 % of the year (the range of the P.530-16 §4.2 inversion) warns instead of passing silently", () => {
    const l = link("pell-grey");
    expect(l.xpd!.rain_annual_pct).toBeLessThan(0.001);
    expect(l.warnings.some((w) => w.includes("§4 (XPD outage), precipitation: outage") && w.includes("outside the method's range"))).toBe(true);
  });

  it("every link has the automatic k_e clearance case and a minimum-heights table; failing links are listed with remedies", () => {
    for (const l of a.result.links) expect(l.clearance.some((c) => c.automatic?.includes("99.9 % of the worst month"))).toBe(true);
    const rep = studyReport(a);
    expect(rep.remedies.map((r) => r.link)).toEqual(a.result.links.filter((l) => !l.target_met).map((l) => l.id));
    expect(rep.remedies.every((r) => r.remedies.length > 0)).toBe(true);
  });
});

it("ridgeline check --json reports both objectives for every link and chain", () => {
  const r = runCli(["check", "--json", "kestrel-vale"]);
  expect([0, 1]).toContain(r.status);
  const out = JSON.parse(r.stdout);
  for (const l of out.links) {
    expect(l.objectives.performance).toMatchObject({ target_pct: expect.any(Number), met: expect.any(Boolean) });
    expect(l.objectives.availability).toMatchObject({ target_pct: expect.any(Number), met: expect.any(Boolean) });
    expect(typeof l.objectives.combined_availability_pct).toBe("number");
  }
  expect(out.chains[0]).toMatchObject({ performance_met: expect.any(Boolean), availability_met: expect.any(Boolean) });
}, 60_000);
