import { scaleLinear, type ScaleLinear } from "d3-scale";
import { line } from "d3-shape";
import { bottomAxis, leftAxis } from "./axes.ts";
import { escapeXml, px, svgId } from "./escape.ts";

/** One height-gain curve: receive-antenna heights above ground (m) and the level relative to free space at each (dB). */
export interface HeightGainSeries {
  rx_antenna_m: ArrayLike<number>;
  relative_db: ArrayLike<number>;
}

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

export interface WaveHeightGainInput {
  id: string;
  title: string;
  /** height-gain from the wave solution and from the two-ray model */
  wave: HeightGainSeries;
  twoRay: HeightGainSeries;
  design_m: number;
  site: string;
  width?: number;
  height?: number;
}

type Margins = { top: number; right: number; bottom: number; left: number };

/** Scales, axes and the zero-dB line shared by the height-gain figures. */
interface Frame {
  x: ScaleLinear<number, number>;
  y: ScaleLinear<number, number>;
  /** the axes and the zero-dB reference line, as SVG */
  svg: string;
  /** the SVG path of one curve; the line breaks at non-finite levels, levels below the axis sit on it */
  path: (s: HeightGainSeries) => string;
  /** lowest and highest height drawn (m), before rounding */
  heights: [number, number];
}

/**
 * The frame of a height-gain figure: level across (at least `levels`, never below −40 dB),
 * height up (the curves' heights and the design height), both rounded to nice ends.
 */
function heightGainFrame(W: number, H: number, m: Margins, series: HeightGainSeries[], levels: [number, number], design_m: number): Frame {
  let [l0, l1] = levels;
  let h0 = design_m;
  let h1 = design_m;
  for (const s of series) {
    for (let i = 0; i < s.rx_antenna_m.length; i++) {
      const h = s.rx_antenna_m[i];
      const v = s.relative_db[i];
      if (!Number.isFinite(h) || !Number.isFinite(v)) continue;
      h0 = Math.min(h0, h);
      h1 = Math.max(h1, h);
      l0 = Math.min(l0, v);
      l1 = Math.max(l1, v);
    }
  }
  const x = scaleLinear().domain([Math.max(l0, -40), l1]).nice().range([m.left, W - m.right]);
  const y = scaleLinear().domain([h0, h1]).nice().range([H - m.bottom, m.top]);
  const svg =
    leftAxis(y, m.left, W - m.left - m.right, "Receive antenna height (m)", (v) => String(v)) +
    bottomAxis(x, H - m.bottom, "Level relative to free space (dB)", (v) => (v < 0 ? `−${-v}` : String(v))) +
    `<line class="zero-db" x1="${px(x(0))}" x2="${px(x(0))}" y1="${m.top}" y2="${H - m.bottom}" />`;
  const path = (s: HeightGainSeries) =>
    line<number>()
      .defined((i) => Number.isFinite(s.relative_db[i]) && Number.isFinite(s.rx_antenna_m[i]))
      .x((i) => x(Math.max(s.relative_db[i], x.domain()[0])))
      .y((i) => y(s.rx_antenna_m[i]))
      .digits(1)(Array.from({ length: s.rx_antenna_m.length }, (_, i) => i)) ?? "";
  return { x, y, svg, path, heights: [h0, h1] };
}

/** The level at the height nearest the design height (the first of equals), NaN for an empty curve. */
function levelAtDesign(s: HeightGainSeries, design_m: number): { rx_antenna_m: number; relative_db: number } {
  let best = -1;
  for (let i = 0; i < s.rx_antenna_m.length; i++) {
    if (!Number.isFinite(s.rx_antenna_m[i])) continue;
    if (best < 0 || Math.abs(s.rx_antenna_m[i] - design_m) < Math.abs(s.rx_antenna_m[best] - design_m)) best = i;
  }
  return best < 0 ? { rx_antenna_m: NaN, relative_db: NaN } : { rx_antenna_m: s.rx_antenna_m[best], relative_db: s.relative_db[best] };
}

const signedDb = (v: number) => `${v >= 0 ? "+" : "−"}${Math.abs(v).toFixed(1)} dB`;

/**
 * Height-gain figure as an SVG string: level relative to free space (dB, across) against the
 * receive-antenna height (m, up), a zero-dB reference line and the design height marked.
 * Points with a non-finite level are left out (the line breaks there).
 */
export function heightGainSvg(p: HeightGainInput): string {
  const W = p.width ?? 880;
  const H = p.height ?? 320;
  const pts = p.points.filter((q) => Number.isFinite(q.rx_antenna_m));
  const s: HeightGainSeries = { rx_antenna_m: pts.map((q) => q.rx_antenna_m), relative_db: pts.map((q) => q.relative_db) };
  const m = { top: 16, right: 24, bottom: 48, left: 64 };
  const { x, y, svg, path, heights } = heightGainFrame(W, H, m, [s], [0, 6], p.design_m);
  const [h0, h1] = heights;
  const at = levelAtDesign(s, p.design_m);
  const pid = svgId(p.id);
  const lo = pts.filter((q) => Number.isFinite(q.relative_db)).reduce((a, q) => (q.relative_db < a.relative_db ? q : a), { rx_antenna_m: NaN, relative_db: Infinity });
  const yd = y(p.design_m);
  const label = `design height ${p.design_m} m${Number.isFinite(at.relative_db) ? `: ${signedDb(at.relative_db)}` : ""}`;
  return [
    `<svg xmlns="http://www.w3.org/2000/svg" class="height-gain" viewBox="0 0 ${W} ${H}" width="${W}" height="${H}" role="img" aria-labelledby="${pid}-title ${pid}-desc">`,
    `<title id="${pid}-title">${escapeXml(p.title)}</title>`,
    `<desc id="${pid}-desc">${escapeXml(
      `Level relative to free space at ${p.site} for receive-antenna heights ${h0} to ${h1} m. ` +
        (Number.isFinite(at.relative_db) ? `At the design height ${p.design_m} m it is ${at.relative_db.toFixed(1)} dB. ` : "") +
        (Number.isFinite(lo.relative_db) ? `The deepest level, ${lo.relative_db.toFixed(1)} dB, is at ${lo.rx_antenna_m} m.` : ""),
    )}</desc>`,
    svg,
    `<path class="hg-line" d="${path(s)}" />`,
    `<g class="hg-points">${pts
      .filter((q) => Number.isFinite(q.relative_db))
      .map((q) => `<circle cx="${px(x(Math.max(q.relative_db, x.domain()[0])))}" cy="${px(y(q.rx_antenna_m))}" r="2.2" />`)
      .join("")}</g>`,
    `<line class="design-height" x1="${m.left}" x2="${W - m.right}" y1="${px(yd)}" y2="${px(yd)}" />`,
    `<text class="design-label halo" x="${W - m.right - 6}" y="${px(yd - 5)}" text-anchor="end">${escapeXml(label)}</text>`,
    Number.isFinite(at.relative_db) ? `<circle class="design-point" cx="${px(x(at.relative_db))}" cy="${px(yd)}" r="4.5" />` : "",
    "</svg>",
  ].join("");
}

/**
 * The receiver's height-gain curve from the wave solution beside the two-ray one, as an SVG
 * string: level relative to free space (dB, across) against antenna height (m, up).
 */
export function waveHeightGainSvg(p: WaveHeightGainInput): string {
  const W = p.width ?? 880;
  const H = p.height ?? 320;
  const m = { top: 30, right: 24, bottom: 48, left: 64 };
  const { y, svg, path } = heightGainFrame(W, H, m, [p.wave, p.twoRay], [-10, 6], p.design_m);
  const fmt = (v: number) => (Number.isFinite(v) ? signedDb(v) : "not computed");
  const pid = svgId(p.id);
  return [
    `<svg xmlns="http://www.w3.org/2000/svg" class="height-gain wave-height-gain" viewBox="0 0 ${W} ${H}" width="${W}" height="${H}" role="img" aria-labelledby="${pid}-title ${pid}-desc">`,
    `<title id="${pid}-title">${escapeXml(p.title)}</title>`,
    `<desc id="${pid}-desc">${escapeXml(`Level relative to free space at ${p.site} against receive-antenna height, from the wave solution and from the two-ray model. At the design height ${p.design_m} m: wave solution ${fmt(levelAtDesign(p.wave, p.design_m).relative_db)}, two-ray ${fmt(levelAtDesign(p.twoRay, p.design_m).relative_db)}.`)}</desc>`,
    svg,
    `<path class="hg-two-ray" d="${path(p.twoRay)}" />`,
    `<path class="hg-wave" d="${path(p.wave)}" />`,
    `<line class="design-height" x1="${m.left}" x2="${W - m.right}" y1="${px(y(p.design_m))}" y2="${px(y(p.design_m))}" />`,
    `<line class="hg-wave" x1="${m.left}" x2="${m.left + 22}" y1="14" y2="14" /><text x="${m.left + 28}" y="14" dy="0.32em">Wave solution</text>`,
    `<line class="hg-two-ray" x1="${m.left + 150}" x2="${m.left + 172}" y1="14" y2="14" /><text x="${m.left + 178}" y="14" dy="0.32em">Two-ray (dominant reflection)</text>`,
    `<text class="design-label halo" x="${W - m.right - 6}" y="${px(y(p.design_m) - 5)}" text-anchor="end">${escapeXml(`design height ${p.design_m} m`)}</text>`,
    "</svg>",
  ].join("");
}
