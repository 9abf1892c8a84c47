import { scaleLinear } from "d3-scale";
import { leftAxis } from "./axes.ts";
import { escapeXml, px, svgId } from "./escape.ts";
import { fixed } from "../../format/quantity.ts";

/** The path cross-section at one k's point of least clearance. */
export interface FresnelSectionPanel {
  k_label: string;
  /** Where along the path (m from the from-end). */
  at_distance_m: number;
  /** Height of the line of sight there (m amsl). */
  ray_m: number;
  /** Terrain plus Earth bulge at this k there (m amsl, on the ray's vertical datum). */
  ground_m: number;
  /** Obstruction (trees, buildings) above the ground there (m). */
  obstruction_m: number;
  /** First Fresnel radius there (m). */
  f1_m: number;
  /** Required clearance as a fraction of F1, or null when none is set for this k. */
  required_f1: number | null;
}

export interface FresnelSectionInput {
  id: string;
  title: string;
  /** Name of the end distances are measured from. */
  from: string;
  panels: FresnelSectionPanel[];
  width?: number;
  height?: number;
}

/**
 * Fresnel-zone cross-section as an SVG string: for each k, the view along the path at the
 * point of least clearance — the first Fresnel zone (F1) and 0.6·F1 as circles around the line
 * of sight, the ground (terrain + bulge) and any obstruction as a level surface, the clearance
 * dimension and the verdict against the required fraction (in words and a symbol, not colour).
 * Equal scales across and up, so the zone is drawn as a circle.
 */
export function fresnelSectionSvg(p: FresnelSectionInput): string {
  const n = Math.max(1, p.panels.length);
  const W = p.width ?? 880;
  const H = p.height ?? 340;
  const gap = 16;
  const pw = (W - gap * (n - 1)) / n;
  const pid = svgId(p.id);
  const titleId = `${pid}-title`;
  const descId = `${pid}-desc`;
  const out: string[] = [
    `<svg xmlns="http://www.w3.org/2000/svg" class="fresnel-section" viewBox="0 0 ${W} ${H}" width="${W}" height="${H}" role="img" aria-labelledby="${titleId} ${descId}">`,
    `<title id="${titleId}">${escapeXml(p.title)}</title>`,
    `<desc id="${descId}">${escapeXml(p.panels.map(describe).join(" "))}</desc>`,
    `<defs><pattern id="${pid}-hatch" width="7" height="7" patternUnits="userSpaceOnUse" patternTransform="rotate(45)"><rect width="7" height="7" class="hatch-back" /><line x1="0" y1="0" x2="0" y2="7" class="hatch-line" /></pattern></defs>`,
  ];
  p.panels.forEach((panel, j) => out.push(`<g transform="translate(${px(j * (pw + gap))},0)">${panelSvg(panel, pw, H, `${pid}-${j}`, `${pid}-hatch`, p.from)}</g>`));
  out.push("</svg>");
  return out.join("");
}

function clearanceOf(q: FresnelSectionPanel): { top_m: number; clearance_m: number; ratio: number; met: boolean | null } {
  const top_m = q.ground_m + q.obstruction_m;
  const clearance_m = q.ray_m - top_m;
  const ratio = clearance_m / q.f1_m;
  return { top_m, clearance_m, ratio, met: q.required_f1 === null ? null : ratio >= q.required_f1 - 1e-9 };
}

function describe(q: FresnelSectionPanel): string {
  const c = clearanceOf(q);
  const req = q.required_f1 === null ? "no requirement set" : `${c.met ? "meets" : "falls short of"} the required ${q.required_f1.toFixed(2)} F1`;
  return `At k = ${q.k_label}, ${(q.at_distance_m / 1000).toFixed(2)} km along the path, the line of sight clears the ${q.obstruction_m > 0 ? "obstruction" : "ground"} by ${c.clearance_m.toFixed(1)} m, ${c.ratio.toFixed(2)} of the first Fresnel radius (${q.f1_m.toFixed(1)} m); this ${req}.`;
}

function panelSvg(q: FresnelSectionPanel, W: number, H: number, id: string, hatchId: string, from: string): string {
  const c = clearanceOf(q);
  const m = { top: 40, bottom: 44, left: 58, right: 10 };
  const iw = W - m.left - m.right;
  const ih = H - m.top - m.bottom;
  // Vertical window: the zone with a margin and the ground surface with some ground below it.
  const hiV = Math.max(q.ray_m + 1.35 * q.f1_m, c.top_m + 0.8 * q.f1_m);
  let loV = Math.min(q.ray_m - 1.35 * q.f1_m, q.ground_m);
  loV -= Math.max(0.12 * (hiV - loV), 0.3 * q.f1_m);
  const s = ih / (hiV - loV); // pixels per metre, same across and up
  const y = scaleLinear().domain([loV, hiV]).range([m.top + ih, m.top]);
  const cx = m.left + iw / 2;
  const cy = y(q.ray_m);
  const gy = y(q.ground_m);
  const ty = y(c.top_m);
  const out: string[] = [
    `<defs><clipPath id="${id}-clip"><rect x="${m.left}" y="${m.top}" width="${px(iw)}" height="${px(ih)}" /></clipPath></defs>`,
    `<text class="panel-title" x="${m.left}" y="16">${escapeXml(`k = ${q.k_label} · ${fixed(q.at_distance_m / 1000, 2)} km from ${from}`)}</text>`,
    leftAxis(y, m.left, iw, "Height (m amsl)", (v) => String(v), 5),
    `<g clip-path="url(#${id}-clip)">`,
    `<rect class="section-ground" x="${m.left}" y="${px(gy)}" width="${px(iw)}" height="${px(Math.max(0, m.top + ih - gy))}" fill="url(#${hatchId})" />`,
    `<line class="section-ground-line" x1="${m.left}" x2="${px(m.left + iw)}" y1="${px(gy)}" y2="${px(gy)}" />`,
  ];
  if (q.obstruction_m > 0) {
    out.push(`<rect class="section-obstruction" x="${m.left}" y="${px(ty)}" width="${px(iw)}" height="${px(gy - ty)}" />`);
  }
  out.push(
    `<circle class="zone f1" cx="${px(cx)}" cy="${px(cy)}" r="${px(q.f1_m * s)}" />`,
    `<circle class="zone f06" cx="${px(cx)}" cy="${px(cy)}" r="${px(0.6 * q.f1_m * s)}" />`,
    `<path class="ray-point" d="M${px(cx - 5)},${px(cy)}h10M${px(cx)},${px(cy - 5)}v10" />`,
  );
  if (q.required_f1 !== null) {
    const ry = y(q.ray_m - q.required_f1 * q.f1_m);
    out.push(`<line class="required" x1="${m.left}" x2="${px(m.left + iw)}" y1="${px(ry)}" y2="${px(ry)}" /><text class="required-label halo" x="${m.left + 4}" y="${px(ry - 4)}">${escapeXml(`required: ${fixed(q.required_f1, 2)} F1 below the ray`)}</text>`);
  }
  // Clearance dimension from the surface to the ray, to the right of the circle.
  const dx = cx + Math.min(iw / 2 - 20, Math.max(q.f1_m * s + 18, 40));
  out.push(
    `<g class="dimension"><line x1="${px(dx)}" x2="${px(dx)}" y1="${px(ty)}" y2="${px(cy)}" /><line x1="${px(dx - 5)}" x2="${px(dx + 5)}" y1="${px(ty)}" y2="${px(ty)}" /><line x1="${px(dx - 5)}" x2="${px(dx + 5)}" y1="${px(cy)}" y2="${px(cy)}" /></g>`,
    "</g>",
  );
  const label = `${c.clearance_m >= 0 ? "clearance" : "blocked by"} ${fixed(Math.abs(c.clearance_m), 1)} m`;
  const lx = Math.min(dx + 6, m.left + iw - 4);
  const anchor = dx + 6 + 110 > m.left + iw ? "end" : "start";
  out.push(`<text class="dimension-label halo" x="${px(anchor === "end" ? dx - 6 : lx)}" y="${px((ty + cy) / 2)}" text-anchor="${anchor}">${escapeXml(label)}</text>`);
  out.push(`<text class="surface-label halo" x="${m.left + 4}" y="${px(Math.min(gy + 14, m.top + ih - 4))}">${escapeXml(q.obstruction_m > 0 ? `ground + bulge; obstruction ${fixed(q.obstruction_m, 1)} m above it` : "ground + Earth bulge")}</text>`);
  const verdict = c.met === null ? `${fixed(c.ratio, 2)} F1 (no requirement)` : `${c.met ? "✓" : "✗"} clearance ${fixed(c.ratio, 2)} F1 ${c.met ? "meets" : "is short of"} the required ${fixed(q.required_f1!, 2)} F1`;
  out.push(
    `<text class="section-verdict ${c.met === false ? "fail" : "pass"}" x="${m.left}" y="${H - 22}">${escapeXml(verdict)}</text>`,
    `<text class="section-note" x="${m.left}" y="${H - 7}">${escapeXml(`F1 = ${fixed(q.f1_m, 1)} m (solid circle); 0.6 F1 (dashed); + line of sight`)}</text>`,
  );
  return out.join("");
}
