import { fadeDepthExceedancePercent } from "./multipath-fading.ts";

/**
 * Logarithmic conversion factor ΔG (dB) from average-worst-month to average-year
 * percentages of time for clear-air fading:
 * ΔG = 10.5 − 5.6·log10(1.1 ± |cos 2ξ|^0.7) − 2.7·log10 d + 1.7·log10(1 + |εp|),
 * "+" for |ξ| ≤ 45°, "−" for |ξ| > 45°, and ΔG ≤ 10.8 dB; then
 * p_year = 10^(−ΔG/10) · p_worst_month.
 *
 * The cap is an upper bound (min, not max): a year cannot hold less than one twelfth of the
 * fading of its worst month, p_year ≥ p_worst/12, i.e. ΔG ≤ 10·log10 12 = 10.79 dB.
 * Reference: ITU-R P.530-16 §2.3.4 Step 2. Equation number (24) as in P.530-18 (the
 * conversion p = 10^(−ΔG/10)·pw is eq. (25) there, per the comments of the ITU-R SG 3 MATLAB
 * implementation github.com/eeveetza/p530, matlab/P530.m); the -16 numbering was not seen. The
 * formula agrees with that implementation and with crc-covlib (itur_p530._DeltaG), except that
 * both apply max(ΔG, 10.8) where the text's bound is ΔG ≤ 10.8 dB. Valid for the paths of §2.3.1.
 * @param latitude_deg path-centre latitude ξ (deg)
 * @param distance_km path length d (km)
 * @param epsilon_p_mrad path inclination |εp| (mrad)
 */
export function worstMonthToAnnualDeltaGDb(latitude_deg: number, distance_km: number, epsilon_p_mrad: number): number {
  const xi = (latitude_deg * Math.PI) / 180;
  const c = Math.abs(Math.cos(2 * xi)) ** 0.7;
  const sign = Math.abs(latitude_deg) <= 45 ? 1 : -1;
  const dG = 10.5 - 5.6 * Math.log10(1.1 + sign * c) - 2.7 * Math.log10(distance_km) + 1.7 * Math.log10(1 + Math.abs(epsilon_p_mrad)); // P.530-16 §2.3.4 Step 2 (eq. (24) in -18)
  return Math.min(dG, 10.8); // P.530-16 §2.3.4 Step 2: ΔG ≤ 10.8 dB
}

/**
 * Average-year percentage from an average-worst-month percentage: p = 10^(−ΔG/10)·pw.
 * Reference: ITU-R P.530-16 §2.3.4 Step 3 (eq. (25) in the P.530-18 numbering).
 * @param pw_pct worst-month percentage (%)
 * @param deltaG_db conversion factor ΔG (dB)
 */
export function annualPercentFromWorstMonth(pw_pct: number, deltaG_db: number): number {
  return 10 ** (-deltaG_db / 10) * pw_pct; // P.530-16 §2.3.4 Step 3 (eq. (25) in -18)
}

/**
 * Percentage of the average year that a fade depth A (dB) is exceeded, for any A ≥ 0.
 *
 * Method: for A ≥ At (deep fades) p = 10^(−ΔG/10)·pw; for A < At the shallow-fade
 * interpolation of §2.3.2 is redone from the annual pt = 10^(−ΔG/10)·p0·10^(−At/10)
 * (qa', qt, qa, p by eqs. (15)–(18) with that pt). At A = 0 both give 63.2 %, like the worst
 * month. A year cannot have more fading than its worst month, so the result is bounded by pw
 * (ΔG ≥ 0 on the method's paths makes the bound inactive there).
 * Reference: ITU-R P.530-16 §2.3.4 Steps 1–4. Step 4 agrees with the annual any-depth
 * procedure of github.com/eeveetza/p530 (multipath_fading_annual) and crc-covlib; those apply the
 * shallow-fade interpolation at every depth, here the deep-fade law is kept for A ≥ At (Step 3),
 * where the two meet (the interpolation gives pt at A = At).
 * @param p0_pct multipath occurrence factor p0 (%), worst month
 * @param A_db fade depth (dB)
 * @param deltaG_db conversion factor ΔG (dB), {@link worstMonthToAnnualDeltaGDb}
 */
export function annualFadeExceedancePercent(p0_pct: number, A_db: number, deltaG_db: number): { p_pct: number; pw_pct: number } {
  const { pw_pct, At_db } = fadeDepthExceedancePercent(p0_pct, A_db);
  if (!Number.isFinite(pw_pct) || !Number.isFinite(deltaG_db)) return { p_pct: NaN, pw_pct };
  let p: number;
  if (A_db >= At_db) {
    p = annualPercentFromWorstMonth(pw_pct, deltaG_db); // P.530-16 §2.3.4 Step 3
  } else {
    const pt = annualPercentFromWorstMonth(p0_pct * 10 ** (-At_db / 10), deltaG_db); // P.530-16 §2.3.4 Step 4, eq. (14) converted
    // ln((100 − pt)/100) as log1p(−pt/100): a tiny pt must not round to ln 1 = 0 (then qa·A = ∞·0)
    const qaPrime = (-20 * Math.log10(-Math.log1p(-pt / 100))) / At_db; // P.530-16 eq. (15)
    const qt = (qaPrime - 2) / ((1 + 0.3 * 10 ** (-At_db / 20)) * 10 ** (-0.016 * At_db)) - 4.3 * (10 ** (-At_db / 20) + At_db / 800); // P.530-16 eq. (16)
    const qa = 2 + (1 + 0.3 * 10 ** (-A_db / 20)) * 10 ** (-0.016 * A_db) * (qt + 4.3 * (10 ** (-A_db / 20) + A_db / 800)); // P.530-16 eq. (17)
    p = 100 * (1 - Math.exp(-(10 ** ((-qa * A_db) / 20)))); // P.530-16 eq. (18)
  }
  return { p_pct: Math.min(p, pw_pct), pw_pct };
}
