const A_M = 6_378_137; // WGS84 semi-major axis (m)
const F = 1 / 298.257223563; // WGS84 flattening
const E2 = F * (2 - F); // first eccentricity squared
const DEG = Math.PI / 180;

/**
 * Ground length (m) of one degree of latitude (north–south) and of longitude (east–west)
 * at geodetic latitude lat on the WGS84 ellipsoid, from the meridional and prime-vertical
 * radii of curvature M = a(1−e²)/(1−e² sin²φ)^{3/2} and N = a/(1−e² sin²φ)^{1/2}
 * (standard ellipsoid geometry). Exact for infinitesimal steps; for one grid step of a
 * few arc-seconds the error is far below a millimetre.
 * @param lat_deg geodetic latitude (deg)
 * @returns [north–south (m per deg), east–west (m per deg)]
 */
export function metresPerDegree(lat_deg: number): [number, number] {
  const s = Math.sin(lat_deg * DEG);
  const w2 = 1 - E2 * s * s;
  const M = (A_M * (1 - E2)) / (w2 * Math.sqrt(w2));
  const N = A_M / Math.sqrt(w2);
  return [M * DEG, N * Math.cos(lat_deg * DEG) * DEG];
}
