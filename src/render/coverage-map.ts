import { escapeXml, px } from "./svg/escape.ts";

/** Everything the coverage map draws, already in pixels (built by coverageMapData). */
export interface CoverageMapData {
  title: string;
  width_px: number;
  height_px: number;
  /** hillshade with the coverage bands over it, a PNG data URI covering the whole map */
  image_href: string;
  sites: { name: string; x_px: number; y_px: number }[];
  /** the study's other sites, its links and service area, in map pixels (optional) */
  others?: { name: string; x_px: number; y_px: number }[];
  links?: [number, number, number, number][];
  areas?: [number, number][][];
  /** colour swatches, weakest first */
  legend: { color: string; label: string }[];
  scale_bar: { length_px: number; label: string };
  /** e.g. "EPSG:32632 (WGS84 / UTM zone 32N), grid north up" */
  crs_note: string;
}

const LEGEND_ROW = 18;
const PAD = 10;

/**
 * The coverage map as an SVG document: the raster image, a marker and name per site, a
 * legend box (bottom left), a scale bar (bottom right) and the grid's CRS. Pure string
 * building; text is escaped. A template embeds it inline; coverageMapPng renders it.
 */
export function coverageMapSvg(d: CoverageMapData): string {
  const W = d.width_px;
  const H = d.height_px;
  const legendH = PAD + LEGEND_ROW * d.legend.length + PAD;
  const legendW = 36 + Math.max(80, ...d.legend.map((l) => 7.4 * l.label.length));
  const ly = H - legendH - PAD;
  const legend = d.legend
    .map(
      (l, i) =>
        `<rect x="${PAD + 8}" y="${px(ly + PAD + i * LEGEND_ROW)}" width="14" height="12" fill="${escapeXml(l.color)}" stroke="#333" stroke-width="0.5"/>` +
        `<text x="${PAD + 28}" y="${px(ly + PAD + i * LEGEND_ROW + 10)}">${escapeXml(l.label)}</text>`,
    )
    .join("");
  const sb = d.scale_bar;
  const sx = W - PAD - sb.length_px - 8;
  const sy = H - PAD - 14;
  const sites = d.sites
    .map(
      (s) =>
        `<g class="site"><circle cx="${px(s.x_px)}" cy="${px(s.y_px)}" r="5" fill="#fff" stroke="#111" stroke-width="2"/>` +
        `<text x="${px(s.x_px + 8)}" y="${px(s.y_px - 8)}" stroke="#fff" stroke-width="3" paint-order="stroke">${escapeXml(s.name)}</text></g>`,
    )
    .join("");
  const links = (d.links ?? []).map(([x1, y1, x2, y2]) => `<path d="M${px(x1)},${px(y1)}L${px(x2)},${px(y2)}"/>`).join("");
  const areas = (d.areas ?? []).map((ring) => `<path d="M${ring.map(([x, y]) => `${px(x)},${px(y)}`).join("L")}Z"/>`).join("");
  const others = (d.others ?? [])
    .map((s) => `<g class="other-site"><rect x="${px(s.x_px - 3.5)}" y="${px(s.y_px - 3.5)}" width="7" height="7" fill="#fff" stroke="#333" stroke-width="1.5"/><text x="${px(s.x_px + 6)}" y="${px(s.y_px + 4)}" font-size="10" stroke="#fff" stroke-width="3" paint-order="stroke">${escapeXml(s.name)}</text></g>`)
    .join("");
  const overlay =
    (areas ? `<g class="service-area" fill="none" stroke="#1a3f8f" stroke-width="2.5" stroke-dasharray="8 4">${areas}</g>` : "") +
    (links ? `<g class="links" stroke="#444" stroke-width="1.5" stroke-dasharray="4 3" fill="none">${links}</g>` : "") +
    others;
  // Ids for the text alternative, unique per map on a page (from the title).
  const id = `cov-${d.title.replace(/[^A-Za-z0-9]+/g, "-").replace(/^-|-$/g, "").slice(0, 60)}`;
  const desc = `Coverage map around ${d.sites.map((s) => s.name).join(", ")}. ${d.legend.map((l) => l.label).join("; ")}. Scale bar ${sb.label}. ${d.crs_note}.`;
  return `<svg xmlns="http://www.w3.org/2000/svg" xmlns:xlink="http://www.w3.org/1999/xlink" width="${W}" height="${H}" viewBox="0 0 ${W} ${H}" font-family="DejaVu Sans, Arial, sans-serif" font-size="12" role="img" aria-labelledby="${id}-t ${id}-d">
<title id="${id}-t">${escapeXml(d.title)}</title>
<desc id="${id}-d">${escapeXml(desc)}</desc>
<rect width="${W}" height="${H}" fill="#f4f4f2"/>
<image x="0" y="0" width="${W}" height="${H}" href="${escapeXml(d.image_href)}" xlink:href="${escapeXml(d.image_href)}" preserveAspectRatio="none"/>
${overlay}${sites}
<g class="legend"><rect x="${PAD}" y="${px(ly)}" width="${px(legendW)}" height="${px(legendH)}" fill="#fff" fill-opacity="0.88" stroke="#999"/>${legend}</g>
<g class="scale"><rect x="${px(sx - 6)}" y="${px(sy - 16)}" width="${px(sb.length_px + 12)}" height="28" fill="#fff" fill-opacity="0.85"/><path d="M${px(sx)},${px(sy)}h${px(sb.length_px)}M${px(sx)},${px(sy - 4)}v8M${px(sx + sb.length_px)},${px(sy - 4)}v8" stroke="#111" stroke-width="2" fill="none"/><text x="${px(sx + sb.length_px / 2)}" y="${px(sy - 6)}" text-anchor="middle">${escapeXml(sb.label)}</text></g>
<text x="${W - PAD}" y="${PAD + 10}" text-anchor="end" font-size="10" fill="#333" stroke="#fff" stroke-width="3" paint-order="stroke">${escapeXml(d.crs_note)}</text>
</svg>
`;
}
