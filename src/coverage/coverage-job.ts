import type { PatternTables } from "./antenna-pattern.ts";
import type { SweepGeometry } from "./radial-sweep.ts";
import type { SphericalGround } from "./spherical-earth-scalar.ts";

export type CoverageMethod = "visibility" | "delta-bullington" | "hata";

/** Nodata of the received-level raster (dBm). */
export const LEVEL_NODATA = -9999;
/** Nodata of the visibility raster (1 visible, 0 not). */
export const VISIBILITY_NODATA = 255;

/**
 * Everything a worker needs to compute its share of one coverage: plain numbers, typed arrays
 * and the shared buffers of the elevations (read) and the result (written, each cell by
 * exactly one worker).
 */
export interface CoverageJob extends SweepGeometry {
  method: CoverageMethod;
  /** ground area of a cell per row (m²) */
  cell_area_m2: Float64Array;
  /** add to a grid azimuth to get the true azimuth (deg) */
  azimuth_offset_deg: number;
  /** elevations on the grid (row-major): Float32 with NaN nodata, or Int16 with −32768 nodata when dem_int16 */
  dem: SharedArrayBuffer;
  dem_int16: boolean;
  /** result: Float32 received level (dBm) or Uint8 visibility, prefilled with nodata */
  out: SharedArrayBuffer;
  site_ground_m: number;
  antenna_m: number;
  receiver_m: number;
  /** effective Earth radius (m), Infinity for k = ∞ */
  ae_m: number;
  lambda_m: number;
  frequency_ghz: number;
  /** visibility: required clearance as a fraction of the first Fresnel radius (0 = geometric) */
  clearance_f1: number;
  /** Tx power − Tx losses + antenna gain (dBm, toward the boresight) */
  eirp_dbm: number;
  /** receiver antenna gain − receiver losses (dB) */
  rx_net_gain_db: number;
  /** gaseous specific attenuation (dB/km), 0 to leave it out */
  gamma_db_km: number;
  ground: SphericalGround;
  /** Hata: loss = hata_A_db + hata_B_db·log10(d_km) */
  hata_A_db: number;
  hata_B_db: number;
  pattern: PatternTables;
  /** ascending thresholds of the tally (dBm; visibility: [1]) */
  thresholds_dbm: Float64Array;
  /** radials per half face of the sweep */
  rc: number;
}
