import { scaleLinear } from "d3-scale";
import { area, line } from "d3-shape";
import { polylinePath } from "./polyline-path.ts";
import { earthBulgeM } from "../../physics/earth-bulge.ts";
import { fresnelRadiusM } from "../../physics/fresnel-radius.ts";
import { bottomAxis, leftAxis } from "./axes.ts";
import { escapeXml, px, svgId } from "./escape.ts";
import { fixed } from "../../format/quantity.ts";
import { placeLabel, textWidthPx, type Box, type Polyline } from "./label-placement.ts";

export interface ProfilePlotInput {
  /** Used for element ids; must be unique on the page. */
  id: string;
  title: string;
  d_m: ArrayLike<number>;
  terrain_m: ArrayLike<number>;
  obstruction_m: ArrayLike<number>;
  /** Ground (m amsl) and antenna height above ground (m) at the two ends. */
  from: { name: string; ground_m: number; antenna_m: number };
  to: { name: string; ground_m: number; antenna_m: number };
  lambda_m: number;
  /** Effective Earth radius per k; the first is drawn filled, the others as lines. */
  ks: { label: string; ae_m: number; worst?: { at_distance_m: number; clearance_f1: number } }[];
  /** Specular reflection points to mark (m from the from-end); label is the point's tooltip. */
  reflections?: { at_distance_m: number; label: string }[];
  /** Legend text for the reflection markers, e.g. "Reflection point (k = 4/3)". */
  reflectionLegend?: string;
  width?: number;
  height?: number;
}

const K_STYLES = ["k-primary", "k-second", "k-third", "k-fourth"];

/**
 * Path-profile plot as an SVG string: terrain plus Earth bulge at each k (so the ray is a
 * straight line), obstructions, antenna masts, the ray, the first Fresnel zone and its 0.6
 * fraction, the worst-clearance point at each k and any reflection points.
 */
export function profilePlotSvg(p: ProfilePlotInput): string {
  const W = p.width ?? 880;
  const H = p.height ?? 380;
  const refl = p.reflections ?? [];
  const legend = legendLayout(
    [
      ["ray", "Line of sight"],
      ["fresnel f1", "First Fresnel zone"],
      ["fresnel f06", "0.6 × first Fresnel radius"],
      ...p.ks.map((k, j): [string, string] => [j === 0 ? "terrain-swatch" : `terrain-line ${K_STYLES[j % K_STYLES.length]}`, `Terrain + bulge, k = ${k.label}`]),
      ...(refl.length ? [["reflection", p.reflectionLegend ?? "Reflection point"] as [string, string]] : []),
      ...(p.ks[0]?.worst && p.ks[0].worst.clearance_f1 < 0 ? [["blocked-swatch", `Obstructs the line of sight at k = ${p.ks[0].label}`] as [string, string]] : []),
    ],
    72,
    (p.width ?? 880) - 96,
  );
  const m = { top: 18 + legend.rows * 16, right: 24, bottom: 48, left: 64 };
  const n = p.d_m.length;
  const D = p.d_m[n - 1];
  const hts = p.from.ground_m + p.from.antenna_m;
  const hrs = p.to.ground_m + p.to.antenna_m;
  const ray = (d: number) => hts + ((hrs - hts) * d) / D;
  const idx = Array.from({ length: n }, (_, i) => i);
  const bulged = p.ks.map((k) => idx.map((i) => p.terrain_m[i] + earthBulgeM(p.d_m[i], D - p.d_m[i], k.ae_m)));
  const r1 = idx.map((i) => fresnelRadiusM(1, p.lambda_m, p.d_m[i], D - p.d_m[i]));
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < n; i++) {
    for (const b of bulged) {
      lo = Math.min(lo, p.terrain_m[i]);
      hi = Math.max(hi, b[i] + p.obstruction_m[i]);
    }
    hi = Math.max(hi, ray(p.d_m[i]) + r1[i]);
    lo = Math.min(lo, ray(p.d_m[i]) - r1[i]);
  }
  const pad = (hi - lo) * 0.06 || 10;
  const x = scaleLinear().domain([0, D]).range([m.left, W - m.right]);
  const y = scaleLinear().domain([lo - pad, hi + pad]).nice().range([H - m.bottom, m.top]);
  const yBase = y.range()[0];
  // each sample's x in pixels, once: every path and polyline below reads it
  const xs = Float64Array.from(idx, (i) => x(p.d_m[i]));
  const pts = (f: (i: number) => number) => polylinePath(xs, Float64Array.from(idx, (i) => y(f(i)))) ?? "";
  const out: string[] = [];
  const pid = svgId(p.id);
  const titleId = `${pid}-title`;
  const descId = `${pid}-desc`;
  out.push(
    `<svg xmlns="http://www.w3.org/2000/svg" class="profile-plot" viewBox="0 0 ${W} ${H}" width="${W}" height="${H}" role="img" aria-labelledby="${titleId} ${descId}">`,
    `<title id="${titleId}">${escapeXml(p.title)}</title>`,
    `<desc id="${descId}">${escapeXml(
      `Path profile from ${p.from.name} (antenna ${p.from.antenna_m} m above ground) to ${p.to.name} (antenna ${p.to.antenna_m} m), ${(D / 1000).toFixed(2)} km. ` +
        p.ks.map((k) => (k.worst ? `At k = ${k.label} the least clearance is ${k.worst.clearance_f1.toFixed(2)} of the first Fresnel radius at ${(k.worst.at_distance_m / 1000).toFixed(2)} km.` : "")).join(" "),
    )}</desc>`,
    leftAxis(y, m.left, W - m.left - m.right, "Height above mean sea level (m)", (v) => String(v)),
    bottomAxis(x, yBase, "Distance (km)", (v) => (v / 1000).toString()),
  );
  // Terrain at the first k, filled; obstructions on top of it.
  const b0 = bulged[0];
  out.push(`<path class="terrain ${K_STYLES[0]}" d="${area<number>().x((i) => xs[i]).y0(yBase).y1((i) => y(b0[i])).digits(1)(idx)}" />`);
  if (Array.from(p.obstruction_m).some((o) => o > 0)) {
    out.push(`<path class="obstruction" d="${area<number>().defined((i) => p.obstruction_m[i] > 0).x((i) => xs[i]).y0((i) => y(b0[i])).y1((i) => y(b0[i] + p.obstruction_m[i])).digits(1)(idx)}" />`);
  }
  for (let j = 1; j < bulged.length; j++) out.push(`<path class="terrain-line ${K_STYLES[j % K_STYLES.length]}" d="${pts((i) => bulged[j][i])}" />`);
  // Fresnel envelopes and the ray.
  out.push(`<path class="fresnel f1" d="${pts((i) => ray(p.d_m[i]) + r1[i])}" />`);
  out.push(`<path class="fresnel f1" d="${pts((i) => ray(p.d_m[i]) - r1[i])}" />`);
  out.push(`<path class="fresnel f06" d="${pts((i) => ray(p.d_m[i]) - 0.6 * r1[i])}" />`);
  out.push(`<line class="ray" x1="${px(x(0))}" y1="${px(y(hts))}" x2="${px(x(D))}" y2="${px(y(hrs))}" />`);
  // Masts.
  const mastLabels: Box[] = [];
  for (const [end, d, anchor, dx] of [
    [p.from, 0, "start", 6],
    [p.to, D, "end", -6],
  ] as const) {
    const top = end.ground_m + end.antenna_m;
    out.push(
      `<line class="mast" x1="${px(x(d))}" x2="${px(x(d))}" y1="${px(y(end.ground_m))}" y2="${px(y(top))}" /><circle class="antenna" cx="${px(x(d))}" cy="${px(y(top))}" r="4" />`,
      `<text class="mast-label" x="${px(x(d) + dx)}" y="${px(y(top) - 8)}" text-anchor="${anchor}">${escapeXml(`${end.name} · ${end.antenna_m} m`)}</text>`,
    );
    const tw = textWidthPx(`${end.name} · ${end.antenna_m} m`, 11);
    mastLabels.push({ x: anchor === "start" ? x(d) + dx : x(d) + dx - tw, y: y(top) - 19, w: tw, h: 14 });
  }
  if (refl.length) {
    out.push(`<g class="reflection">`);
    for (const r of refl) {
      const i = nearestIndex(p.d_m, r.at_distance_m);
      out.push(`<circle cx="${px(x(r.at_distance_m))}" cy="${px(y(b0[i]))}" r="4"><title>${escapeXml(r.label)}</title></circle>`);
    }
    out.push("</g>");
  }
  // Obstructions: where terrain, bulge and obstruction at the first k rise above the ray, a
  // marked band, so a blockage of a few metres on a tall axis is still seen.
  const above = idx.map((i) => b0[i] + p.obstruction_m[i] > ray(p.d_m[i]));
  if (above.some(Boolean)) {
    out.push(
      `<path class="blocked" d="${area<number>().defined((i) => above[i]).x((i) => xs[i]).y0((i) => y(ray(p.d_m[i]))).y1((i) => y(b0[i] + p.obstruction_m[i])).digits(1)(idx)}" />`,
    );
    for (const [a, b] of runs(above)) {
      const xa = x(p.d_m[a]);
      const xb = x(p.d_m[b]);
      const top = Math.min(...idx.slice(a, b + 1).map((i) => y(b0[i] + p.obstruction_m[i])));
      out.push(`<rect class="blocked-mark" x="${px(Math.min(xa, xb - 6) - 3)}" y="${px(top - 3)}" width="${px(Math.max(xb - xa, 6) + 6)}" height="${px(y(ray(p.d_m[a])) - top + 6)}" />`);
    }
  }
  // Worst clearance at each k: marker at the point, labels placed clear of each other and of
  // the drawn lines (ray, Fresnel envelopes, terrain at each k).
  const plotBox: Box = { x: m.left, y: m.top, w: W - m.left - m.right, h: H - m.top - m.bottom };
  const labelBoxes: Box[] = [...mastLabels];
  // A detail panel when the first Fresnel zone at the least clearance is too thin to read at
  // the whole path's scale (a blockage of metres on an axis of hundreds of metres).
  let detail = "";
  const wk = p.ks[0]?.worst;
  if (wk && Number.isFinite(wk.at_distance_m)) {
    const iw = nearestIndex(p.d_m, wk.at_distance_m);
    const f1px = Math.abs(y(ray(p.d_m[iw]) + r1[iw]) - y(ray(p.d_m[iw])));
    if (f1px < 10) detail = detailPanel(p, { iw, D, ray, r1, b0, x, y, plotBox, labelBoxes });
  }
  const poly = (f: (i: number) => number): Polyline => idx.map((i) => [xs[i], y(f(i))] as const);
  const drawn: Polyline[] = [
    poly((i) => ray(p.d_m[i])),
    poly((i) => ray(p.d_m[i]) + r1[i]),
    poly((i) => ray(p.d_m[i]) - r1[i]),
    poly((i) => ray(p.d_m[i]) - 0.6 * r1[i]),
    ...bulged.map((b) => poly((i) => b[i] + p.obstruction_m[i])),
  ];
  p.ks.forEach((k, j) => {
    if (!k.worst || !Number.isFinite(k.worst.at_distance_m)) return;
    const d = k.worst.at_distance_m;
    const i = nearestIndex(p.d_m, d);
    const g = bulged[j][i] + p.obstruction_m[i];
    const text = `k = ${k.label}: ${fixed(k.worst.clearance_f1, 2)} F1`;
    const w = textWidthPx(text, 11) + 4;
    const xx = x(d);
    const x0 = Math.min(Math.max(xx - w / 2, plotBox.x + 2), plotBox.x + plotBox.w - w - 2);
    const cands: Box[] = [];
    for (const shift of [0, -w / 2 - 10, w / 2 + 10])
      for (let row = 0; row < 10; row++) {
        cands.push({ x: x0 + shift, y: y(g) + 14 + row * 14, w, h: 13 });
        cands.push({ x: x0 + shift, y: y(Math.max(g, ray(d))) - 26 - row * 14, w, h: 13 });
      }
    const box = cands[placeLabel(cands, labelBoxes, plotBox, drawn)];
    labelBoxes.push(box);
    out.push(
      `<g class="worst ${K_STYLES[j % K_STYLES.length]}"><line x1="${px(xx)}" x2="${px(xx)}" y1="${px(y(g))}" y2="${px(y(ray(d)))}" /><path d="M${px(xx)},${px(y(g) + 2)}l-5,9h10z" />` +
        `<text class="halo" x="${px(box.x + w / 2)}" y="${px(box.y + 10)}" text-anchor="middle">${escapeXml(text)}</text></g>`,
    );
  });
  out.push(detail);
  out.push(`<g class="legend">${legend.items.join("")}</g>`);
  out.push("</svg>");
  return out.join("");
}

/**
 * The detail panel: the neighbourhood of the least clearance at the first k (±5 % of the path,
 * at least ±200 m) with its own vertical scale, drawn in the upper corner away from the point,
 * and a frame on the main plot showing where it is.
 */
function detailPanel(
  p: ProfilePlotInput,
  c: { iw: number; D: number; ray: (d: number) => number; r1: number[]; b0: number[]; x: (d: number) => number; y: (v: number) => number; plotBox: Box; labelBoxes: Box[] },
): string {
  const d0 = p.d_m[c.iw];
  const hw = Math.max(0.05 * c.D, 200);
  const a = Math.max(0, d0 - hw);
  const b = Math.min(c.D, d0 + hw);
  const win = Array.from({ length: p.d_m.length }, (_, i) => i).filter((i) => p.d_m[i] >= a && p.d_m[i] <= b);
  if (win.length < 2) return "";
  // heights relative to the line of sight: the ray is 0, the zone ±F1, the ground below
  const rel = (i: number, h: number) => h - c.ray(p.d_m[i]);
  const r1max = Math.max(...win.map((i) => c.r1[i]));
  let lo = -1.6 * r1max;
  let hi = 1.3 * r1max;
  for (const i of win) hi = Math.max(hi, rel(i, c.b0[i] + p.obstruction_m[i]) + 0.2 * r1max);
  const note = `Detail at ${fixed(d0 / 1000, 2)} km, heights from the line of sight`;
  const PW = Math.max(260, textWidthPx(note, 11) + 16);
  const PH = 130;
  const left = c.x(d0) > c.plotBox.x + c.plotBox.w / 2;
  const ox = left ? c.plotBox.x + 8 : c.plotBox.x + c.plotBox.w - PW - 8;
  const oy = c.plotBox.y + 6;
  const X = scaleLinear().domain([a, b]).range([ox + 4, ox + PW - 4]);
  const Y = scaleLinear().domain([lo, hi]).range([oy + PH - 4, oy + 18]);
  const ln = (f: (i: number) => number) => line<number>().x((i) => X(p.d_m[i])).y((i) => Y(f(i))).digits(1)(win) ?? "";
  c.labelBoxes.push({ x: ox, y: oy, w: PW, h: PH });
  const clip = `${p.id}-detail-clip`;
  const g = (i: number) => rel(i, c.b0[i] + p.obstruction_m[i]);
  return (
    `<g class="detail"><rect class="detail-frame" x="${px(c.x(a))}" y="${px(c.y(c.ray(d0) + hi))}" width="${px(c.x(b) - c.x(a))}" height="${px(Math.max(3, c.y(c.ray(d0) + lo) - c.y(c.ray(d0) + hi)))}" />` +
    `<clipPath id="${clip}"><rect x="${px(ox)}" y="${px(oy)}" width="${PW}" height="${PH}" /></clipPath>` +
    `<rect class="detail-panel" x="${px(ox)}" y="${px(oy)}" width="${PW}" height="${PH}" />` +
    `<g clip-path="url(#${clip})">` +
    `<path class="terrain k-primary" d="${area<number>().x((i) => X(p.d_m[i])).y0(oy + PH).y1((i) => Y(g(i))).digits(1)(win)}" />` +
    optionalPath("blocked", area<number>().defined((i) => g(i) > 0).x((i) => X(p.d_m[i])).y0(Y(0)).y1((i) => Y(g(i))).digits(1)(win)) +
    `<path class="fresnel f1" d="${ln((i) => c.r1[i])}" /><path class="fresnel f1" d="${ln((i) => -c.r1[i])}" />` +
    `<path class="fresnel f06" d="${ln((i) => -0.6 * c.r1[i])}" /><path class="ray" d="${ln(() => 0)}" />` +
    `</g><text class="detail-label halo" x="${px(ox + 6)}" y="${px(oy + 12)}">${escapeXml(note)}</text></g>`
  );
}

/** A path element, or nothing when d3 drew no segment (every point undefined gives null). */
function optionalPath(cls: string, d: string | null): string {
  return d ? `<path class="${cls}" d="${d}" />` : "";
}

/** Runs of true values as [first, last] index pairs. */
function runs(flags: boolean[]): [number, number][] {
  const out: [number, number][] = [];
  let start = -1;
  flags.forEach((f, i) => {
    if (f && start < 0) start = i;
    if (!f && start >= 0) out.push([start, i - 1]), (start = -1);
  });
  if (start >= 0) out.push([start, flags.length - 1]);
  return out;
}

/** Legend entries laid out in rows that wrap at `maxWidth`, starting at (x0, 14). */
function legendLayout(entries: [string, string][], x0: number, maxWidth: number): { items: string[]; rows: number } {
  const items: string[] = [];
  let lx = 0;
  let row = 0;
  for (const [cls, text] of entries) {
    const w = 34 + textWidthPx(text, 11);
    if (lx > 0 && lx + w > maxWidth) {
      lx = 0;
      row++;
    }
    const x = x0 + lx;
    const y = 14 + row * 16;
    const mark =
      cls === "reflection"
        ? `<circle class="reflection" cx="${x + 11}" cy="${y}" r="4" />`
        : cls === "terrain-swatch"
          ? `<rect class="terrain k-primary" x="${x}" y="${y - 5}" width="22" height="10" />`
          : cls === "blocked-swatch"
            ? `<rect class="blocked" x="${x}" y="${y - 5}" width="22" height="10" />`
          : `<line class="${cls}" x1="${x}" x2="${x + 22}" y1="${y}" y2="${y}" />`;
    items.push(`${mark}<text x="${x + 26}" y="${y}" dy="0.32em">${escapeXml(text)}</text>`);
    lx += w;
  }
  return { items, rows: row + 1 };
}

function nearestIndex(d: ArrayLike<number>, v: number): number {
  let lo = 0;
  let hi = d.length - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (d[mid] <= v) lo = mid;
    else hi = mid;
  }
  return Math.abs(d[lo] - v) <= Math.abs(d[hi] - v) ? lo : hi;
}
