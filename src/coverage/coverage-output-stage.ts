import type { Elevations } from "./elevation-window.ts";
import type { ComputedCoverage } from "./compute-coverage.ts";
import type { ThresholdArea } from "./coverage-result.ts";

/** The raster and drawing a coverage is written as (or the multi-site composite). */
export interface CoverageRaster {
  title: string;
  values: Float32Array | Uint8Array;
  /** elevations on the same grid (for the map's hillshade; Float32 with NaN nodata or Int16, elevation-window.ts) */
  dem: Elevations;
  width: number;
  height: number;
  geoTransform: [number, number, number, number, number, number];
  epsg: number;
  /** ground metres per cell across and down */
  cell_m: [number, number];
  kind: "level" | "visibility";
  areas: ThresholdArea[];
  sites: { name: string; col: number; row: number; lat_deg: number; lon_deg: number }[];
  /** drawn over the map, in the grid's pixel-centre coordinates: the study's other sites, its links, the service area */
  overlay?: MapOverlay;
  /** P.1812: location probability (0–1, −1 outside) of the threshold named by `label` */
  probability?: { values: Float32Array; label: string };
}

/** Other features of the study on a coverage map (grid pixel-centre coordinates). */
export interface MapOverlay {
  others: { name: string; col: number; row: number }[];
  links: [number, number, number, number][];
  areas: [number, number][][];
}

export interface WriteOptions {
  /** folder to write into (created) */
  dir: string;
  /** file name stem, e.g. the coverage id */
  stem: string;
  /** GeoTIFF compression, default "deflate" */
  compression?: "none" | "deflate";
}

/**
 * The page figure of a written coverage: plain data the output stage draws from (kept in the
 * coverage cache, so a hit redraws its SVG without the raster). Opaque to coverage code but
 * for the image it refers to.
 */
export interface CoverageFigure {
  image_href: string;
}

/** What writing one coverage gives: file names relative to the folder, the figure and its SVG. */
export interface WrittenCoverage<F extends CoverageFigure = CoverageFigure> {
  files: Record<string, string>;
  figure: F;
  svg: string;
  /** further maps of the same coverage (e.g. "probability"), each with its figure and SVG */
  extra?: { suffix: string; figure: F; svg: string }[];
}

/**
 * The output stage that turns computed coverage rasters into files (GeoTIFF, PNG, GeoJSON,
 * KML) and page figures. Coverage computes; the render layer writes
 * (`src/render/coverage-outputs.ts`): the caller above both hands the stage in, so coverage
 * code never imports render.
 */
export interface CoverageOutputStage {
  write(raster: CoverageRaster, options: WriteOptions): Promise<WrittenCoverage>;
  /** the SVG of a figure the stage made (pure: the cache keeps figures, not SVGs) */
  svg(figure: CoverageFigure): string;
}

/** The output stage from options, or an internal error naming what the caller forgot. */
export function requireOutputStage(stage: CoverageOutputStage | undefined): CoverageOutputStage {
  if (!stage) throw new Error("internal error: coverage needs an output stage (pass coverageOutputStage from src/render/coverage-outputs.ts)");
  return stage;
}

/** The raster description of one computed coverage. */
export function coverageRaster(c: ComputedCoverage, title: string, areas: ThresholdArea[], site: { name: string; lat_deg: number; lon_deg: number }): CoverageRaster {
  const g = c.grid;
  const row = Math.min(g.height - 1, Math.max(0, Math.round(g.site_row)));
  return {
    title,
    values: c.values,
    dem: c.dem, // not copied: the map samples a few of its cells
    width: g.width,
    height: g.height,
    geoTransform: g.geoTransform,
    epsg: g.epsg,
    cell_m: [Math.abs(g.east_per_col_m[row]), Math.abs(g.north_per_row_m[row])],
    kind: c.request.method === "visibility" ? "visibility" : "level",
    areas,
    sites: [{ ...site, col: g.site_col, row: g.site_row }],
  };
}
