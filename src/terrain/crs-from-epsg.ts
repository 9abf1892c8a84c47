import proj4 from "proj4";

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
 * WGS84 UTM zone, 326zz (north) / 327zz (south), zz = 1…60. UTM is projected with proj4
 * from a definition built here (`+proj=utm +zone=zz [+south] +datum=WGS84`), not looked
 * up in an EPSG database. Returns null for any other code.
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
  const def = `+proj=utm +zone=${zone}${south ? " +south" : ""} +datum=WGS84 +units=m +no_defs`;
  const converter = proj4("+proj=longlat +datum=WGS84 +no_defs", def);
  return {
    epsg,
    geographic: false,
    name: `EPSG:${epsg} (WGS84 / UTM zone ${zone}${south ? "S" : "N"})`,
    toCrs: (lat_deg, lon_deg) => {
      const p = converter.forward([lon_deg, lat_deg]);
      return [p[0], p[1]];
    },
    fromCrs: (x, y) => {
      const p = converter.inverse([x, y]);
      return [p[1], p[0]];
    },
  };
}
