import { SPEED_OF_LIGHT_M_S } from "./constants.ts";
import { waterPermittivity } from "./water-permittivity.ts";

/** Ground classes of ITU-R P.527 (the P.527-3 curve families). */
export type GroundClass = "sea-water" | "fresh-water" | "wet-ground" | "medium-dry-ground" | "very-dry-ground";

export const GROUND_CLASSES: readonly GroundClass[] = [
  "sea-water",
  "fresh-water",
  "wet-ground",
  "medium-dry-ground",
  "very-dry-ground",
];

export interface GroundConstants {
  /** relative permittivity εr (real part) */
  epsilon_r: number;
  /**
   * effective conductivity σ (S/m), ionic plus dielectric loss, defined so that
   * εr − j·60·λ·σ reproduces the model's complex permittivity (ITU-R notation)
   */
  sigma_s_m: number;
  /** true when frequency_ghz lies outside the range the fit was made for (see `fit_range_ghz`) */
  extrapolated: boolean;
  /** frequency range (GHz) of the underlying fit */
  fit_range_ghz: readonly [number, number];
}

/**
 * Power-law fits εr = a·f^b, σ = c·f^d (f in GHz) for the three land classes: ITU-R P.2040-3
 * Table 3 ("very dry ground", "medium dry ground", "wet ground"; the coefficients are the same
 * in P.2040-1 and -2), valid 1–10 GHz. Values from memory, agreeing with several independent
 * public tabulations of that table.
 */
export const LAND_GROUND_FITS = {
  "very-dry-ground": { a: 3, b: 0, c: 0.00015, d: 2.52 },
  "medium-dry-ground": { a: 15, b: -0.1, c: 0.035, d: 1.63 },
  "wet-ground": { a: 30, b: -0.4, c: 0.15, d: 1.3 },
} as const;

/** Frequency range (GHz) of the P.2040-3 Table 3 land fits. */
export const LAND_FIT_RANGE_GHZ = [1, 10] as const;
/** Frequency range (GHz) of the Meissner–Wentz water model used for the water classes. */
export const WATER_FIT_RANGE_GHZ = [1, 1000] as const;

/**
 * Default water conditions: 20 °C for both water classes and 35 ‰ ("average salinity") for
 * sea water, the conditions of the ITU-R P.527-3 curves. Fresh water is modelled as pure water
 * (its small ionic conductivity, ~1e-3 S/m, is neglected; it matters only below ~100 MHz).
 */
export const DEFAULT_WATER_TEMPERATURE_C = 20;
export const DEFAULT_SEA_SALINITY_PPT = 35;

/**
 * Relative permittivity εr and conductivity σ (S/m) of an ITU-R P.527 ground class at a
 * frequency.
 *
 * Method and references (the editions and what comes from where, stated plainly):
 * - sea water, fresh water: the Meissner & Wentz (2004) double-Debye water model, which
 *   ITU-R P.527 adopts from edition -4 on (P.527-6 §5) — see `waterPermittivity`. Fresh water
 *   is salinity 0.
 * - wet, medium dry, very dry ground: P.527-6 gives a physical soil model (sand/clay fractions,
 *   water content) rather than per-class fits; the per-class frequency fits εr = a·f^b,
 *   σ = c·f^d of ITU-R P.2040-3 Table 3 are used instead (1–10 GHz).
 * σ is returned as the effective conductivity σ = ε''/(60·λ) so that the ITU-R form
 * η = εr − j·60·λ·σ (P.526-15 §3.1.1.1; ≈ εr − j·18·σ/f_GHz) gives back the model's complex
 * permittivity exactly (60 approximates 1/(2π·ε0·c) = 59.96).
 *
 * Validity: land classes 1–10 GHz; water 1–1000 GHz. Outside those ranges the fit is evaluated
 * anyway and `extrapolated` is true — the caller decides whether to warn — with one exception:
 * below 1 GHz the land εr is held at its 1 GHz value (the P.527-3 curves are flat below about
 * 1 GHz, the power law is not; an engineering choice of this code). An unknown class or a
 * non-positive frequency gives NaN.
 * @param ground ground class
 * @param frequency_ghz frequency (GHz)
 * @param water water conditions: temperature (°C) and sea salinity (‰); defaults 20 °C, 35 ‰
 */
export function groundConstants(
  ground: GroundClass,
  frequency_ghz: number,
  water: { temperature_c?: number; salinity_ppt?: number } = {},
): GroundConstants {
  const f = frequency_ghz;
  if (!(f > 0) || !Number.isFinite(f)) {
    return { epsilon_r: NaN, sigma_s_m: NaN, extrapolated: true, fit_range_ghz: [NaN, NaN] };
  }
  if (ground === "sea-water" || ground === "fresh-water") {
    const { epsilon } = waterPermittivity({
      frequency_ghz: f,
      temperature_c: water.temperature_c ?? DEFAULT_WATER_TEMPERATURE_C,
      salinity_ppt: ground === "sea-water" ? (water.salinity_ppt ?? DEFAULT_SEA_SALINITY_PPT) : 0,
    });
    const lambda = SPEED_OF_LIGHT_M_S / (f * 1e9);
    return {
      epsilon_r: epsilon.re,
      sigma_s_m: -epsilon.im / (60 * lambda), // P.526-15 §3.1.1.1 notation εr − j60λσ, solved for σ
      extrapolated: f < WATER_FIT_RANGE_GHZ[0] || f > WATER_FIT_RANGE_GHZ[1],
      fit_range_ghz: WATER_FIT_RANGE_GHZ,
    };
  }
  const fit = (LAND_GROUND_FITS as Record<string, { a: number; b: number; c: number; d: number }>)[ground];
  if (fit === undefined) {
    return { epsilon_r: NaN, sigma_s_m: NaN, extrapolated: true, fit_range_ghz: [NaN, NaN] };
  }
  // Below 1 GHz εr is held at its 1 GHz value: with b < 0 the power law grows without bound
  // (wet ground would reach εr = 75 at 100 MHz), whereas the P.527-3 curves are flat there.
  const fEps = Math.max(f, LAND_FIT_RANGE_GHZ[0]);
  return {
    epsilon_r: fit.a * Math.pow(fEps, fit.b), // P.2040-3 Table 3: εr = a·f^b
    sigma_s_m: fit.c * Math.pow(f, fit.d), // P.2040-3 Table 3: σ = c·f^d
    extrapolated: f < LAND_FIT_RANGE_GHZ[0] || f > LAND_FIT_RANGE_GHZ[1],
    fit_range_ghz: LAND_FIT_RANGE_GHZ,
  };
}
