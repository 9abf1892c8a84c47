import { scaleLinear } from "d3-scale";
import { line } from "d3-shape";
import { formatNumber } from "../../format/quantity.ts";
import { freeSpaceLossDb } from "../../physics/free-space-loss.ts";
import { escapeXml, px } from "./escape.ts";

/** One radial of a coverage's wave check, as the figure needs it (losses in dB, distances in km). */
export interface WaveCheckPanel {
  azimuth_deg: number;
  length_km: number;
  status: "ok" | "refused";
  d_km: number[];
  wave_db: number[];
  method_db: number[];
}

export interface WaveCheckFigureInput {
  id: string;
  title: string;
  /** the method's name as the legend shows it */
  method: string;
  frequency_ghz: number;
  radius_km: number;
  radials: WaveCheckPanel[];
  /** overall statistics for the text alternative (dB) */
  overall: { points: number; mean_db: number | null; rms_db: number | null; max_abs_db: number | null };
  width?: number;
}

/** Loss relative to free space is drawn from 0 down to this (dB); deeper values are clipped at the panel's edge. */
const MAX_EXCESS_DB = 100;

const compass = (az: number): string => ["N", "NE", "E", "SE", "S", "SW", "W", "NW"][Math.round(az / 45) % 8] ?? "";

/**
 * Small multiples, one panel per radial of a coverage's wave check: the loss relative to free
 * space (dB, increasing downwards) against distance (km), the wave solution as a line and the
 * method as dots, on shared axes so the panels compare. An SVG string with a title and a text
 * alternative summarising the differences.
 */
export function waveCheckFigureSvg(p: WaveCheckFigureInput): string {
  const n = p.radials.length;
  const cols = Math.min(4, Math.max(1, n));
  const rowsN = Math.ceil(n / cols);
  const W = p.width ?? 880;
  const m = { top: 34, right: 12, bottom: 40, left: 58 };
  const gap = { x: 14, y: 30 };
  const pw = (W - m.left - m.right - gap.x * (cols - 1)) / cols;
  const ph = 130;
  const H = m.top + m.bottom + rowsN * ph + (rowsN - 1) * gap.y;
  const excess = (r: WaveCheckPanel, v: number[]) => v.map((L, i) => L - freeSpaceLossDb(r.d_km[i] * 1000, p.frequency_ghz));
  let top = 0;
  for (const r of p.radials) for (const v of [...excess(r, r.wave_db), ...excess(r, r.method_db)]) if (Number.isFinite(v)) top = Math.max(top, v);
  const yMax = Math.min(MAX_EXCESS_DB, Math.ceil(Math.max(top, 10) / 10) * 10);
  const yMin = -10;
  const titleId = `${p.id}-title`;
  const descId = `${p.id}-desc`;
  const f1 = (v: number | null) => formatNumber(v, 1);
  const desc =
    `Loss relative to free space along ${n} radials from the site, every ${formatNumber(360 / Math.max(1, n), 0)}° from north, out to ${formatNumber(p.radius_km, 1)} km: the wave solution as a line, ${p.method} as dots. ` +
    (p.overall.points > 0 ? `Over ${p.overall.points} points the method's loss minus the wave solution's is ${f1(p.overall.mean_db)} dB on average, ${f1(p.overall.rms_db)} dB RMS, at most ${f1(p.overall.max_abs_db)} dB in magnitude.` : "No point could be compared.");
  const out = [
    `<svg xmlns="http://www.w3.org/2000/svg" class="wave-check" viewBox="0 0 ${W} ${px(H)}" width="${W}" height="${px(H)}" role="img" aria-labelledby="${titleId} ${descId}">`,
    `<title id="${titleId}">${escapeXml(p.title)}</title>`,
    `<desc id="${descId}">${escapeXml(desc)}</desc>`,
    `<g class="wave-check-legend"><line class="wc-wave" x1="${m.left}" x2="${m.left + 24}" y1="14" y2="14" /><text x="${m.left + 30}" y="14" dy="0.32em">Wave solution</text>`,
    `<circle class="wc-method" cx="${m.left + 150}" cy="14" r="2.6" /><text x="${m.left + 158}" y="14" dy="0.32em">${escapeXml(p.method)}</text></g>`,
  ];
  p.radials.forEach((r, k) => {
    const c = k % cols;
    const row = Math.floor(k / cols);
    const x0 = m.left + c * (pw + gap.x);
    const y0 = m.top + row * (ph + gap.y);
    const x = scaleLinear().domain([0, p.radius_km]).nice(4).range([x0, x0 + pw]);
    const y = scaleLinear().domain([yMin, yMax]).range([y0, y0 + ph]);
    const cy = (v: number) => y(Math.max(yMin, Math.min(yMax, v)));
    const clip = `${p.id}-clip-${k}`;
    out.push(`<g class="wc-panel"><clipPath id="${clip}"><rect x="${px(x0)}" y="${px(y0)}" width="${px(pw)}" height="${ph}" /></clipPath>`);
    out.push(`<rect class="wc-frame" x="${px(x0)}" y="${px(y0)}" width="${px(pw)}" height="${ph}" />`);
    for (const t of y.ticks(5)) {
      out.push(`<line class="grid" x1="${px(x0)}" x2="${px(x0 + pw)}" y1="${px(y(t))}" y2="${px(y(t))}" />`);
      if (c === 0) out.push(`<text class="wc-tick" x="${px(x0 - 5)}" y="${px(y(t))}" dy="0.32em" text-anchor="end">${escapeXml(formatNumber(t, 0))}</text>`);
    }
    for (const t of x.ticks(4)) out.push(`<text class="wc-tick" x="${px(x(t))}" y="${px(y0 + ph + 13)}" text-anchor="middle">${escapeXml(formatNumber(t, 0))}</text>`);
    out.push(`<text class="wc-panel-title" x="${px(x0 + 4)}" y="${px(y0 - 5)}">${escapeXml(`${formatNumber(r.azimuth_deg, 0)}° ${compass(r.azimuth_deg)}`)}${r.status === "refused" ? " — not computed" : ""}</text>`);
    const w = excess(r, r.wave_db);
    const mm = excess(r, r.method_db);
    const idx = r.d_km.map((_, i) => i);
    const path =
      line<number>()
        .defined((i) => Number.isFinite(w[i]))
        .x((i) => x(r.d_km[i]))
        .y((i) => y(w[i]))
        .digits(1)(idx) ?? "";
    out.push(`<path class="wc-wave" clip-path="url(#${clip})" d="${path}" />`);
    out.push(`<g class="wc-method">${idx.filter((i) => Number.isFinite(mm[i])).map((i) => `<circle cx="${px(x(r.d_km[i]))}" cy="${px(cy(mm[i]))}" r="2.2" />`).join("")}</g></g>`);
  });
  out.push(`<text class="axis-label" x="${px(W / 2)}" y="${px(H - 8)}" text-anchor="middle">Distance from the site (km)</text>`);
  out.push(`<text class="axis-label" transform="translate(14,${px(m.top + (H - m.top - m.bottom) / 2)}) rotate(-90)" text-anchor="middle">Loss relative to free space (dB)</text>`);
  out.push("</svg>");
  return out.join("");
}
