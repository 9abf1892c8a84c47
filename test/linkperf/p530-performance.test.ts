import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { modeAtAvailability, modeTimeShares } from "../../src/physics/adaptive-modulation.ts";
import { meanTimeDelayNs, multipathActivityFactor, selectiveOutageProbability, type RadioSignature } from "../../src/physics/dispersive-fading.ts";
import { diversityOutageProbability, frequencyDiversityImprovement, spaceDiversityImprovement } from "../../src/physics/diversity.ts";
import { effectiveK999, KE_999_FIGURE_POINTS } from "../../src/physics/effective-k-worst-month.ts";
import { fadeDepthExceedancePercent } from "../../src/physics/multipath-fading.ts";
import { rainAttenuationAtPercent } from "../../src/physics/rain-path-attenuation.ts";
import { annualFadeExceedancePercent, worstMonthToAnnualDeltaGDb } from "../../src/physics/worst-month-to-annual.ts";
import { xpdOutageClearAir, xpdOutagePrecipitation } from "../../src/physics/xpd-outage.ts";
import { expectClose } from "../helpers/expect-close.ts";

// Sources. The text of ITU-R P.530-16 itself was not reachable (the stored copies show only
// its opening pages), so each formula in src/physics was checked against what could be read:
// - public implementations, read and re-expressed (never copied): the ITU-R SG 3 MATLAB
//   implementation of P.530-18 by I. Stevanovic (github.com/eeveetza/p530, matlab/P530.m) for
//   §2.3.4 and §4; iturpropag (github.com/mrazavian/ITURPropagPY, P.530-16/-17) for §4;
//   crc-covlib (github.com/ic-crc/crc-covlib, itur_p530.py) for §2.3.4; a PHP link calculator
//   in the public code index (repository not named by the index) for §2.3.6 and §6.2;
// - worked examples evaluated independently (Python math module or by hand), written below
//   with their inputs and intermediate values;
// - structure: the XPD rain outage against the rain scaling law it inverts (P.530-16 §2.4.1),
//   the continuity of the diversity correlation pieces, the form shared by P_ds and P_dns.
// Still from memory: section, step and equation numbers where no implementation gives them
// (§2.3.6, §6.2), U0's description, the validity ranges of §6.2, and the k_e curve (Fig. 3).
// The "second transcription" checks below guard against slips in the code, not against a
// misremembered constant; the worked examples and implementations carry that weight.

const sig: RadioSignature = { width_ghz: 0.024, depth_minimum_phase_db: 22, depth_non_minimum_phase_db: 20, reference_delay_ns: 6.3 };

describe("dispersive (selective) fading, P.530-16 §2.3.6", () => {
  it.each([
    { d: 50, tau: 0.7 },
    { d: 25, tau: 0.7 * Math.exp(1.3 * Math.log(0.5)) },
    { d: 100, tau: 0.7 * Math.exp(1.3 * Math.log(2)) },
  ])("mean time delay τm = 0.7·(d/50)^1.3 ns at d = $d km (second transcription)", ({ d, tau }) => {
    expectClose(meanTimeDelayNs(d), tau, { rel: 1e-12 }, { d });
  });

  it.each([0.01, 1, 10, 100])("multipath activity η = 1 − e^(−0.2·P0^0.75), P0 = p0/100, at p0 = %s % (second transcription)", (p0) => {
    expectClose(multipathActivityFactor(p0), -Math.expm1(-0.2 * Math.exp(0.75 * Math.log(p0 / 100))), { rel: 1e-12 }, { p0 });
  });

  it.each([
    { d: 40, p0: 5 },
    { d: 15, p0: 0.05 },
    { d: 70, p0: 40 },
  ])("Ps at d = $d km, p0 = $p0 % agrees with a second transcription", ({ d, p0 }) => {
    const eta = 1 - Math.exp(-0.2 * (p0 / 100) ** 0.75);
    const tm = 0.7 * (d / 50) ** 1.3;
    const term = (B: number) => (sig.width_ghz * Math.pow(10, -B / 20) * tm * tm) / sig.reference_delay_ns;
    const expected = 2.15 * eta * (term(22) + term(20));
    expectClose(selectiveOutageProbability(sig, d, p0).Ps, expected, { rel: 1e-12 }, { d, p0 });
  });

  // Worked example, evaluated with Python's math module from §2.3.6 (the form also used by an
  // independent public PHP link calculator in the public code index): d = 40 km, p0 = 5 %,
  // W = 24 MHz, B_M = 22 dB, B_NM = 20 dB, τ_r = 6.3 ns:
  //   η = 1 − exp(−0.2·0.05^0.75) = 0.0209254, τm = 0.7·0.8^1.3 = 0.523739 ns,
  //   Ps = 2.15·η·(0.024·10^−1.1 + 0.024·10^−1)·τm²/6.3 = 8.43557e-6
  it("worked example d = 40 km, p0 = 5 % gives Ps = 8.4356e-6 (independent evaluation)", () => {
    const r = selectiveOutageProbability(sig, 40, 5);
    expectClose(r.eta, 0.0209254, { rel: 1e-5 }, "η");
    expectClose(r.tau_m_ns, 0.523739, { rel: 1e-5 }, "τm");
    expectClose(r.Ps, 8.43557e-6, { rel: 1e-5 }, "Ps");
  });

  it("outage falls as the signature narrows or deepens (property)", () => {
    fc.assert(
      fc.property(fc.double({ min: 0.001, max: 0.1, noNaN: true }), fc.double({ min: 0.1, max: 0.99, noNaN: true }), fc.double({ min: 5, max: 150, noNaN: true }), fc.double({ min: 0.001, max: 100, noNaN: true }), (W, shrink, d, p0) => {
        const wide = selectiveOutageProbability({ ...sig, width_ghz: W }, d, p0).Ps;
        const narrow = selectiveOutageProbability({ ...sig, width_ghz: W * shrink }, d, p0).Ps;
        const deeper = selectiveOutageProbability({ ...sig, width_ghz: W, depth_minimum_phase_db: 30 }, d, p0).Ps;
        expect(narrow).toBeLessThan(wide);
        expect(deeper).toBeLessThan(wide);
      }),
    );
  });

  it("a negative width or a zero reference delay gives NaN, never a number", () => {
    expect(selectiveOutageProbability({ ...sig, width_ghz: -0.01 }, 40, 5).Ps).toBeNaN();
    expect(selectiveOutageProbability({ ...sig, reference_delay_ns: 0 }, 40, 5).Ps).toBeNaN();
  });
});

describe("diversity improvement, P.530-16 §6.2", () => {
  it.each([
    { S: 10, f: 6, d: 50, p0: 10, A: 35, V: 0 },
    { S: 5, f: 8, d: 45, p0: 3, A: 30, V: 3 },
    { S: 20, f: 4, d: 120, p0: 100, A: 40, V: 1 },
  ])("space: I_ns at S = $S m, f = $f GHz, d = $d km agrees with a second transcription", ({ S, f, d, p0, A, V }) => {
    const x = 0.04 * Math.exp(0.87 * Math.log(S) - 0.12 * Math.log(f) + 0.48 * Math.log(d) - 1.04 * Math.log(p0));
    const expected = -Math.expm1(-x) * Math.exp(((A - V) / 10) * Math.LN10);
    expectClose(spaceDiversityImprovement(S, f, d, p0, A, V), Math.max(1, expected), { rel: 1e-12 }, { S, f, d, p0, A, V });
  });

  it("frequency: I = (80/(f·d))·(Δf/f)·10^(F/10): 6 GHz, 2 % spacing, 50 km, 35 dB (second transcription)", () => {
    expectClose(frequencyDiversityImprovement(6, 0.12, 50, 35), (80 / 300) * 0.02 * 10 ** 3.5, { rel: 1e-12 });
  });

  it("improvement is at least 1 and rises with spacing (property)", () => {
    fc.assert(
      fc.property(fc.double({ min: 1, max: 30, noNaN: true }), fc.double({ min: 0.1, max: 10, noNaN: true }), fc.double({ min: 2, max: 11, noNaN: true }), fc.double({ min: 10, max: 240, noNaN: true }), fc.double({ min: 0.01, max: 1000, noNaN: true }), fc.double({ min: 0, max: 50, noNaN: true }), (S, dS, f, d, p0, A) => {
        const I1 = spaceDiversityImprovement(S, f, d, p0, A, 0);
        const I2 = spaceDiversityImprovement(S + dS, f, d, p0, A, 0);
        expect(I1).toBeGreaterThanOrEqual(1);
        expect(I2).toBeGreaterThanOrEqual(I1);
        const F1 = frequencyDiversityImprovement(f, 0.01 * f, d, A);
        const F2 = frequencyDiversityImprovement(f, 0.01 * f + 0.001 * dS, d, A);
        expect(F1).toBeGreaterThanOrEqual(1);
        expect(F2).toBeGreaterThanOrEqual(F1);
      }),
    );
  });

  it("the correlation pieces join at their breakpoints (k_ns² = 0.26, r_w = 0.5, r_w = 0.9628): the published constants are chosen so", () => {
    const rw = (k2: number, low: boolean) => (low ? 1 - 0.9746 * (1 - k2) ** 2.17 : 1 - 0.6921 * (1 - k2) ** 1.034);
    expectClose(rw(0.26, true), rw(0.26, false), { abs: 2e-4 }, "r_w at k_ns² = 0.26");
    const ks2 = (r: number) => 1 - 0.195 * (1 - r) ** (0.109 - 0.13 * Math.log10(1 - r));
    expectClose(ks2(0.5), 0.8238, { abs: 1e-3 }, "k_s² at r_w = 0.5");
    expectClose(ks2(0.9628), 1 - 0.3957 * (1 - 0.9628) ** 0.5136, { abs: 2e-3 }, "k_s² at r_w = 0.9628");
  });

  // Worked example, evaluated by hand (calculator, 6 digits) from the §6.2 equations: p0 = 20 %,
  // P_ns = 1e-4, P_s = 2e-5, I_ns = 50.
  //   η = 1 − exp(−0.2·0.2^0.75) = 1 − exp(−0.059814) = 0.058060
  //   k_ns² = 1 − 50·1e-4/0.058060 = 0.913883                        (> 0.26: second r_w piece)
  //   r_w = 1 − 0.6921·0.086117^1.034 = 1 − 0.6921·0.079225 = 0.945168 (0.5 < r_w ≤ 0.9628)
  //   k_s² = 1 − 0.195·0.054832^(0.109 + 0.13·1.26093) = 1 − 0.195·0.452754 = 0.911713
  //   P_ds = (2e-5)²/(0.058060·(1 − 0.911713)) = 4e-10/0.0051260 = 7.8035e-8
  //   P_dns = 1e-4/50 = 2e-6
  //   P_d = (7.8035e-8^0.75 + 2e-6^0.75)^(4/3) = (4.669e-6 + 5.3183e-5)^(4/3) = 2.2375e-6
  // The piecewise k_s expression is the SQUARE of the selective correlation coefficient and
  // enters P_ds as 1 − k_s² directly; source: the text as recalled, corroborated by an
  // independent public implementation (a PHP link calculator in the public code index, function
  // SD, P_ds = P_s²/(η·(1 − Ks))). Regression: the first transcription squared it again and gave
  // P_ds = 4.082e-8, P_d = 2.1453e-6 for this input.
  it("regression: the selective term with diversity uses the piecewise k_s² as is (hand-worked example: P_d = 2.2375e-6, not 2.1453e-6)", () => {
    const out = diversityOutageProbability(1e-4, 2e-5, 20, 50);
    expectClose(out.eta, 0.05806, { rel: 1e-4 }, "η");
    expectClose(out.k_ns2, 0.913883, { rel: 1e-5 }, "k_ns²");
    expectClose(out.r_w, 0.945168, { rel: 1e-5 }, "r_w");
    expectClose(out.k_s2, 0.911713, { rel: 1e-5 }, "k_s²");
    expectClose(out.Pds, 7.8035e-8, { rel: 2e-4 }, "P_ds");
    expectClose(out.Pdns, 2e-6, { rel: 1e-12 }, "P_dns");
    expectClose(out.Pd, 2.2375e-6, { rel: 2e-4 }, "P_d");
    expect(out.Pd).toBeLessThan(1e-4 + 2e-5);
  });

  it("P_ds has the same form as the non-selective term: P_dns = P_ns/I_ns = P_ns²/(η·(1 − k_ns²)) (identity of Step k_ns²)", () => {
    for (const [p0, Pns, Ps, Ins] of [[20, 1e-4, 2e-5, 50], [5, 3e-5, 1e-5, 20], [1, 1e-5, 1e-6, 200]]) {
      const o = diversityOutageProbability(Pns, Ps, p0, Ins);
      expectClose(o.Pdns, (Pns * Pns) / (o.eta * (1 - o.k_ns2)), { rel: 1e-9 }, { p0, Pns, Ins });
      expectClose(o.Pds, (Ps * Ps) / (o.eta * (1 - o.k_s2)), { rel: 1e-12 }, { p0, Ps });
    }
  });
});

describe("cross-polar discrimination outage, P.530-16 §4", () => {
  const eq = { xpd_g_db: 30, c0_i_db: 15, xpif_db: 0 };
  it.each([
    { p0: 5, xpd: 30, xpif: 0 },
    { p0: 0.5, xpd: 38, xpif: 20 },
  ])("clear air at p0 = $p0 %, XPD_g = $xpd dB, XPIF = $xpif dB agrees with the P.530-18 MATLAB implementation's steps (one transmit antenna)", ({ p0, xpd, xpif }) => {
    const P0 = p0 / 100;
    const xpd0 = xpd <= 35 ? xpd + 5 : 40;
    const eta = 1 - Math.exp(-0.2 * P0 ** 0.75);
    const Q = -10 * Math.log10((0.7 * eta) / P0);
    const M = xpd0 + Q - 15 + xpif;
    expectClose(xpdOutageClearAir({ xpd_g_db: xpd, c0_i_db: 15, xpif_db: xpif }, p0).Pxp, P0 * 10 ** (-M / 10), { rel: 1e-12 }, { p0, xpd, xpif });
  });

  // Worked examples, evaluated with Python's math module from the steps as printed in the
  // public implementations (iturpropag, github.com/mrazavian/ITURPropagPY, iturp530/XPD_outage_*.py,
  // eqs. (101)–(106), (112)–(115); github.com/eeveetza/p530 for P.530-18), with P0 = p0/100 in η:
  //   clear air, p0 = 5 %, XPD_g = 30 dB, C0/I = 15 dB, no XPIC, one transmit antenna:
  //   XPD0 = 35, η = 0.0209254, Q = 5.331985 dB, M_XPD = 25.331985 dB, P_XP = 1.464777e-4
  //   rain, 18 GHz, A0.01 = 35 dB, C0/I = 20 dB, XPIF = 10 dB, U0 = 15 dB:
  //   U = 52.65818, V = 22.16725, A_p = 84.0192 dB, m = 30.26427, n = −3.180894, P_XPR = 6.59334e-6
  it("clear air: worked example p0 = 5 %, XPD_g = 30 dB, C0/I = 15 dB gives P_XP = 1.4648e-4 (independent evaluation)", () => {
    const r = xpdOutageClearAir({ xpd_g_db: 30, c0_i_db: 15, xpif_db: 0 }, 5);
    expectClose(r.M_xpd_db, 25.331985, { abs: 1e-5 }, "M_XPD");
    expectClose(r.Pxp, 1.464777e-4, { rel: 1e-5 }, "P_XP");
  });

  it("rain: worked example 18 GHz, A0.01 = 35 dB, C0/I = 20 dB, XPIF = 10 dB gives P_XPR = 6.5933e-6 (independent evaluation)", () => {
    const r = xpdOutagePrecipitation({ xpd_g_db: 30, c0_i_db: 20, xpif_db: 10 }, 35, 18);
    expectClose(r.Ap_db, 84.0192, { rel: 1e-5 }, "A_p");
    expectClose(r.Pxpr, 6.59334e-6, { rel: 1e-5 }, "P_XPR");
  });

  it("two transmit antennas: the outage scales with k_XP = 1 − 0.3·exp(−4·10⁻⁶·(s_t/λ)²) against 0.7 for one", () => {
    const one = xpdOutageClearAir(eq, 5).Pxp;
    for (const st of [2, 10, 50]) {
      const two = xpdOutageClearAir(eq, 5, { st_m: st, lambda_m: 0.05 }).Pxp;
      expectClose(two / one, (1 - 0.3 * Math.exp(-4e-6 * (st / 0.05) ** 2)) / 0.7, { rel: 1e-9 }, { st });
    }
  });

  it.each([
    { f: 11, A001: 20, ci: 15, xpif: 0 },
    { f: 18, A001: 35, ci: 20, xpif: 10 },
    { f: 23, A001: 45, ci: 18, xpif: 0 },
  ])("rain at $f GHz, A0.01 = $A001 dB: the percentage found makes the rain scaling law (C0 = 0 end) give A_p", ({ f, A001, ci, xpif }) => {
    const { Pxpr, Ap_db } = xpdOutagePrecipitation({ xpd_g_db: 30, c0_i_db: ci, xpif_db: xpif }, A001, f);
    const p = Pxpr * 100;
    // P.530-16 §2.4.1 eq. (34) at C0 = 0: A_p = A0.01·0.12·p^−(0.546 + 0.043·log10 p)
    const law = A001 * 0.12 * p ** -(0.546 + 0.043 * Math.log10(p));
    if (p > 1e-3 && p < 1) expectClose(law, Ap_db, { rel: 2e-3 }, { f, A001, ci, xpif, p });
    else expect(p).toBeGreaterThan(0);
    // the independent V(f) and U of Step 2
    const V = f <= 20 ? 12.8 * f ** 0.19 : 22.6;
    expectClose(Ap_db, 10 ** ((15 + 30 * Math.log10(f) - ci + xpif) / V), { rel: 1e-12 }, "A_p");
  });

  it("rain depolarisation outage is monotone: more rain fade, more outage; a canceller reduces it", () => {
    fc.assert(
      fc.property(fc.double({ min: 8, max: 35, noNaN: true }), fc.double({ min: 1, max: 80, noNaN: true }), (f, A) => {
        const a = xpdOutagePrecipitation(eq, A, f).Pxpr;
        expect(xpdOutagePrecipitation(eq, A * 1.5, f).Pxpr).toBeGreaterThanOrEqual(a);
        expect(xpdOutagePrecipitation({ ...eq, xpif_db: 15 }, A, f).Pxpr).toBeLessThanOrEqual(a);
      }),
    );
  });
});

describe("worst month and average year, P.530-16 §2.3.4", () => {
  it("regression: the annual multipath outage never exceeds the worst month (a blocked link read 63.2 % worst month but 100 % year)", () => {
    fc.assert(
      fc.property(fc.double({ min: 1e-3, max: 1000, noNaN: true }), fc.double({ min: 0, max: 60, noNaN: true }), fc.double({ min: -60, max: 60, noNaN: true }), fc.double({ min: 7.5, max: 185, noNaN: true }), fc.double({ min: 0, max: 37, noNaN: true }), (p0, A, lat, d, eps) => {
        const dG = worstMonthToAnnualDeltaGDb(lat, d, eps);
        const { p_pct, pw_pct } = annualFadeExceedancePercent(p0, A, dG);
        expect(p_pct).toBeLessThanOrEqual(pw_pct);
        expect(p_pct).toBeGreaterThanOrEqual(0);
      }),
    );
    // at A = 0 both are 100·(1 − 1/e)
    expectClose(annualFadeExceedancePercent(3, 0, 5).p_pct, 100 * (1 - Math.exp(-1)), { rel: 1e-12 });
  });

  // ΔG of §2.3.4 Step 2, evaluated with Python's math module from the formula as printed in the
  // ITU-R SG 3 MATLAB implementation (github.com/eeveetza/p530, matlab/P530.m), same in
  // crc-covlib (itur_p530._DeltaG), with the text's cap ΔG ≤ 10.8 dB:
  it.each([
    { lat: 52, d: 40, eps: 5, dG: 8.263740555567374 }, // |ξ| > 45°: "−" sign
    { lat: 30, d: 20, eps: 0, dG: 5.674528601707657 }, // |ξ| ≤ 45°: "+" sign
    { lat: 80, d: 7.5, eps: 0, dG: 10.8 }, // 12.87 before the cap
  ])("ΔG at ξ = $lat°, d = $d km, |εp| = $eps mrad is $dG dB (independent evaluation)", ({ lat, d, eps, dG }) => {
    expectClose(worstMonthToAnnualDeltaGDb(lat, d, eps), dG, { abs: 1e-9 }, { lat, d, eps });
  });

  it("ΔG is capped from above (a year holds at least 1/12 of its worst month's fading: ΔG ≤ 10·log10 12 ≈ 10.8 dB), never raised to 10.8 dB", () => {
    fc.assert(fc.property(fc.double({ min: -89, max: 89, noNaN: true }), fc.double({ min: 7.5, max: 185, noNaN: true }), fc.double({ min: 0, max: 37, noNaN: true }), (lat, d, eps) => {
      const dG = worstMonthToAnnualDeltaGDb(lat, d, eps);
      expect(dG).toBeLessThanOrEqual(10.8);
    }));
    expect(worstMonthToAnnualDeltaGDb(30, 20, 0)).toBeLessThan(10.8);
  });

  // Shallow fade (A < At), §2.3.4 Step 4, evaluated with Python's math module following the
  // steps of the SG 3 MATLAB implementation (github.com/eeveetza/p530, multipath_fading_annual):
  // p0 = 10 %, A = 15 dB, ΔG = 6 dB: At = 26.2 dB, annual pt = 10·10^−2.62·10^−0.6 = 6.025596e-3 %,
  // qa' = 3.221364, qt = 2.808739, qa = 4.214846, p = 0.0689788 % (worst month 0.2382988 %).
  it("shallow fade A = 15 dB below At = 26.2 dB: p = 0.0689788 % of the year (independent evaluation of Step 4)", () => {
    const r = annualFadeExceedancePercent(10, 15, 6);
    expectClose(r.p_pct, 0.0689788488, { rel: 1e-6 }, "p year");
    expectClose(r.pw_pct, 0.2382987931, { rel: 1e-6 }, "p worst month");
  });

  it("deep fades convert by 10^(−ΔG/10) exactly (§2.3.4 Step 3)", () => {
    const p0 = 2, A = 40, dG = 6;
    expectClose(annualFadeExceedancePercent(p0, A, dG).p_pct, fadeDepthExceedancePercent(p0, A).pw_pct * 10 ** -0.6, { rel: 1e-12 });
  });
});

describe("adaptive modulation time shares (common practice)", () => {
  it("shares and outage sum to 100 % and the time at or above a mode falls as thresholds rise (property)", () => {
    fc.assert(
      fc.property(fc.array(fc.double({ min: 0, max: 100, noNaN: true }), { minLength: 1, maxLength: 8 }), (qs) => {
        const sorted = [...qs].sort((a, b) => a - b);
        const { share_pct, outage_pct, at_least_pct } = modeTimeShares(sorted);
        expectClose(share_pct.reduce((a, b) => a + b, 0) + outage_pct, 100, { abs: 1e-9 }, { sorted });
        for (const s of share_pct) expect(s).toBeGreaterThanOrEqual(0);
        for (let i = 1; i < at_least_pct.length; i++) expect(at_least_pct[i]).toBeLessThanOrEqual(at_least_pct[i - 1]);
        // raising every threshold raises every q_i: the time at or above each mode falls
        const raised = modeTimeShares(sorted.map((q) => Math.min(100, q * 1.5 + 0.1)));
        raised.at_least_pct.forEach((a, i) => expect(a).toBeLessThanOrEqual(at_least_pct[i]));
      }),
    );
  });

  it("the mode at an availability is the highest one available that long", () => {
    expect(modeAtAvailability([99.999, 99.995, 99.9], 99.99)).toBe(1);
    expect(modeAtAvailability([99.9], 99.99)).toBe(-1);
  });
});

describe("k_e exceeded 99.9 % of the worst month, P.530-16 §2.2.2 Fig. 3 (read from memory)", () => {
  it("passes through the tabulated points and rises with path length", () => {
    for (const [d, k] of KE_999_FIGURE_POINTS) expectClose(effectiveK999(d), k, { abs: 1e-12 }, { d });
    fc.assert(fc.property(fc.double({ min: 1, max: 300, noNaN: true }), fc.double({ min: 0, max: 50, noNaN: true }), (d, dd) => {
      expect(effectiveK999(d + dd)).toBeGreaterThanOrEqual(effectiveK999(d));
    }));
  });
});

it("rain scaling helper used above is the project's own eq. (34) (sanity: A at 0.01 % ≈ A0.01)", () => {
  expectClose(rainAttenuationAtPercent(10, 0.01, 5), 10, { rel: 5e-3 });
});
