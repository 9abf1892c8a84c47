/**
 * SRTM tile name for the 1°×1° tile whose south-west corner is (lat, lon), e.g.
 * (46, 7) → "N46E007.hgt", (−34, −71) → "S34W071.hgt". Arguments are whole degrees.
 */
export function hgtTileName(lat_deg: number, lon_deg: number): string {
  const ns = lat_deg < 0 ? "S" : "N";
  const ew = lon_deg < 0 ? "W" : "E";
  return `${ns}${String(Math.abs(lat_deg)).padStart(2, "0")}${ew}${String(Math.abs(lon_deg)).padStart(3, "0")}.hgt`;
}

/** South-west corner (whole degrees) of a tile named like N46E007.hgt (any case), or null. */
export function parseHgtTileName(name: string): { lat_deg: number; lon_deg: number } | null {
  const m = /^([NS])(\d{2})([EW])(\d{3})\.hgt$/i.exec(name);
  if (!m) return null;
  const lat = Number(m[2]) * (m[1].toUpperCase() === "S" ? -1 : 1);
  const lon = Number(m[4]) * (m[3].toUpperCase() === "W" ? -1 : 1);
  if (lat < -90 || lat > 89 || lon < -180 || lon > 179) return null;
  return { lat_deg: lat, lon_deg: lon };
}
