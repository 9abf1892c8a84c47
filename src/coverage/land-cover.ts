import type { RasterGrid } from "../terrain/terrain.ts";
import { CoverageError } from "./coverage-error.ts";
import type { CoverageGrid } from "./coverage-grid.ts";
import { latLonMesh } from "./elevation-window.ts";

/** A land-cover raster opened for a coverage, with its table of class values. */
export interface LandCoverSource {
  raster: RasterGrid;
  /** how messages name the file (as written in the study) */
  label: string;
  /** raster value of each class, in table order (the class index is the position) */
  values: number[];
}

/**
 * The land-cover class of every cell of a coverage grid: nearest raster pixel to the cell
 * centre (class values are categories, never interpolated), as an index into `src.values`;
 * `fallback` for cells outside the radius that the raster does not hold.
 * @returns Uint8 class indices on a SharedArrayBuffer (row-major)
 * @throws CoverageError naming the file when a cell inside the radius lies outside the raster,
 *   or holds a value missing from the class table (the value and a cell's position)
 */
export function landCoverOnGrid(src: LandCoverSource, grid: CoverageGrid, fallback: number): Uint8Array {
  const { width: W, height: H } = grid;
  const out = new Uint8Array(new SharedArrayBuffer(W * H));
  const r = src.raster;
  const [x0, dx, , y0, , dy] = r.geoTransform;
  const index = new Map<number, number>(src.values.map((v, i) => [v, i]));
  const mesh = latLonMesh(grid);
  const lat = new Float64Array(W);
  const lon = new Float64Array(W);
  const R2 = grid.radius_m * grid.radius_m;
  const field = "p1812.land_cover";
  for (let row = 0; row < H; row++) {
    mesh.row(row, lat, lon);
    const ny = (row - grid.site_row) * grid.north_per_row_m[row];
    const ex = grid.east_per_col_m[row];
    for (let c = 0; c < W; c++) {
      const e = (c - grid.site_col) * ex;
      const inside = e * e + ny * ny <= R2;
      const [x, y] = r.epsg === 4326 ? [lon[c], lat[c]] : r.toCrs(lat[c], lon[c]);
      const pc = Math.floor((x - x0) / dx);
      const pr = Math.floor((y - y0) / dy);
      const v = pc >= 0 && pc < r.width && pr >= 0 && pr < r.height ? r.data[pr * r.width + pc] : NaN;
      if (v !== v) {
        if (inside) {
          const expected = "a land-cover raster covering the whole coverage radius (or leave land_cover out and give one clutter class)";
          throw new CoverageError(`land cover ${src.label} does not cover the radius: no class at ${lat[c].toFixed(5)}, ${lon[c].toFixed(5)} (outside the raster or nodata); expected ${expected}`, field, { received: `${src.label} (no class at ${lat[c].toFixed(5)}, ${lon[c].toFixed(5)})`, expected });
        }
        out[row * W + c] = fallback;
        continue;
      }
      const k = index.get(v);
      if (k === undefined) {
        if (!inside) {
          out[row * W + c] = fallback;
          continue;
        }
        const expected = `every value of the raster listed in p1812.land_cover.classes (listed: ${src.values.join(", ")})`;
        throw new CoverageError(`land cover ${src.label} holds value ${v} (at ${lat[c].toFixed(5)}, ${lon[c].toFixed(5)}), which is not in the class table; expected ${expected}`, `${field}.classes`, { received: `value ${v} in ${src.label}`, expected });
      }
      out[row * W + c] = k;
    }
  }
  return out;
}
