/**
 * Effective Earth-radius factor k_e exceeded for about 99.9 % of the worst month, against
 * path length, for a continental temperate climate: the curve of ITU-R P.530-16 §2.2.2.1
 * Step 2, Figure 3 ("value of k_e exceeded for approximately 99.9 % of the worst month").
 *
 * The Recommendation gives the curve as a figure only. These points are a reading of it
 * from memory (about ±0.05 in k_e): check them against the printed figure before relying on
 * them for a licence; the report says the same. A published tabulation was looked for and not
 * found: the public P.530 implementations searched (github.com/eeveetza/p530, crc-covlib,
 * iturpropag) do not implement §2.2.2, and the stored copies of the Recommendation show only
 * its opening pages.
 */
export const KE_999_FIGURE_POINTS: readonly (readonly [number, number])[] = [
  [10, 0.6],
  [20, 0.66],
  [30, 0.7],
  [50, 0.75],
  [100, 0.82],
  [200, 0.89],
];

/** The figure's path-length range (km); outside it k_e is held at the nearer end's value. */
export const KE_999_VALIDITY = {
  method: "ITU-R P.530-16 §2.2.2.1 Step 2, Fig. 3 (read from memory)",
  distance_km: [10, 200] as const,
} as const;

/**
 * k_e exceeded for 99.9 % of the worst month at path length d: linear interpolation in
 * log10 d between the points of {@link KE_999_FIGURE_POINTS}, held constant outside 10–200 km.
 * Reference: ITU-R P.530-16 §2.2.2.1 Step 2, Figure 3.
 * @param distance_km path length d (km)
 */
export function effectiveK999(distance_km: number): number {
  if (!(distance_km > 0)) return NaN;
  const pts = KE_999_FIGURE_POINTS;
  if (distance_km <= pts[0][0]) return pts[0][1];
  if (distance_km >= pts[pts.length - 1][0]) return pts[pts.length - 1][1];
  for (let i = 1; i < pts.length; i++) {
    const [d1, k1] = pts[i];
    if (distance_km <= d1) {
      const [d0, k0] = pts[i - 1];
      const t = Math.log10(distance_km / d0) / Math.log10(d1 / d0);
      return k0 + t * (k1 - k0); // P.530-16 Fig. 3, interpolated in log d
    }
  }
  return NaN;
}

/**
 * Clearance the Recommendation asks at k_e(99.9 %) in temperate climates (fraction of F1):
 * 0 for a single isolated obstruction, 0.3 where the obstruction extends along part of the
 * path. Reference: ITU-R P.530-16 §2.2.2.1 Step 2 (from memory of the text; not verified).
 */
export const KE_999_CLEARANCE_F1 = { isolated: 0, extended: 0.3 } as const;
