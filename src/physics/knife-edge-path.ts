import { edgeNu, effectiveHeightsM } from "./edge-geometry.ts";
import { knifeEdgeObstructionLoss } from "./knife-edge.ts";
import { isComputablePath, pathLambdaM, type DiffractionPath } from "./profile.ts";

/** Result of the single (dominant) knife-edge method. */
export interface SingleKnifeEdgeResult {
  /** diffraction loss (dB), ≥ 0 */
  loss_db: number;
  /** ν of the dominant edge (dimensionless); −Infinity when the path has no inner sample */
  nu: number;
  /** index of the dominant edge in the profile; −1 when there is none */
  at_index: number;
}

/**
 * Diffraction loss (dB) of a profile taken as one knife edge: the inner sample with the
 * largest Fresnel–Kirchhoff parameter ν above the Tx–Rx ray (Earth bulge d1·d2/(2·ae)
 * included), with the exact J(ν).
 *
 * Method: ν_i = h_i·sqrt(2·d/(λ·d1·d2)) for every inner sample (ITU-R P.526-15 §4.1
 * eq. (22)); loss = J(ν_max) from the Fresnel integrals (P.526-15 eqs. (26)–(27)), floored
 * at 0 dB and taken as 0 below ν = −1 (`knifeEdgeObstructionLoss`). On a line-of-sight
 * path this gives the partial Fresnel-zone obstruction loss of the worst sample, and 0
 * when every sample has ν ≤ −0.78 (J(ν) ≤ 0).
 * Validity: one dominant obstacle; underestimates several comparable obstacles. Paraxial
 * geometry (d1, d2 ≫ λ). See DIFFRACTION_VALIDITY.single_knife_edge.
 * @param path profile, antenna heights (m amsl), frequency (GHz), ae (m)
 * @returns loss (dB), ν and the index of the dominant edge; NaN fields for a bad path
 */
export function singleKnifeEdgeLoss(path: DiffractionPath): SingleKnifeEdgeResult {
  if (!isComputablePath(path)) return { loss_db: NaN, nu: NaN, at_index: -1 };
  const lambda = pathLambdaM(path);
  const H = effectiveHeightsM(path);
  const dArr = path.d_m;
  const n = dArr.length;
  const d = dArr[n - 1];
  let nuMax = -Infinity;
  let at = -1;
  for (let i = 1; i < n - 1; i++) {
    const nu = edgeNu(dArr[i], H[i], 0, path.hts_m, d, path.hrs_m, lambda); // P.526-15 eq. (22)
    if (nu > nuMax) {
      nuMax = nu;
      at = i;
    }
  }
  return { loss_db: knifeEdgeObstructionLoss(nuMax), nu: nuMax, at_index: at };
}
