import { scaleLinear, type ScaleLinear } from "d3-scale";
import { line } from "d3-shape";
import { earthBulgeM } from "../../physics/earth-bulge.ts";
import { fresnelRadiusM } from "../../physics/fresnel-radius.ts";
import { fieldColourCss } from "../raster/field-colormap.ts";
import type { WaveRasterFrame } from "../raster/wave-field-raster.ts";
import { bottomAxis, leftAxis } from "./axes.ts";
import { escapeXml, px } from "./escape.ts";
import { fixed } from "../../format/quantity.ts";

export interface WaveFieldFigureInput {
  /** element ids; unique on the page */
  id: string;
  title: string;
  d_m: ArrayLike<number>;
  /** ground with obstructions (m amsl) */
  ground_m: ArrayLike<number>;
  from: { name: string; amsl_m: number };
  to: { name: string; amsl_m: number };
  lambda_m: number;
  ae_m: number;
  k_label: string;
  /** top of the solved region (m amsl) */
  top_m: number;
  excess_loss_db: number;
  /** each diffraction method's loss (dB), for the text alternative */
  methods: Record<string, number>;
  width?: number;
  height?: number;
}

/** Styles for the figure outside the site (the command line's PNG): the site's stylesheet has the same rules. */
export const WAVE_FIGURE_STANDALONE_STYLE =
  "text{font:11px sans-serif;fill:#1b2430}.axis line{stroke:#2a3644}.grid{stroke:#d6dce2;stroke-opacity:.5}.axis-label{font-size:12px}" +
  ".wave-sky{fill:#f4f4f2}.wave-terrain{fill:#8a8378;stroke:#2b2a28}.wave-los{stroke:#111;stroke-width:1.4}.wave-fresnel{fill:none;stroke:#111;stroke-dasharray:4 3}" +
  ".wave-shadow{stroke:#e8590c;stroke-width:1.6;stroke-dasharray:8 4}.wave-antenna{fill:#fff;stroke:#111;stroke-width:1.5}.wave-scale line{stroke:#2a3644}";

/** Colour range of the figure (dB relative to free space). */
export const WAVE_FIGURE_DB = { min: -40, max: 10 } as const;

export interface WaveFieldLayout {
  W: number;
  H: number;
  m: { top: number; right: number; bottom: number; left: number };
  x: ScaleLinear<number, number>;
  y: ScaleLinear<number, number>;
  /** the raster behind the plot area, at `scale` pixels per SVG unit */
  raster: WaveRasterFrame;
  scale: number;
}

/** Plot area, scales and the raster frame of the field figure (the raster is drawn to match). */
export function waveFieldLayout(p: WaveFieldFigureInput, scale = 2): WaveFieldLayout {
  const W = p.width ?? 880;
  const H = p.height ?? 400;
  const m = { top: 30, right: 96, bottom: 48, left: 64 };
  const n = p.d_m.length;
  const D = p.d_m[n - 1];
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < n; i++) {
    const b = earthBulgeM(p.d_m[i], D - p.d_m[i], p.ae_m);
    lo = Math.min(lo, p.ground_m[i] + b);
    hi = Math.max(hi, p.ground_m[i] + b);
  }
  hi = Math.max(hi, p.from.amsl_m, p.to.amsl_m) + 1.2 * fresnelRadiusM(1, p.lambda_m, D / 2, D / 2);
  const pad = (hi - lo) * 0.08 || 10;
  const x = scaleLinear().domain([0, D]).range([m.left, W - m.right]);
  const y = scaleLinear().domain([lo - pad, hi + pad]).nice().range([H - m.bottom, m.top]);
  const [z0, z1] = y.domain();
  const pw = W - m.left - m.right;
  const ph = H - m.top - m.bottom;
  return {
    W,
    H,
    m,
    x,
    y,
    scale,
    raster: {
      width: Math.round(pw * scale),
      height: Math.round(ph * scale),
      x0_m: 0,
      x1_m: D,
      z0_m: z0,
      z1_m: z1,
      bulge: (d: number) => earthBulgeM(d, D - d, p.ae_m),
      min_db: WAVE_FIGURE_DB.min,
      max_db: WAVE_FIGURE_DB.max,
    },
  };
}

/**
 * The wave solution's field over the height–distance plane as an SVG string: the field raster
 * (an embedded PNG, `imageHref`) under SVG overlays — terrain plus Earth bulge at the solution's
 * k (so the line of sight is straight), the line of sight, the first Fresnel zone, the
 * geometrical shadow boundary of the transmitter's horizon, the two antennas — with a dB scale
 * bar and a text alternative.
 */
export function waveFieldSvg(p: WaveFieldFigureInput, layout: WaveFieldLayout, imageHref: string, options: { style?: string } = {}): string {
  const { W, H, m, x, y } = layout;
  const n = p.d_m.length;
  const D = p.d_m[n - 1];
  const idx = Array.from({ length: n }, (_, i) => i);
  const gb = idx.map((i) => p.ground_m[i] + earthBulgeM(p.d_m[i], D - p.d_m[i], p.ae_m));
  const zT = p.from.amsl_m;
  const zR = p.to.amsl_m;
  const ray = (d: number) => zT + ((zR - zT) * d) / D;
  // the transmitter's horizon: the terrain point of steepest elevation seen from it
  let hi = 1;
  for (let i = 1; i < n - 1; i++) if ((gb[i] - zT) / p.d_m[i] > (gb[hi] - zT) / p.d_m[hi]) hi = i;
  const slope = (gb[hi] - zT) / p.d_m[hi];
  const yBase = y.range()[0];
  const out: string[] = [];
  const titleId = `${p.id}-title`;
  const descId = `${p.id}-desc`;
  const vals = Object.values(p.methods).filter(Number.isFinite);
  const shadowed = slope > (zR - zT) / D;
  out.push(
    `<svg xmlns="http://www.w3.org/2000/svg" class="wave-field" viewBox="0 0 ${W} ${H}" width="${W}" height="${H}" role="img" aria-labelledby="${titleId} ${descId}">`,
    `<title id="${titleId}">${escapeXml(p.title)}</title>`,
    options.style ? `<style>${options.style}</style>` : "",
    `<desc id="${descId}">${escapeXml(
      `Colour image of the field strength relative to free space computed by the parabolic-equation wave solution over the path from ${p.from.name} to ${p.to.name} ` +
        `(${(D / 1000).toFixed(2)} km, k = ${p.k_label}); colours run from ${WAVE_FIGURE_DB.min} dB (dark) to +${WAVE_FIGURE_DB.max} dB (light). ` +
        `At the receiving antenna the field is ${Math.abs(p.excess_loss_db).toFixed(1)} dB ${p.excess_loss_db >= 0 ? "below" : "above"} free space` +
        (vals.length ? `; the five diffraction methods give losses from ${Math.min(...vals).toFixed(1)} to ${Math.max(...vals).toFixed(1)} dB. ` : ". ") +
        `The receiver is ${shadowed ? "inside" : "outside"} the geometrical shadow of the transmitter's horizon ${((p.d_m[hi] / 1000).toFixed(2))} km from ${p.from.name}. ` +
        `Overlays: terrain with Earth bulge, line of sight, first Fresnel zone, shadow boundary.`,
    )}</desc>`,
    `<defs><clipPath id="${p.id}-clip"><rect x="${m.left}" y="${m.top}" width="${W - m.left - m.right}" height="${H - m.top - m.bottom}" /></clipPath></defs>`,
    `<rect class="wave-sky" x="${m.left}" y="${m.top}" width="${W - m.left - m.right}" height="${H - m.top - m.bottom}" />`,
    `<image href="${imageHref}" x="${m.left}" y="${m.top}" width="${W - m.left - m.right}" height="${H - m.top - m.bottom}" preserveAspectRatio="none" />`,
    leftAxis(y, m.left, W - m.left - m.right, "Height (m above sea level, with Earth bulge)", (v) => String(v)),
    bottomAxis(x, yBase, "Distance (km)", (v) => fixed(v / 1000, D < 5000 ? 1 : 0)),
  );
  const g = [`<g clip-path="url(#${p.id}-clip)">`];
  const terrain = line<number>().x((i) => x(p.d_m[i])).y((i) => y(gb[i])).digits(1)(idx) ?? "";
  g.push(`<path class="wave-terrain" d="${terrain}L${px(x(D))},${px(yBase)}L${px(x(0))},${px(yBase)}Z" />`);
  const r1 = idx.map((i) => fresnelRadiusM(1, p.lambda_m, p.d_m[i], D - p.d_m[i]));
  for (const s of [1, -1]) g.push(`<path class="wave-fresnel" d="${line<number>().x((i) => x(p.d_m[i])).y((i) => y(ray(p.d_m[i]) + s * r1[i])).digits(1)(idx)}" />`);
  g.push(`<line class="wave-los" x1="${px(x(0))}" y1="${px(y(zT))}" x2="${px(x(D))}" y2="${px(y(zR))}" />`);
  g.push(`<line class="wave-shadow" x1="${px(x(0))}" y1="${px(y(zT))}" x2="${px(x(D))}" y2="${px(y(zT + slope * D))}" />`);
  g.push("</g>");
  out.push(g.join(""));
  for (const [d, z, name, anchor] of [
    [0, zT, p.from.name, "start"],
    [D, zR, p.to.name, "end"],
  ] as const) {
    out.push(`<circle class="wave-antenna" cx="${px(x(d))}" cy="${px(y(z))}" r="4" /><text class="halo" x="${px(x(d) + (anchor === "start" ? 8 : -8))}" y="${px(y(z) - 8)}" text-anchor="${anchor}">${escapeXml(name)}</text>`);
  }
  // legend of the overlays
  const legend: [string, string][] = [
    ["wave-los", "Line of sight"],
    ["wave-fresnel", "First Fresnel zone"],
    ["wave-shadow", "Shadow boundary (transmitter's horizon)"],
  ];
  let lx = m.left;
  for (const [cls, text] of legend) {
    out.push(`<line class="${cls}" x1="${lx}" x2="${lx + 22}" y1="14" y2="14" /><text x="${lx + 28}" y="14" dy="0.32em">${escapeXml(text)}</text>`);
    lx += 40 + text.length * 6.4;
  }
  // dB scale bar
  const bx = W - m.right + 30;
  const bw = 14;
  const sy = scaleLinear().domain([WAVE_FIGURE_DB.min, WAVE_FIGURE_DB.max]).range([H - m.bottom, m.top]);
  const stops = Array.from({ length: 11 }, (_, i) => `<stop offset="${i * 10}%" stop-color="${fieldColourCss(1 - i / 10)}" />`).join("");
  out.push(`<defs><linearGradient id="${p.id}-scale" x1="0" x2="0" y1="0" y2="1">${stops}</linearGradient></defs>`);
  out.push(`<g class="wave-scale"><rect x="${bx}" y="${m.top}" width="${bw}" height="${H - m.top - m.bottom}" fill="url(#${p.id}-scale)" />`);
  for (let v = WAVE_FIGURE_DB.min; v <= WAVE_FIGURE_DB.max; v += 10) {
    out.push(`<line x1="${bx + bw}" x2="${bx + bw + 4}" y1="${px(sy(v))}" y2="${px(sy(v))}" /><text x="${bx + bw + 6}" y="${px(sy(v))}" dy="0.32em">${v > 0 ? "+" : ""}${fixed(v, 0)}</text>`);
  }
  out.push(`<text class="axis-label" transform="translate(${bx - 6},${px((m.top + H - m.bottom) / 2)}) rotate(-90)" text-anchor="middle">dB relative to free space</text></g>`);
  out.push("</svg>");
  return out.join("");
}
