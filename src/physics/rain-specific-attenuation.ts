/** Where the rain specific-attenuation model applies (for warnings at the boundary). */
export const RAIN_P838_VALIDITY = {
  method: "ITU-R P.838-3",
  frequency_ghz: [1, 1000] as const,
} as const;

/** One curve fit of P.838-3: Σ_j a_j·exp(−((log10 f − b_j)/c_j)²) + m·log10 f + c. */
interface P838Fit {
  /** [a_j, b_j, c_j] per term. */
  terms: readonly (readonly [number, number, number])[];
  m: number;
  c: number;
}

/**
 * Coefficients of ITU-R P.838-3 (03/2005) Tables 1–4, typed from the Recommendation and
 * checked against test/fixtures/itu/p838/coefficients.csv by the reference test.
 */
export const P838_COEFFICIENTS: { kH: P838Fit; kV: P838Fit; alphaH: P838Fit; alphaV: P838Fit } = {
  // Table 1
  kH: {
    terms: [
      [-5.3398, -0.10008, 1.13098],
      [-0.35351, 1.2697, 0.454],
      [-0.23789, 0.86036, 0.15354],
      [-0.94158, 0.64552, 0.16817],
    ],
    m: -0.18961,
    c: 0.71147,
  },
  // Table 2
  kV: {
    terms: [
      [-3.80595, 0.56934, 0.81061],
      [-3.44965, -0.22911, 0.51059],
      [-0.39902, 0.73042, 0.11899],
      [0.50167, 1.07319, 0.27195],
    ],
    m: -0.16398,
    c: 0.63297,
  },
  // Table 3
  alphaH: {
    terms: [
      [-0.14318, 1.82442, -0.55187],
      [0.29591, 0.77564, 0.19822],
      [0.32177, 0.63773, 0.13164],
      [-5.3761, -0.9623, 1.47828],
      [16.1721, -3.2998, 3.4399],
    ],
    m: 0.67849,
    c: -1.95537,
  },
  // Table 4
  alphaV: {
    terms: [
      [-0.07771, 2.3384, -0.76284],
      [0.56727, 0.95545, 0.54039],
      [-0.20238, 1.1452, 0.26809],
      [-48.2991, 0.791669, 0.116226],
      [48.5833, 0.791459, 0.116479],
    ],
    m: -0.053739,
    c: 0.83433,
  },
};

function evaluateFit(fit: P838Fit, log10f: number): number {
  let sum = 0;
  for (const [a, b, c] of fit.terms) sum += a * Math.exp(-(((log10f - b) / c) ** 2));
  return sum + fit.m * log10f + fit.c;
}

/**
 * The four polarisation coefficients kH, kV, αH, αV at a frequency.
 *
 * Method: log10 k = Σ a_j·exp(−((log10 f − b_j)/c_j)²) + m_k·log10 f + c_k and
 * α = Σ a_j·exp(−((log10 f − b_j)/c_j)²) + m_α·log10 f + c_α.
 * Reference: ITU-R P.838-3 eqs. (2), (3), Tables 1–4. Valid 1–1000 GHz.
 * @param frequency_ghz frequency f (GHz)
 */
export function rainPolarisationCoefficients(frequency_ghz: number): {
  kH: number;
  kV: number;
  alphaH: number;
  alphaV: number;
} {
  if (!(frequency_ghz > 0) || !Number.isFinite(frequency_ghz)) return { kH: NaN, kV: NaN, alphaH: NaN, alphaV: NaN };
  const x = Math.log10(frequency_ghz);
  return {
    kH: 10 ** evaluateFit(P838_COEFFICIENTS.kH, x), // P.838-3 eq. (2), Table 1
    kV: 10 ** evaluateFit(P838_COEFFICIENTS.kV, x), // P.838-3 eq. (2), Table 2
    alphaH: evaluateFit(P838_COEFFICIENTS.alphaH, x), // P.838-3 eq. (3), Table 3
    alphaV: evaluateFit(P838_COEFFICIENTS.alphaV, x), // P.838-3 eq. (3), Table 4
  };
}

export interface RainGeometry {
  /** Path elevation angle θ (degrees); 0 for a horizontal terrestrial path. */
  elevation_deg: number;
  /** Polarisation tilt angle τ relative to the horizontal (degrees): 0 horizontal, 90 vertical, 45 circular. */
  tilt_deg: number;
}

/** Tilt angles τ (degrees) of the usual polarisations, as P.838-3 eqs. (4), (5) take them. */
export const POLARISATION_TILT_DEG = { horizontal: 0, vertical: 90, circular: 45 } as const;

/**
 * Power-law coefficients k and α of γR = k·R^α for any linear or circular polarisation
 * and path elevation.
 *
 * Method: k = [kH + kV + (kH − kV)·cos²θ·cos 2τ]/2,
 * α = [kH·αH + kV·αV + (kH·αH − kV·αV)·cos²θ·cos 2τ]/(2k).
 * Reference: ITU-R P.838-3 eqs. (4), (5). Valid 1–1000 GHz.
 * @param frequency_ghz frequency f (GHz)
 * @param geometry.elevation_deg path elevation θ (degrees)
 * @param geometry.tilt_deg polarisation tilt τ (degrees)
 */
export function rainCoefficients(frequency_ghz: number, geometry: RainGeometry): { k: number; alpha: number } {
  const { kH, kV, alphaH, alphaV } = rainPolarisationCoefficients(frequency_ghz);
  const theta = (geometry.elevation_deg * Math.PI) / 180;
  const tau = (geometry.tilt_deg * Math.PI) / 180;
  const w = Math.cos(theta) ** 2 * Math.cos(2 * tau);
  const k = (kH + kV + (kH - kV) * w) / 2; // P.838-3 eq. (4)
  const alpha = (kH * alphaH + kV * alphaV + (kH * alphaH - kV * alphaV) * w) / (2 * k); // P.838-3 eq. (5)
  return { k, alpha };
}

/**
 * Specific attenuation due to rain (dB/km): γR = k·R^α.
 *
 * Reference: ITU-R P.838-3 eq. (1), with k and α from {@link rainCoefficients}.
 * Valid 1–1000 GHz; R ≥ 0 (negative rain rate gives NaN).
 * @param rain_rate_mm_h rain rate R (mm/h)
 * @param frequency_ghz frequency f (GHz)
 * @param geometry elevation θ and polarisation tilt τ (degrees)
 */
export function rainSpecificAttenuation(rain_rate_mm_h: number, frequency_ghz: number, geometry: RainGeometry): number {
  if (!(rain_rate_mm_h >= 0)) return NaN;
  const { k, alpha } = rainCoefficients(frequency_ghz, geometry);
  return k * rain_rate_mm_h ** alpha; // P.838-3 eq. (1)
}
