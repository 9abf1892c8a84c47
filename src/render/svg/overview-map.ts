import { geoGraticule, geoPath, type GeoProjection } from "d3-geo";
import { escapeXml, px, svgId } from "./escape.ts";
import { placeLabel, textWidthPx, type Box } from "./label-placement.ts";
import { metresPerPixel } from "./map-projection.ts";

export interface MapSite {
  id: string;
  name: string;
  lat_deg: number;
  lon_deg: number;
}

export interface MapLink {
  id: string;
  from: MapSite;
  to: MapSite;
  /** Every design target met: drawn solid; otherwise dashed and labelled as missed. */
  met: boolean;
}

/** A background image covering the whole frame (a data: URI), what it shows, and its colour ramp. */
export interface MapBackdrop {
  href: string;
  label: string;
  /** CSS colours from low to high, drawn as a swatch in the legend. */
  ramp?: string[];
}

/** An interference path: from an interfering transmitter's site to a victim receiver's site. */
export interface MapInterferencePath {
  from: MapSite;
  to: MapSite;
  /** The receiver misses its C/I or degradation limit because of this path. */
  failing: boolean;
  /** Tooltip text. */
  label: string;
}

export interface OverviewMapInput {
  /** Used for element ids; unique on the page. */
  id: string;
  title: string;
  sites: MapSite[];
  links: MapLink[];
  projection: GeoProjection;
  width: number;
  height: number;
  backdrop?: MapBackdrop;
  /** Interference paths to draw (thin dotted lines, arrow at the victim), if any. */
  interference?: MapInterferencePath[];
}

const LABEL_PX = 11.5;

/**
 * Overview map as an SVG string: hillshade backdrop, graticule, links (solid when every target
 * is met, dashed and labelled "✗" when one is missed — never by colour alone), site markers
 * with names, a scale bar, a north arrow and a legend.
 */
export function overviewMapSvg(p: OverviewMapInput): string {
  const { width: W, height: H, projection } = p;
  const frame: Box = { x: 4, y: 4, w: W - 8, h: H - 8 };
  const proj = (s: MapSite) => projection([s.lon_deg, s.lat_deg]) ?? [Number.NaN, Number.NaN];
  const path = geoPath(projection).digits(1);
  const out: string[] = [];
  const pid = svgId(p.id);
  const titleId = `${pid}-title`;
  const descId = `${pid}-desc`;
  const missed = p.links.filter((l) => !l.met);
  out.push(
    `<svg xmlns="http://www.w3.org/2000/svg" class="overview-map" viewBox="0 0 ${W} ${H}" width="${W}" height="${H}" role="img" aria-labelledby="${titleId} ${descId}">`,
    `<title id="${titleId}">${escapeXml(p.title)}</title>`,
    `<desc id="${descId}">${escapeXml(
      `${p.sites.length} sites and ${p.links.length} links. ` +
        p.links.map((l) => `Link ${l.id} from ${l.from.name} to ${l.to.name}: ${l.met ? "meets its targets" : "misses a target"}.`).join(" ") +
        (missed.length ? "" : " Every link meets its targets."),
    )}</desc>`,
    `<defs><clipPath id="${pid}-clip"><rect x="0" y="0" width="${W}" height="${H}" /></clipPath></defs>`,
    `<rect class="map-paper" x="0" y="0" width="${W}" height="${H}" />`,
  );
  if (p.backdrop) out.push(`<image class="map-backdrop" href="${escapeXml(p.backdrop.href)}" x="0" y="0" width="${W}" height="${H}" preserveAspectRatio="none" />`);
  const legendRows = legendEntries(p);
  const legendW = Math.max(...legendRows.map((r) => textWidthPx(r[1], 11))) + 44;
  const legendH = legendRows.length * 17 + 12;
  // Bottom right, unless a site marker or its label would lie under it: then the first other
  // free place (top left, above the scale bar, middle left, middle right, below the north
  // arrow), else the place covering the fewest sites.
  const sitesUnder = (b: Box) =>
    p.sites.filter((site) => {
      const [x, y] = proj(site);
      return x > b.x - 24 && x < b.x + b.w + 24 && y > b.y - 24 && y < b.y + b.h + 24;
    }).length;
  const places: Box[] = [
    { x: W - legendW - 12, y: H - legendH - 12, w: legendW, h: legendH },
    { x: 12, y: 12, w: legendW, h: legendH },
    { x: 12, y: H - legendH - 56, w: legendW, h: legendH },
    { x: 12, y: (H - legendH) / 2, w: legendW, h: legendH },
    { x: W - legendW - 12, y: (H - legendH) / 2, w: legendW, h: legendH },
    { x: W - legendW - 12, y: 80, w: legendW, h: legendH },
  ];
  const counts = places.map(sitesUnder);
  const legendBox: Box = places[counts.indexOf(Math.min(...counts))];
  const scaleBox: Box = { x: 8, y: H - 48, w: 200, h: 40 };
  out.push(`<g clip-path="url(#${pid}-clip)">`, graticule(projection, W, H, [legendBox, scaleBox]), "</g>");

  // Links: a white casing under each line so it reads over the shading.
  out.push(`<g class="map-links">`);
  for (const l of p.links) {
    const d = path({ type: "LineString", coordinates: [[l.from.lon_deg, l.from.lat_deg], [l.to.lon_deg, l.to.lat_deg]] }) ?? "";
    out.push(`<path class="map-link-casing" d="${d}" /><path class="map-link ${l.met ? "met" : "missed"}" d="${d}"><title>${escapeXml(`${l.id}: ${l.met ? "meets its targets" : "misses a target"}`)}</title></path>`);
  }
  out.push("</g>");
  if (p.interference?.length) out.push(interferencePaths(p.interference, proj, p.id));

  // Reserved areas: scale bar (bottom left), north arrow (top right), legend (bottom right).
  const taken: Box[] = [legendBox, scaleBox, { x: W - 62, y: 8, w: 54, h: 64 }];
  const sitePts = p.sites.map((s) => ({ s, xy: proj(s) }));
  for (const { xy } of sitePts) taken.push({ x: xy[0] - 7, y: xy[1] - 7, w: 14, h: 14 });
  // The link lines themselves, as small boxes every 8 px, so labels sit beside them.
  for (const l of p.links) {
    const a = proj(l.from);
    const b = proj(l.to);
    const steps = Math.ceil(Math.hypot(b[0] - a[0], b[1] - a[1]) / 8);
    for (let i = 1; i < steps; i++) taken.push({ x: a[0] + ((b[0] - a[0]) * i) / steps - 2, y: a[1] + ((b[1] - a[1]) * i) / steps - 2, w: 4, h: 4 });
  }

  // Link labels: id, plus "✗ target missed" when missed; slid along the line to avoid clashes.
  const linkLabels: string[] = [];
  for (const l of p.links) {
    const a = proj(l.from);
    const b = proj(l.to);
    const text = l.met ? `${l.id} ✓` : `${l.id} ✗ target missed`;
    const w = textWidthPx(text, 10.5) + 6;
    // Beside the line (never on it, so its dash pattern stays visible), slid along it.
    const len = Math.hypot(b[0] - a[0], b[1] - a[1]) || 1;
    const nx = -(b[1] - a[1]) / len;
    const ny = (b[0] - a[0]) / len;
    const off = 5 + Math.abs(nx) * (w / 2) + Math.abs(ny) * 7;
    const cands: Box[] = [];
    for (const t of [0.5, 0.4, 0.6, 0.3, 0.7, 0.25, 0.75]) {
      for (const side of [1, -1]) {
        const cx = a[0] + (b[0] - a[0]) * t + side * nx * off;
        const cy = a[1] + (b[1] - a[1]) * t + side * ny * off;
        cands.push({ x: cx - w / 2, y: cy - 7, w, h: 14 });
      }
    }
    const k = placeLabel(cands, taken, frame);
    const box = cands[k];
    taken.push(box);
    linkLabels.push(`<text class="map-link-label ${l.met ? "met" : "missed"}" x="${px(box.x + w / 2)}" y="${px(box.y + 10.5)}" text-anchor="middle">${escapeXml(text)}</text>`);
  }

  // Sites and their names.
  out.push(`<g class="map-sites">`);
  for (const { s, xy } of sitePts) {
    const [x, y] = xy;
    const text = s.name;
    const w = textWidthPx(text, LABEL_PX);
    const h = 14;
    const cands: Box[] = [
      { x: x + 9, y: y - h / 2, w, h },
      { x: x - 9 - w, y: y - h / 2, w, h },
      { x: x - w / 2, y: y - 10 - h, w, h },
      { x: x - w / 2, y: y + 10, w, h },
      { x: x + 7, y: y - 6 - h, w, h },
      { x: x + 7, y: y + 6, w, h },
      { x: x - 7 - w, y: y - 6 - h, w, h },
      { x: x - 7 - w, y: y + 6, w, h },
    ];
    const k = placeLabel(cands, taken, frame);
    const box = cands[k];
    taken.push(box);
    out.push(
      `<path class="map-site" d="M${px(x)},${px(y - 6.5)}l6,10.5h-12z"><title>${escapeXml(`${s.id} — ${s.name}`)}</title></path>`,
      `<text class="map-site-label" x="${px(box.x)}" y="${px(box.y + 11)}">${escapeXml(text)}</text>`,
    );
  }
  out.push("</g>", `<g class="map-link-labels">${linkLabels.join("")}</g>`);

  out.push(scaleBar(projection, W, H), northArrow(projection, W), legend(legendRows, legendBox, pid, p.backdrop?.ramp));
  out.push(`<rect class="map-frame" x="0.5" y="0.5" width="${W - 1}" height="${H - 1}" />`, "</svg>");
  return out.join("");
}

function legendEntries(p: OverviewMapInput): [string, string][] {
  const rows: [string, string][] = [
    ["site", "Site"],
    ["met", "Link meets every target (✓)"],
    ["missed", "Link misses a target (✗, dashed)"],
  ];
  if (p.interference?.length) {
    rows.push([p.interference.some((x) => x.failing) ? "interference failing" : "interference", "Interference into a receiver (→; heavy: over its limit)"]);
  }
  if (p.backdrop) rows.push(["shade", p.backdrop.label]);
  return rows;
}

/**
 * Interference paths as thin dotted lines from the interferer's site to the victim's, with an
 * arrowhead short of the victim's marker; a path over the receiver's limit is drawn heavier
 * (never by colour alone). Paths between the same two sites are drawn once (the worst).
 */
function interferencePaths(paths: MapInterferencePath[], proj: (s: MapSite) => [number, number], id: string): string {
  const byPair = new Map<string, MapInterferencePath>();
  for (const x of paths) {
    const k = `${x.from.id}>${x.to.id}`;
    const had = byPair.get(k);
    if (!had || (x.failing && !had.failing)) byPair.set(k, x);
  }
  const out = [`<defs><marker id="${id}-arrow" viewBox="0 0 8 8" refX="7" refY="4" markerWidth="7" markerHeight="7" orient="auto-start-reverse"><path class="map-interference-head" d="M0,0L8,4L0,8z" /></marker></defs>`, `<g class="map-interference">`];
  for (const x of byPair.values()) {
    const a = proj(x.from);
    const b = proj(x.to);
    const len = Math.hypot(b[0] - a[0], b[1] - a[1]);
    if (!(len > 20)) continue;
    const t = (len - 10) / len; // stop short of the victim's marker
    const ex = a[0] + (b[0] - a[0]) * t;
    const ey = a[1] + (b[1] - a[1]) * t;
    out.push(`<path class="map-interference-path${x.failing ? " failing" : ""}" d="M${px(a[0])},${px(a[1])}L${px(ex)},${px(ey)}" marker-end="url(#${id}-arrow)"><title>${escapeXml(x.label)}</title></path>`);
  }
  out.push("</g>");
  return out.join("");
}

function legend(rows: [string, string][], b: Box, id: string, ramp?: string[]): string {
  const out = [`<g class="map-legend" transform="translate(${px(b.x)},${px(b.y)})"><rect width="${px(b.w)}" height="${px(b.h)}" />`];
  if (ramp?.length) {
    const stops = ramp.map((c, i) => `<stop offset="${px((100 * i) / Math.max(1, ramp.length - 1))}%" stop-color="${escapeXml(c)}" />`).join("");
    out.push(`<defs><linearGradient id="${id}-ramp">${stops}</linearGradient></defs>`);
  }
  rows.forEach(([kind, text], i) => {
    const y = 14 + i * 17;
    if (kind === "site") out.push(`<path class="map-site" d="M17,${y - 6}l6,10.5h-12z" />`);
    else if (kind === "shade") out.push(`<rect class="map-legend-shade" x="6" y="${y - 6}" width="24" height="11"${ramp?.length ? ` style="fill: url(#${id}-ramp)"` : ""} />`);
    else if (kind.startsWith("interference")) out.push(`<line class="map-interference-path${kind.includes("failing") ? " failing" : ""}" x1="6" x2="30" y1="${y}" y2="${y}" />`);
    else out.push(`<line class="map-link ${kind}" x1="6" x2="30" y1="${y}" y2="${y}" />`);
    out.push(`<text x="36" y="${y}" dy="0.35em">${escapeXml(text)}</text>`);
  });
  out.push("</g>");
  return out.join("");
}

/** A scale bar of a round length (1, 2 or 5 × 10ⁿ m) at most 170 px long, bottom left. */
function scaleBar(projection: GeoProjection, W: number, H: number): string {
  const { dx_m } = metresPerPixel(projection, W / 2, H / 2);
  const maxM = dx_m * 170;
  const pow = 10 ** Math.floor(Math.log10(maxM));
  const L = [5, 2, 1].map((m) => m * pow).find((v) => v <= maxM) ?? pow;
  const len = L / dx_m;
  const x0 = 18;
  const y0 = H - 26;
  const fmt = (m: number) => (L >= 1000 ? `${m / 1000} km` : `${m} m`);
  const out = [`<g class="map-scale"><rect class="map-scale-back" x="${x0 - 8}" y="${y0 - 16}" width="${px(len + 50)}" height="34" />`];
  for (let i = 0; i < 4; i++) out.push(`<rect class="${i % 2 ? "light" : "dark"}" x="${px(x0 + (i * len) / 4)}" y="${y0}" width="${px(len / 4)}" height="5" />`);
  out.push(
    `<text x="${x0}" y="${y0 - 4}" text-anchor="middle">0</text><text x="${px(x0 + len / 2)}" y="${y0 - 4}" text-anchor="middle">${escapeXml(fmt(L / 2))}</text><text x="${px(x0 + len)}" y="${y0 - 4}" text-anchor="middle">${escapeXml(fmt(L))}</text>`,
    `<text class="map-scale-note" x="${x0}" y="${y0 + 15}">Scale at map centre</text></g>`,
  );
  return out.join("");
}

/** A north arrow pointing to true north at its own position (top right). */
function northArrow(projection: GeoProjection, W: number): string {
  const cx = W - 34;
  const cy = 44;
  const ll = projection.invert!([cx, cy]) as [number, number];
  const n = projection([ll[0], ll[1] + 0.01]) as [number, number];
  const angle = (Math.atan2(n[0] - cx, cy - n[1]) * 180) / Math.PI;
  return (
    `<g class="map-north" transform="translate(${cx},${cy}) rotate(${px(angle)})" role="presentation">` +
    `<circle r="19" /><path class="dark" d="M0,-15L6,8L0,3z" /><path class="light" d="M0,-15L-6,8L0,3z" />` +
    `<text y="-20" text-anchor="middle">N</text></g>`
  );
}

/** Graticule lines at a round step with degree labels on the left and bottom edges. */
function graticule(projection: GeoProjection, W: number, H: number, avoid: Box[]): string {
  const clear = (x: number, y: number) => !avoid.some((b) => x > b.x - 30 && x < b.x + b.w + 30 && y > b.y - 4 && y < b.y + b.h + 12);
  const corners = [
    [0, 0],
    [W, 0],
    [0, H],
    [W, H],
  ].map((c) => projection.invert!(c as [number, number]) as [number, number]);
  const lons = corners.map((c) => c[0]);
  const lats = corners.map((c) => c[1]);
  const span = Math.max(Math.max(...lons) - Math.min(...lons), Math.max(...lats) - Math.min(...lats));
  const step = [0.005, 0.01, 0.02, 0.05, 0.1, 0.2, 0.5, 1, 2, 5, 10].find((s) => span / s <= 7) ?? 10;
  const ext: [[number, number], [number, number]] = [
    [Math.floor(Math.min(...lons) / step) * step, Math.floor(Math.min(...lats) / step) * step],
    [Math.ceil(Math.max(...lons) / step) * step + 1e-9, Math.ceil(Math.max(...lats) / step) * step + 1e-9],
  ];
  const g = geoGraticule().extent(ext).step([step, step]).precision(step / 10);
  const d = geoPath(projection).digits(1)(g()) ?? "";
  const out = [`<g class="map-graticule"><path d="${d}" />`];
  const decimals = Math.max(0, -Math.floor(Math.log10(step) + 1e-9));
  const deg = (v: number, pos: string, neg: string) => `${Math.abs(v).toFixed(decimals)}° ${v >= 0 ? pos : neg}`;
  for (let lon = ext[0][0]; lon <= ext[1][0]; lon += step) {
    const bottom = projection.invert!([W / 2, H]) as [number, number];
    const xy = projection([lon, bottom[1]]);
    if (xy && xy[0] > 30 && xy[0] < W - 30 && clear(xy[0], H - 6)) out.push(`<text x="${px(xy[0])}" y="${H - 6}" text-anchor="middle">${escapeXml(deg(lon, "E", "W"))}</text>`);
  }
  for (let lat = ext[0][1]; lat <= ext[1][1]; lat += step) {
    const left = projection.invert!([0, H / 2]) as [number, number];
    const xy = projection([left[0], lat]);
    if (xy && xy[1] > 20 && xy[1] < H - 20 && clear(6, xy[1])) out.push(`<text x="6" y="${px(xy[1] - 3)}">${escapeXml(deg(lat, "N", "S"))}</text>`);
  }
  out.push("</g>");
  return out.join("");
}
