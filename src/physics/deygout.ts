import { edgeNu, effectiveHeightsM } from "./edge-geometry.ts";
import { knifeEdgeObstructionLoss } from "./knife-edge.ts";
import { isComputablePath, pathLambdaM, type DiffractionPath } from "./profile.ts";

/** Result of the Deygout method: the total and its three edges. */
export interface DeygoutResult {
  /** total diffraction loss (dB), ≥ 0 */
  loss_db: number;
  /** ν of the main edge over the whole path (dimensionless); −Infinity without inner samples */
  nu_main: number;
  /** index of the main edge; −1 when there is none */
  main_index: number;
  /** ν of the subsidiary edge between Tx and the main edge, NaN when none is evaluated */
  nu_tx_side: number;
  /** its index; −1 when none */
  tx_side_index: number;
  /** ν of the subsidiary edge between the main edge and Rx, NaN when none is evaluated */
  nu_rx_side: number;
  /** its index; −1 when none */
  rx_side_index: number;
  /** loss of the main edge alone (dB) */
  loss_main_db: number;
  /** losses of the subsidiary edges (dB), 0 when none */
  loss_tx_side_db: number;
  loss_rx_side_db: number;
}

/**
 * Multiple-edge diffraction loss (dB) by the Deygout construction: the main edge (largest
 * ν over the Tx–Rx path) plus at most one subsidiary edge on each side, each subsidiary
 * taken as the largest ν over the sub-path from the terminal to the main edge, with the
 * exact J(ν) for every edge.
 *
 * Method: L = J(ν_m) + J(ν_t) + J(ν_r) (Deygout 1966; one level of subsidiary edges is
 * common practice). ν by ITU-R P.526-15 eq. (22) with the Earth bulge (heights from
 * `effectiveHeightsM`); J from the Fresnel integrals (P.526-15 eqs. (26)–(27)) floored at 0
 * (`knifeEdgeObstructionLoss`). Subsidiary edges are evaluated only when the main edge
 * itself causes loss (J(ν_m) > 0), so a cleared path costs 0 dB (common practice).
 * Validity: well-separated edges; tends to overestimate closely spaced edges of similar
 * height. Not monotone in every obstacle height: raising the main edge lowers its
 * subsidiary edges' ν, and the total jumps when the main edge moves to another sample.
 * See DIFFRACTION_VALIDITY.deygout.
 * @param path profile, antenna heights (m amsl), frequency (GHz), ae (m)
 * @returns total and per-edge losses (dB) and ν; NaN fields for a bad path
 */
export function deygoutLoss(path: DiffractionPath): DeygoutResult {
  const res: DeygoutResult = {
    loss_db: NaN, nu_main: NaN, main_index: -1, nu_tx_side: NaN, tx_side_index: -1,
    nu_rx_side: NaN, rx_side_index: -1, loss_main_db: NaN, loss_tx_side_db: NaN, loss_rx_side_db: NaN,
  };
  if (!isComputablePath(path)) return res;
  const lambda = pathLambdaM(path);
  const H = effectiveHeightsM(path);
  const D = path.d_m;
  const n = D.length;
  const d = D[n - 1];
  const hts = path.hts_m;
  const hrs = path.hrs_m;

  let nuM = -Infinity;
  let m = -1;
  for (let i = 1; i < n - 1; i++) {
    const nu = edgeNu(D[i], H[i], 0, hts, d, hrs, lambda); // P.526-15 eq. (22)
    if (nu > nuM) {
      nuM = nu;
      m = i;
    }
  }
  res.nu_main = nuM;
  res.main_index = m;
  res.loss_main_db = knifeEdgeObstructionLoss(nuM);
  res.loss_tx_side_db = 0;
  res.loss_rx_side_db = 0;
  if (res.loss_main_db > 0) {
    let nuT = -Infinity;
    for (let i = 1; i < m; i++) {
      const nu = edgeNu(D[i], H[i], 0, hts, D[m], H[m], lambda); // P.526-15 eq. (22), Tx–main
      if (nu > nuT) {
        nuT = nu;
        res.tx_side_index = i;
      }
    }
    let nuR = -Infinity;
    for (let i = m + 1; i < n - 1; i++) {
      const nu = edgeNu(D[i], H[i], D[m], H[m], d, hrs, lambda); // P.526-15 eq. (22), main–Rx
      if (nu > nuR) {
        nuR = nu;
        res.rx_side_index = i;
      }
    }
    res.nu_tx_side = res.tx_side_index >= 0 ? nuT : NaN;
    res.nu_rx_side = res.rx_side_index >= 0 ? nuR : NaN;
    res.loss_tx_side_db = knifeEdgeObstructionLoss(nuT);
    res.loss_rx_side_db = knifeEdgeObstructionLoss(nuR);
  }
  res.loss_db = res.loss_main_db + res.loss_tx_side_db + res.loss_rx_side_db;
  return res;
}
