import { fieldColormap, FIELD_COLORMAP_SIZE } from "./field-colormap.ts";

export interface WaveFieldGrid {
  x_m: ArrayLike<number>;
  z0_m: number;
  dz_m: number;
  rows: number;
  f_db: ArrayLike<number>;
}

export interface WaveRasterFrame {
  width: number;
  height: number;
  /** distance (m) at the left and right pixel edges */
  x0_m: number;
  x1_m: number;
  /** plotted height (m) at the bottom and top pixel edges */
  z0_m: number;
  z1_m: number;
  /** Earth bulge (m) added to heights in the plot at distance x (0 for a flat plot) */
  bulge: (x_m: number) => number;
  /** dB range of the colour map */
  min_db: number;
  max_db: number;
}

/**
 * The field as RGBA pixels (row-major from the top): each pixel's centre is mapped to a
 * distance and a height in the plot, the bulge removed, and the field (dB) interpolated
 * bilinearly from the solver's grid; transparent below the ground and outside the solved region.
 */
export function waveFieldRgba(grid: WaveFieldGrid, f: WaveRasterFrame): Uint8Array {
  const { width: W, height: H } = f;
  const out = new Uint8Array(W * H * 4);
  const map = fieldColormap();
  const cols = grid.x_m.length;
  const xs = grid.x_m;
  const span = f.max_db - f.min_db;
  let c = 0;
  for (let px = 0; px < W; px++) {
    const x = f.x0_m + ((px + 0.5) / W) * (f.x1_m - f.x0_m);
    while (c < cols - 2 && xs[c + 1] < x) c++;
    const tx = cols > 1 ? Math.min(1, Math.max(0, (x - xs[c]) / (xs[c + 1] - xs[c]))) : 0;
    const c1 = Math.min(cols - 1, c + 1);
    const b = f.bulge(x);
    for (let py = 0; py < H; py++) {
      const zp = f.z1_m - ((py + 0.5) / H) * (f.z1_m - f.z0_m);
      const r = (zp - b - grid.z0_m) / grid.dz_m;
      const r0 = Math.floor(r);
      if (r0 < 0 || r0 + 1 >= grid.rows) continue;
      const ty = r - r0;
      const v00 = grid.f_db[c * grid.rows + r0];
      const v01 = grid.f_db[c * grid.rows + r0 + 1];
      const v10 = grid.f_db[c1 * grid.rows + r0];
      const v11 = grid.f_db[c1 * grid.rows + r0 + 1];
      const v = (1 - tx) * ((1 - ty) * v00 + ty * v01) + tx * ((1 - ty) * v10 + ty * v11);
      if (!Number.isFinite(v)) continue;
      const t = Math.min(1, Math.max(0, (v - f.min_db) / span));
      const k = Math.round(t * (FIELD_COLORMAP_SIZE - 1)) * 3;
      const o = (py * W + px) * 4;
      out[o] = map[k];
      out[o + 1] = map[k + 1];
      out[o + 2] = map[k + 2];
      out[o + 3] = 255;
    }
  }
  return out;
}
