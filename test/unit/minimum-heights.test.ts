import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { minimumAntennaHeights } from "../../src/analysis/minimum-heights.ts";
import { pathClearance } from "../../src/analysis/clearance.ts";

const profile = (n: number, D: number, hill: (t: number) => number) => {
  const d_m = Array.from({ length: n }, (_, i) => (i * D) / (n - 1));
  return { d_m, ground_m: d_m.map((d) => hill(d / D)) };
};

describe("minimum antenna heights", () => {
  it("flat Earth, a midpath knife edge: symmetric heights equal to edge + F1 (closed form)", () => {
    const p = profile(101, 10_000, (t) => (Math.abs(t - 0.5) < 1e-9 ? 40 : 0));
    const lambda = 0.05;
    const f1 = Math.sqrt((lambda * 5000 * 5000) / 10_000);
    const r = minimumAntennaHeights({ ...p, from_ground_m: 0, to_ground_m: 0, lambda_m: lambda, criteria: [{ ae_m: Infinity, min_f1: 1 }], step_m: 0.5, max_m: 100 })!;
    // Any pair with (hA + hB)/2 ≥ 40 + F1 works; the least total puts both at ceil to the step.
    const need = 40 + f1;
    expect(r.from_antenna_m + r.to_antenna_m).toBeGreaterThanOrEqual(2 * need - 1e-9);
    expect(r.from_antenna_m + r.to_antenna_m).toBeLessThanOrEqual(2 * need + 1.0);
  });

  it("the heights found meet every criterion, and one step lower on either end does not", () => {
    fc.assert(
      fc.property(fc.double({ min: 0.1, max: 0.9, noNaN: true }), fc.double({ min: 5, max: 60, noNaN: true }), (pos, h) => {
        const p = profile(201, 20_000, (t) => h * Math.exp(-(((t - pos) / 0.05) ** 2)));
        const criteria = [
          { ae_m: (4 / 3) * 6_371_000, min_f1: 1 },
          { ae_m: (2 / 3) * 6_371_000, min_f1: 0.6 },
        ];
        const r = minimumAntennaHeights({ ...p, from_ground_m: 0, to_ground_m: 0, lambda_m: 0.03, criteria, step_m: 1, max_m: 150 });
        if (!r) return false;
        const ok = (a: number, b: number) =>
          criteria.every((c) => pathClearance({ d_m: p.d_m, terrain_m: p.ground_m, hts_m: a, hrs_m: b, lambda_m: 0.03, ae_m: c.ae_m }).min_clearance_f1 >= c.min_f1 - 1e-9);
        return ok(r.from_antenna_m, r.to_antenna_m) && (r.to_antenna_m <= 1 || !ok(r.from_antenna_m, r.to_antenna_m - 1));
      }),
      { numRuns: 40 },
    );
  });

  it("returns null when nothing up to max_m clears", () => {
    const p = profile(51, 5000, () => 500);
    expect(minimumAntennaHeights({ ...p, from_ground_m: 0, to_ground_m: 0, lambda_m: 0.05, criteria: [{ ae_m: Infinity, min_f1: 1 }], step_m: 1, max_m: 100 })).toBeNull();
  });
});
