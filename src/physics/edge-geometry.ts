import type { DiffractionPath } from "./profile.ts";

/**
 * Heights (m) of the profile samples on the effective Earth, referred to the chord joining
 * the two ends at sea level: H_i = h_i + d_i·(d − d_i)/(2·ae).
 *
 * Method: parabolic Earth bulge, as in ITU-R P.526-15 §4.5 and P.452-17 §4.2.1 (the term
 * 500·Ce·d_i·(d − d_i) with km and m). Because the bulge differs from the bulge about any
 * sub-path chord by a term linear in d_i, heights above a line joining any two samples of
 * H equal the heights above that sub-path's own chord, so sub-path edges (Deygout,
 * Epstein–Peterson) can use H directly. Error of the parabola below (d/2ae)² ≈ 1e-5 at
 * d = 100 km, k = 4/3.
 * @param path the path (d_m in m, h_m in m amsl, ae_m in m; Infinity gives H = h)
 * @returns a new array of H (m)
 */
export function effectiveHeightsM(path: DiffractionPath): Float64Array {
  const n = path.d_m.length;
  const H = new Float64Array(n);
  const d = path.d_m[n - 1];
  const twoAe = 2 * path.ae_m;
  for (let i = 0; i < n; i++) {
    const di = path.d_m[i];
    H[i] = path.h_m[i] + (path.ae_m === Infinity ? 0 : (di * (d - di)) / twoAe);
  }
  return H;
}

/**
 * Diffraction parameter ν of the sample at distance di (m) with effective height Hi (m),
 * seen from the line joining (da, ha) and (db, hb), da < di < db:
 * h = Hi − (ha·(db − di) + hb·(di − da))/(db − da), ν = h·sqrt(2·(d1 + d2)/(λ·d1·d2)).
 *
 * Reference: ITU-R P.526-15 §4.1 eq. (22) with d1 = di − da, d2 = db − di.
 * @param di distance of the edge (m)
 * @param Hi effective height of the edge (m)
 * @param da distance of the line's first end (m)
 * @param ha height of the line's first end (m)
 * @param db distance of the line's second end (m)
 * @param hb height of the line's second end (m)
 * @param lambda wavelength (m)
 * @returns ν (dimensionless)
 */
export function edgeNu(di: number, Hi: number, da: number, ha: number, db: number, hb: number, lambda: number): number {
  const d1 = di - da;
  const d2 = db - di;
  const h = Hi - (ha * d2 + hb * d1) / (d1 + d2);
  return h * Math.sqrt((2 * (d1 + d2)) / (lambda * d1 * d2)); // P.526-15 eq. (22)
}
