/**
 * Logarithmic conversion factor ΔG (dB) from average-worst-month to average-year
 * percentages of time for clear-air fading:
 * ΔG = 10.5 − 5.6·log10(1.1 ± |cos 2ξ|^0.7) − 2.7·log10 d + 1.7·log10(1 + |εp|),
 * "+" for |ξ| ≤ 45°, "−" for |ξ| > 45°, and ΔG ≤ 10.8 dB; then
 * p_year = 10^(−ΔG/10) · p_worst_month.
 *
 * Reference: ITU-R P.530-16 §2.3.4, Steps 2–3, eq. (20) (from memory of the Recommendation's
 * text; the structure is checked in the tests). Valid for the same paths as §2.3.1.
 * @param latitude_deg path-centre latitude ξ (deg)
 * @param distance_km path length d (km)
 * @param epsilon_p_mrad path inclination |εp| (mrad)
 */
export function worstMonthToAnnualDeltaGDb(latitude_deg: number, distance_km: number, epsilon_p_mrad: number): number {
  const xi = (latitude_deg * Math.PI) / 180;
  const c = Math.abs(Math.cos(2 * xi)) ** 0.7;
  const sign = Math.abs(latitude_deg) <= 45 ? 1 : -1;
  const dG = 10.5 - 5.6 * Math.log10(1.1 + sign * c) - 2.7 * Math.log10(distance_km) + 1.7 * Math.log10(1 + Math.abs(epsilon_p_mrad)); // P.530-16 eq. (20)
  return Math.min(dG, 10.8); // P.530-16 §2.3.4 Step 2: ΔG ≤ 10.8 dB
}

/**
 * Average-year percentage from an average-worst-month percentage: p = 10^(−ΔG/10)·pw.
 * Reference: ITU-R P.530-16 §2.3.4 Step 3, eq. (21).
 * @param pw_pct worst-month percentage (%)
 * @param deltaG_db conversion factor ΔG (dB)
 */
export function annualPercentFromWorstMonth(pw_pct: number, deltaG_db: number): number {
  return 10 ** (-deltaG_db / 10) * pw_pct; // P.530-16 eq. (21)
}
