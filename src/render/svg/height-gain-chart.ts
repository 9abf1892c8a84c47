import { extent } from "d3-array";
import { scaleLinear } from "d3-scale";
import { line } from "d3-shape";
import { bottomAxis, leftAxis } from "./axes.ts";
import { escapeXml, px, svgId } from "./escape.ts";

export interface HeightGainInput {
  id: string;
  title: string;
  /** Receive-antenna height above ground (m) against level relative to free space (dB). */
  points: { rx_antenna_m: number; relative_db: number }[];
  /** The design antenna height (m), marked on the curve. */
  design_m: number;
  /** Name of the receiving end. */
  site: string;
  width?: number;
  height?: number;
}

/**
 * Height-gain figure as an SVG string: level relative to free space (dB, across) against the
 * receive-antenna height (m, up), a zero-dB reference line and the design height marked.
 * Points with a non-finite level are left out (the line breaks there).
 */
export function heightGainSvg(p: HeightGainInput): string {
  const W = p.width ?? 880;
  const H = p.height ?? 320;
  const m = { top: 16, right: 24, bottom: 48, left: 64 };
  const pts = p.points.filter((q) => Number.isFinite(q.rx_antenna_m));
  const levels = pts.map((q) => q.relative_db).filter(Number.isFinite);
  const [l0, l1] = extent([...levels, 0, 6]) as [number, number];
  const [h0, h1] = extent([...pts.map((q) => q.rx_antenna_m), p.design_m]) as [number, number];
  const x = scaleLinear().domain([Math.max(l0, -40), l1]).nice().range([m.left, W - m.right]);
  const y = scaleLinear().domain([h0, h1]).nice().range([H - m.bottom, m.top]);
  const d = line<{ rx_antenna_m: number; relative_db: number }>()
    .defined((q) => Number.isFinite(q.relative_db))
    .x((q) => x(Math.max(q.relative_db, x.domain()[0])))
    .y((q) => y(q.rx_antenna_m))
    .digits(1)(pts);
  const at = pts.reduce<{ rx_antenna_m: number; relative_db: number } | null>((best, q) => (best === null || Math.abs(q.rx_antenna_m - p.design_m) < Math.abs(best.rx_antenna_m - p.design_m) ? q : best), null);
  const pid = svgId(p.id);
  const titleId = `${pid}-title`;
  const descId = `${pid}-desc`;
  const lo = pts.filter((q) => Number.isFinite(q.relative_db)).reduce((a, q) => (q.relative_db < a.relative_db ? q : a), { rx_antenna_m: NaN, relative_db: Infinity });
  const out: string[] = [
    `<svg xmlns="http://www.w3.org/2000/svg" class="height-gain" viewBox="0 0 ${W} ${H}" width="${W}" height="${H}" role="img" aria-labelledby="${titleId} ${descId}">`,
    `<title id="${titleId}">${escapeXml(p.title)}</title>`,
    `<desc id="${descId}">${escapeXml(
      `Level relative to free space at ${p.site} for receive-antenna heights ${h0} to ${h1} m. ` +
        (at && Number.isFinite(at.relative_db) ? `At the design height ${p.design_m} m it is ${at.relative_db.toFixed(1)} dB. ` : "") +
        (Number.isFinite(lo.relative_db) ? `The deepest level, ${lo.relative_db.toFixed(1)} dB, is at ${lo.rx_antenna_m} m.` : ""),
    )}</desc>`,
    leftAxis(y, m.left, W - m.left - m.right, "Receive antenna height (m)", (v) => String(v)),
    bottomAxis(x, H - m.bottom, "Level relative to free space (dB)", (v) => (v < 0 ? `−${-v}` : String(v))),
    `<line class="zero-db" x1="${px(x(0))}" x2="${px(x(0))}" y1="${m.top}" y2="${H - m.bottom}" />`,
    `<path class="hg-line" d="${d ?? ""}" />`,
    `<g class="hg-points">${pts
      .filter((q) => Number.isFinite(q.relative_db))
      .map((q) => `<circle cx="${px(x(Math.max(q.relative_db, x.domain()[0])))}" cy="${px(y(q.rx_antenna_m))}" r="2.2" />`)
      .join("")}</g>`,
  ];
  const yd = y(p.design_m);
  out.push(`<line class="design-height" x1="${m.left}" x2="${W - m.right}" y1="${px(yd)}" y2="${px(yd)}" />`);
  const label = `design height ${p.design_m} m${at && Number.isFinite(at.relative_db) ? `: ${at.relative_db >= 0 ? "+" : "−"}${Math.abs(at.relative_db).toFixed(1)} dB` : ""}`;
  out.push(`<text class="design-label halo" x="${W - m.right - 6}" y="${px(yd - 5)}" text-anchor="end">${escapeXml(label)}</text>`);
  if (at && Number.isFinite(at.relative_db)) out.push(`<circle class="design-point" cx="${px(x(at.relative_db))}" cy="${px(yd)}" r="4.5" />`);
  out.push("</svg>");
  return out.join("");
}
