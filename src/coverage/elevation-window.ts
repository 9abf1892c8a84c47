import type { ShareDecode } from "../terrain/geotiff.ts";
import { sharedFloat32 } from "../terrain/shared-grid.ts";
import { INT16_NODATA, type PixelWindow, type RowProgress } from "../terrain/tiff-band-reader.ts";
import type { Terrain } from "../terrain/terrain.ts";
import { cellCentreLatLon, type CoverageGrid } from "./coverage-grid.ts";
import { uniformMetric } from "./radial-sweep.ts";

/** Spacing (m, about) of the exactly projected nodes between which cell positions are interpolated. */
const MESH_M = 500;

/**
 * A coverage grid's elevations (m, row-major): Float32 with NaN for nodata (or −32768, see
 * elevationWindow's insideRadiusOnly), or — read from an
 * Int16 raster, or from a Float32 one whose samples are all whole metres — Int16 with
 * INT16_NODATA (−32768) for nodata, the same values in half the memory. Read single values with `elevationAt`; hot loops compare with INT16_NODATA
 * themselves (−32768 is never a height on Earth, so the test is the same for both types).
 */
export type Elevations = Float32Array | Int16Array;

/** The elevation at index i (m), NaN for nodata of either type. */
export function elevationAt(dem: Elevations, i: number): number {
  const v = dem[i];
  return v === INT16_NODATA ? NaN : v;
}

/**
 * The elevations of a coverage grid in a SharedArrayBuffer, read from the terrain once and
 * shared by every worker thread.
 * - Raster source: a copy of the window of the terrain's own raster (no resampling), read
 *   straight from the file by terrains that offer `readWindow` (GeoTIFF) — as Int16 when the
 *   file holds Int16 (see Elevations), else Float32.
 * - Otherwise: each cell centre is converted to latitude/longitude and the terrain sampled
 *   there (bilinear, as for a link profile). Positions are projected exactly about every
 *   500 m in both directions and interpolated bilinearly in between: the error is bounded by
 *   L²/8 times the curvature of the inverse projection (about tan(lat)/R² for UTM), 0.5 cm
 *   for L = 500 m at 46°N (test/coverage/coverage-grid.test.ts).
 * @param onRow optional progress callback (rows done, rows)
 * @param share hands a GeoTIFF window decode to worker threads as well (CoveragePool.shareDecode)
 * @param options.progress told of the rows as a GeoTIFF window is read straight from the file
 *   (see RowProgress; not called for other sources, nor for a window kept from before)
 * @param options.insideRadiusOnly read a GeoTIFF window only within the coverage radius plus
 *   three cells — all the sweeps and Hata read (samples end 1.5 cells past the radius, and
 *   interpolate with the next cell) — leaving the corners of the square zero: about a fifth
 *   less memory written; and a Float32 band whose nodata is −32768 keeps those samples as read
 *   (nodata as INT16_NODATA in Float32, which every reader here takes as nodata) rather than
 *   NaN, which saves a pass over every sample. Not for callers that use the elevations outside
 *   the radius or hand them on (the shaded relief of a map).
 */
export function elevationWindow(terrain: Terrain, grid: CoverageGrid, onRow?: (done: number, total: number) => void, share?: ShareDecode, options: { insideRadiusOnly?: boolean; progress?: RowProgress } = {}): Elevations {
  const keep = keptWindows.get(terrain);
  if (keep) {
    const key = JSON.stringify([grid.epsg, grid.geoTransform, grid.width, grid.height, grid.source, grid.radius_m, !!options.insideRadiusOnly]);
    let dem = keep.find((w) => w.key === key)?.dem;
    if (!dem) {
      keptWindows.delete(terrain); // read it as usual
      dem = elevationWindow(terrain, grid, onRow, share, { insideRadiusOnly: options.insideRadiusOnly });
      keptWindows.set(terrain, [{ key, dem }, ...keep].slice(0, KEEP_WINDOWS));
    }
    onRow?.(grid.height, grid.height);
    return dem;
  }
  const { width: W, height: H } = grid;
  const src = grid.source;
  // A terrain that reads windows of its raster itself (GeoTIFF) decodes only the grid's pixels, once.
  const readWindow = (terrain as { readWindow?: (w: PixelWindow, share: ShareDecode | undefined, int16: boolean, progress?: RowProgress) => Elevations }).readWindow;
  if (src.kind === "raster" && typeof readWindow === "function") {
    const spans = options.insideRadiusOnly ? radiusSpans(grid) : undefined;
    const only = options.insideRadiusOnly === true;
    const out = readWindow.call(terrain, { col0: src.col0, row0: src.row0, width: W, height: H, ...(spans ? { spans } : {}), ...(only ? { int16NodataKept: true } : {}) }, share, true, options.progress);
    onRow?.(H, H);
    return out;
  }
  const out = sharedFloat32(W * H);
  if (src.kind === "raster") {
    const r = terrain.raster!;
    for (let row = 0; row < H; row++) {
      const from = (src.row0 + row) * r.width + src.col0;
      out.set(r.data.subarray(from, from + W), row * W);
    }
    onRow?.(H, H);
    return out;
  }
  if (terrain.kind === "constant") {
    out.fill(terrain.elevation(...cellCentreLatLon(grid, Math.floor(W / 2), Math.floor(H / 2))));
    onRow?.(H, H);
    return out;
  }
  const mesh = latLonMesh(grid);
  const lat = new Float64Array(W);
  const lon = new Float64Array(W);
  for (let row = 0; row < H; row++) {
    mesh.row(row, lat, lon);
    const { h_m } = terrain.sample(lat, lon);
    for (let c = 0; c < W; c++) out[row * W + c] = h_m[c];
    if ((row & 63) === 63 || row === H - 1) onRow?.(row + 1, H);
  }
  return out;
}

/** Terrains whose last elevation windows are kept (keepElevationWindows), with them. */
const keptWindows = new WeakMap<Terrain, { key: string; dem: Elevations }[]>();
const KEEP_WINDOWS = 2;

/**
 * Keep the last two elevation windows read from this terrain and hand them out again for the
 * same grid (read-only: every user of a window only reads it). For a queue worker, whose
 * tiles of a map and the map's assembly read the same window: it is read once.
 */
export function keepElevationWindows(terrain: Terrain): void {
  if (!keptWindows.has(terrain)) keptWindows.set(terrain, []);
}

/**
 * Per row of the grid, the columns [first, end) within the coverage radius plus three cells of
 * the site (PixelWindow.spans); undefined when the grid's rows differ in metric (then every cell).
 */
export function radiusSpans(grid: CoverageGrid): Int32Array | undefined {
  const { width: W, height: H, east_per_col_m: EX, north_per_row_m: NY } = grid;
  if (!uniformMetric(grid)) return undefined;
  const ex = Math.abs(EX[0]);
  const ny = Math.abs(NY[0]);
  const reach = grid.radius_m + 3 * Math.max(ex, ny);
  const spans = new Int32Array(2 * H);
  for (let r = 0; r < H; r++) {
    const dy = (r - grid.site_row) * ny;
    if (Math.abs(dy) > reach) continue; // [0, 0): nothing in this row
    const half = Math.sqrt(reach * reach - dy * dy) / ex;
    spans[2 * r] = Math.max(0, Math.floor(grid.site_col - half));
    spans[2 * r + 1] = Math.min(W, Math.ceil(grid.site_col + half) + 1);
  }
  return spans;
}

/**
 * Latitude/longitude of the cell centres of a grid, exact at every MESH-th row and column
 * (MESH cells ≈ 500 m) and interpolated bilinearly in between. `row(r, lat, lon)` fills one row.
 */
export function latLonMesh(grid: Pick<CoverageGrid, "epsg" | "geoTransform" | "width" | "height">): { row(r: number, lat: Float64Array, lon: Float64Array): void } {
  const { width: W, height: H } = grid;
  const cellM = grid.epsg === 4326 ? Math.abs(grid.geoTransform[1]) * 111_000 : Math.abs(grid.geoTransform[1]);
  const MESH = Math.max(1, Math.round(MESH_M / cellM));
  const nc = Math.ceil((W - 1) / MESH) + 1;
  const nr = Math.ceil((H - 1) / MESH) + 1;
  const mLat = new Float64Array(nc * nr);
  const mLon = new Float64Array(nc * nr);
  for (let j = 0; j < nr; j++) {
    for (let i = 0; i < nc; i++) {
      const [la, lo] = cellCentreLatLon(grid, Math.min(i * MESH, W - 1), Math.min(j * MESH, H - 1));
      mLat[j * nc + i] = la;
      mLon[j * nc + i] = lo;
    }
  }
  return {
    row(r, lat, lon) {
      const j0 = Math.min(Math.floor(r / MESH), nr - 2 < 0 ? 0 : nr - 2);
      const rA = j0 * MESH;
      const rB = Math.min((j0 + 1) * MESH, H - 1);
      const fr = rB > rA ? (r - rA) / (rB - rA) : 0;
      const j1 = nr > 1 ? j0 + 1 : j0;
      for (let c = 0; c < W; c++) {
        const i0 = Math.min(Math.floor(c / MESH), nc - 2 < 0 ? 0 : nc - 2);
        const cA = i0 * MESH;
        const cB = Math.min((i0 + 1) * MESH, W - 1);
        const fc = cB > cA ? (c - cA) / (cB - cA) : 0;
        const i1 = nc > 1 ? i0 + 1 : i0;
        const a = j0 * nc;
        const b = j1 * nc;
        lat[c] = (mLat[a + i0] * (1 - fc) + mLat[a + i1] * fc) * (1 - fr) + (mLat[b + i0] * (1 - fc) + mLat[b + i1] * fc) * fr;
        lon[c] = (mLon[a + i0] * (1 - fc) + mLon[a + i1] * fc) * (1 - fr) + (mLon[b + i0] * (1 - fc) + mLon[b + i1] * fc) * fr;
      }
    },
  };
}
