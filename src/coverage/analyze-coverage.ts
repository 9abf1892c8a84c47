import { availableParallelism } from "node:os";
import { join } from "node:path";
import type { GroundClass } from "../physics/ground-constants.ts";
import { InputError } from "../study/input-error.ts";
import { openGeoTiff } from "../terrain/geotiff.ts";
import { resolve } from "node:path";
import type { LandCoverSource } from "./land-cover.ts";
import { clutterHeightM, type ClutterClass, type P1812Request } from "./p1812-setup.ts";
import { parseK } from "../study/load-study.ts";
import type { CoverageInput, Study } from "../study/study.ts";
import type { Terrain } from "../terrain/terrain.ts";
import { computeCoverage, type ComputedCoverage } from "./compute-coverage.ts";
import type { CoverageTileStore } from "./coverage-tiles.ts";
import { CoverageError } from "./coverage-error.ts";
import { CoveragePool } from "./coverage-pool.ts";
import type { CoverageRequest, FieldNames } from "./coverage-request.ts";
import { coverageResult, formatDb, thresholdAreas, type CoverageResult } from "./coverage-result.ts";
import { mapOverlay, p1812Summary, readServiceArea, serviceAreaSummary } from "./coverage-extras.ts";
import type { ServiceArea } from "./service-area.ts";
import { isotropicPowerDbm } from "./field-strength.ts";
import { coverageWaveCheck, WAVE_CHECK_DEFAULT_RADIALS } from "./coverage-wave-check.ts";
import { studyComposite, type CompositeMember, type CompositeOutputs } from "./study-composite.ts";
import { coverageRaster, requireOutputStage, type CoverageFigure, type CoverageOutputStage } from "./coverage-output-stage.ts";

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
  /** writes the files and page figure (src/render/coverage-outputs.ts) */
  outputs?: CoverageOutputStage;
  /** worker threads; null or absent computes in the calling thread */
  pool?: CoveragePool | null;
  /** called with (coverage id, phase, done, total) */
  onProgress?: (id: string, phase: "terrain" | "compute", done: number, total: number) => void;
  /** where the map's tiles are found and kept (coverage-tiles.ts) */
  tiles?: CoverageTileStore | null;
}

/** What analysing one coverage gives: its JSON, file paths, page figure and the raster. */
export interface AnalyzedCoverage {
  result: CoverageResult;
  /** absolute paths of the files written */
  files: Record<string, string>;
  /** data for the page's coverage map (coverageMapSvg) and the SVG itself */
  figure: CoverageFigure;
  svg: string;
  /** further maps (the location-probability map of a P.1812 coverage) */
  extra: { suffix: string; figure: CoverageFigure; svg: string }[];
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
 * The P.1812 inputs of a study's coverage entry, with its land cover opened (null for another
 * method).
 * @throws InputError naming the study file and field when the land-cover file cannot be read
 */
export async function p1812RequestOf(study: Study, entry: CoverageInput, index: number): Promise<P1812Request | null> {
  if (entry.method !== "p1812") return null;
  const o = entry.p1812 ?? P1812_INPUT_DEFAULTS;
  let land_cover: LandCoverSource | null = null;
  let classes: ClutterClass[];
  if (o.land_cover) {
    const file = o.land_cover.file;
    try {
      const t = await openGeoTiff(resolve(study.dir, file), { label: file });
      land_cover = { raster: t.raster, label: file, values: o.land_cover.classes.map((c) => c.value) };
    } catch (e) {
      const msg = e instanceof Error ? e.message : String(e);
      throw new InputError([{ file: study.file, ...study.locate(["coverage", index, "p1812", "land_cover", "file"]), field: `coverage[${index}].p1812.land_cover.file (${entry.id})`, received: `"${file}"`, expected: `a readable land-cover GeoTIFF (${msg})` }], { cause: e });
    }
    classes = o.land_cover.classes.map((c) => ({ value: c.value, name: c.name ?? c.category.replace("_", " "), category: c.category, height_m: c.height_m ?? clutterHeightM(c.category) }));
  } else {
    classes = [{ value: null, name: o.clutter.replace("_", " "), category: o.clutter, height_m: o.clutter_height_m ?? clutterHeightM(o.clutter) }];
  }
  return {
    time_pct: o.time_pct,
    location_pct: o.location_pct,
    sigma_l_db: o.sigma_l_db ?? null,
    dn: o.dn,
    n0: o.n0,
    classes,
    land_cover,
    receiver_clutter_loss: o.receiver_clutter_loss,
    indoor: o.indoor ? { building: o.indoor.building } : null,
  };
}

/** P.1812 inputs of an entry that gives none (the schema's defaults). */
const P1812_INPUT_DEFAULTS = { time_pct: 50, location_pct: 50, sigma_l_db: undefined, dn: 45, n0: 325, land_cover: undefined, clutter: "open", clutter_height_m: undefined, receiver_clutter_loss: "none", indoor: undefined } as const;

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
    const request = coverageRequestOf(study, entry);
    const p1812 = await p1812RequestOf(study, entry, i);
    if (p1812) request.p1812 = p1812;
    computed = await computeCoverage(terrain, request, {
      pool: options.pool,
      tiles: options.tiles,
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
  const rowLabels = areas.map((a) => a.label);
  let sa: ServiceArea | null = null;
  const extras: Pick<CoverageResult, "p1812" | "service_area"> = {};
  try {
    sa = readServiceArea(study, entry);
    if (computed.job.p1812) extras.p1812 = p1812Summary(study, entry, computed, rowLabels);
    if (sa) extras.service_area = serviceAreaSummary(entry, computed, sa, rowLabels);
  } catch (e) {
    if (e instanceof CoverageError) throw new InputError([{ file: study.file, ...study.locate(["coverage", i, e.field.split(".")[0]]), field: `coverage[${i}].${e.field} (${entry.id})`, received: e.detail.received ?? "", expected: e.detail.expected ?? e.message }], { cause: e });
    throw e;
  }
  const title = `${entry.id}: ${methodName(entry.method)} from ${site.name}, ${entry.frequency_ghz} GHz, radius ${entry.radius_km} km`;
  const raster = coverageRaster(computed, title, areas, { name: site.name, lat_deg: site.lat_deg, lon_deg: site.lon_deg });
  raster.overlay = mapOverlay(study, computed, entry.site, sa);
  if (computed.job.p1812 && rowLabels.length) raster.probability = { values: new Float32Array(computed.job.p1812.probability), label: rowLabels[0] };
  const out = await requireOutputStage(options.outputs).write(raster, { dir: options.outDir, stem: entry.id });
  const check = coverageWaveCheck(computed.job, computed.dem, computed.values, entry.wave_check_radials ?? WAVE_CHECK_DEFAULT_RADIALS);
  const result = { ...coverageResult(entry.id, [site.id], computed, out.files, labels), ...(entry.note ? { note: entry.note } : {}), ...extras, ...(check ? { wave_check: check } : {}) };
  const files = Object.fromEntries(Object.entries(out.files).map(([k, f]) => [k, join(options.outDir, f)]));
  return { result, files, figure: out.figure, svg: out.svg, extra: out.extra ?? [], computed };
}

/**
 * Every coverage of a study, then the multi-site composite (strongest level, best server) of
 * the level coverages when there are two or more. Starts the worker threads once for all.
 * Computes everything; a study build goes through cachedStudyCoverage (coverage-cache.ts),
 * which computes only the maps its cache lacks, on the same code path.
 * @param options.workers threads to use (default: available parallelism; 0 computes in this thread)
 */
export async function analyzeStudyCoverage(
  study: Study,
  terrain: Terrain,
  options: Omit<CoverageOptions, "pool"> & { workers?: number },
): Promise<{ results: CoverageResult[]; items: AnalyzedCoverage[]; composite: CompositeOutputs | null; warnings: string[] }> {
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
  const levels = items.map(compositeMemberOf).filter((m) => m !== null);
  if (levels.length < 2) return { results, items, composite: null, warnings };
  const comp = await studyComposite(study, levels, options.outDir, requireOutputStage(options.outputs));
  if ("warning" in comp) {
    warnings.push(comp.warning);
    return { results, items, composite: null, warnings };
  }
  results.push(comp.result);
  return { results, items, composite: comp.outputs, warnings };
}

/** What the multi-site composite needs of an analysed coverage; null for a visibility coverage. */
export function compositeMemberOf(it: Pick<AnalyzedCoverage, "result" | "computed">): CompositeMember | null {
  const c = it.computed;
  if (c.request.method === "visibility") return null;
  const { epsg, geoTransform, width, height, site_col, site_row } = c.grid;
  return { result: it.result, thresholds_dbm: c.request.thresholds_dbm, grid: { epsg, geoTransform, width, height, site_col, site_row }, values: c.values as Float32Array, dem: c.dem };
}

function methodName(m: string): string {
  return m === "visibility" ? "radio line of sight" : m === "hata" ? "Hata" : m === "p1812" ? "ITU-R P.1812-6" : "delta-Bullington";
}
