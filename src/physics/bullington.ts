import { knifeEdgeLossApprox } from "./knife-edge.ts";
import { isComputablePath, pathLambdaM, type DiffractionPath } from "./profile.ts";

/** Result of the Bullington part of the delta-Bullington method, with its intermediates. */
export interface BullingtonResult {
  /** Bullington diffraction loss Lbull (dB) */
  Lbull: number;
  /** knife-edge loss of the Bullington point Luc (dB) */
  Luc: number;
  /** ν used: νmax (line of sight) or νb (transhorizon) (dimensionless) */
  nu: number;
  /** true when Stim < Str (diffraction path line of sight, case 1) */
  los: boolean;
  /** highest slope from Tx to an inner sample (m/km) */
  Stim: number;
  /** slope of the Tx–Rx line (m/km) */
  Str: number;
  /** highest slope from Rx to an inner sample (m/km); NaN in case 1 */
  Srim: number;
  /** distance of the Bullington point from Tx (m); of the νmax sample in case 1 */
  dbp_m: number;
}

/**
 * Bullington diffraction loss (dB) of a profile given as arrays; h_m = null stands for a
 * profile of zero heights (the smooth path of the delta-Bullington method).
 *
 * Method: ITU-R P.526-15 §4.5.1, identical to P.452-17 §4.2.1, in the Recommendation's
 * units (distances in km, heights in m, slopes in m/km, Ce = 1/ae in 1/km):
 *   Stim = max_i (h_i + 500·Ce·d_i·(d − d_i) − hts)/d_i over inner samples;
 *   Str = (hrs − hts)/d;
 *   case 1, Stim < Str: νmax = max_i [h_i + 500·Ce·d_i·(d − d_i) − (hts·(d − d_i) + hrs·d_i)/d]
 *     · sqrt(0.002·d/(λ·d_i·(d − d_i))), Luc = J(νmax);
 *   case 2: Srim = max_i (h_i + 500·Ce·d_i·(d − d_i) − hrs)/(d − d_i),
 *     dbp = (hrs − hts + Srim·d)/(Stim + Srim),
 *     νb = [hts + Stim·dbp − (hts·(d − dbp) + hrs·dbp)/d]·sqrt(0.002·d/(λ·dbp·(d − dbp))),
 *     Luc = J(νb);
 *   Lbull = Luc + [1 − exp(−Luc/6)]·(10 + 0.02·d),
 * with J(ν) the approximation of P.526-15 eq. (31). (The equation numbers of §4.5.1 are not
 * quoted here: the tags name the section and the quantity.)
 * Validity: see DIFFRACTION_VALIDITY.bullington.
 * @param d_m distances from Tx (m), strictly increasing, first 0
 * @param h_m heights amsl (m), or null for all zero
 * @param hts_m Tx antenna height amsl (m)
 * @param hrs_m Rx antenna height amsl (m)
 * @param lambda_m wavelength (m)
 * @param ae_m effective Earth radius (m), Infinity allowed
 * @returns Lbull (dB) and its intermediates
 */
export function bullingtonFromArrays(
  d_m: ArrayLike<number>,
  h_m: ArrayLike<number> | null,
  hts_m: number,
  hrs_m: number,
  lambda_m: number,
  ae_m: number,
): BullingtonResult {
  const n = d_m.length;
  const d = d_m[n - 1] / 1000; // km
  const Ce = 1000 / ae_m; // 1/km; 0 for ae = Infinity
  const hts = hts_m;
  const hrs = hrs_m;
  const lambda = lambda_m;

  let Stim = -Infinity;
  for (let i = 1; i < n - 1; i++) {
    const di = d_m[i] / 1000;
    const hi = h_m === null ? 0 : h_m[i];
    const s = (hi + 500 * Ce * di * (d - di) - hts) / di; // P.526-15 §4.5.1 (Stim)
    if (s > Stim) Stim = s;
  }
  const Str = (hrs - hts) / d; // P.526-15 §4.5.1 (Str)

  let nu: number;
  let Srim = NaN;
  let dbp: number;
  const los = Stim < Str;
  if (los) {
    nu = -Infinity;
    dbp = NaN;
    for (let i = 1; i < n - 1; i++) {
      const di = d_m[i] / 1000;
      const hi = h_m === null ? 0 : h_m[i];
      const v =
        (hi + 500 * Ce * di * (d - di) - (hts * (d - di) + hrs * di) / d) *
        Math.sqrt((0.002 * d) / (lambda * di * (d - di))); // P.526-15 §4.5.1 (νmax)
      if (v > nu) {
        nu = v;
        dbp = di;
      }
    }
  } else {
    Srim = -Infinity;
    for (let i = 1; i < n - 1; i++) {
      const di = d_m[i] / 1000;
      const hi = h_m === null ? 0 : h_m[i];
      const s = (hi + 500 * Ce * di * (d - di) - hrs) / (d - di); // P.526-15 §4.5.1 (Srim)
      if (s > Srim) Srim = s;
    }
    dbp = (hrs - hts + Srim * d) / (Stim + Srim); // P.526-15 §4.5.1 (dbp)
    nu =
      (hts + Stim * dbp - (hts * (d - dbp) + hrs * dbp) / d) *
      Math.sqrt((0.002 * d) / (lambda * dbp * (d - dbp))); // P.526-15 §4.5.1 (νb)
  }
  const Luc = knifeEdgeLossApprox(nu); // P.526-15 §4.5.1 (Luc = J(ν)), J of eq. (31)
  const Lbull = Luc + (1 - Math.exp(-Luc / 6)) * (10 + 0.02 * d); // P.526-15 §4.5.1 (Lbull)
  return { Lbull, Luc, nu, los, Stim, Str, Srim, dbp_m: dbp * 1000 };
}

/**
 * Bullington diffraction loss (dB) of a path profile (the "Lbulla" of the delta-Bullington
 * method): ITU-R P.526-15 §4.5.1 / P.452-17 §4.2.1 with J(ν) of P.526-15 eq. (31).
 * See `bullingtonFromArrays` for the equations.
 * Validity: see DIFFRACTION_VALIDITY.bullington. Alone it underestimates losses on long
 * smooth paths; the delta-Bullington method corrects that.
 * @param path profile, antenna heights (m amsl), frequency (GHz), ae (m)
 * @param options lambda_m: wavelength override (m), else the path's
 * @returns Lbull (dB) and intermediates; NaN fields for a bad path
 */
export function bullingtonLoss(path: DiffractionPath, options: { lambda_m?: number } = {}): BullingtonResult {
  const lambda = options.lambda_m !== undefined ? options.lambda_m : pathLambdaM(path);
  if (!isComputablePath(path) || !(lambda > 0 && lambda < Infinity)) {
    return { Lbull: NaN, Luc: NaN, nu: NaN, los: false, Stim: NaN, Str: NaN, Srim: NaN, dbp_m: NaN };
  }
  return bullingtonFromArrays(path.d_m, path.h_m, path.hts_m, path.hrs_m, lambda, path.ae_m);
}
