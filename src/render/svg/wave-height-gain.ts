import { scaleLinear } from "d3-scale";
import { line } from "d3-shape";
import { bottomAxis, leftAxis } from "./axes.ts";
import { escapeXml, px } from "./escape.ts";

type Series = { rx_antenna_m: ArrayLike<number>; relative_db: ArrayLike<number> };

export interface WaveHeightGainInput {
  id: string;
  title: string;
  /** height-gain from the wave solution and from the two-ray model (m above ground, dB) */
  wave: Series;
  twoRay: Series;
  design_m: number;
  site: string;
  width?: number;
  height?: number;
}

/**
 * The receiver's height-gain curve from the wave solution beside the two-ray one, as an SVG
 * string: level relative to free space (dB, across) against antenna height (m, up).
 */
export function waveHeightGainSvg(p: WaveHeightGainInput): string {
  const W = p.width ?? 880;
  const H = p.height ?? 320;
  const m = { top: 30, right: 24, bottom: 48, left: 64 };
  const all = [p.wave, p.twoRay];
  let l0 = -10;
  let l1 = 6;
  let h0 = p.design_m;
  let h1 = p.design_m;
  for (const s of all) {
    for (let i = 0; i < s.rx_antenna_m.length; i++) {
      if (!Number.isFinite(s.relative_db[i])) continue;
      l0 = Math.min(l0, s.relative_db[i]);
      l1 = Math.max(l1, s.relative_db[i]);
      h0 = Math.min(h0, s.rx_antenna_m[i]);
      h1 = Math.max(h1, s.rx_antenna_m[i]);
    }
  }
  const x = scaleLinear().domain([Math.max(l0, -40), l1]).nice().range([m.left, W - m.right]);
  const y = scaleLinear().domain([h0, h1]).nice().range([H - m.bottom, m.top]);
  const path = (s: Series) =>
    line<number>()
      .defined((i) => Number.isFinite(s.relative_db[i]))
      .x((i) => x(Math.max(s.relative_db[i], x.domain()[0])))
      .y((i) => y(s.rx_antenna_m[i]))
      .digits(1)(Array.from({ length: s.rx_antenna_m.length }, (_, i) => i)) ?? "";
  const at = (s: Series) => {
    let best = -1;
    for (let i = 0; i < s.rx_antenna_m.length; i++) if (best < 0 || Math.abs(s.rx_antenna_m[i] - p.design_m) < Math.abs(s.rx_antenna_m[best] - p.design_m)) best = i;
    return best < 0 ? NaN : s.relative_db[best];
  };
  const fmt = (v: number) => (Number.isFinite(v) ? `${v >= 0 ? "+" : "−"}${Math.abs(v).toFixed(1)} dB` : "not computed");
  const titleId = `${p.id}-title`;
  const descId = `${p.id}-desc`;
  return [
    `<svg xmlns="http://www.w3.org/2000/svg" class="height-gain wave-height-gain" viewBox="0 0 ${W} ${H}" width="${W}" height="${H}" role="img" aria-labelledby="${titleId} ${descId}">`,
    `<title id="${titleId}">${escapeXml(p.title)}</title>`,
    `<desc id="${descId}">${escapeXml(`Level relative to free space at ${p.site} against receive-antenna height, from the wave solution and from the two-ray model. At the design height ${p.design_m} m: wave solution ${fmt(at(p.wave))}, two-ray ${fmt(at(p.twoRay))}.`)}</desc>`,
    leftAxis(y, m.left, W - m.left - m.right, "Receive antenna height (m)", (v) => String(v)),
    bottomAxis(x, H - m.bottom, "Level relative to free space (dB)", (v) => (v < 0 ? `−${-v}` : String(v))),
    `<line class="zero-db" x1="${px(x(0))}" x2="${px(x(0))}" y1="${m.top}" y2="${H - m.bottom}" />`,
    `<path class="hg-two-ray" d="${path(p.twoRay)}" />`,
    `<path class="hg-wave" d="${path(p.wave)}" />`,
    `<line class="design-height" x1="${m.left}" x2="${W - m.right}" y1="${px(y(p.design_m))}" y2="${px(y(p.design_m))}" />`,
    `<line class="hg-wave" x1="${m.left}" x2="${m.left + 22}" y1="14" y2="14" /><text x="${m.left + 28}" y="14" dy="0.32em">Wave solution</text>`,
    `<line class="hg-two-ray" x1="${m.left + 150}" x2="${m.left + 172}" y1="14" y2="14" /><text x="${m.left + 178}" y="14" dy="0.32em">Two-ray (dominant reflection)</text>`,
    `<text class="design-label halo" x="${W - m.right - 6}" y="${px(y(p.design_m) - 5)}" text-anchor="end">${escapeXml(`design height ${p.design_m} m`)}</text>`,
    "</svg>",
  ].join("");
}
