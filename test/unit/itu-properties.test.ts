import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { ZONE_INLAND, ZONE_SEA } from "../../src/physics/itu-path-geometry.ts";
import { p1812Loss, type P1812Input } from "../../src/physics/p1812.ts";
import { p452Loss } from "../../src/physics/p452.ts";
import { expectClose } from "../helpers/expect-close.ts";

// Invariants of the ITU-R P.1812-6 and P.452-18 implementations on random paths
// (house style: symmetry, monotonicity, known limits, NaN in → NaN out).

/** Random path: 5–60 equally spaced points, 0.5–300 km, heights 0–400 m, a sea stretch. */
const arbPath = fc.record({
  heights: fc.array(fc.double({ min: 0, max: 400, noNaN: true }), { minLength: 5, maxLength: 60 }),
  length_km: fc.double({ min: 0.5, max: 300, noNaN: true }),
  htg_m: fc.double({ min: 1, max: 100, noNaN: true }),
  hrg_m: fc.double({ min: 1, max: 100, noNaN: true }),
  f_ghz: fc.double({ min: 0.1, max: 6, noNaN: true }),
  sea_share: fc.double({ min: 0, max: 1, noNaN: true }),
});
type ArbPath = typeof arbPath extends fc.Arbitrary<infer T> ? T : never;

function arrays(a: ArbPath) {
  const n = a.heights.length;
  return {
    d_km: Float64Array.from(a.heights, (_, i) => (a.length_km * i) / (n - 1)),
    h_m: Float64Array.from(a.heights),
    zone: Uint8Array.from(a.heights, (_, i) => (i / n < a.sea_share ? ZONE_SEA : ZONE_INLAND)),
  };
}

describe("P.1812-6 and P.452-18 properties", () => {
  it("P.1812-6 is reciprocal: swapping the terminals (profile reversed) gives the same Lb (pL = 50 %)", () => {
    fc.assert(
      fc.property(arbPath, fc.double({ min: 1, max: 50, noNaN: true }), (a, p) => {
        const { d_km, h_m, zone } = arrays(a);
        const L = d_km[d_km.length - 1];
        const base: Omit<P1812Input, "d_km" | "h_m" | "zone" | "htg_m" | "hrg_m"> = { frequency_ghz: a.f_ghz, time_pct: p, polarization: "v", phi_path_deg: 50 };
        const ab = p1812Loss({ ...base, d_km, h_m, zone, htg_m: a.htg_m, hrg_m: a.hrg_m }).Lb;
        const ba = p1812Loss({ ...base, d_km: Float64Array.from(d_km, (x) => L - x).reverse(), h_m: h_m.slice().reverse(), zone: zone.slice().reverse(), htg_m: a.hrg_m, hrg_m: a.htg_m }).Lb;
        expectClose(ba, ab, { abs: 1e-9 }, { a, p });
      }),
      { numRuns: 150 },
    );
  });

  it("the loss not exceeded for a larger percentage of time is not smaller (both methods)", () => {
    fc.assert(
      fc.property(arbPath, fc.double({ min: 0.001, max: 33, noNaN: true }), (a, p) => {
        const { d_km, h_m, zone } = arrays(a);
        const common = { frequency_ghz: a.f_ghz, d_km, h_m, zone, htg_m: a.htg_m, hrg_m: a.hrg_m, polarization: "h" as const, phi_path_deg: 40 };
        const p1812 = Math.max(1, p);
        expect(p1812Loss({ ...common, time_pct: p1812 * 1.5 }).Lb).toBeGreaterThanOrEqual(p1812Loss({ ...common, time_pct: p1812 }).Lb - 1e-9);
        expect(p452Loss({ ...common, time_pct: p * 1.5 }).Lb).toBeGreaterThanOrEqual(p452Loss({ ...common, time_pct: p }).Lb - 1e-9);
      }),
      { numRuns: 150 },
    );
  });

  it("finite for every valid path; a NaN height gives NaN, not a number", () => {
    fc.assert(
      fc.property(arbPath, (a) => {
        const { d_km, h_m, zone } = arrays(a);
        const common = { frequency_ghz: a.f_ghz, time_pct: 10, d_km, h_m, zone, htg_m: a.htg_m, hrg_m: a.hrg_m, polarization: "h" as const, phi_path_deg: 40 };
        expect(Number.isFinite(p1812Loss(common).Lb)).toBe(true);
        expect(Number.isFinite(p452Loss(common).Lb)).toBe(true);
        const bad = h_m.slice();
        bad[1] = NaN;
        expect(p1812Loss({ ...common, h_m: bad }).Lb).toBeNaN();
        expect(p452Loss({ ...common, h_m: bad }).Lb).toBeNaN();
      }),
      { numRuns: 100 },
    );
  });

  it("a short, well-cleared path at 50 % of time is free space (P.525-4: 92.45 + 20 log f + 20 log d with the P.1812 constant 92.4)", () => {
    // 2 km over flat ground, antennas 100 m: no diffraction, no enhancement at p = 50 %
    const n = 41;
    const d_km = Float64Array.from({ length: n }, (_, i) => (2 * i) / (n - 1));
    const h_m = new Float64Array(n);
    const r = p1812Loss({ frequency_ghz: 0.9, time_pct: 50, d_km, h_m, htg_m: 100, hrg_m: 100, polarization: "v", phi_path_deg: 45 });
    expectClose(r.Lb, 92.4 + 20 * Math.log10(0.9) + 20 * Math.log10(2), { abs: 0.01 }, "P.1812 Lb");
    const q = p452Loss({ frequency_ghz: 0.9, time_pct: 50, d_km, h_m, htg_m: 100, hrg_m: 100, polarization: "v", phi_path_deg: 45 });
    expectClose(q.Lb, 92.4 + 20 * Math.log10(0.9) + 20 * Math.log10(2) + q.Ag, { abs: 0.01 }, "P.452 Lb");
  });
});
