import { type Complex } from "./complex.ts";

/** Permittivity of free space (F/m), CODATA 2022 recommended value. */
const EPSILON_0_F_M = 8.8541878188e-12;

export interface WaterPermittivity {
  /** complex relative permittivity ε' − j·ε'' (engineering sign convention, ε'' ≥ 0 means loss) */
  epsilon: Complex;
  /** ionic (DC) conductivity σ(T, S) of the model (S/m); 0 for pure water */
  sigma_ionic_s_m: number;
}

// Meissner & Wentz (2004) fit coefficients a0…a10 (pure water) and b0…b12 (salinity terms),
// written from memory of the paper and cross-checked digit by digit against the paper's values
// as reproduced in C. Mätzler's published 2004 routine for the same model.
const a = [
  5.723, 2.2379e-2, -7.1237e-4, 5.0478, -7.0315e-2, 6.0059e-4, 3.6143, 2.8841e-2, 1.3652e-1, 1.4825e-3,
  2.4166e-4,
] as const;
const b = [
  -3.56417e-3, 4.74868e-6, 1.15574e-5, 2.39357e-3, -3.1353e-5, 2.52477e-7, -6.28908e-3, 1.76032e-4,
  -9.22144e-5, -1.99723e-2, 1.81176e-4, -2.04265e-3, 1.57883e-4,
] as const;

/**
 * Complex relative permittivity of pure and sea water, double-Debye relaxation plus ionic
 * conductivity:
 *   ε(f) = (εs − ε1)/(1 + j f/f1) + (ε1 − ε∞)/(1 + j f/f2) + ε∞ − j σ/(2π ε0 f).
 *
 * Method and reference: the fit of T. Meissner & F. J. Wentz, "The complex dielectric constant
 * of pure and sea water from microwave satellite observations", IEEE Trans. Geosci. Remote
 * Sens. 42(9), 2004, pp. 1836–1849 (§II–III): εs, ε1, ε∞, f1, f2 of pure water as functions of
 * T, multiplied by salinity factors for sea water; σ(T, S) from σ35(T), R15(S) and RT/R15.
 * ITU-R P.527 adopts this water model from edition -4 on (§5, "water"); the P.527 equation
 * numbers are not quoted because they were not checked against the text for this code — the
 * tags below name the quantity instead.
 *
 * Validity (paper): 1–1000 GHz (fit data to ~500 GHz); pure water −20…40 °C, sea water
 * −2…34 °C and 0…40 ‰. Below 1 GHz the Debye form tends to the static value and stays
 * physically sensible (common practice), but it is outside the fit range.
 * @param frequency_ghz frequency (GHz), > 0
 * @param temperature_c water temperature (°C)
 * @param salinity_ppt salinity (‰, practical salinity units); 0 for fresh/pure water
 */
export function waterPermittivity(opts: {
  frequency_ghz: number;
  temperature_c: number;
  salinity_ppt: number;
}): WaterPermittivity {
  const f = opts.frequency_ghz;
  const T = opts.temperature_c;
  const S = opts.salinity_ppt;
  if (!(f > 0) || !Number.isFinite(f) || !Number.isFinite(T) || !(S >= 0) || !Number.isFinite(S)) {
    return { epsilon: { re: NaN, im: NaN }, sigma_ionic_s_m: NaN };
  }
  const T2 = T * T;
  const S2 = S * S;

  // Pure water (S = 0)
  const es0 = (3.70886e4 - 82.168 * T) / (421.854 + T); // MW2004 εs(T) (static permittivity)
  const e10 = a[0] + a[1] * T + a[2] * T2; // MW2004 ε1(T)
  const f10 = (45 + T) / (a[3] + a[4] * T + a[5] * T2); // MW2004 ν1(T) (GHz)
  const einf0 = a[6] + a[7] * T; // MW2004 ε∞(T)
  const f20 = (45 + T) / (a[8] + a[9] * T + a[10] * T2); // MW2004 ν2(T) (GHz)

  // Salinity factors (all equal 1 at S = 0)
  const es = es0 * Math.exp(b[0] * S + b[1] * S2 + b[2] * T * S); // MW2004 εs(T,S)
  const f1 = f10 * (1 + S * (b[3] + b[4] * T + b[5] * T2)); // MW2004 ν1(T,S)
  const e1 = e10 * Math.exp(b[6] * S + b[7] * S2 + b[8] * T * S); // MW2004 ε1(T,S)
  const f2 = f20 * (1 + S * (b[9] + b[10] * T)); // MW2004 ν2(T,S)
  const einf = einf0 * (1 + S * (b[11] + b[12] * T)); // MW2004 ε∞(T,S)

  // Ionic conductivity σ(T,S) (S/m)
  let sigma = 0;
  if (S > 0) {
    const sigma35 = 2.903602 + 8.607e-2 * T + 4.738817e-4 * T2 - 2.991e-6 * T2 * T + 4.3047e-9 * T2 * T2; // MW2004 σ35(T)
    const R15 = (S * (37.5109 + 5.45216 * S + 1.4409e-2 * S2)) / (1004.75 + 182.283 * S + S2); // MW2004 R15(S)
    const alpha0 = (6.9431 + 3.2841 * S - 9.9486e-2 * S2) / (84.85 + 69.024 * S + S2); // MW2004 α0(S)
    const alpha1 = 49.843 - 0.2276 * S + 1.98e-3 * S2; // MW2004 α1(S)
    const RTR15 = 1 + (alpha0 * (T - 15)) / (alpha1 + T); // MW2004 RT/R15
    sigma = sigma35 * R15 * RTR15; // MW2004 σ(T,S)
  }

  // Double Debye: 1/(1 + j x) = (1 − j x)/(1 + x²)
  const x1 = f / f1;
  const x2 = f / f2;
  const d1 = (es - e1) / (1 + x1 * x1);
  const d2 = (e1 - einf) / (1 + x2 * x2);
  const re = d1 + d2 + einf; // MW2004 double-Debye ε'
  const im = -(d1 * x1 + d2 * x2) - sigma / (2 * Math.PI * EPSILON_0_F_M * f * 1e9); // MW2004 double-Debye −ε''
  return { epsilon: { re, im }, sigma_ionic_s_m: sigma };
}
