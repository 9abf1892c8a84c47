import { multipathActivityFactor } from "./dispersive-fading.ts";

/**
 * Where the cross-polar discrimination (XPD) outage methods apply (for warnings at the
 * boundary). ITU-R P.530-16 §4.2 (precipitation) gives V(f) for 8–35 GHz; its result is
 * meaningful for 0.001–1 % of the time (the rain scaling law it inverts). §4.1 (clear air)
 * states no frequency range of its own beyond the multipath method's.
 */
export const XPD_P530_VALIDITY = {
  method: "ITU-R P.530-16 §4 (XPD outage)",
  precipitation_frequency_ghz: [8, 35] as const,
  precipitation_time_pct: [0.001, 1] as const,
} as const;

/** Equipment and interference figures of a co-channel dual-polarised link. */
export interface XpdEquipment {
  /** XPD_g: manufacturer's guaranteed minimum XPD of the antennas at boresight (dB). */
  xpd_g_db: number;
  /** C0/I: carrier-to-interference ratio for the reference bit-error ratio (dB). */
  c0_i_db: number;
  /** XPIF: cross-polar improvement factor of a canceller (XPIC), 0 without one (dB). */
  xpif_db: number;
}

/**
 * Probability of outage from clear-air depolarisation (multipath), average worst month.
 *
 * Method: XPD0 = XPD_g + 5 dB for XPD_g ≤ 35 dB, else 40 dB; η from P0 = p0/100;
 * Q = −10·log10(k_XP·η/P0), k_XP = 0.7 for one transmit antenna, or
 * 1 − 0.3·exp(−4·10⁻⁶·(s_t/λ)²) for two spaced s_t apart; C = XPD0 + Q;
 * M_XPD = C − C0/I + XPIF; P_XP = P0·10^(−M_XPD/10).
 * P0 is the worst-month occurrence factor as a fraction (P0 = p0/100) inside η as well.
 * Reference: ITU-R P.530-16 §4.1 Steps 1–5; eqs. (101)–(106) in the numbering of the public
 * Python implementation iturpropag (github.com/mrazavian/ITURPropagPY, P.530-16/-17). Checked
 * against that implementation, the ITU-R SG 3 MATLAB implementation of P.530-18
 * (github.com/eeveetza/p530, XPD_outage_clear_air) and a worked example. The implementations
 * differ on P0: the MATLAB one takes the annual occurrence at A = 0, iturpropag the worst-month
 * p0 in percent inside η; here the worst-month fraction, as the text is recalled
 * ("P0 = pw/100 … exceeding A = 0 dB in the average worst month").
 * @param eq equipment figures (dB)
 * @param p0_pct multipath occurrence factor p0 (%), §2.3.2
 * @param options.st_m vertical spacing of two transmit antennas (m); one antenna when absent
 * @param options.lambda_m wavelength (m), needed with st_m
 * @returns P_XP (probability, 0–1) and the margin M_XPD (dB)
 */
export function xpdOutageClearAir(eq: XpdEquipment, p0_pct: number, options: { st_m?: number; lambda_m?: number } = {}): { Pxp: number; M_xpd_db: number } {
  const P0 = p0_pct / 100;
  if (!(P0 > 0) || !Number.isFinite(eq.xpd_g_db) || !Number.isFinite(eq.c0_i_db) || !(eq.xpif_db >= 0)) return { Pxp: NaN, M_xpd_db: NaN };
  const XPD0 = eq.xpd_g_db <= 35 ? eq.xpd_g_db + 5 : 40; // P.530-16 §4.1 Step 1, eq. (101)
  const eta = multipathActivityFactor(p0_pct); // P.530-16 §4.1 Step 2, eq. (102)
  const kXP = options.st_m !== undefined && options.lambda_m !== undefined ? 1 - 0.3 * Math.exp(-4e-6 * (options.st_m / options.lambda_m) ** 2) : 0.7; // P.530-16 §4.1 Step 3, eq. (104)
  const Q = -10 * Math.log10((kXP * eta) / P0); // P.530-16 §4.1 Step 3, eq. (103)
  const C = XPD0 + Q; // P.530-16 §4.1 Step 4, eq. (105)
  const M = C - eq.c0_i_db + eq.xpif_db; // P.530-16 §4.1 Step 5
  return { Pxp: Math.min(1, P0 * 10 ** (-M / 10)), M_xpd_db: M }; // P.530-16 §4.1 Step 5, eq. (106)
}

/**
 * Probability of outage from depolarisation by rain, average year.
 *
 * Method: U = U0 + 30·log10 f with U0 = 15 dB (the Recommendation's mean value for
 * attenuations above 15 dB; it also gives a lower bound of 9 dB — from memory of the text);
 * V = 12.8·f^0.19 for 8 ≤ f ≤ 20 GHz, 22.6 for 20 < f ≤ 35 GHz;
 * A_p = 10^((U − C0/I + XPIF)/V), the co-polar attenuation at which the XPD falls to C0/I;
 * m = 23.26·log10(A_p/(0.12·A0.01)), at most 40; n = (−12.7 + √(161.23 − 4m))/2;
 * P_XPR = 10^(n − 2). n is log10 of the percentage at which the rain scaling law of §2.4.1
 * (the C0 = 0 end: C1 = 0.12, C2 = 0.546, C3 = 0.043) gives A_p, so P_XPR is a probability.
 * Reference: ITU-R P.530-16 §4.2 Steps 1–4; eqs. (112)–(115) in the iturpropag numbering.
 * Agrees with iturpropag and github.com/eeveetza/p530 (XPD_outage_precipitation); iturpropag
 * labels 10^(n − 2) a percentage, but n = log10 of the percentage (the tests invert the
 * scaling law), so 10^(n − 2) is a probability.
 * @param eq equipment figures (dB)
 * @param A001_db rain attenuation exceeded 0.01 % of the year (dB), §2.4.1
 * @param frequency_ghz frequency (GHz)
 * @param U0_db coefficient U0 (dB), 15 by default
 * @returns P_XPR (probability, 0–1) and A_p (dB)
 */
export function xpdOutagePrecipitation(eq: XpdEquipment, A001_db: number, frequency_ghz: number, U0_db = 15): { Pxpr: number; Ap_db: number } {
  if (!(A001_db >= 0) || !(frequency_ghz > 0) || !Number.isFinite(eq.c0_i_db) || !(eq.xpif_db >= 0)) return { Pxpr: NaN, Ap_db: NaN };
  const U = U0_db + 30 * Math.log10(frequency_ghz); // P.530-16 §4.2 Step 2
  const V = frequency_ghz <= 20 ? 12.8 * frequency_ghz ** 0.19 : 22.6; // P.530-16 §4.2 Step 2
  const Ap = 10 ** ((U - eq.c0_i_db + eq.xpif_db) / V); // P.530-16 §4.2 Step 2, eq. (112)
  if (A001_db === 0) return { Pxpr: 0, Ap_db: Ap };
  const m = Math.min(40, 23.26 * Math.log10(Ap / (0.12 * A001_db))); // P.530-16 §4.2 Step 3, eq. (113)
  const n = (-12.7 + Math.sqrt(161.23 - 4 * m)) / 2; // P.530-16 §4.2 Step 3, eq. (114)
  return { Pxpr: Math.min(1, 10 ** (n - 2)), Ap_db: Ap }; // P.530-16 §4.2 Step 4, eq. (115)
}
