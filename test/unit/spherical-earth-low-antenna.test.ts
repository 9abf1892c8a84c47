import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { sphericalEarthDiffractionLoss } from "../../src/physics/spherical-earth-diffraction.ts";
import { expectClose } from "../helpers/expect-close.ts";

// Regression: ITU-R P.526-15 §3.2 smooth-Earth loss returned NaN for a very low antenna.
// With one height at 0 (c = ±1) the arccos argument (3c/2)·sqrt(3m/(m + 1)³) is exactly ±1 at
// m = 1/2 and rounding pushed it past ±1; with b = 1 the ratio h/hreq was 0/0.
// References for the checks below: P.526-15 §3.2 itself (loss between 0 and the first-term
// loss Ldft inside dlos; the method is symmetric in h1, h2) and continuity in the heights
// (a 10 nm change of a height cannot move the loss by more than 0.01 dB — invariant, not a
// published value; near h2 = 0 the loss varies like sqrt(h2), so the step is 10 nm, which
// moves it by about 1e-3 dB).

const a = (4 / 3) * 6_371_000; // k = 4/3, P.453 / P.526 usage (common practice)
const lambda = 299_792_458 / 900e6; // 900 MHz

describe("spherical-Earth diffraction with a very low antenna", () => {
  it("spherical-earth loss is finite for an antenna at 0.1 m", () => {
    const h1 = 0.1;
    const dlos = Math.sqrt(2 * a) * Math.sqrt(h1);
    // m = d²/(4a(h1 + h2)) = 1/2 ⇔ d = sqrt(2a·h1): the distance where the arccos argument is ±1
    const dHalf = Math.sqrt(2 * a * h1);
    const cases = [200, 1000, dHalf * (1 - 2e-6), dHalf, dHalf * (1 - 1e-12), 0.999 * dlos, dlos, 1.5 * dlos];
    for (const d of cases) {
      for (const [t, r] of [[h1, 0], [0, h1]]) {
        const res = sphericalEarthDiffractionLoss(d, t, r, a, lambda, { polarization: "v", epsilon_r: 15, sigma_s_m: 0.005 });
        expect(Number.isFinite(res.Ldsph), `Ldsph at d = ${d} m, h1 = ${t} m, h2 = ${r} m: ${res.Ldsph}`).toBe(true);
        if (!res.transhorizon) {
          expect(res.Ldsph).toBeGreaterThanOrEqual(0);
          expect(res.Ldsph).toBeLessThanOrEqual(res.Ldft + 1e-9);
        }
      }
    }
  });

  it("spherical-earth loss with one height at 0 is the limit of small heights and symmetric", () => {
    fc.assert(
      fc.property(fc.double({ min: 0.01, max: 2, noNaN: true }), fc.double({ min: 0.05, max: 0.999, noNaN: true }), (h1, frac) => {
        const d = frac * Math.sqrt(2 * a) * Math.sqrt(h1);
        const at0 = sphericalEarthDiffractionLoss(d, h1, 0, a, lambda).Ldsph;
        const near0 = sphericalEarthDiffractionLoss(d, h1, 1e-8, a, lambda).Ldsph;
        const swapped = sphericalEarthDiffractionLoss(d, 0, h1, a, lambda).Ldsph;
        expectClose(near0, at0, { abs: 0.01 }, { what: "Ldsph (dB), h2 = 10 nm vs 0", h1, d });
        expectClose(swapped, at0, { abs: 1e-5 }, { what: "Ldsph (dB), heights swapped", h1, d });
      }),
      { numRuns: 300, seed: 526 },
    );
  });
});
