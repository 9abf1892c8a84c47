import { EARTH_RADIUS_M } from "../physics/constants.ts";
import { deltaBullingtonLoss } from "../physics/delta-bullington.ts";
import { freeSpaceLossDb } from "../physics/free-space-loss.ts";
import { dryPressureFromTotalHpa, gasPathAttenuation, gasSpecificAttenuation } from "../physics/gas-attenuation.ts";
import { groundConstants, type GroundClass } from "../physics/ground-constants.ts";
import type { Study } from "../study/study.ts";

/** An interference path: a profile from the interfering transmitter to the victim receiver. */
export interface InterferencePath {
  /** distance from the transmitter of each sample (m), first 0 */
  d_m: Float64Array;
  /** terrain (and obstruction) height amsl of each sample (m) */
  h_m: Float64Array;
  /** transmitter and receiver antenna centre heights amsl (m) */
  hts_m: number;
  hrs_m: number;
  frequency_ghz: number;
  polarization: "h" | "v";
  /** antenna gains toward each other (dBi), for methods with a troposcatter term */
  gt_dbi: number;
  gr_dbi: number;
  /** ends (deg), for methods that read the radio climate */
  tx_lat_deg: number;
  tx_lon_deg: number;
  rx_lat_deg: number;
  rx_lon_deg: number;
}

/** Basic transmission loss (dB) of an interference path not exceeded for p % of time. */
export interface InterferencePathLossModel {
  /** Short name and reference for the report's methods table. */
  method: string;
  /** Whether the loss depends on the time percentage (else long and short term are equal). */
  time_dependent: boolean;
  loss(path: InterferencePath, p_pct: number): number;
}

/**
 * The interference path loss of a study: for now free space (P.525-4) + delta-Bullington
 * diffraction (P.526-15 §4.5) at k = 4/3 for the long term and at k = 3 for percentages
 * below 1 % (a stand-in for enhanced propagation), + gases (P.676-12 over the path length).
 * This is the interim model until ITU-R P.452-18 is available in src/physics: it has no
 * ducting or troposcatter and so underestimates short-term interference on long paths.
 */
export function interferencePathLossModel(study: Study): InterferencePathLossModel {
  const c = study.climate;
  const T_k = c.temperature_c + 273.15;
  const pDry = dryPressureFromTotalHpa(c.pressure_hpa, T_k, c.water_vapour_g_m3);
  const gammaCache = new Map<number, number>();
  const gamma = (f: number) => {
    let g = gammaCache.get(f);
    if (g === undefined) {
      g = gasSpecificAttenuation({ frequency_ghz: f, pressure_dry_hpa: pDry, temperature_k: T_k, water_vapour_density_g_m3: c.water_vapour_g_m3 }).gamma_db_km;
      gammaCache.set(f, g);
    }
    return g;
  };
  const omega = c.ground === "sea_water" || c.ground === "fresh_water" ? 1 : 0;
  return {
    method: "Interim: free space (ITU-R P.525-4) + delta-Bullington diffraction (ITU-R P.526-15 §4.5; k = 4/3, k = 3 below 1 % of time) + gases (ITU-R P.676-12)",
    time_dependent: true,
    loss(path, p_pct) {
      const D = path.d_m[path.d_m.length - 1];
      const f = path.frequency_ghz;
      const k = p_pct < 1 ? 3 : 4 / 3;
      const ground = groundConstants(c.ground.replace(/_/g, "-") as GroundClass, f);
      const Ld = deltaBullingtonLoss({ d_m: path.d_m, h_m: path.h_m, hts_m: path.hts_m, hrs_m: path.hrs_m, frequency_ghz: f, ae_m: k * EARTH_RADIUS_M }, { polarization: path.polarization, epsilon_r: ground.epsilon_r, sigma_s_m: ground.sigma_s_m, omega }).Ld;
      return freeSpaceLossDb(Math.hypot(D, path.hts_m - path.hrs_m), f) + Ld + gasPathAttenuation(gamma(f), D);
    },
  };
}
