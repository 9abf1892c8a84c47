import { utmZone } from "./transverse-mercator.ts";

/** A coordinate reference system the terrain readers understand, with its projection. */
export interface Crs {
  epsg: number;
  /** true for EPSG:4326 (x = longitude, y = latitude, degrees) */
  geographic: boolean;
  /** e.g. "EPSG:4326 (WGS84 geographic)", "EPSG:32632 (WGS84 / UTM zone 32N)" */
  name: string;
  /** WGS84 lat/lon (deg) → CRS [x, y] */
  toCrs(lat_deg: number, lon_deg: number): [number, number];
  /** CRS x, y → WGS84 [lat, lon] (deg) */
  fromCrs(x: number, y: number): [number, number];
}

/**
 * The CRS for an EPSG code: 4326 (WGS84 geographic, identity with x = lon, y = lat) or a
 * WGS84 UTM zone, 326zz (north) / 327zz (south), zz = 1…60, projected by our transverse
 * Mercator (src/geo/transverse-mercator.ts, Krüger's series after Karney 2011) from the
 * zone's definition, not looked up in an EPSG database. Returns null for any other code.
 */
export function crsFromEpsg(epsg: number): Crs | null {
  if (epsg === 4326) {
    return {
      epsg,
      geographic: true,
      name: "EPSG:4326 (WGS84 geographic)",
      toCrs: (lat_deg, lon_deg) => [lon_deg, lat_deg],
      fromCrs: (x, y) => [y, x],
    };
  }
  const zone = epsg % 100;
  const hemisphere = Math.floor(epsg / 100);
  if (!Number.isInteger(epsg) || zone < 1 || zone > 60 || (hemisphere !== 326 && hemisphere !== 327)) {
    return null;
  }
  const south = hemisphere === 327;
  const utm = utmZone(zone, south);
  return {
    epsg,
    geographic: false,
    name: `EPSG:${epsg} (WGS84 / UTM zone ${zone}${south ? "S" : "N"})`,
    toCrs: (lat_deg, lon_deg) => utm.forward(lat_deg, lon_deg),
    fromCrs: (x, y) => utm.inverse(x, y),
  };
}
