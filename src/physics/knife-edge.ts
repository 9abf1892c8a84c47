import { fresnelIntegrals } from "./fresnel-integrals.ts";

/**
 * Fresnel–Kirchhoff diffraction parameter ν of a single knife edge:
 * ν = h·sqrt( (2/λ)·(1/d1 + 1/d2) ).
 *
 * Reference: ITU-R P.526-15 §4.1 eq. (22).
 * Validity: d1, d2 ≫ λ and |h| ≪ d1, d2 (paraxial geometry).
 * @param h_m height of the edge above the straight line joining the path ends (m);
 *   negative below it
 * @param d1_m distance from one end to the edge (m), > 0
 * @param d2_m distance from the edge to the other end (m), > 0
 * @param lambda_m wavelength (m), > 0
 * @returns ν (dimensionless); NaN for non-positive distances or wavelength
 */
export function fresnelKirchhoffNu(h_m: number, d1_m: number, d2_m: number, lambda_m: number): number {
  if (!(d1_m > 0 && d2_m > 0 && lambda_m > 0)) return NaN;
  return h_m * Math.sqrt((2 / lambda_m) * (1 / d1_m + 1 / d2_m)); // P.526-15 eq. (22)
}

/**
 * Knife-edge diffraction loss J(ν) (dB) from the Fresnel integrals:
 * J(ν) = −20·log10( sqrt( (1 − C(ν) − S(ν))² + (C(ν) − S(ν))² ) / 2 ).
 *
 * Reference: ITU-R P.526-15 §4.1 eqs. (26)–(27) (the field ratio of eq. (26) written with
 * C and S of §2.7); C, S from `fresnelIntegrals` (A&S §7.3). J(0) = 20·log10 2 ≈ 6.02 dB.
 * For ν below about −0.78 the value is negative (the gain lobes of the diffraction pattern);
 * path methods use `knifeEdgeObstructionLoss`, which does not credit those.
 * Validity: the knife-edge model (see `fresnelKirchhoffNu`), every real ν.
 * @param nu diffraction parameter ν (dimensionless)
 * @returns J(ν) (dB); NaN for NaN
 */
export function knifeEdgeLossExact(nu: number): number {
  const { C, S } = fresnelIntegrals(nu);
  const a = 1 - C - S;
  const b = C - S;
  return -20 * Math.log10(Math.sqrt(a * a + b * b) / 2); // P.526-15 eq. (26)/(27)
}

/**
 * Approximation of J(ν) (dB):
 * J(ν) = 6.9 + 20·log10( sqrt((ν − 0.1)² + 1) + ν − 0.1 ) for ν > −0.78, else 0.
 *
 * Reference: ITU-R P.526-15 §4.1 eq. (31); used by the Bullington and delta-Bullington
 * methods (P.526-15 §4.5, P.452-17 §4.2). It differs from `knifeEdgeLossExact` by at most
 * 0.13 dB for −0.78 < ν ≤ 10 (measured in test/reference/knife-edge.test.ts).
 * @param nu diffraction parameter ν (dimensionless)
 * @returns J(ν) (dB); NaN for NaN
 */
export function knifeEdgeLossApprox(nu: number): number {
  if (Number.isNaN(nu)) return NaN;
  if (!(nu > -0.78)) return 0; // P.526-15 eq. (31)
  const t = nu - 0.1;
  return 6.9 + 20 * Math.log10(Math.sqrt(t * t + 1) + t); // P.526-15 eq. (31)
}

/**
 * Knife-edge obstruction loss (dB) as the multi-edge path methods use it: the exact J(ν)
 * where it is positive on its monotone branch, 0 elsewhere.
 *
 * Method: J(ν) from `knifeEdgeLossExact` rises monotonically from its first lobe maximum
 * at ν ≈ −1.2 and crosses 0 dB near ν ≈ −0.78; the loss is max(J(ν), 0) for ν > −1 and 0 for
 * ν ≤ −1, so the gain lobes of a well-cleared path are not credited and the loss never
 * decreases as ν grows (common practice).
 * Reference: ITU-R P.526-15 §4.1 eqs. (26)–(27).
 * @param nu diffraction parameter ν (dimensionless)
 * @returns loss ≥ 0 (dB); NaN for NaN
 */
export function knifeEdgeObstructionLoss(nu: number): number {
  if (Number.isNaN(nu)) return NaN;
  if (!(nu > -1)) return 0;
  const J = knifeEdgeLossExact(nu);
  return J > 0 ? J : 0;
}
