import type { PatternTables } from "./antenna-pattern.ts";
import type { SweepGeometry } from "./radial-sweep.ts";
import type { SphericalGround } from "./spherical-earth-scalar.ts";

export type CoverageMethod = "visibility" | "delta-bullington" | "hata" | "p1812";

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
  /**
   * elevations on the grid (row-major): Float32 with NaN nodata, or Int16 with −32768 nodata
   * when dem_int16; the buffer may be longer than the grid (terrain/shared-grid.ts), so view
   * its first width × height samples
   */
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
  /**
   * geometric line of sight: the buffer of the threads' shared horizonTileTable (horizon-sweep.ts),
   * which belongs to `dem` (a job given other elevations must not carry it); absent, each thread makes its own
   */
  dem_tile_max?: SharedArrayBuffer;
  /**
   * Line of sight computed straight into the map's raster: `out` already holds 0 at every cell
   * inside the radius and nodata outside (horizon-sweep.ts, `fillLineOfSightRaster`), so the
   * sweep writes only the cells that differ (visible ones, and nodata where it computes none).
   */
  out_zeroed?: boolean;
  /** p1812 only: the method's statistics, clutter classes and the location-probability raster */
  p1812?: P1812Job;
}

/** Nodata of the location-probability raster. */
export const PROBABILITY_NODATA = -1;

/** The P.1812-6 part of a coverage job (plain numbers and shared buffers). */
export interface P1812Job {
  time_pct: number;
  location_pct: number;
  /** −I(pL/100) of P.1812-6 eq. (69): times σ gives the location term (dB) */
  loc_factor: number;
  /** median effective Earth radius from ΔN (m) */
  ae_m: number;
  n0: number;
  polarization: "h" | "v";
  /** site latitude (deg): path-centre latitudes are taken half-way north along each cell's offset */
  site_lat_deg: number;
  /** metres per degree of latitude at the site */
  m_per_deg_lat: number;
  /** per clutter class: representative height (m), at sea (1/0), location σ (dB, σL with any building-entry spread) */
  clutter_m: Float64Array;
  sea: Uint8Array;
  sigma_db: Float64Array;
  /** land-cover class index per cell (Uint8, row-major), or null: class `default_class` everywhere */
  classes: SharedArrayBuffer | null;
  default_class: number;
  /** class of the site's own cell */
  site_class: number;
  /** median building entry loss (dB), 0 outdoors */
  extra_median_db: number;
  /** add the P.2108-1 §3.2 terrestrial clutter loss (median, spread into σ) per cell */
  p2108: boolean;
  /** location-probability raster for the first threshold (Float32, 0–1, PROBABILITY_NODATA outside) */
  probability: SharedArrayBuffer;
}
