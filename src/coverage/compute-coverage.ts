import { EARTH_RADIUS_M, wavelengthM } from "../physics/constants.ts";
import { dryPressureFromTotalHpa, gasSpecificAttenuation, GAS_P676_VALIDITY } from "../physics/gas-attenuation.ts";
import { groundConstants } from "../physics/ground-constants.ts";
import { hataLoss } from "../physics/hata.ts";
import type { ShareDecode } from "../terrain/geotiff.ts";
import type { Terrain } from "../terrain/terrain.ts";
import { rangeWarning } from "../analysis/range-warning.ts";
import { formatFrequency, formatK, formatNumber, formatSmall } from "../format/quantity.ts";
import { planCoverageGrid, type CoverageGrid } from "./coverage-grid.ts";
import { LEVEL_NODATA, VISIBILITY_NODATA, type CoverageJob } from "./coverage-job.ts";
import type { CoveragePool, CoverageProgress } from "./coverage-pool.ts";
import { computeCoverageTiles, coverageTileCount, type CoverageTileStore } from "./coverage-tiles.ts";
import { validateCoverageRequest, type CoverageRequest, type FieldNames } from "./coverage-request.ts";
import type { TallyData } from "./coverage-tally.ts";
import { elevationWindow, type Elevations } from "./elevation-window.ts";
import { raysPerHalfFace } from "./radial-sweep.ts";
import { fillLineOfSightRaster, horizonSweepApplies, horizonTileTable, horizonTileTableRows, lineOfSightOnly } from "./horizon-sweep.ts";
import type { RowProgress } from "../terrain/tiff-band-reader.ts";
import { CoverageError } from "./coverage-error.ts";
import { p1812Job } from "./p1812-setup.ts";

/** A computed coverage raster with what it was computed from. */
export interface ComputedCoverage {
  request: CoverageRequest;
  grid: CoverageGrid;
  /** received level (dBm, nodata LEVEL_NODATA) or visibility (1/0, nodata VISIBILITY_NODATA), row-major */
  values: Float32Array | Uint8Array;
  /** the grid's elevations (m; see Elevations for nodata) */
  dem: Elevations;
  site_ground_m: number;
  /** EIRP toward the boresight (dBm) */
  eirp_dbm: number;
  tally: TallyData;
  warnings: string[];
  /** method, model choices and the grid, in sentences for the report */
  assumptions: string[];
  timing: { terrain_s: number; compute_s: number; threads: number };
  /**
   * Set when runCoverage was asked for `outsideOnWrite` and could honour it: the cells outside
   * the radius are still 0 in `values`, and the writer sets them to nodata strip by strip
   * (fillLineOfSightRaster with row0, row1, value VISIBILITY_NODATA)
   */
  outside_pending?: boolean;
  /** the job the threads ran (its constants; the buffers are `dem` and `values`) */
  job: CoverageJob;
}

export interface ComputeOptions {
  /** worker threads to use; null computes in this thread */
  pool?: CoveragePool | null;
  /** called with (phase, done, total) */
  onProgress?: (phase: "terrain" | "compute", done: number, total: number) => void;
  /** how messages name the request's fields */
  names?: FieldNames;
  patternField?: string;
  maxCells?: number;
  /** hands a GeoTIFF window decode to worker threads as well (CoveragePool.shareDecode) */
  shareDecode?: ShareDecode;
  /**
   * Read a GeoTIFF's elevations only within the radius (elevationWindow's insideRadiusOnly):
   * the result's `dem` is then zero in the square's corners. For callers that use only the
   * coverage raster (the one-off command), not the relief.
   */
  elevationsInsideRadiusOnly?: boolean;
  /** where the map's tiles are found and kept (coverage-tiles.ts); none: every tile is computed */
  tiles?: CoverageTileStore | null;
  /**
   * Geometric line of sight: have these threads fill the sweep's horizon tile table while the
   * elevations are read (CoveragePool.fillTileTable), when they are read row by row straight
   * from a GeoTIFF; the table then goes with the prepared job
   */
  tileTableWhileReading?: CoveragePool | null;
}

/** A coverage laid out and ready to compute: everything but the result buffer. */
export type PreparedCoverage = Omit<ComputedCoverage, "tally" | "timing" | "job" | "values"> & { job: Omit<CoverageJob, "out">; terrain_s: number };

/**
 * Compute one coverage: check the request, lay out the grid, read the terrain into it once,
 * then sweep it (visibility, delta-Bullington) or evaluate every cell (Hata) on the pool's
 * threads or in this thread.
 * @throws CoverageError for a request that cannot be computed (see validateCoverageRequest, planCoverageGrid)
 */
export async function computeCoverage(terrain: Terrain, req: CoverageRequest, options: ComputeOptions = {}): Promise<ComputedCoverage> {
  return runCoverage(prepareCoverage(terrain, req, options), options);
}

/**
 * Allocate the result (filled with nodata) and compute a prepared coverage, tile by tile
 * (coverage-tiles.ts), taking the tiles `options.tiles` holds. The terrain is no longer needed
 * at this point: a caller that holds nothing else of it can let it go first.
 * @param options.outsideOnWrite for a caller that only writes the raster to a file: a line of
 *   sight raster computed straight into `values` may leave its cells outside the radius 0, for
 *   the writer to set (see ComputedCoverage.outside_pending)
 */
export async function runCoverage(prepared: PreparedCoverage, options: Pick<ComputeOptions, "pool" | "onProgress" | "tiles"> & { outsideOnWrite?: boolean } = {}): Promise<ComputedCoverage> {
  const { terrain_s, job: base, ...rest } = prepared;
  const cells = rest.grid.width * rest.grid.height;
  const isLevel = base.method !== "visibility";
  const out = new SharedArrayBuffer(isLevel ? cells * 4 : cells);
  const values = isLevel ? new Float32Array(out) : new Uint8Array(out);
  const nodata = isLevel ? LEVEL_NODATA : VISIBILITY_NODATA;
  const job: CoverageJob = { ...base, out };
  // line of sight straight into this raster: nodata outside the radius, the fresh buffer's
  // zeros inside (horizon-sweep.ts: the sweep writes only what differs)
  const zeroed = !options.tiles && lineOfSightOnly(base.method, base.clearance_f1) && horizonSweepApplies(base);
  if (zeroed) {
    // for a caller that only writes the raster, the cells outside the radius are set as it is
    // written (outside_pending): their pages of this raster are then never touched
    if (!options.outsideOnWrite) fillLineOfSightRaster(values as Uint8Array, base, nodata);
    job.out_zeroed = true;
  } else if (options.pool && !options.tiles) await options.pool.fill(values, nodata); // with tiles at hand, not worth waiting for the threads
  else values.fill(nodata);
  // made here, with the result, so that it always belongs to these elevations
  if (lineOfSightOnly(base.method, base.clearance_f1) && !job.dem_tile_max) job.dem_tile_max = horizonTileTable(base.width, base.height).buffer as SharedArrayBuffer;
  const t1 = performance.now();
  const progress: CoverageProgress = (d, t) => options.onProgress?.("compute", d, t);
  const count = coverageTileCount(rest.request.radius_m, rest.request.resolution_m);
  const tally = await computeCoverageTiles(job, count, { pool: options.pool, onProgress: progress, store: options.tiles });
  const compute_s = (performance.now() - t1) / 1000;
  if (tally.failed > 0) {
    rest.warnings.push(`${tally.failed} cells inside the radius could not be computed (no terrain data on their profile or under them) and are left as nodata.`);
  }
  return { ...rest, values, job, tally, timing: { terrain_s, compute_s, threads: options.pool ? options.pool.size : 1 }, ...(zeroed && options.outsideOnWrite ? { outside_pending: true } : {}) };
}

/**
 * Everything before the sweep: check the request, lay out the grid, read the elevations and
 * resolve the method's constants.
 * @throws CoverageError for a request that cannot be computed
 */
export function prepareCoverage(terrain: Terrain, req: CoverageRequest, options: ComputeOptions = {}): PreparedCoverage {
  const pattern = validateCoverageRequest(req, options.names, options.patternField);
  const t0 = performance.now();
  const { grid, warnings } = planCoverageGrid(terrain, req.site, req.radius_m, req.resolution_m, { maxCells: options.maxCells });
  // the threads take the elevations' rows for the tile table as they are read (when the reader reports them)
  const pool = options.tileTableWhileReading;
  const tiles = pool && lineOfSightOnly(req.method, req.clearance_f1) && horizonSweepApplies({ ...grid, radius_m: req.radius_m }) ? horizonTileTable(grid.width, grid.height) : null;
  // (this thread does not take tile rows itself once it has read them: when the threads are
  // still warming up, it would take them all, in code not yet optimised, while they wait)
  const progress: RowProgress | undefined = tiles
    ? {
        started: (out) => {
          horizonTileTableRows(tiles, 0, true);
          pool!.fillTileTable(tiles, out, { ...grid, radius_m: req.radius_m });
        },
        rows: (done) => horizonTileTableRows(tiles, done, true),
      }
    : undefined;
  let dem: Elevations;
  try {
    dem = elevationWindow(terrain, grid, (d, t) => options.onProgress?.("terrain", d, t), options.shareDecode, { insideRadiusOnly: options.elevationsInsideRadiusOnly, progress });
  } finally {
    if (tiles) horizonTileTableRows(tiles, grid.height, false); // read, or failed: the threads wait no longer
  }
  const t1 = performance.now();
  const site_ground_m = terrain.elevation(req.site.lat_deg, req.site.lon_deg);
  const f = req.frequency_ghz;
  const eirp_dbm = req.tx_power_dbm - req.tx_losses_db + req.gain_dbi;
  // in client words; the geometry behind it (straight radials on the grid, distance scaling:
  // grid.distanceNote) is described in the README, not in the report
  const assumptions: string[] = [`Terrain: each cell is predicted over the ground profile from the site to the cell's centre, read from the elevation data at the map's ${formatNumber(req.resolution_m, 0)} m spacing.`];

  let gamma = 0;
  let hataA = NaN;
  let hataB = NaN;
  const ground = groundConstants(req.ground, f);
  if (req.method === "delta-bullington") {
    const T_k = req.atmosphere.temperature_c + 273.15;
    gamma = gasSpecificAttenuation({
      frequency_ghz: f,
      pressure_dry_hpa: dryPressureFromTotalHpa(req.atmosphere.pressure_hpa, T_k, req.atmosphere.water_vapour_g_m3),
      temperature_k: T_k,
      water_vapour_density_g_m3: req.atmosphere.water_vapour_g_m3,
    }).gamma_db_km;
    push(warnings, rangeWarning("Diffraction (ITU-R P.526-15 §4.5)", "frequency", f, [0.03, 50], "GHz"));
    push(warnings, rangeWarning(GAS_P676_VALIDITY.method, "frequency", f, GAS_P676_VALIDITY.frequency_ghz, "GHz"));
    assumptions.push(
      `Received level = EIRP − antenna pattern − free-space loss (ITU-R P.525-4) − delta-Bullington diffraction (ITU-R P.526-15 §4.5, k = ${fmtK(req.k)}, ${req.polarization === "v" ? "vertical" : "horizontal"} polarisation, ${req.ground.replace(/-/g, " ")} εr = ${formatNumber(ground.epsilon_r, 1)}, σ = ${formatSmall(ground.sigma_s_m, 3)} S/m) − gases (ITU-R P.676-12, ${formatSmall(gamma, 3)} dB/km) + receiver gain.`,
      "Statistics: one prediction for the effective Earth radius above, over bare terrain; no allowance is made for variability in time or between locations, nor for clutter around the receiver.",
    );
  } else if (req.method === "hata") {
    const base = { frequency_mhz: f * 1000, base_m: req.antenna_m, mobile_m: req.receiver_m, environment: req.hata.environment, city_size: req.hata.city_size };
    const at1 = hataLoss({ ...base, distance_km: 1 });
    const at10 = hataLoss({ ...base, distance_km: 10 });
    hataA = at1.loss_db;
    hataB = at10.loss_db - at1.loss_db;
    const model = at1.model === "okumura-hata" ? "Okumura–Hata" : "COST-231 Hata";
    for (const w of [...at1.warnings, ...at10.warnings]) if (!/distance/.test(w)) push(warnings, w);
    warnings.push(`${model}: cells within 1 km of the site are outside the validity range 1–20 km; the formula is extrapolated there.`);
    if (req.radius_m > 20_000) warnings.push(`${model}: distances beyond 20 km (up to ${(req.radius_m / 1000).toFixed(1)} km here) are outside the validity range 1–20 km; the formula is extrapolated there.`);
    assumptions.push(
      `Received level = EIRP − antenna pattern − ${model} median loss (${req.hata.environment}, ${req.hata.city_size} city) + receiver gain; the base-station height is the antenna's height above ground (${req.antenna_m} m), not an effective height over the surrounding terrain, and the terrain is not otherwise used.`,
    );
  } else {
    assumptions.push(
      req.clearance_f1 > 0
        ? `Visible: line of sight with Earth curvature at k = ${fmtK(req.k)} and at least ${req.clearance_f1} of the first Fresnel radius clear at ${formatFrequency(f)} along the whole path.`
        : `Visible: geometric line of sight with Earth curvature at k = ${fmtK(req.k)} from the site to each cell, receiver ${req.receiver_m} m above ground.`,
    );
  }
  const isLevel = req.method !== "visibility";
  const job: Omit<CoverageJob, "out"> = {
    method: req.method,
    width: grid.width,
    height: grid.height,
    site_col: grid.site_col,
    site_row: grid.site_row,
    radius_m: req.radius_m,
    east_per_col_m: grid.east_per_col_m,
    north_per_row_m: grid.north_per_row_m,
    cell_area_m2: grid.cell_area_m2,
    azimuth_offset_deg: grid.azimuth_offset_deg,
    dem: dem.buffer as SharedArrayBuffer,
    dem_int16: dem instanceof Int16Array,
    ...(tiles ? { dem_tile_max: tiles.buffer as SharedArrayBuffer } : {}),
    site_ground_m,
    antenna_m: req.antenna_m,
    receiver_m: req.receiver_m,
    ae_m: req.k * EARTH_RADIUS_M,
    lambda_m: wavelengthM(f),
    frequency_ghz: f,
    clearance_f1: req.clearance_f1,
    eirp_dbm,
    rx_net_gain_db: req.rx_gain_dbi - req.rx_losses_db,
    gamma_db_km: gamma,
    ground: { epsilon_r: ground.epsilon_r, sigma_s_m: ground.sigma_s_m, vertical: req.polarization === "v" },
    hata_A_db: hataA,
    hata_B_db: hataB,
    pattern,
    thresholds_dbm: Float64Array.from(isLevel ? req.thresholds_dbm : [1]),
    rc: raysPerHalfFace({ ...grid, radius_m: req.radius_m }),
  };
  if (req.method === "p1812") {
    if (!req.p1812) throw new CoverageError("p1812: the method's inputs are missing", "p1812");
    const a: string[] = [];
    job.p1812 = p1812Job(req.p1812, { grid, site: req.site, frequency_ghz: f, receiver_m: req.receiver_m, resolution_m: req.resolution_m, polarization: req.polarization }, warnings, a);
    assumptions.unshift(...a);
  }
  if (!(site_ground_m === site_ground_m)) warnings.push("The ground height at the site is unknown.");
  return { request: req, grid, dem, site_ground_m, eirp_dbm, warnings, assumptions, job, terrain_s: (t1 - t0) / 1000 };
}

function push(list: string[], w: string | null): void {
  if (w && !list.includes(w)) list.push(w);
}

function fmtK(k: number): string {
  return formatK(k);
}
