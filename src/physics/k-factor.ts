import { EARTH_RADIUS_M } from "./constants.ts";

/** Where the k-factor relation applies (for warnings at the boundary). */
export const K_FACTOR_VALIDITY = {
  method: "effective Earth radius for a linear refractivity gradient (ITU-R P.452-17 eq. (5) exact form; P.453-14 gradients)",
  /** At this gradient (−10⁶/6371 ≈ −156.96 N/km) k is infinite; below it (ducting) k < 0. */
  dN_dh_pole_n_per_km: -1e6 / (EARTH_RADIUS_M / 1000),
} as const;

/**
 * Median vertical refractivity gradient of the lowest 1 km in temperate climates
 * (N-units/km), the value behind the standard k = 4/3 (common practice; P.453-14 maps ΔN,
 * the lapse rate of N over the first km, around 40 N-units/km in temperate latitudes).
 */
export const MEDIAN_REFRACTIVITY_GRADIENT_N_PER_KM = -40;

/**
 * Effective Earth radius factor k for a constant vertical refractivity gradient dN/dh:
 * k = 1 / (1 + a·(dN/dh)·10⁻⁶), a = 6371 km — the same as 157/(157 + dN/dh) within 0.05 % for dN/dh ≥ −100 N/km.
 * dN/dh = −40 N/km gives k = 1.342 (≈ 4/3); 0 gives 1; at −156.96 N/km k → ∞ and below it
 * (a duct) k is negative, meaning rays bend more strongly than the Earth's surface.
 *
 * Method: a ray in a linear gradient has curvature −dn/dh = −(dN/dh)·10⁻⁶ per km; the
 * effective Earth makes the ray straight: 1/ae = 1/a + dn/dh (common practice).
 * Reference: ITU-R P.452-17 eq. (5), k50 = 157/(157 − ΔN) with ΔN = −dN/dh, of which this is
 * the unrounded form (157 = 10⁶/6371 rounded); gradients from ITU-R P.453-14.
 * Valid where the gradient is uniform over the path's height range.
 * @param dN_dh_n_per_km vertical refractivity gradient dN/dh (N-units/km)
 */
export function kFactorFromGradient(dN_dh_n_per_km: number): number {
  const a_km = EARTH_RADIUS_M / 1000;
  return 1 / (1 + a_km * dN_dh_n_per_km * 1e-6); // P.452-17 eq. (5), unrounded: 1/ae = 1/a + dn/dh
}

/**
 * Effective Earth radius ae = k·a (m), a = 6371 km.
 * Reference: ITU-R P.452-17 eq. (6a) (ae = 6371·k km).
 * @param k effective Earth radius factor (dimensionless)
 */
export function effectiveEarthRadiusM(k: number): number {
  return k * EARTH_RADIUS_M; // P.452-17 eq. (6a)
}
