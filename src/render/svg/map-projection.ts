import { geoDistance, geoTransverseMercator, type GeoProjection } from "d3-geo";

/** Mean Earth radius (m) used only to turn the spherical map scale into metres (IUGG R1). */
const MAP_EARTH_RADIUS_M = 6_371_008.8;

/**
 * A map height (px) for a frame `width` px wide that follows the aspect of the sites' fitted
 * extent, clamped to `range`, so that a tall or a wide network fills its frame.
 */
export function mapHeightFor(points: { lat_deg: number; lon_deg: number }[], width: number, margin_px: number, range: [number, number]): number {
  const probe = fitMapProjection(points, width, width, margin_px);
  const xy = points.map((p) => probe([p.lon_deg, p.lat_deg]) ?? [0, 0]);
  const w = Math.max(...xy.map((q) => q[0])) - Math.min(...xy.map((q) => q[0]));
  const h = Math.max(...xy.map((q) => q[1])) - Math.min(...xy.map((q) => q[1]));
  const inner = width - 2 * margin_px;
  const ideal = w > 0 ? (inner * Math.max(h, 1)) / w + 2 * margin_px : range[1];
  return Math.round(Math.min(range[1], Math.max(range[0], ideal * 1.1)));
}

/**
 * A transverse Mercator projection centred on the sites' central meridian and fitted, with a
 * margin, to their extent inside a `width` × `height` frame (pixels). A single site or a very
 * small cluster gets at least ±0.01° around it.
 */
export function fitMapProjection(points: { lat_deg: number; lon_deg: number }[], width: number, height: number, margin_px = 48): GeoProjection {
  const lats = points.map((p) => p.lat_deg);
  const lons = points.map((p) => p.lon_deg);
  let [s, n] = [Math.min(...lats), Math.max(...lats)];
  let [w, e] = [Math.min(...lons), Math.max(...lons)];
  const padLat = Math.max((n - s) * 0.08, 0.01);
  const padLon = Math.max((e - w) * 0.08, 0.01);
  s -= padLat;
  n += padLat;
  w -= padLon;
  e += padLon;
  const lon0 = (w + e) / 2;
  const box = { type: "MultiPoint" as const, coordinates: [[w, s], [e, s], [e, n], [w, n], [lon0, s], [lon0, n]] };
  return geoTransverseMercator()
    .rotate([-lon0, 0])
    .fitExtent(
      [
        [margin_px, margin_px],
        [width - margin_px, height - margin_px],
      ],
      box,
    );
}

/**
 * Ground distance (m) per pixel at a point of the map, east–west and north–south, measured
 * on the sphere between the inverse-projected neighbours (spherical: within about 0.5 % of the
 * ellipsoid, enough for a scale bar and for shading).
 */
export function metresPerPixel(projection: GeoProjection, x: number, y: number): { dx_m: number; dy_m: number } {
  const inv = (px: number, py: number) => projection.invert!([px, py]) as [number, number];
  const h = 20;
  const dx_m = (geoDistance(inv(x - h, y), inv(x + h, y)) * MAP_EARTH_RADIUS_M) / (2 * h);
  const dy_m = (geoDistance(inv(x, y - h), inv(x, y + h)) * MAP_EARTH_RADIUS_M) / (2 * h);
  return { dx_m, dy_m };
}
