/**
 * Height (m) of the effective Earth's surface above the chord joining the path ends, at a
 * point d1 from one end and d2 from the other: b = d1·d2 / (2·ae).
 *
 * Method: parabolic approximation of the circular arc (ITU-R P.526-15 §4.5 and P.452-17
 * eq. (14c) use the same term d·(D − d)/(2·ae)); relative error below (D/2ae)² ≈ 1e-5 for
 * D = 100 km. ae = k · 6371 km; k = ∞ (ae = Infinity) gives 0.
 * @param d1_m distance from the first end (m)
 * @param d2_m distance from the second end (m)
 * @param ae_m effective Earth radius (m)
 */
export function earthBulgeM(d1_m: number, d2_m: number, ae_m: number): number {
  if (ae_m === Infinity) return Number.isNaN(d1_m + d2_m) ? NaN : 0;
  return (d1_m * d2_m) / (2 * ae_m); // P.452-17 eq. (14c)
}
