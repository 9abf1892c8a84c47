import sharp from "sharp";
import type { CoverageMapData } from "../coverage-map.ts";
import { hillshade } from "./hillshade.ts";
import { elevationAt, type Elevations } from "../../coverage/elevation-window.ts";
import { overlayRgba, type OverlayStyle } from "./coverage-overlay.ts";

/** What the map needs of a computed coverage. */
export interface CoverageMapInput {
  title: string;
  /** coverage raster and its elevations, row-major, same grid */
  values: ArrayLike<number>;
  /** Float32 with NaN nodata, or Int16 with INT16_NODATA (elevation-window.ts) */
  dem: Elevations;
  width: number;
  height: number;
  /** ground metres per cell across and down (at the site) */
  cell_m: [number, number];
  style: OverlayStyle;
  legend: { color: string; label: string }[];
  /** site positions in pixel-centre coordinates of the grid */
  sites: { name: string; col: number; row: number }[];
  crs_note: string;
  /** the study's other sites, links and service area, grid pixel-centre coordinates */
  overlay?: { others: { name: string; col: number; row: number }[]; links: [number, number, number, number][]; areas: [number, number][][] };
  /** longest side of the map (px): at most maxSide (default 900), at least 640 */
  maxSide?: number;
}

/**
 * Build the coverage map's data: the terrain shaded (Horn's hillshade, sun from the north-west
 * at 45°) in grey, the coverage bands drawn over it, sites in map pixels, the legend and a
 * scale bar of a round length near a quarter of the map's width. Raster work goes through
 * sharp on Uint8 buffers.
 */
export async function coverageMapData(m: CoverageMapInput): Promise<CoverageMapData> {
  const maxSide = m.maxSide ?? 900;
  // True scale: map pixels cover the same ground distance across and down (cells need not be
  // square: a geographic grid's cells are narrower than tall away from the equator).
  const groundW = m.width * m.cell_m[0];
  const groundH = m.height * m.cell_m[1];
  const long = Math.max(groundW, groundH);
  const side = Math.min(maxSide, Math.max(640, Math.max(m.width, m.height)));
  const size = { width: Math.max(1, Math.round((side * groundW) / long)), height: Math.max(1, Math.round((side * groundH) / long)) };
  const over = overlayRgba(m.values, m.width, m.height, { ...m.style, alpha: m.style.alpha ?? 150 }, maxSide, Math.min(640, maxSide), size);
  const w = over.width;
  const h = over.height;
  const sx = m.width / w;
  const sy = m.height / h;
  // terrain sampled at the map's pixels (nearest cell), then shaded at that spacing
  const z = new Float64Array(w * h);
  const int16 = m.dem instanceof Int16Array;
  for (let r = 0; r < h; r++) {
    const rr = Math.min(m.height - 1, Math.floor((r + 0.5) * sy));
    for (let c = 0; c < w; c++) {
      const i = rr * m.width + Math.min(m.width - 1, Math.floor((c + 0.5) * sx));
      z[r * w + c] = int16 ? elevationAt(m.dem, i) : m.dem[i];
    }
  }
  const { shade, valid } = hillshade(z, w, h, { dx_m: m.cell_m[0] * sx, dy_m: m.cell_m[1] * sy });
  const base = new Uint8Array(w * h * 4);
  for (let i = 0; i < w * h; i++) {
    const g = valid[i] ? Math.round(150 + (shade[i] * 95) / 255) : 235;
    base[4 * i] = g;
    base[4 * i + 1] = g;
    base[4 * i + 2] = g;
    base[4 * i + 3] = 255;
  }
  const overlay = await sharp(Buffer.from(over.rgba.buffer, over.rgba.byteOffset, over.rgba.byteLength), { raw: { width: w, height: h, channels: 4 } }).png().toBuffer();
  const png = await sharp(Buffer.from(base.buffer), { raw: { width: w, height: h, channels: 4 } })
    .composite([{ input: overlay }])
    .png({ compressionLevel: 9 })
    .toBuffer();
  const mPerPx = m.cell_m[0] * sx;
  const target = (w / 4) * mPerPx;
  const nice = niceLength(target);
  return {
    title: m.title,
    width_px: w,
    height_px: h,
    image_href: `data:image/png;base64,${png.toString("base64")}`,
    sites: m.sites.map((s) => ({ name: s.name, x_px: (s.col + 0.5) / sx, y_px: (s.row + 0.5) / sy })),
    ...(m.overlay
      ? {
          others: m.overlay.others.map((s) => ({ name: s.name, x_px: (s.col + 0.5) / sx, y_px: (s.row + 0.5) / sy })),
          links: m.overlay.links.map(([a, b, c, d]) => [(a + 0.5) / sx, (b + 0.5) / sy, (c + 0.5) / sx, (d + 0.5) / sy] as [number, number, number, number]),
          areas: m.overlay.areas.map((ring) => ring.map(([c, r]) => [(c + 0.5) / sx, (r + 0.5) / sy] as [number, number])),
        }
      : {}),
    legend: m.legend,
    scale_bar: { length_px: nice / mPerPx, label: nice >= 1000 ? `${nice / 1000} km` : `${nice} m` },
    crs_note: m.crs_note,
  };
}

/** 1, 2 or 5 times a power of ten, not above x. */
function niceLength(x: number): number {
  const p = 10 ** Math.floor(Math.log10(x));
  for (const k of [5, 2, 1]) if (k * p <= x) return k * p;
  return p;
}

/** The map rendered to PNG (sharp renders the SVG, fonts from the system). */
export async function coverageMapPng(svg: string): Promise<Buffer> {
  return sharp(Buffer.from(svg)).png({ compressionLevel: 9 }).toBuffer();
}
