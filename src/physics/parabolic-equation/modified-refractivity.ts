import { EARTH_RADIUS_M } from "../constants.ts";

/**
 * How the atmosphere is described to the parabolic-equation solver:
 * - `k-factor`: a uniform effective-Earth factor k (k = ∞ a flat Earth without refraction);
 * - `gradient`: a uniform vertical refractivity gradient dN/dh (N-units/km);
 * - `profile`: a tabulated modified refractivity M(h) (M-units against height above the
 *   profile's datum, ascending heights), for ducts and other layered atmospheres.
 */
export type RefractivityModel =
  | { kind: "k-factor"; k: number }
  | { kind: "gradient"; dN_dh_n_per_km: number }
  | { kind: "profile"; height_m: readonly number[]; m_units: readonly number[] };

/** Gradient of M in the standard atmosphere above a tabulated profile (M-units/m): 10⁶/(4/3 · 6371 km) ≈ 0.118 (common practice). */
export const STANDARD_M_GRADIENT_PER_M = 1e6 / ((4 / 3) * EARTH_RADIUS_M);

/**
 * Excess modified refractive index m(z) − 1 (dimensionless, up to a constant) as a function
 * of height z (m) above the datum, the quantity whose phase the split-step solver applies:
 * m = n + z/a, M = (m − 1)·10⁶ (ITU-R P.453-14 §2 eq. (8)–(9): M = N + 157·h, h in km, with
 * 157 = 10⁶/6371 rounded; unrounded here). A flat Earth in modified refractivity then carries
 * both the Earth's curvature and the refraction (the Earth-flattening transformation of the
 * parabolic equation; common practice).
 * - k-factor: dM/dz = 10⁶/(k·a), so m − 1 = z/(k·a);
 * - gradient: dM/dz = dN/dz + 10⁶/a;
 * - profile: linear interpolation of the table; below its first height the first segment's
 *   slope is continued, above its last height the standard gradient 0.118 M/m.
 * Bad numbers (a table of unequal lengths, fewer than two rows, non-ascending heights) give a
 * function returning NaN.
 * @param model the atmosphere
 * @returns z_m ↦ m(z) − 1
 */
export function modifiedRefractivity(model: RefractivityModel): (z_m: number) => number {
  if (model.kind === "k-factor") {
    const slope = 1 / (model.k * EARTH_RADIUS_M); // P.453-14 eq. (9) with dN/dh from k: dM/dz = 1e6/(k·a)
    return Number.isNaN(slope) || model.k === 0 ? () => NaN : (z) => z * slope;
  }
  if (model.kind === "gradient") {
    const slope = model.dN_dh_n_per_km * 1e-9 + 1 / EARTH_RADIUS_M; // P.453-14 eq. (9): dM/dh = dN/dh + 1e6/a
    return Number.isFinite(slope) ? (z) => z * slope : () => NaN;
  }
  const h = model.height_m;
  const M = model.m_units;
  const n = h.length;
  let ok = n >= 2 && M.length === n;
  for (let i = 1; ok && i < n; i++) ok = h[i] > h[i - 1] && Number.isFinite(M[i]) && Number.isFinite(M[i - 1]);
  if (!ok) return () => NaN;
  return (z) => {
    if (z <= h[0]) return (M[0] + ((M[1] - M[0]) / (h[1] - h[0])) * (z - h[0])) * 1e-6;
    if (z >= h[n - 1]) return (M[n - 1] + STANDARD_M_GRADIENT_PER_M * (z - h[n - 1])) * 1e-6;
    let lo = 0;
    let hi = n - 1;
    while (hi - lo > 1) {
      const mid = (lo + hi) >> 1;
      if (h[mid] <= z) lo = mid;
      else hi = mid;
    }
    const t = (z - h[lo]) / (h[hi] - h[lo]);
    return (M[lo] + t * (M[hi] - M[lo])) * 1e-6;
  };
}

/**
 * Effective Earth radius (m) seen by rays near the ground: 10⁶/(dM/dz) at the datum, for the
 * grid's angle estimates and the aim of the source (negative in a duct). Reference as above.
 */
export function effectiveRadiusFromRefractivity(model: RefractivityModel, z_m = 0): number {
  const m = modifiedRefractivity(model);
  const slope = (m(z_m + 10) - m(z_m)) / 10;
  return 1 / slope;
}
