import { inverseComplementaryNormal } from "./itu-path-geometry.ts";

/** Interpolation factors and blended losses of `clearAirBlend` (dB unless noted). */
export interface ClearAirBlend {
  /** Fi (eq. (40)), 1 for p < β0 */
  Fi: number;
  Lbd50: number;
  Lbd: number;
  Lminb0p: number;
  Lminbap: number;
  Lbda: number;
  Lbam: number;
  /** combination with troposcatter, Lbc (P.1812-6 eq. (63); P.452-18 eq. (64) before clutter) */
  Lbc: number;
}

/**
 * Path-angular-distance factor Fj = 1 − 0.5·[1 + tanh(3ξ·(x − Θ)/Θ)], Θ = 0.3, ξ = 0.8.
 * P.1812-6 eq. (57) takes x = θ (mrad); P.452-18 eq. (58) takes x = Stim − Str (m/km).
 * @param x θ (mrad) or Stim − Str (m/km)
 * @returns Fj
 */
export function interpolationFj(x: number): number {
  return 1.0 - 0.5 * (1.0 + Math.tanh((3.0 * 0.8 * (x - 0.3)) / 0.3)); // P.1812-6 eq. (57)
}

/**
 * Great-circle-distance factor Fk = 1 − 0.5·[1 + tanh(3κ·(d − dsw)/dsw)], dsw = 20 km, κ = 0.5.
 * P.1812-6 eq. (58); P.452-18 eq. (59).
 * @param d_km path length (km)
 * @returns Fk
 */
export function interpolationFk(d_km: number): number {
  return 1.0 - 0.5 * (1.0 + Math.tanh((3.0 * 0.5 * (d_km - 20)) / 20)); // P.1812-6 eq. (58)
}

/**
 * Blending of line of sight, diffraction, ducting/layer reflection and troposcatter into the
 * basic transmission loss not exceeded for p % of time.
 * Method: P.1812-6 §4.6 eq. (42), (43), (59)–(63) (P.452-18 §4.6 eq. (43), (44), (60)–(64)):
 *   Lbd50 = Lbfs + Ld50; Lbd = Lb0p + Ldp;
 *   Lminb0p = Lb0p + (1 − ω)·Ldp for p < β0, else Lbd50 + (Lb0β + (1 − ω)·Ldp − Lbd50)·Fi,
 *     Fi = I(p/100)/I(β0/100);
 *   Lminbap = η·ln(exp(Lba/η) + exp(Lb0p/η)), η = 2.5;
 *   Lbda = Lbd if Lminbap > Lbd, else Lminbap + (Lbd − Lminbap)·Fk;
 *   Lbam = Lbda + (Lminb0p − Lbda)·Fj;
 *   Lbc = −5·log(10^(−0.2·Lbs) + 10^(−0.2·Lbam)).
 * Pure scalar function (no profile), so a coverage sweep can call it per cell; `Ip`, I(p/100),
 * may be given (a coverage computes it once).
 * @returns the blended losses
 */
export function clearAirBlend(
  p_pct: number,
  beta0_pct: number,
  omega: number,
  Lbfs: number,
  Lb0p: number,
  Lb0b: number,
  Ld50: number,
  Ldp: number,
  Lba: number,
  Lbs: number,
  Fj: number,
  Fk: number,
  out?: ClearAirBlend,
  Ip = inverseComplementaryNormal(p_pct / 100),
): ClearAirBlend {
  const o = out ?? ({} as ClearAirBlend);
  const Lbd50 = Lbfs + Ld50; // P.1812-6 eq. (42)
  const Lbd = Lb0p + Ldp; // P.1812-6 eq. (43)
  let Lminb0p = Lb0p + (1 - omega) * Ldp; // P.1812-6 eq. (59)
  let Fi = 1;
  if (p_pct >= beta0_pct) {
    Fi = Ip / inverseComplementaryNormal(beta0_pct / 100); // P.1812-6 eq. (40)
    Lminb0p = Lbd50 + (Lb0b + (1 - omega) * Ldp - Lbd50) * Fi; // P.1812-6 eq. (59)
  }
  const Lminbap = minimumLoss(Lba, Lb0p); // P.1812-6 eq. (60)
  const Lbda = Lminbap <= Lbd ? Lminbap + (Lbd - Lminbap) * Fk : Lbd; // P.1812-6 eq. (61)
  const Lbam = Lbda + (Lminb0p - Lbda) * Fj; // P.1812-6 eq. (62)
  const Lbc = powerSumLoss(Lbs, Lbam); // P.1812-6 eq. (63)
  o.Fi = Fi;
  o.Lbd50 = Lbd50;
  o.Lbd = Lbd;
  o.Lminb0p = Lminb0p;
  o.Lminbap = Lminbap;
  o.Lbda = Lbda;
  o.Lbam = Lbam;
  o.Lbc = Lbc;
  return o;
}

/**
 * Terms of the two power sums below that lie this far (dB) beyond the other are left out:
 * the sums then move by at most 2.5·exp(−60/2.5) = 9.4e-11 dB (eq. (60)) and
 * (5/ln 10)·10^(−0.2·60) = 2.2e-12 dB (eq. (63)), below the printed precision of the ITU-R
 * validation intermediates (1e-7 dB) and the 1e-6 dB to which the coverage is checked.
 */
const NEGLIGIBLE_TERM_DB = 60;

/**
 * η·ln(exp(a/η) + exp(b/η)), η = 2.5 (P.1812-6 eq. (60), P.452-18 eq. (61)), written as
 * max + η·ln(1 + exp(−|a − b|/η)): the same value, without overflow, two transcendental calls
 * (none when |a − b| ≥ NEGLIGIBLE_TERM_DB).
 */
function minimumLoss(a: number, b: number): number {
  const eta = 2.5;
  const hi = a > b ? a : b;
  const lo = a > b ? b : a;
  if (hi - lo >= NEGLIGIBLE_TERM_DB) return hi; // P.1812-6 eq. (60), the other term below 1e-10 dB
  if (hi === Infinity || lo === -Infinity) return lo !== lo || hi !== hi ? NaN : hi; // an infinite term decides
  return hi + eta * Math.log1p(Math.exp((lo - hi) / eta)); // P.1812-6 eq. (60)
}

/**
 * −5·log(10^(−0.2a) + 10^(−0.2b)) (P.1812-6 eq. (63), P.452-18 eq. (64)), written as
 * min − 5·log(1 + 10^(−0.2|a − b|)): the same value, two transcendental calls (none when
 * |a − b| ≥ NEGLIGIBLE_TERM_DB).
 */
function powerSumLoss(a: number, b: number): number {
  const hi = a > b ? a : b;
  const lo = a > b ? b : a;
  if (hi - lo >= NEGLIGIBLE_TERM_DB) return lo; // P.1812-6 eq. (63), the other term below 1e-11 dB
  if (hi === Infinity || lo === -Infinity) return lo !== lo || hi !== hi ? NaN : lo; // an infinite term decides
  return lo - (5 / Math.LN10) * Math.log1p(Math.exp(-0.2 * Math.LN10 * (hi - lo))); // P.1812-6 eq. (63)
}
