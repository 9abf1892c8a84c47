import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { pathClearance } from "../../src/analysis/clearance.ts";
import { expectClose } from "../helpers/expect-close.ts";

const flat = (n: number, D: number, h = 0) => ({
  d_m: Array.from({ length: n }, (_, i) => (i * D) / (n - 1)),
  terrain_m: new Array(n).fill(h),
});

describe("path clearance", () => {
  it("flat Earth (k = ∞), level antennas: the minimum is at the highest terrain point", () => {
    const p = flat(101, 10_000);
    p.terrain_m[30] = 20;
    const lambda = 0.05;
    const r = pathClearance({ ...p, hts_m: 40, hrs_m: 40, lambda_m: lambda, ae_m: Infinity });
    const f1 = Math.sqrt((lambda * 3000 * 7000) / 10_000);
    expectClose(r.at_distance_m, 3000, { abs: 1e-9 }, "where");
    expectClose(r.min_clearance_f1, 20 / f1, { rel: 1e-12 }, "ratio");
  });

  it("smooth sphere, level antennas: the minimum is midpath with h − D²/(8ae)", () => {
    const p = flat(1001, 40_000);
    const ae = (4 / 3) * 6_371_000;
    const r = pathClearance({ ...p, hts_m: 60, hrs_m: 60, lambda_m: 0.04, ae_m: ae });
    expectClose(r.at_distance_m, 20_000, { abs: 1e-6 });
    expectClose(r.clearance_m, 60 - 40_000 ** 2 / (8 * ae), { abs: 1e-9 });
  });

  it("obstructions count on top of the terrain", () => {
    const p = flat(11, 1000);
    const obstruction_m = new Array(11).fill(0);
    obstruction_m[5] = 15;
    const r = pathClearance({ ...p, obstruction_m, hts_m: 20, hrs_m: 20, lambda_m: 0.1, ae_m: Infinity });
    expectClose(r.clearance_m, 5, { abs: 1e-12 });
  });

  it("clearance falls as k falls (more bulge) — common practice", () => {
    fc.assert(
      fc.property(fc.double({ min: 0.3, max: 3, noNaN: true }), fc.double({ min: 0.3, max: 3, noNaN: true }), (k1, k2) => {
        const p = flat(201, 30_000);
        const a = pathClearance({ ...p, hts_m: 50, hrs_m: 30, lambda_m: 0.05, ae_m: k1 * 6_371_000 });
        const b = pathClearance({ ...p, hts_m: 50, hrs_m: 30, lambda_m: 0.05, ae_m: k2 * 6_371_000 });
        return k1 <= k2 ? a.min_clearance_f1 <= b.min_clearance_f1 + 1e-12 : a.min_clearance_f1 >= b.min_clearance_f1 - 1e-12;
      }),
    );
  });

  it("NaN terrain gives NaN clearance", () => {
    const p = flat(11, 1000);
    p.terrain_m[4] = NaN;
    expect(pathClearance({ ...p, hts_m: 20, hrs_m: 20, lambda_m: 0.1, ae_m: Infinity }).min_clearance_f1).toBeNaN();
  });
});
