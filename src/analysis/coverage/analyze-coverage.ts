import { availableParallelism } from "node:os";
import { join } from "node:path";
import { writeGeoTiff } from "../../geo/geotiff-writer.ts";
import type { GroundClass } from "../../physics/ground-constants.ts";
import type { CoverageMapData } from "../../render/coverage-map.ts";
import { InputError } from "../../study/input-error.ts";
import { parseK } from "../../study/load-study.ts";
import type { CoverageInput, Study } from "../../study/study.ts";
import type { Terrain } from "../../terrain/terrain.ts";
import { compositeAreas, compositeCoverage } from "./composite-coverage.ts";
import { computeCoverage, type ComputedCoverage } from "./compute-coverage.ts";
import { CoverageError } from "./coverage-error.ts";
import { cellCentreLatLon } from "./coverage-grid.ts";
import { CoveragePool } from "./coverage-pool.ts";
import type { CoverageRequest, FieldNames } from "./coverage-request.ts";
import { coverageResult, formatDb, thresholdAreas, type CoverageResult } from "./coverage-result.ts";
import { isotropicPowerDbm } from "./field-strength.ts";
import { coverageRaster, writeCoverageOutputs } from "./write-coverage-outputs.ts";

/** Study field names of the request's quantities (for messages). */
const STUDY_FIELDS: FieldNames = {
  radius_m: "radius_km",
  thresholds_dbm: "thresholds",
  rx_gain_dbi: "receiver_gain_dbi",
  rx_losses_db: "receiver_losses_db",
};

export interface CoverageOptions {
  /** folder for the coverage files (GeoTIFF, PNGs, GeoJSON, KML) */
  outDir: string;
  /** worker threads; null or absent computes in the calling thread */
  pool?: CoveragePool | null;
  /** called with (coverage id, phase, done, total) */
  onProgress?: (id: string, phase: "terrain" | "compute", done: number, total: number) => void;
}

/** What analysing one coverage gives: its JSON, file paths, page figure and the raster. */
export interface AnalyzedCoverage {
  result: CoverageResult;
  /** absolute paths of the files written */
  files: Record<string, string>;
  /** data for the page's coverage map (coverageMapSvg) and the SVG itself */
  figure: CoverageMapData;
  svg: string;
  computed: ComputedCoverage;
}

/** The computation request of a study's coverage entry (SI units, thresholds in dBm). */
export function coverageRequestOf(study: Study, entry: CoverageInput): CoverageRequest {
  const site = study.sites.find((s) => s.id === entry.site);
  if (!site) {
    const expected = `the id of a site in sites (${study.sites.map((s) => s.id).join(", ")})`;
    throw new CoverageError(`site: "${entry.site}" is not ${expected}`, "site", { received: `"${entry.site}"`, expected });
  }
  const rxNet = entry.receiver_gain_dbi - entry.receiver_losses_db;
  const thresholds_dbm = entry.threshold_unit === "dBuV/m" ? entry.thresholds.map((e) => isotropicPowerDbm(e, entry.frequency_ghz) + rxNet) : [...entry.thresholds];
  return {
    site: { lat_deg: site.lat_deg, lon_deg: site.lon_deg },
    method: entry.method,
    antenna_m: entry.antenna_m,
    receiver_m: entry.receiver_m,
    radius_m: entry.radius_km * 1000,
    resolution_m: entry.resolution_m,
    frequency_ghz: entry.frequency_ghz,
    k: parseK(entry.k),
    clearance_f1: entry.clearance_f1,
    tx_power_dbm: entry.tx_power_dbm,
    tx_losses_db: entry.tx_losses_db,
    gain_dbi: entry.gain_dbi,
    rx_gain_dbi: entry.receiver_gain_dbi,
    rx_losses_db: entry.receiver_losses_db,
    pattern: entry.pattern,
    thresholds_dbm,
    polarization: entry.polarization,
    ground: study.climate.ground.replace(/_/g, "-") as GroundClass,
    atmosphere: { pressure_hpa: study.climate.pressure_hpa, temperature_c: study.climate.temperature_c, water_vapour_g_m3: study.climate.water_vapour_g_m3 },
    hata: { environment: entry.hata.environment, city_size: entry.hata.city_size },
  };
}

/**
 * Compute one coverage entry of a study on the study's terrain and write its files into
 * options.outDir (`<id>.tif`, `<id>-overlay.png`, `<id>-map.png`, `<id>.geojson`, `<id>.kml`).
 * @param index the entry's position in study.coverage (for messages)
 * @throws InputError naming the study file, line and field for a request that cannot be computed
 */
export async function analyzeCoverage(study: Study, entry: CoverageInput, terrain: Terrain, options: CoverageOptions & { index: number }): Promise<AnalyzedCoverage> {
  const i = options.index;
  let computed: ComputedCoverage;
  try {
    computed = await computeCoverage(terrain, coverageRequestOf(study, entry), {
      pool: options.pool,
      names: STUDY_FIELDS,
      patternField: "pattern",
      onProgress: (phase, d, t) => options.onProgress?.(entry.id, phase, d, t),
    });
  } catch (e) {
    if (e instanceof CoverageError) {
      const field = e.field.split(".")[0];
      const path = ["coverage", i, ...(field in entry ? [field] : [])];
      throw new InputError(
        [
          {
            file: study.file,
            ...study.locate(path),
            field: `coverage[${i}]${field in entry ? `.${e.field}` : ""} (${entry.id})`,
            received: e.detail.received ?? "this coverage",
            expected: e.detail.expected ?? e.message,
          },
        ],
        { cause: e },
      );
    }
    throw e;
  }
  const site = study.sites.find((s) => s.id === entry.site)!;
  const labels = entry.threshold_unit === "dBuV/m" ? entry.thresholds.map((e) => `≥ ${formatDb(e)} dBµV/m`) : undefined;
  const areas = thresholdAreas(computed, labels);
  const title = `${entry.id}: ${methodName(entry.method)} from ${site.name}, ${entry.frequency_ghz} GHz, radius ${entry.radius_km} km`;
  const out = await writeCoverageOutputs(coverageRaster(computed, title, areas, { name: site.name, lat_deg: site.lat_deg, lon_deg: site.lon_deg }), { dir: options.outDir, stem: entry.id });
  const result = coverageResult(entry.id, [site.id], computed, out.files, labels);
  const files = Object.fromEntries(Object.entries(out.files).map(([k, f]) => [k, join(options.outDir, f)]));
  return { result, files, figure: out.figure, svg: out.svg, computed };
}

/**
 * Every coverage of a study, then the multi-site composite (strongest level, best server) of
 * the level coverages when there are two or more. Starts the worker threads once for all.
 * This is the one call the study analysis makes:
 *   const coverage = await analyzeStudyCoverage(study, terrain, { outDir });
 *   result.coverage = coverage.results;
 * @param options.workers threads to use (default: available parallelism; 0 computes in this thread)
 */
export async function analyzeStudyCoverage(
  study: Study,
  terrain: Terrain,
  options: Omit<CoverageOptions, "pool"> & { workers?: number },
): Promise<{ results: CoverageResult[]; items: AnalyzedCoverage[]; composite: { files: Record<string, string>; figure: CoverageMapData; svg: string } | null; warnings: string[] }> {
  const entries = study.coverage ?? [];
  const warnings: string[] = [];
  if (entries.length === 0) return { results: [], items: [], composite: null, warnings };
  const workers = options.workers ?? availableParallelism();
  const pool = workers > 0 ? CoveragePool.start(workers) : null;
  const items: AnalyzedCoverage[] = [];
  try {
    for (let i = 0; i < entries.length; i++) items.push(await analyzeCoverage(study, entries[i], terrain, { ...options, pool, index: i }));
  } finally {
    await pool?.close();
  }
  const results = items.map((it) => it.result);
  const levels = items.filter((it) => it.computed.request.method !== "visibility");
  if (levels.length < 2) return { results, items, composite: null, warnings };
  const comp = compositeCoverage(levels.map((it) => it.computed));
  if (typeof comp === "string") {
    warnings.push(`No multi-site composite: ${comp}.`);
    return { results, items, composite: null, warnings };
  }
  const thresholds = [...new Set(levels.flatMap((it) => it.computed.request.thresholds_dbm))].sort((a, b) => a - b);
  const serveFrom = thresholds.length ? thresholds[0] : -Infinity;
  const a = compositeAreas(comp, thresholds, levels.length, serveFrom);
  const pct = (x: number) => (a.area_m2 > 0 ? (100 * x) / a.area_m2 : 0);
  const areas = thresholds.map((t, j) => ({ label: `≥ ${formatDb(t)} dBm`, level_dbm: t, field_dbuv_m: null, area_km2: a.at_least_m2[j] / 1e6, pct: pct(a.at_least_m2[j]) }));
  const siteOf = (it: AnalyzedCoverage) => study.sites.find((s) => s.id === it.result.sites[0])!;
  const crsSites = levels.map((it, k) => {
    const s = siteOf(it);
    return { name: s.name, lat_deg: s.lat_deg, lon_deg: s.lon_deg, col: it.computed.grid.site_col + comp.offsets[k][0], row: it.computed.grid.site_row + comp.offsets[k][1] };
  });
  const title = `Composite of ${levels.map((it) => it.result.id).join(", ")}: strongest level`;
  const out = await writeCoverageOutputs(
    { title, values: comp.level, dem: comp.dem, width: comp.width, height: comp.height, geoTransform: comp.geoTransform, epsg: comp.epsg, cell_m: comp.cell_m, kind: "level", areas, sites: crsSites },
    { dir: options.outDir, stem: "composite" },
  );
  out.files.best_server_geotiff = "composite-best-server.tif";
  writeGeoTiff(join(options.outDir, out.files.best_server_geotiff), {
    width: comp.width,
    height: comp.height,
    data: comp.best,
    geoTransform: comp.geoTransform,
    epsg: comp.epsg,
    nodata: 255,
    description: `best server: ${levels.map((it, k) => `${k + 1} = ${it.result.id}`).join(", ")}`,
    compression: "deflate",
  });
  const [lat, lon] = cellCentreLatLon(comp, comp.width / 2, comp.height / 2);
  results.push({
    id: "composite",
    sites: levels.map((it) => it.result.sites[0]),
    method: "composite (strongest level, best server)",
    frequency_ghz: levels[0].result.frequency_ghz,
    radius_m: Math.max(...levels.map((it) => it.result.radius_m)),
    antenna_m: null,
    receiver_m: levels[0].result.receiver_m,
    k: levels[0].result.k,
    clearance_f1: null,
    eirp_dbm: null,
    grid: { epsg: comp.epsg, crs: levels[0].result.grid.crs, width: comp.width, height: comp.height, geotransform: [...comp.geoTransform], cell_m: comp.cell_m },
    area_km2: a.area_m2 / 1e6,
    cells: comp.level.reduce((n, v) => (v === -9999 ? n : n + 1), 0),
    thresholds: areas,
    level_min_dbm: null,
    level_max_dbm: null,
    files: out.files,
    best_server: levels.map((it, k) => ({ index: k + 1, coverage: it.result.id, site: it.result.sites[0], area_km2: a.served_m2[k] / 1e6, pct: pct(a.served_m2[k]) })),
    assumptions: [
      `Each cell takes the strongest received level of the ${levels.length} coverages and the coverage providing it (best server; ${levels.map((it, k) => `${k + 1} = ${it.result.id}`).join(", ")}); the area a site serves counts cells where it is the best server at or above ${serveFrom} dBm.`,
      `Centre of the composite grid: ${lat.toFixed(5)}, ${lon.toFixed(5)}.`,
    ],
    warnings: [],
    compute_s: 0,
  });
  return { results, items, composite: { files: Object.fromEntries(Object.entries(out.files).map(([k, f]) => [k, join(options.outDir, f)])), figure: out.figure, svg: out.svg }, warnings };
}

function methodName(m: string): string {
  return m === "visibility" ? "radio line of sight" : m === "hata" ? "Hata" : "delta-Bullington";
}
