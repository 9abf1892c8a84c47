/**
 * Radius (m) of the n-th Fresnel ellipsoid at a point d1 from one end and d2 from the
 * other: Rn = sqrt(n·λ·d1·d2 / (d1 + d2)).
 *
 * Reference: ITU-R P.530-18 eq. (2) / P.526-15 §2 eq. (2) (R1 in metres for d1, d2 in m).
 * Valid for d1, d2 ≫ λ (everywhere on a radio link but at the antennas themselves).
 * @param n zone number (1 for the first Fresnel zone)
 * @param lambda_m wavelength (m)
 * @param d1_m distance from the first end (m)
 * @param d2_m distance from the second end (m)
 */
export function fresnelRadiusM(n: number, lambda_m: number, d1_m: number, d2_m: number): number {
  const d = d1_m + d2_m;
  if (d === 0) return 0;
  return Math.sqrt((n * lambda_m * d1_m * d2_m) / d); // P.526-15 eq. (2)
}
