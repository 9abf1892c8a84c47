import { edgeNu, effectiveHeightsM } from "./edge-geometry.ts";
import { knifeEdgeObstructionLoss } from "./knife-edge.ts";
import { isComputablePath, pathLambdaM, type DiffractionPath } from "./profile.ts";

/** Result of the Epstein–Peterson method. */
export interface EpsteinPetersonResult {
  /** total diffraction loss (dB), ≥ 0 */
  loss_db: number;
  /** profile indices of the edges used, Tx to Rx */
  edge_indices: number[];
  /** ν of each edge over its own sub-path (dimensionless) */
  edge_nu: number[];
  /** loss of each edge (dB) */
  edge_loss_db: number[];
}

/**
 * Multiple-edge diffraction loss (dB) by the Epstein–Peterson construction: the edges are
 * the inner vertices of the "stretched string" from the Tx antenna to the Rx antenna over
 * the profile (upper convex hull, Earth bulge included); each edge is a knife edge over
 * the sub-path between its neighbouring edges (or antennas), and the losses add.
 *
 * Method: Epstein & Peterson (1953). ν of each edge by ITU-R P.526-15 eq. (22) on the
 * sub-path between its neighbours, J(ν) exact from the Fresnel integrals (P.526-15
 * eqs. (26)–(27)) floored at 0 (`knifeEdgeObstructionLoss`). When the string touches no
 * sample (line of sight) the loss is that of the sample with the largest ν over the whole
 * path, as for the single knife edge (common practice), so partial Fresnel-zone
 * obstruction still counts and a cleared path costs 0 dB.
 * Validity: well-separated edges. With edges closer than a few Fresnel radii the sub-path
 * ν of the neighbours shrinks as a new edge appears between them, so the total is not
 * monotone in every obstacle height.
 * See DIFFRACTION_VALIDITY.epstein_peterson.
 * @param path profile, antenna heights (m amsl), frequency (GHz), ae (m)
 * @returns total loss (dB) and the edges with their ν and losses; NaN loss for a bad path
 */
export function epsteinPetersonLoss(path: DiffractionPath): EpsteinPetersonResult {
  if (!isComputablePath(path)) return { loss_db: NaN, edge_indices: [], edge_nu: [], edge_loss_db: [] };
  const lambda = pathLambdaM(path);
  const H = effectiveHeightsM(path);
  const D = path.d_m;
  const n = D.length;
  const d = D[n - 1];
  // Ends of the string are the antennas, not the ground samples.
  H[0] = path.hts_m;
  H[n - 1] = path.hrs_m;

  // Upper convex hull by a monotone chain over samples already sorted by distance.
  const hull = new Int32Array(n);
  let k = 0;
  for (let i = 0; i < n; i++) {
    while (k >= 2) {
      const a = hull[k - 2];
      const b = hull[k - 1];
      // Keep b only when it lies strictly above the line from a to i.
      const cross = (D[b] - D[a]) * (H[i] - H[a]) - (H[b] - H[a]) * (D[i] - D[a]);
      if (cross >= 0) k--;
      else break;
    }
    hull[k++] = i;
  }

  const edge_indices: number[] = [];
  const edge_nu: number[] = [];
  const edge_loss_db: number[] = [];
  let total = 0;
  if (k === 2) {
    // Line of sight: dominant sample over the whole path.
    let nuMax = -Infinity;
    let at = -1;
    for (let i = 1; i < n - 1; i++) {
      const nu = edgeNu(D[i], H[i], 0, path.hts_m, d, path.hrs_m, lambda); // P.526-15 eq. (22)
      if (nu > nuMax) {
        nuMax = nu;
        at = i;
      }
    }
    if (at >= 0) {
      const L = knifeEdgeObstructionLoss(nuMax);
      edge_indices.push(at);
      edge_nu.push(nuMax);
      edge_loss_db.push(L);
      total = L;
    }
  } else {
    for (let j = 1; j < k - 1; j++) {
      const a = hull[j - 1];
      const i = hull[j];
      const b = hull[j + 1];
      const nu = edgeNu(D[i], H[i], D[a], H[a], D[b], H[b], lambda); // P.526-15 eq. (22)
      const L = knifeEdgeObstructionLoss(nu);
      edge_indices.push(i);
      edge_nu.push(nu);
      edge_loss_db.push(L);
      total += L;
    }
  }
  return { loss_db: total, edge_indices, edge_nu, edge_loss_db };
}
