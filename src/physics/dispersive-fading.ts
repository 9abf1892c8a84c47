/**
 * Where the dispersive-fading method applies (for warnings at the boundary).
 * Edition: ITU-R P.530-16 (07/2015) §2.3.6, "Prediction of outage due to dispersive
 * (selective) fading", the signature method for single-carrier digital radios. The mean time
 * delay relation was fitted to paths of roughly 15–100 km (from memory of the
 * Recommendation's text; the section states no hard limits, so only the multipath method's own
 * range, MULTIPATH_P530_VALIDITY, applies to η).
 */
export const DISPERSIVE_P530_VALIDITY = {
  method: "ITU-R P.530-16 §2.3.6 (signature method)",
} as const;

/**
 * A radio's signature as a pair of rectangles: its width W (GHz), its depths B_M and B_NM (dB)
 * for minimum- and non-minimum-phase fades, and the echo delay τ_r at which it was measured (ns).
 */
export interface RadioSignature {
  width_ghz: number;
  depth_minimum_phase_db: number;
  depth_non_minimum_phase_db: number;
  reference_delay_ns: number;
}

/**
 * Mean time delay of the multipath echo on a path of length d: τm = 0.7·(d/50)^1.3 ns.
 * Reference: ITU-R P.530-16 §2.3.6 Step 1 (equation numbers not restated: the edition was
 * not at hand; transcribed from memory of the text).
 * @param distance_km path length d (km)
 */
export function meanTimeDelayNs(distance_km: number): number {
  if (!(distance_km > 0)) return NaN;
  return 0.7 * (distance_km / 50) ** 1.3; // P.530-16 §2.3.6 Step 1 (τm)
}

/**
 * Multipath activity factor η = 1 − exp(−0.2·P0^0.75), with P0 = p0/100 the multipath
 * occurrence factor of §2.3.2 (the worst-month percentage of exceeding A = 0 dB, as a fraction).
 * Reference: ITU-R P.530-16 §2.3.6 Step 2 (also §4.1 Step 2 and §6.2.2 Step 1).
 * @param p0_pct multipath occurrence factor p0 (%)
 */
export function multipathActivityFactor(p0_pct: number): number {
  if (!(p0_pct >= 0)) return NaN;
  // 1 − exp(−x) as −expm1(−x): for a tiny p0 (a 1 m path) exp(−x) rounds to 1 and η to 0, which
  // made the diversity outage NaN
  return -Math.expm1(-0.2 * (p0_pct / 100) ** 0.75); // P.530-16 §2.3.6 Step 2 (η)
}

/**
 * Probability of outage due to dispersive (selective) fading in the average worst month.
 *
 * Method: Ps = 2.15·η·(W_M·10^(−B_M/20)·τm²/|τ_r,M| + W_NM·10^(−B_NM/20)·τm²/|τ_r,NM|),
 * with W in GHz and delays in ns; one signature width and reference delay for both phases
 * here (the usual data sheet), the two depths apart.
 * Reference: ITU-R P.530-16 §2.3.6 Step 3 (transcribed from memory of the text; equation
 * numbers not seen). Corroborated by an independent public implementation (a PHP link
 * calculator in the public code index, function Selective: the same η with P0 = p0/100, the
 * same τm and the same Ps with τ_r = 6.3 ns for both phases); the tests add a worked example.
 * Valid for single-carrier radios whose signature was measured with a two-ray model at delay τ_r.
 * @param signature radio signature (GHz, dB, ns)
 * @param distance_km path length (km)
 * @param p0_pct multipath occurrence factor p0 (%)
 * @returns Ps (probability, 0–1), η and τm (ns)
 */
export function selectiveOutageProbability(signature: RadioSignature, distance_km: number, p0_pct: number): { Ps: number; eta: number; tau_m_ns: number } {
  const { width_ghz: W, depth_minimum_phase_db: BM, depth_non_minimum_phase_db: BNM, reference_delay_ns: tr } = signature;
  const eta = multipathActivityFactor(p0_pct);
  const tau_m_ns = meanTimeDelayNs(distance_km);
  if (!(W >= 0) || !(tr > 0) || !Number.isFinite(BM) || !Number.isFinite(BNM)) return { Ps: NaN, eta, tau_m_ns };
  const Ps = 2.15 * eta * (W * 10 ** (-BM / 20) * tau_m_ns ** 2 / tr + W * 10 ** (-BNM / 20) * tau_m_ns ** 2 / tr); // P.530-16 §2.3.6 Step 3 (Ps)
  return { Ps: Math.min(1, Ps), eta, tau_m_ns };
}
