import { normalQuantile } from "./normal-distribution.ts";

/** Validity of ITU-R P.2108-1 §3.2: frequency (GHz), path length (km), percentage of locations (%). */
export const TERRESTRIAL_CLUTTER_LOSS_VALIDITY = { frequency_ghz: [0.5, 67], distance_km: [0.25, Infinity], p_pct: [0, 100] } as const;

/**
 * Statistical clutter loss at one end of a terrestrial path, not exceeded for p % of
 * locations — ITU-R P.2108-1 §3.2: L_ctt = −5·log10(10^{−0.2·Ll} + 10^{−0.2·Ls}) − σ_cb·Q⁻¹(p/100),
 * Ll = −2·log10(10^{−5·log10 f − 12.5} + 10^{−16.5}), Ls = 32.98 + 23.9·log10 d + 3·log10 f,
 * σ_cb = √((σl²·10^{−0.2·Ll} + σs²·10^{−0.2·Ls}) / (10^{−0.2·Ll} + 10^{−0.2·Ls})), σl = 4 dB,
 * σs = 6 dB; Q⁻¹ the inverse complementary normal distribution. The model is for urban and
 * suburban surroundings of the terminal. The loss is never more than the loss at 2 km for the
 * same p: L = min(L(d), L(2 km)), taken per percentage, as the ITU-R validation data of
 * P.2108-1 and the reference implementation they come with compute it. (For p ≤ 50 % that is
 * the loss at min(d, 2 km); for p > 50 % and d < 2 km the 2 km curve, whose σ_cb is smaller,
 * can be the lower one: with a cap on d alone, 122 of the 130 published rows with p > 50 %
 * came out up to 2 dB high.) Valid 0.5–67 GHz, d ≥ 0.25 km.
 * @param f_ghz frequency (GHz)
 * @param d_km path length (km)
 * @param p_pct percentage of locations (%), 0 < p < 100
 * @returns loss (dB); NaN for bad input
 */
export function terrestrialClutterLoss(f_ghz: number, d_km: number, p_pct: number): number {
  if (!(f_ghz > 0) || !(d_km > 0) || !(p_pct > 0 && p_pct < 100)) return NaN;
  const Qinv = -normalQuantile(p_pct / 100); // Q⁻¹(x) = Φ⁻¹(1 − x) = −Φ⁻¹(x)
  const Ll = -2 * Math.log10(10 ** (-5 * Math.log10(f_ghz) - 12.5) + 10 ** -16.5); // P.2108-1 eq. (4a)
  return Math.min(lossAt(f_ghz, d_km, Ll, Qinv), lossAt(f_ghz, 2, Ll, Qinv)); // P.2108-1 §3.2 (not more than the loss at 2 km, as the ITU-R validation data)
}

/** L_ctt of P.2108-1 eq. (3) at distance d (km) for Ll (dB) and Q⁻¹(p/100). */
function lossAt(f_ghz: number, d_km: number, Ll: number, Qinv: number): number {
  const sigmaL = 4; // P.2108-1 §3.2 (σl)
  const sigmaS = 6; // P.2108-1 §3.2 (σs)
  const Ls = 32.98 + 23.9 * Math.log10(d_km) + 3 * Math.log10(f_ghz); // P.2108-1 eq. (4b)
  const el = 10 ** (-0.2 * Ll);
  const es = 10 ** (-0.2 * Ls);
  const sigmaCb = Math.sqrt((sigmaL * sigmaL * el + sigmaS * sigmaS * es) / (el + es)); // P.2108-1 eq. (4c)
  return -5 * Math.log10(el + es) - sigmaCb * Qinv; // P.2108-1 eq. (4)
}
