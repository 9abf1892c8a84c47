/** A latitude/longitude box (deg); `lon_min` may exceed `lon_max` when the box crosses 180°. */
export interface LatLonBox {
  lat_min: number;
  lat_max: number;
  lon_min: number;
  lon_max: number;
}

/** Metres per degree of latitude (mean; the boxes below are generous, so a sphere will do). */
const M_PER_DEG = 111_195;
/** Added on every side of every box (deg): about 5.5 km, well beyond a geodesic's bow or a grid's rounding. */
const MARGIN_DEG = 0.05;

/**
 * Where a study can read terrain, found from its geometry before anything is read: boxes
 * that hold every point any part of a build samples. Used so that the terrain's content key
 * hashes only the tiles a study touches (terrain-source-key.ts).
 *
 * - The sites' box, which holds every link, interference path and external transmitter (all
 *   run between sites; a geodesic's bow out of the box is far below the margin for any link
 *   shorter than a few hundred km) and the ground under each site.
 * - Each coverage: its site ± 1.5 × radius (the grid is a square around the circle, and a
 *   cell's profile runs from the site).
 * The overview map's shaded relief reaches further (its frame is fitted to the sites with
 * margins); it is remembered under a key over the tiles of its own frame (study-map.ts).
 * Every box is widened by 0.05° on each side. A box reaching within 1° of a pole takes every
 * longitude.
 */
export function terrainExtent(sites: readonly { lat_deg: number; lon_deg: number }[], coverages: readonly { lat_deg: number; lon_deg: number; radius_km: number }[]): LatLonBox[] {
  const boxes: LatLonBox[] = [];
  const finite = sites.filter((s) => Number.isFinite(s.lat_deg) && Number.isFinite(s.lon_deg));
  if (finite.length) {
    const lat0 = Math.min(...finite.map((s) => s.lat_deg));
    const lat1 = Math.max(...finite.map((s) => s.lat_deg));
    // longitudes relative to the first site, so a study across 180° has a small box
    const ref = finite[0].lon_deg;
    const rel = finite.map((s) => ((((s.lon_deg - ref) % 360) + 540) % 360) - 180);
    const lon0 = ref + Math.min(...rel);
    const lon1 = ref + Math.max(...rel);
    boxes.push(widened({ lat_min: lat0, lat_max: lat1, lon_min: lon0, lon_max: lon1 }));
  }
  for (const c of coverages) {
    if (!Number.isFinite(c.lat_deg) || !Number.isFinite(c.lon_deg) || !Number.isFinite(c.radius_km)) continue;
    const far = Math.min(Math.abs(c.lat_deg) + (1.5 * c.radius_km * 1000) / M_PER_DEG, 90);
    boxes.push(around(c.lat_deg, c.lon_deg, 1.5 * c.radius_km * 1000, Math.max(Math.cos((far * Math.PI) / 180), 1e-6)));
  }
  return boxes;
}

/** A box widened by the margin on each side (every longitude near a pole or past a half turn). */
export function widened(b: LatLonBox): LatLonBox {
  const lat_min = Math.max(b.lat_min - MARGIN_DEG, -90);
  const lat_max = Math.min(b.lat_max + MARGIN_DEG, 90);
  const span = (b.lon_max >= b.lon_min ? b.lon_max - b.lon_min : b.lon_max + 360 - b.lon_min) + 2 * MARGIN_DEG;
  if (lat_min <= -89 || lat_max >= 89 || span >= 360) return { lat_min, lat_max, lon_min: -180, lon_max: 180 };
  return { lat_min, lat_max, lon_min: wrap(b.lon_min - MARGIN_DEG), lon_max: wrap(b.lon_max + MARGIN_DEG) };
}

/** The box ± `half_m` around a point, longitudes scaled by `cos_lat` (the cosine at the box's poleward edge). */
function around(lat: number, lon: number, half_m: number, cos_lat: number): LatLonBox {
  const dLat = half_m / M_PER_DEG + MARGIN_DEG;
  const lat_min = Math.max(lat - dLat, -90);
  const lat_max = Math.min(lat + dLat, 90);
  const dLon = half_m / (M_PER_DEG * cos_lat) + MARGIN_DEG;
  if (lat_min <= -89 || lat_max >= 89 || dLon >= 180) return { lat_min, lat_max, lon_min: -180, lon_max: 180 };
  return { lat_min, lat_max, lon_min: wrap(lon - dLon), lon_max: wrap(lon + dLon) };
}

/** Longitude into [−180, 180). */
function wrap(lon: number): number {
  return ((((lon + 180) % 360) + 360) % 360) - 180;
}

/**
 * The one-degree tiles whose closed square meets any of the boxes, as "lat,lon" of their
 * south-west corners ("46,7" for N46E007.hgt): a point on a tile's edge may be read from
 * either neighbour.
 */
export function tilesInExtent(boxes: readonly LatLonBox[]): Set<string> {
  const names = new Set<string>();
  for (const b of boxes) {
    const lat0 = Math.max(Math.floor(b.lat_min) - (Number.isInteger(b.lat_min) ? 1 : 0), -90);
    const lat1 = Math.min(Math.floor(b.lat_max), 89);
    // longitudes as a run of whole degrees from the box's west edge, across 180° when it wraps
    const span = b.lon_max >= b.lon_min ? b.lon_max - b.lon_min : b.lon_max + 360 - b.lon_min;
    const w = Math.floor(b.lon_min) - (Number.isInteger(b.lon_min) ? 1 : 0);
    const e = Math.floor(b.lon_min + span);
    const lons = e - w >= 359 ? Array.from({ length: 360 }, (_, i) => i - 180) : Array.from({ length: e - w + 1 }, (_, i) => ((((w + i + 180) % 360) + 360) % 360) - 180);
    for (let lat = lat0; lat <= lat1; lat++) for (const lon of lons) names.add(`${lat},${lon}`);
  }
  return names;
}
