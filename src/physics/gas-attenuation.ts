import { P676_OXYGEN_LINES, P676_WATER_VAPOUR_LINES } from "./p676-lines.ts";

/** Where the gaseous-attenuation method applies (for warnings at the boundary). */
export const GAS_P676_VALIDITY = {
  method: "ITU-R P.676-12 Annex 1 (line-by-line)",
  frequency_ghz: [1, 1000] as const,
} as const;

/**
 * Sea-level reference atmosphere used when a study gives none (ITU-R P.676-12 / P.835
 * mean annual global reference: 1013.25 hPa total pressure, 15 °C, 7.5 g/m³).
 */
export const REFERENCE_ATMOSPHERE = {
  pressure_total_hpa: 1013.25,
  temperature_k: 288.15,
  water_vapour_density_g_m3: 7.5,
} as const;

export interface GasAttenuationInput {
  frequency_ghz: number;
  /** Dry-air pressure p (hPa) — total pressure minus the water-vapour partial pressure. */
  pressure_dry_hpa: number;
  temperature_k: number;
  water_vapour_density_g_m3: number;
}

export interface GasSpecificAttenuation {
  /** Dry air: oxygen lines, pressure-induced nitrogen and the Debye continuum (dB/km). */
  gamma_o_db_km: number;
  /** Water vapour lines (dB/km). */
  gamma_w_db_km: number;
  /** gamma_o + gamma_w (dB/km). */
  gamma_db_km: number;
}

/**
 * Water-vapour partial pressure e (hPa) from the vapour density: e = ρ·T / 216.7.
 *
 * Reference: ITU-R P.676-12 Annex 1 eq. (4) (also P.453-14 eq. (9)).
 * @param water_vapour_density_g_m3 water-vapour density ρ (g/m³)
 * @param temperature_k absolute temperature T (K)
 */
export function waterVapourPressureHpa(water_vapour_density_g_m3: number, temperature_k: number): number {
  return (water_vapour_density_g_m3 * temperature_k) / 216.7; // P.676-12 eq. (4)
}

/**
 * Dry-air pressure p (hPa) from total barometric pressure: p = p_total − e, with e from
 * {@link waterVapourPressureHpa}. P.676 Annex 1 takes the dry pressure; its validation
 * examples give p = 1013.25 hPa dry and add e on top, whereas a study gives total pressure.
 *
 * Reference: ITU-R P.676-12 Annex 1 §1 (p_tot = p + e) with eq. (4).
 * @param pressure_total_hpa total barometric pressure (hPa)
 * @param temperature_k absolute temperature (K)
 * @param water_vapour_density_g_m3 water-vapour density (g/m³)
 */
export function dryPressureFromTotalHpa(
  pressure_total_hpa: number,
  temperature_k: number,
  water_vapour_density_g_m3: number,
): number {
  return pressure_total_hpa - waterVapourPressureHpa(water_vapour_density_g_m3, temperature_k);
}

/**
 * Line shape factor F_i for line centre fi, width Δf and interference correction δ.
 * Reference: ITU-R P.676-12 Annex 1 eq. (5).
 */
function lineShape(f: number, fi: number, df: number, delta: number): number {
  return (
    (f / fi) *
    ((df - delta * (fi - f)) / ((fi - f) ** 2 + df ** 2) + (df - delta * (fi + f)) / ((fi + f) ** 2 + df ** 2))
  ); // P.676-12 eq. (5)
}

/** Σ S_i·F_i over the oxygen lines (P.676-12 eqs. (3), (5)–(7)). */
function oxygenLineSum(f: number, p: number, e: number, theta: number): number {
  let sum = 0;
  for (const [fi, a1, a2, a3, a4, a5, a6] of P676_OXYGEN_LINES) {
    const S = a1 * 1e-7 * p * theta ** 3 * Math.exp(a2 * (1 - theta)); // P.676-12 eq. (3)
    const df0 = a3 * 1e-4 * (p * theta ** (0.8 - a4) + 1.1 * e * theta); // P.676-12 eq. (6a)
    const df = Math.sqrt(df0 * df0 + 2.25e-6); // P.676-12 eq. (6b), Zeeman splitting
    const delta = (a5 + a6 * theta) * 1e-4 * (p + e) * theta ** 0.8; // P.676-12 eq. (7)
    sum += S * lineShape(f, fi, df, delta);
  }
  return sum;
}

/** Σ S_i·F_i over the water-vapour lines (P.676-12 eqs. (3), (5)–(7); δ = 0). */
function waterVapourLineSum(f: number, p: number, e: number, theta: number): number {
  let sum = 0;
  for (const [fi, b1, b2, b3, b4, b5, b6] of P676_WATER_VAPOUR_LINES) {
    const S = b1 * 1e-1 * e * theta ** 3.5 * Math.exp(b2 * (1 - theta)); // P.676-12 eq. (3)
    const df0 = b3 * 1e-4 * (p * theta ** b4 + b5 * e * theta ** b6); // P.676-12 eq. (6a)
    const df = 0.535 * df0 + Math.sqrt(0.217 * df0 * df0 + (2.1316e-12 * fi * fi) / theta); // P.676-12 eq. (6b), Doppler
    sum += S * lineShape(f, fi, df, 0); // P.676-12 eq. (7): δ = 0 for water vapour
  }
  return sum;
}

/**
 * Dry continuum N''_D(f): Debye spectrum of oxygen below 10 GHz plus pressure-induced
 * nitrogen absorption above 100 GHz.
 * Reference: ITU-R P.676-12 Annex 1 eqs. (8), (9).
 */
function dryContinuum(f: number, p: number, e: number, theta: number): number {
  const d = 5.6e-4 * (p + e) * theta ** 0.8; // P.676-12 eq. (9), width parameter of the Debye spectrum
  return (
    f *
    p *
    theta ** 2 *
    (6.14e-5 / (d * (1 + (f / d) ** 2)) + (1.4e-12 * p * theta ** 1.5) / (1 + 1.9e-5 * f ** 1.5))
  ); // P.676-12 eq. (8)
}

/**
 * Specific attenuation (dB/km) of dry air and water vapour by summing the individual
 * resonance lines of oxygen (44) and water vapour (35) plus the dry continuum:
 * γ = γo + γw = 0.1820·f·(N''_Oxygen(f) + N''_WaterVapour(f)), θ = 300/T.
 *
 * Reference: ITU-R P.676-12 (08/2019) Annex 1 §1, eqs. (1)–(9), Tables 1 and 2.
 * Valid 1–1000 GHz at any pressure, temperature and humidity of the lower atmosphere
 * (outside that band the result is still computed; the boundary warns).
 * @param input.frequency_ghz frequency f (GHz)
 * @param input.pressure_dry_hpa dry-air pressure p (hPa); see {@link dryPressureFromTotalHpa}
 * @param input.temperature_k temperature T (K)
 * @param input.water_vapour_density_g_m3 water-vapour density ρ (g/m³)
 * @returns γo, γw and γ (dB/km); NaN for non-finite or non-physical input
 */
export function gasSpecificAttenuation(input: GasAttenuationInput): GasSpecificAttenuation {
  const { frequency_ghz: f, pressure_dry_hpa: p, temperature_k: T, water_vapour_density_g_m3: rho } = input;
  if (!(f > 0) || !(p >= 0) || !(T > 0) || !(rho >= 0) || ![f, p, T, rho].every(Number.isFinite)) {
    return { gamma_o_db_km: NaN, gamma_w_db_km: NaN, gamma_db_km: NaN };
  }
  const theta = 300 / T; // P.676-12 §1: θ = 300/T
  const e = waterVapourPressureHpa(rho, T);
  const NppOxygen = oxygenLineSum(f, p, e, theta) + dryContinuum(f, p, e, theta); // P.676-12 eq. (2a)
  const NppWater = waterVapourLineSum(f, p, e, theta); // P.676-12 eq. (2b)
  const gamma_o = 0.182 * f * NppOxygen; // P.676-12 eq. (1)
  const gamma_w = 0.182 * f * NppWater; // P.676-12 eq. (1)
  return { gamma_o_db_km: gamma_o, gamma_w_db_km: gamma_w, gamma_db_km: gamma_o + gamma_w };
}

/**
 * Gaseous attenuation (dB) along a terrestrial (horizontal) path of uniform atmosphere:
 * A = γ·d.
 *
 * Reference: ITU-R P.676-12 Annex 1 §2.1 eq. (10); ITU-R P.530-18 §2.1.
 * Valid for near-horizontal line-of-sight paths where γ is constant along the path.
 * @param gamma_db_km specific attenuation γ (dB/km)
 * @param distance_m path length d (m)
 */
export function gasPathAttenuation(gamma_db_km: number, distance_m: number): number {
  if (!(distance_m >= 0)) return NaN;
  return gamma_db_km * (distance_m / 1000); // P.676-12 eq. (10)
}
