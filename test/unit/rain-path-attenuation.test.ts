import { describe, expect, it } from "vitest";
import fc from "fast-check";
import {
  RAIN_DISTANCE_FACTOR_MAX,
  RAIN_OUTAGE_SEARCH_MIN_PCT,
  rainAttenuation001,
  rainAttenuationAtPercent,
  rainDistanceFactor,
  rainOutagePercent,
  rainScalingCoefficients,
} from "../../src/physics/rain-path-attenuation.ts";
import { rainPolarisationCoefficients } from "../../src/physics/rain-specific-attenuation.ts";
import { expectClose } from "../helpers/expect-close.ts";

// No published worked example of the P.530-16 §2.4.1 method was at hand: the values below are
// an independent recomputation written out in the test (stated as such), plus identities of
// the Recommendation's equations.

describe("A0.01 on a terrestrial path (P.530-16 §2.4.1 Steps 1–4) — independent recomputation", () => {
  it.each([
    { d_km: 20, f: 23, R: 42, tau: 0 },
    { d_km: 8, f: 38, R: 60, tau: 90 },
    { d_km: 45, f: 11, R: 25, tau: 0 },
  ])("d = $d_km km, f = $f GHz, R0.01 = $R mm/h, τ = $tau°", ({ d_km, f, R, tau }) => {
    // Horizontal path: k, α are kH, αH (τ = 0) or kV, αV (τ = 90) — P.838-3 eqs. (4), (5) with θ = 0.
    const c = rainPolarisationCoefficients(f);
    const [k, alpha] = tau === 0 ? [c.kH, c.alphaH] : [c.kV, c.alphaV];
    const gammaR = Math.exp(Math.log(k) + alpha * Math.log(R));
    const denom = 0.477 * Math.exp(0.633 * Math.log(d_km) + 0.073 * alpha * Math.log(R) + 0.123 * Math.log(f)) - 10.579 * -Math.expm1(-0.024 * d_km);
    const r = Math.min(1 / denom, 2.5);
    const got = rainAttenuation001({ distance_m: d_km * 1000, frequency_ghz: f, rain_rate_001_mm_h: R, elevation_deg: 0, tilt_deg: tau });
    expectClose(got.gammaR_db_km, gammaR, { rel: 1e-12 }, "gammaR");
    expectClose(got.r, r, { rel: 1e-12 }, "r");
    expectClose(got.d_eff_m, r * d_km * 1000, { rel: 1e-12 }, "d_eff");
    expectClose(got.A001_db, gammaR * r * d_km, { rel: 1e-12 }, "A0.01");
  });

  it("r is capped at 2.5 where the denominator of eq. (32) falls below 0.4 (a 100 m path)", () => {
    expect(rainDistanceFactor(0.1, 50, 1, 23)).toBe(RAIN_DISTANCE_FACTOR_MAX);
    fc.assert(
      fc.property(
        fc.double({ min: 0.01, max: 200, noNaN: true }),
        fc.double({ min: 0, max: 250, noNaN: true }),
        fc.double({ min: 0.6, max: 1.8, noNaN: true }),
        fc.double({ min: 1, max: 100, noNaN: true }),
        (d, R, alpha, f) => {
          const r = rainDistanceFactor(d, R, alpha, f);
          return r > 0 && r <= RAIN_DISTANCE_FACTOR_MAX;
        },
      ),
    );
  });

  it("NaN and non-physical input give NaN", () => {
    expect(rainDistanceFactor(0, 50, 1, 23)).toBeNaN();
    expect(rainDistanceFactor(NaN, 50, 1, 23)).toBeNaN();
    expect(rainAttenuation001({ distance_m: 5000, frequency_ghz: 23, rain_rate_001_mm_h: -1, elevation_deg: 0, tilt_deg: 0 }).A001_db).toBeNaN();
  });
});

describe("scaling to other time percentages (P.530-16 eqs. (34)–(36))", () => {
  it("below 10 GHz C0 = 0.12: C1 = 0.07^0.12·0.12^0.88 = 0.112484, C2 = 0.58308, C3 = 0.05452 (hand-evaluated)", () => {
    const c = rainScalingCoefficients(7);
    expect(c.C0).toBe(0.12);
    expectClose(c.C1, 0.1124841, { abs: 1e-7 }, "C1");
    expectClose(c.C2, 0.58308, { abs: 1e-12 }, "C2");
    expectClose(c.C3, 0.05452, { abs: 1e-12 }, "C3");
    expectClose(rainScalingCoefficients(10).C0, 0.12, { abs: 1e-15 }, "continuous at 10 GHz");
    expectClose(rainScalingCoefficients(100).C0, 0.12 + 0.4 * 0.8, { abs: 1e-12 }, "C0 at 100 GHz");
  });

  it("p = 0.01 % returns A0.01 to the Recommendation's own rounding: A/A0.01 = 10^(C0·(log 0.07 + 1.154) + (1 − C0)·(log 0.12 + 0.92)) ≈ 0.998", () => {
    // With x = log10 0.01 = −2 eq. (34) reduces to the closed form in the title; the constants
    // 0.07/0.12 and 0.855/0.546, 0.139/0.043 do not make it exactly 1 (they are rounded).
    fc.assert(
      fc.property(fc.double({ min: 1, max: 1000, noNaN: true }), fc.double({ min: 0.1, max: 200, noNaN: true }), (f, A001) => {
        const { C0 } = rainScalingCoefficients(f);
        const ratio = 10 ** (C0 * (Math.log10(0.07) + 1.154) + (1 - C0) * (Math.log10(0.12) + 0.92));
        expectClose(rainAttenuationAtPercent(A001, 0.01, f), A001 * ratio, { rel: 1e-12 }, { f, A001 });
        expectClose(rainAttenuationAtPercent(A001, 0.01, f), A001, { rel: 2.5e-3 }, { f, A001 });
      }),
    );
  });

  it("A(1 %)/A0.01 = C1 lies between the old latitude curves' 0.07 and 0.12 (common practice: ≈ 0.12 below 10 GHz)", () => {
    fc.assert(
      fc.property(fc.double({ min: 1, max: 1000, noNaN: true }), (f) => {
        const ratio = rainAttenuationAtPercent(1, 1, f);
        return ratio > 0.07 && ratio <= 0.12;
      }),
    );
  });

  it("attenuation decreases with p over 0.001–1 % at every frequency 1–1000 GHz", () => {
    fc.assert(
      fc.property(fc.double({ min: 1, max: 1000, noNaN: true }), fc.double({ min: -3, max: 0, noNaN: true }), fc.double({ min: -3, max: 0, noNaN: true }), (f, a, b) => {
        fc.pre(b - a > 1e-9);
        return rainAttenuationAtPercent(10, 10 ** a, f) > rainAttenuationAtPercent(10, 10 ** b, f);
      }),
    );
  });
});

describe("rain outage: time percentage at which rain exceeds the fade margin", () => {
  it("inverts the scaling law: outage(A_p) = p to 1e-9 over 0.001–1 %", () => {
    fc.assert(
      fc.property(fc.double({ min: 1, max: 100, noNaN: true }), fc.double({ min: 1, max: 80, noNaN: true }), fc.double({ min: -3, max: -1e-6, noNaN: true }), (f, A001, x) => {
        const p = 10 ** x;
        const { outage_pct, flag } = rainOutagePercent(rainAttenuationAtPercent(A001, p, f), A001, f);
        expectClose(outage_pct, p, { rel: 1e-9 }, { f, A001, p });
        return flag === "within_range";
      }),
    );
  });

  it("is non-increasing in the fade margin", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 1, max: 100, noNaN: true }),
        fc.double({ min: 0.5, max: 80, noNaN: true }),
        fc.double({ min: 0, max: 300, noNaN: true }),
        fc.double({ min: 0, max: 50, noNaN: true }),
        (f, A001, m, dm) => rainOutagePercent(m + dm, A001, f).outage_pct <= rainOutagePercent(m, A001, f).outage_pct,
      ),
    );
  });

  it("clamps and flags outside the law's range", () => {
    const f = 23;
    const A001 = 30;
    // A margin below A(1 %) is exceeded more than 1 % of the time.
    expect(rainOutagePercent(rainAttenuationAtPercent(A001, 1, f) * 0.9, A001, f)).toEqual({ outage_pct: 1, flag: "clamped_at_max" });
    // Between A(0.001 %) and A(p_min) the power law is extrapolated.
    const extrapolated = rainOutagePercent(rainAttenuationAtPercent(A001, 1e-4, f), A001, f);
    expect(extrapolated.flag).toBe("extrapolated");
    expectClose(extrapolated.outage_pct, 1e-4, { rel: 1e-9 }, "1e-4 %");
    // Beyond the turning point of the power law (p = 10^(−C2/(2·C3)) = 1.93e-5 % at 23 GHz).
    const { C2, C3 } = rainScalingCoefficients(f);
    const low = rainOutagePercent(10 * A001, A001, f);
    expect(low.flag).toBe("clamped_at_min");
    expectClose(low.outage_pct, Math.max(RAIN_OUTAGE_SEARCH_MIN_PCT, 10 ** (-C2 / (2 * C3))), { rel: 1e-12 }, "floor");
    // Below 10 GHz the turning point lies below 1e-5 %, so the floor is 1e-5 %.
    expect(rainOutagePercent(1000, A001, 7)).toEqual({ outage_pct: RAIN_OUTAGE_SEARCH_MIN_PCT, flag: "clamped_at_min" });
  });

  it("no rain fade means no rain outage; NaN in, NaN out", () => {
    expect(rainOutagePercent(20, 0, 23).outage_pct).toBe(0);
    expect(rainOutagePercent(NaN, 10, 23).outage_pct).toBeNaN();
    expect(rainOutagePercent(20, NaN, 23).outage_pct).toBeNaN();
    expect(rainOutagePercent(20, 10, NaN).outage_pct).toBeNaN();
  });
});
