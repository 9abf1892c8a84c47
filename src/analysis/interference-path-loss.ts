import { dryPressureFromTotalHpa } from "../physics/gas-attenuation.ts";
import { P452_DEFAULTS, P452_VALIDITY, p452Loss } from "../physics/p452.ts";
import type { Study } from "../study/study.ts";

/** An interference path: a profile from the interfering transmitter to the victim receiver. */
export interface InterferencePath {
  /** distance from the transmitter of each sample (m), first 0 */
  d_m: Float64Array;
  /** terrain height amsl of each sample (m); the ends are the sites' ground */
  h_m: Float64Array;
  /** transmitter and receiver antenna centre heights amsl (m) */
  hts_m: number;
  hrs_m: number;
  frequency_ghz: number;
  polarization: "h" | "v";
  /** antenna gains toward each other (dBi), for the troposcatter aperture coupling */
  gt_dbi: number;
  gr_dbi: number;
  /** ends (deg), for the path-centre latitude of the radio climate */
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

/** Time percentages the interference analysis accepts: the range of ITU-R P.452-18. */
export const INTERFERENCE_TIME_PCT = P452_VALIDITY.time_pct;

/**
 * The interference path loss of a study: ITU-R P.452-18 clear-air basic transmission loss
 * (src/physics/p452.ts: line of sight with focusing and multipath, delta-Bullington
 * diffraction with the time interpolation, troposcatter, ducting/layer reflection, the
 * blend) over the path's terrain profile, all points of the inland zone, ΔN and N0 at the
 * Recommendation's defaults (45 N-units/km, 325 N-units: the study holds no radio-climate
 * maps), dry-air pressure and temperature from the study's climate. The antenna gains for
 * the troposcatter term are those toward the other station.
 */
export function interferencePathLossModel(study: Study): InterferencePathLossModel {
  const c = study.climate;
  const pressure_hpa = dryPressureFromTotalHpa(c.pressure_hpa, c.temperature_c + 273.15, c.water_vapour_g_m3);
  return {
    method: `ITU-R P.452-18 clear-air basic transmission loss (ΔN = ${P452_DEFAULTS.dn} N-units/km, N0 = ${P452_DEFAULTS.n0} N-units, every profile point inland, no clutter)`,
    time_dependent: true,
    loss(path, p_pct) {
      const n = path.d_m.length;
      const d_km = new Float64Array(n);
      for (let i = 0; i < n; i++) d_km[i] = path.d_m[i] / 1000;
      return p452Loss({
        frequency_ghz: path.frequency_ghz,
        time_pct: p_pct,
        d_km,
        h_m: path.h_m,
        htg_m: path.hts_m - path.h_m[0],
        hrg_m: path.hrs_m - path.h_m[n - 1],
        polarization: path.polarization,
        tx_gain_dbi: path.gt_dbi,
        rx_gain_dbi: path.gr_dbi,
        tx_lat_deg: path.tx_lat_deg,
        tx_lon_deg: path.tx_lon_deg,
        rx_lat_deg: path.rx_lat_deg,
        rx_lon_deg: path.rx_lon_deg,
        pressure_hpa,
        temperature_c: c.temperature_c,
      }).Lb;
    },
  };
}
