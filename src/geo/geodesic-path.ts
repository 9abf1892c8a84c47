import geographiclib from "geographiclib-geodesic";

// The package is CommonJS; its runtime export is a default object holding the named members.
const { Geodesic } = geographiclib as unknown as typeof import("geographiclib-geodesic");

/** A geodesic between two points on the WGS84 ellipsoid. */
export interface GeodesicPath {
  /** Length of the geodesic (m). */
  distance_m: number;
  /** Azimuth at the start toward the end (deg, 0–360 clockwise from true north). */
  azimuth_from_deg: number;
  /** Azimuth at the end toward the start (deg, 0–360 clockwise from true north). */
  azimuth_to_deg: number;
  /** Latitudes (deg) of the samples, first and last are the ends. */
  lat_deg: Float64Array;
  /** Longitudes (deg) of the samples. */
  lon_deg: Float64Array;
  /** Distance from the start of each sample (m). */
  d_m: Float64Array;
  /** Spacing between samples (m); the last interval is the same length. */
  step_m: number;
}

/** Normalise an angle (deg) into [0, 360). */
export function normalizeAzimuthDeg(azi: number): number {
  const a = azi % 360;
  return a < 0 ? a + 360 : a === 360 ? 0 : a;
}

/** Length (m) of the WGS84 geodesic between two points (GeographicLib inverse problem, Karney 2013). */
export function geodesicDistanceM(lat1_deg: number, lon1_deg: number, lat2_deg: number, lon2_deg: number): number {
  return Geodesic.WGS84.Inverse(lat1_deg, lon1_deg, lat2_deg, lon2_deg, Geodesic.DISTANCE).s12 ?? NaN;
}

/**
 * The WGS84 geodesic from (lat1, lon1) to (lat2, lon2), sampled at equal steps no longer
 * than `maxStep_m`. Method: GeographicLib's inverse problem and geodesic line (Karney 2013,
 * "Algorithms for geodesics", J. Geodesy 87, 43–55), accurate to about 15 nm.
 * @param lat1_deg start latitude (deg)
 * @param lon1_deg start longitude (deg)
 * @param lat2_deg end latitude (deg)
 * @param lon2_deg end longitude (deg)
 * @param maxStep_m largest allowed spacing between samples (m)
 */
export function geodesicPath(
  lat1_deg: number,
  lon1_deg: number,
  lat2_deg: number,
  lon2_deg: number,
  maxStep_m: number,
): GeodesicPath {
  const g = Geodesic.WGS84;
  const inv = g.Inverse(lat1_deg, lon1_deg, lat2_deg, lon2_deg);
  const distance_m = inv.s12 ?? NaN;
  const azimuth_from_deg = normalizeAzimuthDeg(inv.azi1 ?? NaN);
  // azi2 is the forward azimuth at the end; the bearing back to the start is opposite.
  const azimuth_to_deg = normalizeAzimuthDeg((inv.azi2 ?? NaN) + 180);
  const intervals = Math.max(1, Math.ceil(distance_m / maxStep_m - 1e-9));
  const step_m = distance_m / intervals;
  const n = intervals + 1;
  const lat_deg = new Float64Array(n);
  const lon_deg = new Float64Array(n);
  const d_m = new Float64Array(n);
  const line = g.InverseLine(lat1_deg, lon1_deg, lat2_deg, lon2_deg, Geodesic.STANDARD | Geodesic.DISTANCE_IN);
  for (let i = 0; i < n; i++) {
    const s = i === intervals ? distance_m : i * step_m;
    d_m[i] = s;
    if (i === 0) {
      lat_deg[i] = lat1_deg;
      lon_deg[i] = lon1_deg;
    } else if (i === intervals) {
      lat_deg[i] = lat2_deg;
      lon_deg[i] = lon2_deg;
    } else {
      const p = line.Position(s, Geodesic.LATITUDE | Geodesic.LONGITUDE);
      lat_deg[i] = p.lat2 ?? NaN;
      lon_deg[i] = p.lon2 ?? NaN;
    }
  }
  return { distance_m, azimuth_from_deg, azimuth_to_deg, lat_deg, lon_deg, d_m, step_m };
}
