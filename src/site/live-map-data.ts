import type { AnalyzedStudy } from "../analysis/analyze-study.ts";
import { shadedRelief } from "../render/raster/elevation-tint.ts";
import { hillshade } from "../render/raster/hillshade.ts";
import { rgbaPngDataUri } from "../render/raster/rgba-png.ts";
import { metresPerDegree } from "../terrain/metres-per-degree.ts";
import { urlPathSegment } from "../render/svg/escape.ts";
import { linkVerdict } from "./exchange-files.ts";
import { widened } from "../cache/terrain-extent.ts";

/** [[south, west], [north, east]] in degrees, as Leaflet takes bounds. */
type Bounds = [[number, number], [number, number]];

/** What the study page's interactive map draws; paths are relative to the study's folder, each segment percent-encoded. */
export interface LiveMapData {
  bounds: Bounds;
  hillshade: { href: string; bounds: Bounds; label: string } | null;
  sites: { id: string; name: string; lat: number; lon: number; ground_m: number }[];
  links: { id: string; from: [number, number]; to: [number, number]; verdict: string; label: string; href: string }[];
  coverage: { id: string; label: string; href: string; bounds: Bounds }[];
}

/** Hillshade samples across the longer side of the map's frame. */
const SHADE_PX = 480;

const cache = new WeakMap<AnalyzedStudy, Promise<LiveMapData>>();

/**
 * Data of the study page's interactive map: sites, links with their verdict and page, the
 * coverage overlays on geographic grids (their PNGs placed by the raster's corners), and a
 * hillshade of the study's terrain on a latitude/longitude grid (sun from 315° at 45°) as a data
 * URI. Leaflet shows them in Web Mercator: a lat/lon image stretched between its corners is off
 * by under 0.2 % of its height over a frame of half a degree at 41° (tan φ·Δφ/2, common practice).
 */
export function liveMapData(s: AnalyzedStudy): Promise<LiveMapData> {
  let p = cache.get(s);
  if (!p) {
    p = build(s);
    cache.set(s, p);
  }
  return p;
}

async function build(s: AnalyzedStudy): Promise<LiveMapData> {
  const r = s.result;
  const lats = r.sites.map((x) => x.lat_deg);
  const lons = r.sites.map((x) => x.lon_deg);
  const coverage: LiveMapData["coverage"] = [];
  for (const c of r.coverage as { id: string; method: string; grid: { epsg: number; width: number; height: number; geotransform: number[] }; files: Record<string, string> }[]) {
    const png = c.files?.overlay_png;
    if (!png || c.grid.epsg !== 4326) continue; // projected grids are not rectangles in lat/lon
    const [x0, dx, , y0, , dy] = c.grid.geotransform;
    const south = Math.min(y0, y0 + c.grid.height * dy);
    const north = Math.max(y0, y0 + c.grid.height * dy);
    const west = Math.min(x0, x0 + c.grid.width * dx);
    const east = Math.max(x0, x0 + c.grid.width * dx);
    coverage.push({ id: c.id, label: `Coverage ${c.id} (${c.method})`, href: `coverage/${urlPathSegment(png)}`, bounds: [[south, west], [north, east]] });
    lats.push(south, north);
    lons.push(west, east);
  }
  const pad = (lo: number, hi: number) => Math.max((hi - lo) * 0.08, 0.01);
  const [s0, n0, w0, e0] = [Math.min(...lats), Math.max(...lats), Math.min(...lons), Math.max(...lons)];
  const bounds: Bounds = [
    [s0 - pad(s0, n0), w0 - pad(w0, e0)],
    [n0 + pad(s0, n0), e0 + pad(w0, e0)],
  ];
  const byId = new Map(r.sites.map((x) => [x.id, x]));
  const links = r.links.map((l) => {
    const a = byId.get(l.from)!;
    const b = byId.get(l.to)!;
    const v = linkVerdict(l);
    return { id: l.id, from: [a.lat_deg, a.lon_deg] as [number, number], to: [b.lat_deg, b.lon_deg] as [number, number], verdict: v, label: `${a.name} → ${b.name}`, href: `links/${urlPathSegment(l.id)}/index.html` };
  });
  return {
    bounds,
    hillshade: "constant_m" in s.study.terrain ? null : await shadeImage(s, bounds),
    sites: r.sites.map((x) => ({ id: x.id, name: x.name, lat: x.lat_deg, lon: x.lon_deg, ground_m: x.ground_m })),
    links,
    coverage,
  };
}

async function shadeImage(s: AnalyzedStudy, b: Bounds): Promise<LiveMapData["hillshade"]> {
  const [[south, west], [north, east]] = b;
  const [ns, ew] = metresPerDegree((south + north) / 2);
  const wide = (east - west) * ew >= (north - south) * ns;
  const width = wide ? SHADE_PX : Math.max(8, Math.round((SHADE_PX * (east - west) * ew) / ((north - south) * ns)));
  const height = wide ? Math.max(8, Math.round((SHADE_PX * (north - south) * ns) / ((east - west) * ew))) : SHADE_PX;
  const stored = await s.remember("live-map-relief", { b, width, height }, [import.meta.url], (terrain) => {
    const z: (number | null)[] = [];
    for (let row = 0; row < height; row++)
      for (let col = 0; col < width; col++) {
        const v = terrain.elevation(north - ((row + 0.5) * (north - south)) / height, west + ((col + 0.5) * (east - west)) / width);
        z.push(Number.isFinite(v) ? v : null);
      }
    return z;
  }, [widened({ lat_min: south, lat_max: north, lon_min: west, lon_max: east })]); // the relief reads the whole box, beyond the sites
  const z = Float64Array.from(stored, (v) => (v === null ? NaN : v));
  const { shade, valid } = hillshade(z, width, height, { dx_m: ((east - west) * ew) / width, dy_m: ((north - south) * ns) / height, azimuth_deg: 315, altitude_deg: 45 });
  let lo = Infinity;
  let hi = -Infinity;
  z.forEach((v, i) => {
    if (valid[i]) (lo = Math.min(lo, v)), (hi = Math.max(hi, v));
  });
  if (!Number.isFinite(lo)) return null;
  const href = await rgbaPngDataUri(shadedRelief(z, shade, valid, lo, hi), width, height);
  return { href, bounds: b, label: `Shaded relief${s.result.terrain.synthetic ? " (synthetic terrain)" : ""}` };
}

/** JSON for a `<script type="application/json">` block: "<" escaped so no text can end the block. */
export function scriptJson(v: unknown): string {
  return JSON.stringify(v).replace(/</g, "\\u003c").replace(/\u2028/g, "\\u2028").replace(/\u2029/g, "\\u2029");
}
