import { SPEED_OF_LIGHT_M_S } from "./constants.ts";

/**
 * A terrain path profile as the diffraction methods read it: samples from the
 * transmitter (index 0) to the receiver (last index), heights above mean sea level.
 * Earth curvature is applied by the methods through ae_m; the heights are not bulged.
 */
export interface DiffractionPath {
  /** distance from Tx of each sample (m), strictly increasing, first 0 */
  d_m: ArrayLike<number>;
  /** height amsl of each sample (m) = terrain + obstruction */
  h_m: ArrayLike<number>;
  /** Tx antenna height amsl (m) */
  hts_m: number;
  /** Rx antenna height amsl (m) */
  hrs_m: number;
  /** frequency (GHz) */
  frequency_ghz: number;
  /** effective Earth radius (m); Infinity allowed (k = ∞, flat Earth) */
  ae_m: number;
  /** wavelength override (m); the ITU validation examples use 0.3/f_GHz */
  lambda_m?: number;
}

/**
 * Wavelength (m) of a path: its `lambda_m` override when given, else c/f with the exact c.
 * @param path the path (frequency in GHz)
 * @returns λ (m); NaN when neither gives a positive finite value
 */
export function pathLambdaM(path: DiffractionPath): number {
  const lambda = path.lambda_m !== undefined ? path.lambda_m : SPEED_OF_LIGHT_M_S / (path.frequency_ghz * 1e9);
  return lambda > 0 && lambda < Infinity ? lambda : NaN;
}

/**
 * Whether a path can be computed: at least two samples, d_m and h_m of equal length,
 * d_m starting at 0 and strictly increasing, every height and distance finite, antenna
 * heights finite, frequency positive and finite, ae_m positive (Infinity allowed) and a
 * usable wavelength. The methods return NaN results for a path that fails this.
 * @param path the path to check
 * @returns true when every number is usable
 */
export function isComputablePath(path: DiffractionPath): boolean {
  const { d_m, h_m } = path;
  const n = d_m.length;
  if (n < 2 || h_m.length !== n) return false;
  if (!(Number.isFinite(path.hts_m) && Number.isFinite(path.hrs_m))) return false;
  if (!(path.frequency_ghz > 0 && path.frequency_ghz < Infinity)) return false;
  if (!(path.ae_m > 0)) return false;
  if (Number.isNaN(pathLambdaM(path))) return false;
  if (d_m[0] !== 0 || !Number.isFinite(h_m[0])) return false;
  for (let i = 1; i < n; i++) {
    if (!(d_m[i] > d_m[i - 1]) || !Number.isFinite(d_m[i]) || !Number.isFinite(h_m[i])) return false;
  }
  return true;
}
