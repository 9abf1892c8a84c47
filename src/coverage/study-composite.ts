import { join } from "node:path";
import { formatLatLon, formatNumber } from "../format/quantity.ts";
import { writeGeoTiff } from "../geo/geotiff-writer.ts";
import type { Study } from "../study/study.ts";
import { compositeAreas, compositeCoverage } from "./composite-coverage.ts";
import { cellCentreLatLon, type CoverageGrid } from "./coverage-grid.ts";
import { formatDb, type CoverageResult } from "./coverage-result.ts";
import type { CoverageFigure, CoverageOutputStage } from "./coverage-output-stage.ts";
import type { Elevations } from "./elevation-window.ts";

/**
 * What the multi-site composite reads of one level coverage: its JSON, thresholds (dBm), grid
 * and the level and elevation rasters. Plain data, so the coverage cache can keep it.
 */
export interface CompositeMember {
  result: CoverageResult;
  thresholds_dbm: number[];
  grid: Pick<CoverageGrid, "epsg" | "geoTransform" | "width" | "height" | "site_col" | "site_row">;
  /** received level (dBm, LEVEL_NODATA where not computed), row-major */
  values: Float32Array;
  /** the grid's elevations (m; Float32 with NaN nodata, or Int16 as read from an Int16 DEM: elevation-window.ts) */
  dem: Elevations;
}

/** The composite's files (absolute paths), page figure and SVG. */
export interface CompositeOutputs {
  files: Record<string, string>;
  figure: CoverageFigure;
  svg: string;
}

/**
 * The multi-site composite (strongest level, best server) of a study's level coverages, in
 * study order, written into outDir as `composite.*` and `composite-best-server.tif`.
 * Returns its JSON (compute_s 0) and outputs, or a warning when the coverages cannot be
 * combined (e.g. different coordinate systems). Call it with two or more members.
 */
export async function studyComposite(study: Study, levels: CompositeMember[], outDir: string, outputs: CoverageOutputStage): Promise<{ result: CoverageResult; outputs: CompositeOutputs } | { warning: string }> {
  const comp = compositeCoverage(levels);
  if (typeof comp === "string") return { warning: `No multi-site composite: ${comp}.` };
  const thresholds = [...new Set(levels.flatMap((it) => it.thresholds_dbm))].sort((a, b) => a - b);
  const serveFrom = thresholds.length ? thresholds[0] : -Infinity;
  const a = compositeAreas(comp, thresholds, levels.length, serveFrom);
  const pct = (x: number) => (a.area_m2 > 0 ? (100 * x) / a.area_m2 : 0);
  const areas = thresholds.map((t, j) => ({ label: `≥ ${formatDb(t)} dBm`, level_dbm: t, field_dbuv_m: null, area_km2: a.at_least_m2[j] / 1e6, pct: pct(a.at_least_m2[j]) }));
  const siteOf = (it: CompositeMember) => study.sites.find((s) => s.id === it.result.sites[0])!;
  const crsSites = levels.map((it, k) => {
    const s = siteOf(it);
    return { name: s.name, lat_deg: s.lat_deg, lon_deg: s.lon_deg, col: it.grid.site_col + comp.offsets[k][0], row: it.grid.site_row + comp.offsets[k][1] };
  });
  const title = `Composite of ${levels.map((it) => it.result.id).join(", ")}: strongest level`;
  const out = await outputs.write(
    { title, values: comp.level, dem: comp.dem, width: comp.width, height: comp.height, geoTransform: comp.geoTransform, epsg: comp.epsg, cell_m: comp.cell_m, kind: "level", areas, sites: crsSites },
    { dir: outDir, stem: "composite" },
  );
  out.files.best_server_geotiff = "composite-best-server.tif";
  writeGeoTiff(join(outDir, out.files.best_server_geotiff), {
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
  const result: CoverageResult = {
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
    cells: a.cells,
    thresholds: areas,
    level_min_dbm: a.level_min_dbm,
    level_max_dbm: a.level_max_dbm,
    files: out.files,
    best_server: levels.map((it, k) => ({ index: k + 1, coverage: it.result.id, site: it.result.sites[0], area_km2: a.served_m2[k] / 1e6, pct: pct(a.served_m2[k]) })),
    assumptions: [
      `Each cell takes the strongest received level of the ${levels.length} coverages and the coverage providing it (best server; ${levels.map((it, k) => `${k + 1} = ${it.result.id}`).join(", ")}); the area a site serves counts cells where it is the best server${Number.isFinite(serveFrom) ? ` at or above ${formatNumber(serveFrom, 1)} dBm` : ""}.`,
      `Centre of the composite grid: ${formatLatLon(lat, lon)}.`,
    ],
    warnings: [],
    compute_s: 0,
  };
  const files = Object.fromEntries(Object.entries(out.files).map(([k, f]) => [k, join(outDir, f)]));
  return { result, outputs: { files, figure: out.figure, svg: out.svg } };
}
