import { crsFromEpsg } from "../geo/crs-from-epsg.ts";
import type { ComputedCoverage } from "./compute-coverage.ts";
import { fieldStrengthDbuvM } from "./field-strength.ts";
import type { ServedSite } from "./served-sites.ts";
import type { WaveCheck } from "./coverage-wave-check.ts";

/** One row of the area table: a threshold and the ground it covers. */
export interface ThresholdArea {
  /** "≥ −90 dBm", "visible" */
  label: string;
  /** the threshold as received level (dBm); null for visibility */
  level_dbm: number | null;
  /** the threshold as field strength at an isotropic receiver (dBµV/m); null for visibility */
  field_dbuv_m: number | null;
  area_km2: number;
  /** share of the computed area inside the radius (%) */
  pct: number;
}

/** A coverage in results.json (plain JSON; units in the key names). */
export interface CoverageResult {
  id: string;
  /** transmitting site id(s) */
  sites: string[];
  method: string;
  frequency_ghz: number;
  radius_m: number;
  /** null for the composite */
  antenna_m: number | null;
  receiver_m: number;
  k: number | "inf";
  clearance_f1: number | null;
  eirp_dbm: number | null;
  grid: { epsg: number; crs: string; width: number; height: number; geotransform: number[]; cell_m: [number, number] };
  /** ground area computed inside the radius (km²) and its cell count */
  area_km2: number;
  cells: number;
  thresholds: ThresholdArea[];
  /** range of the received level over the computed cells (dBm); null for visibility */
  level_min_dbm: number | null;
  level_max_dbm: number | null;
  /** composite only: the area each coverage serves as best server (at or above the lowest threshold) */
  best_server?: { index: number; coverage: string; site: string; area_km2: number; pct: number }[];
  /** the study's note for the report, as written */
  note?: string;
  /** P.1812 coverages: the statistics, area reliability per threshold and the served-sites table */
  p1812?: P1812Summary;
  /** the service area: its coverage share and area reliability */
  service_area?: ServiceAreaSummary;
  /** level coverages: the wave solution along radials beside the method (coverage-wave-check.ts) */
  wave_check?: WaveCheck;
  /** output files, relative to the output folder */
  files: Record<string, string>;
  assumptions: string[];
  warnings: string[];
  /** compute time (s): for the one-off command only; a study's results omit it so builds are reproducible */
  compute_s?: number;
}

/** What a P.1812 coverage adds to its JSON. */
export interface P1812Summary {
  recommendation: string;
  time_pct: number;
  location_pct: number;
  dn: number;
  n0: number;
  /** area reliability: mean location probability over the computed cells, per threshold (%) */
  reliability: { label: string; level_dbm: number; area_reliability_pct: number }[];
  /** the threshold the location-probability map shows */
  probability_of: string;
  served_sites: ServedSite[];
  talk_back?: { tx_power_dbm: number; base_threshold_dbm: number; limiting: "downlink" | "uplink"; by_db: number };
}

/** A service area's statistics inside a coverage. */
export interface ServiceAreaSummary {
  name: string;
  file: string;
  area_km2: number;
  /** computed area of the coverage inside the service area (km²) and the share of the service area it is (%) */
  computed_km2: number;
  computed_pct: number;
  /** share of the computed service area at or above each threshold (at the coverage's location percentage) */
  thresholds: { label: string; pct: number }[];
  /** mean location probability of the first threshold inside the service area (%); null when not a P.1812 coverage */
  area_reliability_pct: number | null;
}

/**
 * The table of area per threshold from a computed coverage: levels ≥ each threshold, or the
 * visible area. Areas are ground areas (cell areas per row from the grid), within the radius.
 * @param labels optional row labels (e.g. the thresholds as given in dBµV/m)
 */
export function thresholdAreas(c: ComputedCoverage, labels?: string[]): ThresholdArea[] {
  const t = c.tally;
  const total = t.area_m2;
  const pct = (a: number) => (total > 0 ? (100 * a) / total : 0);
  if (c.request.method === "visibility") {
    return [{ label: "visible", level_dbm: null, field_dbuv_m: null, area_km2: t.at_least_m2[0] / 1e6, pct: pct(t.at_least_m2[0]) }];
  }
  const f = c.request.frequency_ghz;
  const rxNet = c.request.rx_gain_dbi - c.request.rx_losses_db;
  return c.request.thresholds_dbm.map((level, i) => ({
    label: labels?.[i] ?? `≥ ${formatDb(level)} dBm`,
    level_dbm: level,
    field_dbuv_m: fieldStrengthDbuvM(level - rxNet, f),
    area_km2: t.at_least_m2[i] / 1e6,
    pct: pct(t.at_least_m2[i]),
  }));
}

/** The JSON summary of a computed coverage. */
export function coverageResult(id: string, sites: string[], c: ComputedCoverage, files: Record<string, string>, labels?: string[]): CoverageResult {
  const r = c.request;
  const g = c.grid;
  const row = Math.min(g.height - 1, Math.max(0, Math.round(g.site_row)));
  const isLevel = r.method !== "visibility";
  return {
    id,
    sites,
    method: r.method,
    frequency_ghz: r.frequency_ghz,
    radius_m: r.radius_m,
    antenna_m: r.antenna_m,
    receiver_m: r.receiver_m,
    k: Number.isFinite(r.k) ? r.k : "inf",
    clearance_f1: r.method === "visibility" ? r.clearance_f1 : null,
    eirp_dbm: isLevel ? c.eirp_dbm : null,
    grid: {
      epsg: g.epsg,
      crs: crsFromEpsg(g.epsg)?.name ?? `EPSG:${g.epsg}`,
      width: g.width,
      height: g.height,
      geotransform: [...g.geoTransform],
      cell_m: [Math.abs(g.east_per_col_m[row]), Math.abs(g.north_per_row_m[row])],
    },
    area_km2: c.tally.area_m2 / 1e6,
    cells: c.tally.cells,
    thresholds: thresholdAreas(c, labels),
    level_min_dbm: isLevel && c.tally.cells > 0 ? c.tally.min : null,
    level_max_dbm: isLevel && c.tally.cells > 0 ? c.tally.max : null,
    files,
    assumptions: c.assumptions,
    warnings: c.warnings,
    compute_s: c.timing.compute_s,
  };
}

/** A level for labels: whole numbers as they are, others to 0.1, with a true minus sign. */
export function formatDb(v: number): string {
  return (Number.isInteger(v) ? String(v) : v.toFixed(1)).replace("-", "−");
}
