import type { ScaleLinear } from "d3-scale";
import { escapeXml, px } from "./escape.ts";

/** A bottom axis with ticks and a label, as an SVG string. */
export function bottomAxis(x: ScaleLinear<number, number>, y0: number, label: string, format: (v: number) => string, ticks = 8): string {
  const [r0, r1] = x.range();
  const parts = [`<g class="axis axis-x"><line x1="${px(r0)}" x2="${px(r1)}" y1="${px(y0)}" y2="${px(y0)}" />`];
  for (const t of x.ticks(ticks)) {
    const xx = px(x(t));
    parts.push(`<line x1="${xx}" x2="${xx}" y1="${px(y0)}" y2="${px(y0 + 5)}" /><text x="${xx}" y="${px(y0 + 17)}" text-anchor="middle">${escapeXml(format(t))}</text>`);
  }
  parts.push(`<text class="axis-label" x="${px((r0 + r1) / 2)}" y="${px(y0 + 34)}" text-anchor="middle">${escapeXml(label)}</text></g>`);
  return parts.join("");
}

/** A left axis with ticks, light grid lines across `width`, and a rotated label. */
export function leftAxis(y: ScaleLinear<number, number>, x0: number, width: number, label: string, format: (v: number) => string, ticks = 6): string {
  const [r0, r1] = y.range();
  const parts = [`<g class="axis axis-y"><line x1="${px(x0)}" x2="${px(x0)}" y1="${px(r0)}" y2="${px(r1)}" />`];
  for (const t of y.ticks(ticks)) {
    const yy = px(y(t));
    parts.push(
      `<line class="grid" x1="${px(x0)}" x2="${px(x0 + width)}" y1="${yy}" y2="${yy}" /><line x1="${px(x0 - 5)}" x2="${px(x0)}" y1="${yy}" y2="${yy}" /><text x="${px(x0 - 8)}" y="${yy}" dy="0.32em" text-anchor="end">${escapeXml(format(t))}</text>`,
    );
  }
  const cy = (r0 + r1) / 2;
  parts.push(`<text class="axis-label" transform="translate(${px(x0 - 46)},${px(cy)}) rotate(-90)" text-anchor="middle">${escapeXml(label)}</text></g>`);
  return parts.join("");
}
