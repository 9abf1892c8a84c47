import type { GeoProjection } from "d3-geo";
import { metresPerPixel } from "../svg/map-projection.ts";

/**
 * Elevations sampled on the pixel grid of a map: cell (col, row) holds the ground height at
 * the inverse projection of its centre ((col + 0.5)·step, (row + 0.5)·step). NaN where the
 * terrain has no data. Also returns the cell size in metres at the map centre (for shading).
 * @param elevation ground height (m) at WGS84 latitude, longitude (deg)
 */
export function projectedElevationGrid(
  elevation: (lat_deg: number, lon_deg: number) => number,
  projection: GeoProjection,
  width_px: number,
  height_px: number,
  step_px = 1,
): { z: Float64Array; width: number; height: number; dx_m: number; dy_m: number } {
  const width = Math.max(1, Math.round(width_px / step_px));
  const height = Math.max(1, Math.round(height_px / step_px));
  const z = new Float64Array(width * height);
  for (let r = 0; r < height; r++) {
    for (let c = 0; c < width; c++) {
      const ll = projection.invert!([(c + 0.5) * step_px, (r + 0.5) * step_px]);
      z[r * width + c] = ll ? elevation(ll[1], ll[0]) : Number.NaN;
    }
  }
  const m = metresPerPixel(projection, width_px / 2, height_px / 2);
  return { z, width, height, dx_m: m.dx_m * step_px, dy_m: m.dy_m * step_px };
}
