import type { ScaleLinear } from "d3-scale";
import { scaleLinear, scaleLog } from "d3-scale";
import { line, curveStepAfter } from "d3-shape";
import { bottomAxis, leftAxis } from "./axes.ts";
import { escapeXml, px } from "./escape.ts";

export interface SeriesChartInput {
  id: string;
  title: string;
  /** Text for screen readers: what the figure shows and its key values. */
  desc: string;
  xLabel: string;
  yLabel: string;
  points: { x: number; y: number }[];
  /** Logarithmic axes (decades labelled). */
  logX?: boolean;
  logY?: boolean;
  /** Draw the series as steps (held until the next point) instead of a line. */
  steps?: boolean;
  /** A marked point (the study's design value) with its label. */
  marker?: { x: number; y: number; label: string } | null;
  /** A vertical reference line (a target) with its label. */
  reference?: { x: number; label: string } | null;
  xFormat?: (v: number) => string;
  yFormat?: (v: number) => string;
  width?: number;
  height?: number;
}

const minus = (v: number) => (v < 0 ? `−${-v}` : String(v));

/** A logarithmic scale that offers its decades as ticks, shaped for the axis helpers. */
function logScale(domain: [number, number], range: [number, number]): ScaleLinear<number, number> {
  const lo = Math.floor(Math.log10(domain[0]));
  const hi = Math.ceil(Math.log10(domain[1]));
  const s = scaleLog().domain([10 ** lo, 10 ** hi]).range(range);
  const decades = Array.from({ length: hi - lo + 1 }, (_, i) => 10 ** (lo + i));
  const axis = Object.assign((v: number) => s(v), { range: () => s.range(), domain: () => s.domain(), ticks: () => decades });
  return axis as unknown as ScaleLinear<number, number>;
}

/**
 * One series as an SVG string: a line (or steps) over linear or logarithmic axes, with an
 * optional marked point and vertical reference line. Non-finite points are left out.
 */
export function seriesChartSvg(p: SeriesChartInput): string {
  const W = p.width ?? 880;
  const H = p.height ?? 300;
  const m = { top: 16, right: 24, bottom: 48, left: 72 };
  const pts = p.points.filter((q) => Number.isFinite(q.x) && Number.isFinite(q.y) && (!p.logX || q.x > 0) && (!p.logY || q.y > 0));
  const xs = [...pts.map((q) => q.x), ...(p.marker ? [p.marker.x] : []), ...(p.reference ? [p.reference.x] : [])];
  const ys = [...pts.map((q) => q.y), ...(p.marker ? [p.marker.y] : [])];
  const ext = (v: number[]): [number, number] => (v.length ? [Math.min(...v), Math.max(...v)] : [0, 1]);
  const [x0, x1] = ext(xs);
  const [y0, y1] = ext(ys);
  const x = p.logX ? logScale([x0, x1 > x0 ? x1 : x0 * 10], [m.left, W - m.right]) : scaleLinear().domain([x0, x1 > x0 ? x1 : x0 + 1]).nice().range([m.left, W - m.right]);
  const y = p.logY ? logScale([y0, y1 > y0 ? y1 : y0 * 10], [H - m.bottom, m.top]) : scaleLinear().domain([Math.min(0, y0), y1 > y0 ? y1 : y0 + 1]).nice().range([H - m.bottom, m.top]);
  const fx = p.xFormat ?? minus;
  const fy = p.yFormat ?? minus;
  const shape = line<{ x: number; y: number }>()
    .x((q) => x(q.x))
    .y((q) => y(q.y))
    .digits(1);
  const d = (p.steps ? shape.curve(curveStepAfter) : shape)(pts);
  const titleId = `${p.id}-title`;
  const descId = `${p.id}-desc`;
  const out = [
    `<svg xmlns="http://www.w3.org/2000/svg" class="series-chart" viewBox="0 0 ${W} ${H}" width="${W}" height="${H}" role="img" aria-labelledby="${titleId} ${descId}">`,
    `<title id="${titleId}">${escapeXml(p.title)}</title>`,
    `<desc id="${descId}">${escapeXml(p.desc)}</desc>`,
    leftAxis(y, m.left, W - m.left - m.right, p.yLabel, fy),
    bottomAxis(x, H - m.bottom, p.xLabel, fx),
    `<path class="hg-line series-line" d="${d ?? ""}" />`,
    `<g class="hg-points">${pts.map((q) => `<circle cx="${px(x(q.x))}" cy="${px(y(q.y))}" r="2.2" />`).join("")}</g>`,
  ];
  if (p.reference) {
    const rx = px(x(p.reference.x));
    out.push(`<line class="design-height" x1="${rx}" x2="${rx}" y1="${m.top}" y2="${H - m.bottom}" />`, `<text class="design-label halo" x="${px(x(p.reference.x) + 4)}" y="${m.top + 12}">${escapeXml(p.reference.label)}</text>`);
  }
  if (p.marker) {
    out.push(`<circle class="design-point" cx="${px(x(p.marker.x))}" cy="${px(y(p.marker.y))}" r="4.5" />`, `<text class="design-label halo" x="${px(x(p.marker.x) + 8)}" y="${px(y(p.marker.y) - 8)}">${escapeXml(p.marker.label)}</text>`);
  }
  out.push("</svg>");
  return out.join("");
}
