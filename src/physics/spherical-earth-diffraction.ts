import { sphericalEarthFirstTermLoss, type FirstTermOptions } from "./spherical-earth-first-term.ts";

/** Result of the spherical-Earth diffraction loss, with its intermediates. */
export interface SphericalEarthResult {
  /** spherical-Earth diffraction loss Ldsph (dB) */
  Ldsph: number;
  /** marginal line-of-sight distance dlos (m) */
  dlos_m: number;
  /** true when d ≥ dlos (transhorizon) */
  transhorizon: boolean;
  /** smallest clearance hse between the ray and the spherical Earth (m); NaN beyond dlos */
  hse_m: number;
  /** clearance needed for zero loss hreq (m); NaN beyond dlos */
  hreq_m: number;
  /** Earth radius for marginal line of sight aem (m); NaN beyond dlos */
  aem_m: number;
  /** first-term loss Ldft (dB) used */
  Ldft: number;
}

/**
 * Diffraction loss (dB) over a smooth spherical Earth for any distance, with antenna
 * heights h1, h2 above the smooth surface.
 *
 * Method: ITU-R P.526-15 §3.2 in SI units (the same steps as P.452-17 §4.2.2, which writes
 * them with km and the constant 17.456 = 0.552·sqrt(1000)):
 *   dlos = sqrt(2a)·(sqrt(h1) + sqrt(h2));
 *   d ≥ dlos: Ldsph = Ldft(a_dft = a);
 *   else c = (h1 − h2)/(h1 + h2), m = d²/(4a·(h1 + h2)),
 *     b = 2·sqrt((m + 1)/(3m))·cos(π/3 + (1/3)·arccos((3c/2)·sqrt(3m/(m + 1)³))),
 *     d1 = d(1 + b)/2, d2 = d − d1,
 *     h = [(h1 − d1²/(2a))·d2 + (h2 − d2²/(2a))·d1]/d,
 *     hreq = 0.552·sqrt(d1·d2·λ/d);
 *     h > hreq: Ldsph = 0; else aem = 0.5·(d/(sqrt(h1) + sqrt(h2)))², Ldft(a_dft = aem),
 *     Ldsph = 0 if Ldft < 0, else (1 − h/hreq)·Ldft.
 * First-term loss from `sphericalEarthFirstTermLoss`. (Equation numbers are not quoted:
 * the tags name the section and the quantity.)
 * ae = Infinity (flat Earth) gives Ldsph = 0; negative heights give NaN.
 * Validity: see DIFFRACTION_VALIDITY.delta_bullington (P.526-15 §3.2 states 10 MHz and above).
 * @param d_m path length (m)
 * @param hte_m Tx height above the smooth Earth, h1 (m)
 * @param hre_m Rx height above the smooth Earth, h2 (m)
 * @param ae_m effective Earth radius (m)
 * @param lambda_m wavelength (m)
 * @param options ground and polarisation of the first term
 * @param out optional result object to fill (a coverage reuses one instead of allocating per cell)
 * @returns Ldsph (dB) and intermediates
 */
export function sphericalEarthDiffractionLoss(
  d_m: number,
  hte_m: number,
  hre_m: number,
  ae_m: number,
  lambda_m: number,
  options: FirstTermOptions = {},
  out?: SphericalEarthResult,
): SphericalEarthResult {
  const d = d_m;
  const a = ae_m;
  const h1 = hte_m;
  const h2 = hre_m;
  const lambda = lambda_m;
  const dlos = Math.sqrt(2 * a) * (Math.sqrt(h1) + Math.sqrt(h2)); // P.526-15 §3.2 (dlos)
  if (Number.isNaN(dlos + d + lambda) || !(lambda > 0)) {
    return fill(out, NaN, NaN, false, NaN, NaN, NaN, NaN);
  }
  if (a === Infinity) {
    // Flat Earth (k = ∞): the surface never rises into the ray; Ldsph → 0 as a → ∞.
    return fill(out, 0, Infinity, false, NaN, NaN, NaN, NaN);
  }
  if (d >= dlos) {
    const Ldft = sphericalEarthFirstTermLoss(d, h1, h2, a, lambda, options); // P.526-15 §3.2 (d ≥ dlos)
    return fill(out, Ldft, dlos, true, NaN, NaN, NaN, Ldft);
  }
  const c = (h1 - h2) / (h1 + h2); // P.526-15 §3.2 (c)
  const m = (d * d) / (4 * a * (h1 + h2)); // P.526-15 §3.2 (m)
  // The arccos argument is (3c/2)·sqrt(3m/(m + 1)³), at most |c| ≤ 1 (the root factor peaks
  // at 2/3 for m = 1/2); with one height at or near 0 (|c| → 1) rounding can push it a few ulp
  // past ±1, where acos gives NaN. Clamp it to [−1, 1] (the exact value is ±1 there).
  const arg = ((3 * c) / 2) * Math.sqrt((3 * m) / ((m + 1) ** 3));
  const b = 2 * Math.sqrt((m + 1) / (3 * m)) * Math.cos(Math.PI / 3 + (1 / 3) * Math.acos(arg > 1 ? 1 : arg < -1 ? -1 : arg)); // P.526-15 §3.2 (b)
  const d1 = (d / 2) * (1 + b); // P.526-15 §3.2 (d1)
  const d2 = d - d1; // P.526-15 §3.2 (d2)
  const h = ((h1 - (d1 * d1) / (2 * a)) * d2 + (h2 - (d2 * d2) / (2 * a)) * d1) / d; // P.526-15 §3.2 (h)
  // d1·d2 ≥ 0 exactly (0 ≤ b ≤ 1); rounding can leave it a few ulp below 0 when b → 1.
  const d1d2 = d1 * d2 > 0 ? d1 * d2 : 0;
  // with options.frequency_ghz (the practical-unit form of P.1812-6 / P.452-18), the printed
  // constant 17.456 (km units) is kept: 17.456/sqrt(1000) = 0.55201, not 0.552
  const hreqConst = options.frequency_ghz !== undefined ? 17.456 / Math.sqrt(1000) : 0.552;
  const hreq = hreqConst * Math.sqrt((d1d2 * lambda) / d); // P.526-15 §3.2 (hreq); P.1812-6 eq. (25) // P.526-15 §3.2 (hreq)
  if (h > hreq) {
    return fill(out, 0, dlos, false, h, hreq, NaN, NaN);
  }
  const aem = 0.5 * (d / (Math.sqrt(h1) + Math.sqrt(h2))) ** 2; // P.526-15 §3.2 (aem)
  const Ldft = sphericalEarthFirstTermLoss(d, h1, h2, aem, lambda, options);
  // With a terminal on the surface (b = 1, d2 = 0) the closest approach is at that terminal:
  // h = O(d2) while hreq = O(√d2), so h/hreq → 0 (full first-term loss), not 0/0.
  const ratio = hreq > 0 ? h / hreq : 0;
  const Ldsph = Ldft < 0 ? 0 : (1 - ratio) * Ldft; // P.526-15 §3.2 (A = (1 − h/hreq)·Ah)
  return fill(out, Ldsph, dlos, false, h, hreq, aem, Ldft);
}

/** Fill `out` when one is given, else a new result. */
function fill(out: SphericalEarthResult | undefined, Ldsph: number, dlos_m: number, transhorizon: boolean, hse_m: number, hreq_m: number, aem_m: number, Ldft: number): SphericalEarthResult {
  if (out === undefined) return { Ldsph, dlos_m, transhorizon, hse_m, hreq_m, aem_m, Ldft };
  out.Ldsph = Ldsph;
  out.dlos_m = dlos_m;
  out.transhorizon = transhorizon;
  out.hse_m = hse_m;
  out.hreq_m = hreq_m;
  out.aem_m = aem_m;
  out.Ldft = Ldft;
  return out;
}
