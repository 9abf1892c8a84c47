import sharp from "sharp";
import { hexRgb } from "./coverage-palette.ts";

export interface OverlayStyle {
  /** ascending thresholds; a cell takes the colour of the highest threshold it reaches */
  thresholds: number[];
  /** one "#rrggbb" per threshold */
  colors: string[];
  /** value marking cells outside the data (transparent) */
  nodata: number;
  /** alpha (0–255) of coloured cells */
  alpha?: number;
}

/**
 * RGBA pixels (Uint8, 4 per pixel) of a coverage raster drawn as threshold bands, sampled
 * (nearest cell) so that the longer side has at most `maxSide` and at least `minSide` pixels;
 * cells below the lowest threshold and nodata are transparent.
 */
export function overlayRgba(values: ArrayLike<number>, width: number, height: number, style: OverlayStyle, maxSide = 1200, minSide = 1, size?: { width: number; height: number }): { rgba: Uint8Array; width: number; height: number } {
  const long = Math.max(width, height);
  const s = long > maxSide ? long / maxSide : long < minSide ? long / minSide : 1;
  const w = size ? size.width : Math.max(1, Math.round(width / s));
  const h = size ? size.height : Math.max(1, Math.round(height / s));
  const rgba = new Uint8Array(w * h * 4);
  const cols = style.colors.map(hexRgb);
  const t = style.thresholds;
  const alpha = style.alpha ?? 200;
  for (let r = 0; r < h; r++) {
    const sr = Math.min(height - 1, Math.floor((r + 0.5) * (height / h)));
    for (let c = 0; c < w; c++) {
      const sc = Math.min(width - 1, Math.floor((c + 0.5) * (width / w)));
      const v = values[sr * width + sc];
      if (v === style.nodata || v !== v) continue;
      let j = -1;
      while (j + 1 < t.length && v >= t[j + 1]) j++;
      if (j < 0) continue;
      const o = (r * w + c) * 4;
      rgba[o] = cols[j][0];
      rgba[o + 1] = cols[j][1];
      rgba[o + 2] = cols[j][2];
      rgba[o + 3] = alpha;
    }
  }
  return { rgba, width: w, height: h };
}

/** The overlay as a PNG (sharp, from the Uint8 RGBA buffer). */
export async function overlayPng(values: ArrayLike<number>, width: number, height: number, style: OverlayStyle, maxSide = 1200): Promise<Buffer> {
  const o = overlayRgba(values, width, height, style, maxSide);
  return sharp(Buffer.from(o.rgba.buffer, o.rgba.byteOffset, o.rgba.byteLength), { raw: { width: o.width, height: o.height, channels: 4 } })
    .png({ compressionLevel: 9 })
    .toBuffer();
}
