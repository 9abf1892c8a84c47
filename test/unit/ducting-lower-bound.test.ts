import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { anomalousConstants, ductingLayerReflectionLoss, ductingLossLowerBound, type AnomalousInput } from "../../src/physics/itu-anomalous.ts";

// The lower bound of the ducting loss Lba that lets a P.1812 coverage skip Lba and the terrain
// roughness where Lba cannot change the result (src/physics/itu-anomalous.ts,
// ductingLossLowerBound; src/physics/p1812.ts, p1812DuctingLowerBound). It rests on A(p) of
// ITU-R P.1812-6 eq. (53) decreasing as β grows; both facts are checked here.

/** A(p) of P.1812-6 eq. (53), (53a) for p, β (%) and d (km), written out as the Recommendation prints it. */
function Ap(p: number, beta: number, d: number): number {
  const lb = Math.log10(beta);
  const G = (1.076 / Math.pow(2.0058 - lb, 1.012)) * Math.exp(-(9.51 - 4.8 * lb + 0.198 * lb * lb) * 1e-6 * Math.pow(d, 1.13));
  return -12 + (1.2 + 3.7e-3 * d) * Math.log10(p / beta) + 12 * Math.pow(p / beta, G);
}

describe("A(p) of P.1812-6 eq. (53) decreases as β grows (what the ducting lower bound rests on)", () => {
  it("on a grid: 1e-12 ≤ β ≤ 50 %, 1 ≤ p ≤ 50 %, 0.01 ≤ d ≤ 3000 km", () => {
    for (const d of [0.01, 0.1, 1, 5, 10, 20, 50, 100, 150, 200, 300, 500, 1000, 2000, 3000]) {
      for (const p of [1, 2, 5, 10, 20, 30, 40, 50]) {
        let prev = Infinity;
        for (let k = -1200; k <= 170; k++) {
          const a = Ap(p, 10 ** (k / 100), d);
          expect(a, JSON.stringify({ d, p, beta: 10 ** (k / 100) })).toBeLessThanOrEqual(prev + 1e-9);
          prev = a;
        }
      }
    }
  });
});

describe("ductingLossLowerBound never exceeds ductingLayerReflectionLoss (P.1812-6 eq. (46)–(56a))", () => {
  it("on random inputs", () => {
    fc.assert(
      fc.property(
        fc.record({
          d: fc.double({ min: 0.1, max: 300, noNaN: true }),
          ft: fc.double({ min: 0.01, max: 0.99, noNaN: true }),
          fr: fc.double({ min: 0.01, max: 0.99, noNaN: true }),
          tt: fc.double({ min: -10, max: 50, noNaN: true }),
          tr: fc.double({ min: -10, max: 50, noNaN: true }),
          hte: fc.double({ min: 1, max: 500, noNaN: true }),
          hre: fc.double({ min: 1, max: 500, noNaN: true }),
          hm: fc.double({ min: 0, max: 1500, noNaN: true }),
          f: fc.double({ min: 0.03, max: 6, noNaN: true }),
          p: fc.double({ min: 1, max: 50, noNaN: true }),
          beta0: fc.double({ min: 0.5, max: 46, noNaN: true }),
          omega: fc.double({ min: 0, max: 1, noNaN: true }),
          dct: fc.double({ min: 0, max: 10, noNaN: true }),
        }),
        (r) => {
          const dlt = r.d * r.ft * 0.5;
          const dlr = r.d * r.fr * 0.5;
          const i: AnomalousInput = {
            d_km: r.d, dlt_km: dlt, dlr_km: dlr, dct_km: r.dct, dcr_km: r.dct, dlm_km: r.d * (1 - r.omega), hts_m: 30, hrs_m: 10, hte_m: r.hte, hre_m: r.hre, hm_m: r.hm,
            theta_t_mrad: r.tt, theta_r_mrad: r.tr, f_ghz: r.f, p_pct: r.p, omega: r.omega, ae_km: 8495, beta0_pct: r.beta0, low_frequency_correction: true,
          };
          const k = anomalousConstants(r.f, r.p, 8495, true);
          const exact = ductingLayerReflectionLoss(i);
          const bound = ductingLossLowerBound(i, k);
          expect(bound, JSON.stringify(r)).toBeLessThanOrEqual(exact + 1e-9);
          // with a target, the cruder bound it may return is still below Lba
          for (const target of [exact - 40, exact - 10, exact]) expect(ductingLossLowerBound(i, k, target), JSON.stringify({ ...r, target })).toBeLessThanOrEqual(exact + 1e-9);
        },
      ),
      { numRuns: 5000, seed: 1812 },
    );
  });
});
