/**
 * EPSG code of the WGS84 / UTM zone holding a point: 326zz north of the equator, 327zz south,
 * zz = floor((lon + 180)/6) + 1 (1…60). The standard 6° zones only: the exceptions around
 * Norway and Svalbard are not applied (a neighbouring zone is as usable for a local grid).
 * @param lat_deg WGS84 latitude (deg)
 * @param lon_deg WGS84 longitude (deg)
 */
export function utmEpsgFor(lat_deg: number, lon_deg: number): number {
  const lon = ((((lon_deg + 180) % 360) + 360) % 360) - 180;
  const zone = Math.min(60, Math.floor((lon + 180) / 6) + 1);
  return (lat_deg < 0 ? 32700 : 32600) + zone;
}
