export interface HillshadeOptions {
  /** Cell size across (east–west) and down (north–south) the grid (m). */
  dx_m: number;
  dy_m: number;
  /** Sun azimuth, clockwise from north (deg); common practice 315 (north-west). */
  azimuth_deg?: number;
  /** Sun altitude above the horizon (deg); common practice 45. */
  altitude_deg?: number;
  /** Vertical exaggeration. */
  z_factor?: number;
}

/**
 * Hillshade of an elevation grid (row 0 at the north edge), as brightness 0–255 and a
 * validity mask (0 where the cell or a neighbour is NaN).
 *
 * Method (common practice; Burrough & McDonnell, "Principles of GIS", 1998, the form GDAL's
 * gdaldem and most GIS use): Horn's 3×3 gradient
 *   ∂z/∂x = ((c + 2f + i) − (a + 2d + g)) / (8·dx),  ∂z/∂y = ((g + 2h + i) − (a + 2b + c)) / (8·dy)
 * (a b c / d e f / g h i the window, y pointing south), slope = atan(z·√(∂x² + ∂y²)),
 * aspect = atan2(∂z/∂y, −∂z/∂x), and
 *   shade = cos(zenith)·cos(slope) + sin(zenith)·sin(slope)·cos(azimuth_math − aspect)
 * with zenith = 90° − altitude and azimuth_math = 90° − azimuth (counter-clockwise from east);
 * negative shade (self-shadow) is 0. Edge cells repeat their nearest inner neighbour.
 * @returns new arrays of width·height bytes
 */
export function hillshade(z: ArrayLike<number>, width: number, height: number, options: HillshadeOptions): { shade: Uint8Array; valid: Uint8Array } {
  const shade = new Uint8Array(width * height);
  const valid = new Uint8Array(width * height);
  const zf = options.z_factor ?? 1;
  const zenith = ((90 - (options.altitude_deg ?? 45)) * Math.PI) / 180;
  const azMath = ((90 - (options.azimuth_deg ?? 315)) * Math.PI) / 180;
  const cosZ = Math.cos(zenith);
  const sinZ = Math.sin(zenith);
  const at = (r: number, c: number) => z[Math.min(height - 1, Math.max(0, r)) * width + Math.min(width - 1, Math.max(0, c))];
  for (let r = 0; r < height; r++) {
    for (let c = 0; c < width; c++) {
      const a = at(r - 1, c - 1);
      const b = at(r - 1, c);
      const cc = at(r - 1, c + 1);
      const d = at(r, c - 1);
      const e = at(r, c);
      const f = at(r, c + 1);
      const g = at(r + 1, c - 1);
      const h = at(r + 1, c);
      const i = at(r + 1, c + 1);
      const dzdx = (cc + 2 * f + i - (a + 2 * d + g)) / (8 * options.dx_m);
      const dzdy = (g + 2 * h + i - (a + 2 * b + cc)) / (8 * options.dy_m);
      if (!Number.isFinite(dzdx + dzdy + e)) continue;
      const slope = Math.atan(zf * Math.hypot(dzdx, dzdy));
      const aspect = Math.atan2(dzdy, -dzdx);
      const s = cosZ * Math.cos(slope) + sinZ * Math.sin(slope) * Math.cos(azMath - aspect);
      shade[r * width + c] = Math.round(255 * Math.max(0, s));
      valid[r * width + c] = 1;
    }
  }
  return { shade, valid };
}
