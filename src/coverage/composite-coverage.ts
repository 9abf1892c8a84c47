import { crsFromEpsg } from "../geo/crs-from-epsg.ts";
import { metresPerDegree } from "../terrain/metres-per-degree.ts";
import { MAX_COVERAGE_CELLS, pointScale, type CoverageGrid } from "./coverage-grid.ts";
import { LEVEL_NODATA, VISIBILITY_NODATA } from "./coverage-job.ts";
import { elevationAt, type Elevations } from "./elevation-window.ts";

/** What the composite reads of a level coverage (a ComputedCoverage is one). */
export interface CompositeInput {
  grid: Pick<CoverageGrid, "epsg" | "geoTransform" | "width" | "height">;
  /** received level (dBm, LEVEL_NODATA where not computed), row-major */
  values: Float32Array | Uint8Array;
  /** the grid's elevations (m; Float32 with NaN nodata or Int16: elevation-window.ts) */
  dem: Elevations;
}

/** The multi-site composite of level coverages on their common grid. */
export interface Composite {
  width: number;
  height: number;
  geoTransform: [number, number, number, number, number, number];
  epsg: number;
  /** strongest received level over the sites (dBm, LEVEL_NODATA where no site reaches) */
  level: Float32Array;
  /** best server: 1-based index into the inputs of the strongest site; VISIBILITY_NODATA (255) where none */
  best: Uint8Array;
  /** elevations (m) where any input has them */
  dem: Float32Array;
  /** ground area of a cell per row (m²) */
  cell_area_m2: Float64Array;
  cell_m: [number, number];
  /** offset (col, row) of each input's grid in the composite */
  offsets: [number, number][];
}

/**
 * Combine level coverages (delta-Bullington, Hata) into the strongest level per cell and the
 * site that provides it (best server; ties go to the earlier input). The inputs must lie on
 * one grid family — same CRS and cell size, origins a whole number of cells apart — which
 * holds for coverages on one terrain raster, and for UTM grids of sites in one zone at one
 * resolution (their origins are multiples of it). Returns a reason string when they do not.
 * At most 254 inputs.
 */
export function compositeCoverage(inputs: readonly CompositeInput[]): Composite | string {
  if (inputs.length === 0) return "no level coverages";
  if (inputs.length > 254) return "more than 254 coverages";
  const g0 = inputs[0].grid;
  const [, dx, , , , dy] = g0.geoTransform;
  for (const c of inputs) {
    const g = c.grid;
    if (g.epsg !== g0.epsg) return `the coverages lie in different coordinate systems (EPSG:${g0.epsg} and EPSG:${g.epsg})`;
    if (Math.abs(g.geoTransform[1] - dx) > 1e-9 * Math.abs(dx) || Math.abs(g.geoTransform[5] - dy) > 1e-9 * Math.abs(dy)) return "the coverages have different cell sizes";
    const oc = (g.geoTransform[0] - g0.geoTransform[0]) / dx;
    const or = (g.geoTransform[3] - g0.geoTransform[3]) / dy;
    if (Math.abs(oc - Math.round(oc)) > 1e-6 || Math.abs(or - Math.round(or)) > 1e-6) return "the coverages' grids are not aligned";
  }
  // union of the windows, in cells relative to the first grid
  let c0 = Infinity;
  let r0 = Infinity;
  let c1 = -Infinity;
  let r1 = -Infinity;
  const rel = inputs.map((c) => {
    const oc = Math.round((c.grid.geoTransform[0] - g0.geoTransform[0]) / dx);
    const or = Math.round((c.grid.geoTransform[3] - g0.geoTransform[3]) / dy);
    c0 = Math.min(c0, oc);
    r0 = Math.min(r0, or);
    c1 = Math.max(c1, oc + c.grid.width);
    r1 = Math.max(r1, or + c.grid.height);
    return [oc, or] as [number, number];
  });
  const W = c1 - c0;
  const H = r1 - r0;
  // the members' own limit applies to their union too: far-apart sites span a huge grid
  if (!(W * H <= MAX_COVERAGE_CELLS)) return `the composite would need ${W} × ${H} = ${((W * H) / 1e6).toFixed(1)} M cells, more than the limit of ${MAX_COVERAGE_CELLS / 1e6} M (the coverages lie far apart; give them separate studies)`;
  const level = new Float32Array(W * H).fill(LEVEL_NODATA);
  const best = new Uint8Array(W * H).fill(VISIBILITY_NODATA);
  const dem = new Float32Array(W * H).fill(NaN);
  const offsets = rel.map(([oc, or]) => [oc - c0, or - r0] as [number, number]);
  inputs.forEach((c, k) => {
    const [oc, or] = offsets[k];
    const { width: w, height: h } = c.grid;
    const v = c.values as Float32Array;
    for (let r = 0; r < h; r++) {
      const src = r * w;
      const dst = (r + or) * W + oc;
      for (let i = 0; i < w; i++) {
        const x = v[src + i];
        const j = dst + i;
        if (dem[j] !== dem[j]) dem[j] = elevationAt(c.dem, src + i);
        if (x === LEVEL_NODATA) continue;
        if (level[j] === LEVEL_NODATA || x > level[j]) {
          level[j] = x;
          best[j] = k + 1;
        }
      }
    }
  });
  const gt: Composite["geoTransform"] = [g0.geoTransform[0] + c0 * dx, dx, 0, g0.geoTransform[3] + r0 * dy, 0, dy];
  const crs = crsFromEpsg(g0.epsg)!;
  const area = new Float64Array(H);
  let cell_m: [number, number];
  if (crs.geographic) {
    for (let r = 0; r < H; r++) {
      const [ns, ew] = metresPerDegree(gt[3] + (r + 0.5) * dy);
      area[r] = Math.abs(dx * ew * dy * ns);
    }
    const [ns, ew] = metresPerDegree(gt[3] + (H / 2) * dy);
    cell_m = [Math.abs(dx) * ew, Math.abs(dy) * ns];
  } else {
    const [lat, lon] = crs.fromCrs(gt[0] + (W / 2) * dx, gt[3] + (H / 2) * dy);
    const k = pointScale(crs, lat, lon);
    area.fill(Math.abs((dx * dy) / (k * k)));
    cell_m = [Math.abs(dx) / k, Math.abs(dy) / k];
  }
  return { width: W, height: H, geoTransform: gt, epsg: g0.epsg, level, best, dem, cell_area_m2: area, cell_m, offsets };
}

/**
 * Area (m²) at or above each threshold of a composite, and the area each input serves as best
 * server with a level at or above `serveFrom` (dBm); with the cells that have a level and the
 * lowest and highest of those levels (dBm; null when there are none, as for one coverage), in the same pass.
 */
export function compositeAreas(
  c: Composite,
  thresholds: number[],
  n: number,
  serveFrom: number,
): { at_least_m2: number[]; area_m2: number; served_m2: number[]; cells: number; level_min_dbm: number | null; level_max_dbm: number | null } {
  const at = new Array<number>(thresholds.length).fill(0);
  const served = new Array<number>(n).fill(0);
  let total = 0;
  let cells = 0;
  let min = Infinity;
  let max = -Infinity;
  for (let r = 0; r < c.height; r++) {
    const a = c.cell_area_m2[r];
    for (let i = r * c.width, e = i + c.width; i < e; i++) {
      const v = c.level[i];
      if (v === LEVEL_NODATA) continue;
      total += a;
      cells++;
      if (v < min) min = v;
      if (v > max) max = v;
      for (let j = 0; j < thresholds.length && v >= thresholds[j]; j++) at[j] += a;
      if (v >= serveFrom) served[c.best[i] - 1] += a;
    }
  }
  return { at_least_m2: at, area_m2: total, served_m2: served, cells, level_min_dbm: cells > 0 ? min : null, level_max_dbm: cells > 0 ? max : null };
}
