import { describe, expect, it } from "vitest";
import fc from "fast-check";
import {
  effectiveEarthRadiusM,
  K_FACTOR_VALIDITY,
  kFactorFromGradient,
  MEDIAN_REFRACTIVITY_GRADIENT_N_PER_KM,
} from "../../src/physics/k-factor.ts";
import { expectClose } from "../helpers/expect-close.ts";

describe("k-factor from the refractivity gradient", () => {
  it("median gradient −40 N/km gives k = 1.342, the standard 4/3 (ITU-R P.453-14; common practice)", () => {
    const k = kFactorFromGradient(MEDIAN_REFRACTIVITY_GRADIENT_N_PER_KM);
    expectClose(k, 1 / (1 - 6371 * 40e-6), { rel: 1e-15 }, "closed form");
    expectClose(k, 1.342, { abs: 5e-4 }, "1.342");
    expectClose(k, 4 / 3, { rel: 0.01 }, "≈ 4/3");
  });

  it("no gradient gives k = 1 and ae = a = 6371 km", () => {
    expect(kFactorFromGradient(0)).toBe(1);
    expect(effectiveEarthRadiusM(1)).toBe(6_371_000);
  });

  it("ae for k = 4/3 is 8495 km (commonly rounded to 8500 km; common practice)", () => {
    expectClose(effectiveEarthRadiusM(4 / 3), 8_494_667, { abs: 1 }, "ae");
  });

  it("k → +∞ as dN/dh → −157 N/km from above; a duct (steeper gradient) gives k < 0", () => {
    const pole = K_FACTOR_VALIDITY.dN_dh_pole_n_per_km;
    expectClose(pole, -156.96, { abs: 0.005 }, "pole");
    expect(kFactorFromGradient(pole + 1e-3)).toBeGreaterThan(1e5);
    expect(kFactorFromGradient(pole + 1e-6)).toBeGreaterThan(kFactorFromGradient(pole + 1e-3));
    expect(kFactorFromGradient(-157)).toBeLessThan(0);
  });

  it("agrees with the rounded 157/(157 + dN/dh) of P.452-17 eq. (5) within 0.05 % for −100…+100 N/km", () => {
    fc.assert(
      fc.property(fc.double({ min: -100, max: 100, noNaN: true }), (g) => {
        expectClose(kFactorFromGradient(g), 157 / (157 + g), { rel: 5e-4 }, { g });
      }),
    );
  });

  it("is decreasing in dN/dh above the pole (more negative gradient → more bending)", () => {
    fc.assert(
      fc.property(fc.double({ min: -156, max: 300, noNaN: true }), fc.double({ min: 0.01, max: 50, noNaN: true }), (g, dg) =>
        kFactorFromGradient(g) > kFactorFromGradient(g + dg),
      ),
    );
  });

  it("NaN in, NaN out", () => {
    expect(kFactorFromGradient(NaN)).toBeNaN();
    expect(effectiveEarthRadiusM(NaN)).toBeNaN();
  });
});
