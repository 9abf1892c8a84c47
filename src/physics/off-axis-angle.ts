/**
 * Pointing geometry of fixed-link antennas: the elevation of one antenna seen from another
 * over a curved Earth, and the angle between an antenna's boresight and a direction.
 */

/**
 * Elevation angle (deg) of a point seen from an antenna, over a smooth Earth of effective
 * radius ae: θ = atan((h2 − h1)/d − d/(2·ae)). Reference: spherical-Earth geometry, the form of
 * the terminal elevation angles θtd, θrd of ITU-R P.452-18 Attachment 2 to Annex 1 §5.1.1
 * (there in mrad, small-angle); here as an angle. Valid for d ≪ ae.
 * @param h1_m height of the antenna (m amsl)
 * @param h2_m height of the point (m amsl)
 * @param d_m great-circle distance (m), > 0
 * @param ae_m effective Earth radius (m); Infinity for a flat Earth
 */
export function elevationDeg(h1_m: number, h2_m: number, d_m: number, ae_m: number): number {
  if (!(d_m > 0)) return NaN;
  const curvature = Number.isFinite(ae_m) ? d_m / (2 * ae_m) : 0;
  return (Math.atan((h2_m - h1_m) / d_m - curvature) * 180) / Math.PI; // P.452-18 Att. 2 §5.1.1 (θtd form)
}

/** Signed azimuth difference a − b (deg) wrapped into (−180, 180]. */
export function azimuthDifferenceDeg(a_deg: number, b_deg: number): number {
  let d = (a_deg - b_deg) % 360;
  if (d > 180) d -= 360;
  if (d <= -180) d += 360;
  return d;
}

/** Off-axis direction of a target relative to a boresight. */
export interface OffAxis {
  /** total angle between the boresight and the target direction (deg), 0–180 */
  theta_deg: number;
  /** target azimuth minus boresight azimuth (deg), −180–180 */
  azimuth_deg: number;
  /** target elevation minus boresight elevation (deg) */
  elevation_deg: number;
  /** direction of the offset from the horizontal plane (deg), 0–90 (for envelope weighting) */
  psi_deg: number;
}

/**
 * Angle between a boresight (azimuth, elevation) and a target direction, by the spherical law
 * of cosines: cos θ = sin e_b·sin e_t + cos e_b·cos e_t·cos(Δaz) (exact on the unit sphere).
 * @param boresight_az_deg boresight azimuth (deg from true north)
 * @param boresight_el_deg boresight elevation (deg)
 * @param target_az_deg target azimuth (deg)
 * @param target_el_deg target elevation (deg)
 */
export function offAxisAngle(boresight_az_deg: number, boresight_el_deg: number, target_az_deg: number, target_el_deg: number): OffAxis {
  const r = Math.PI / 180;
  const daz = azimuthDifferenceDeg(target_az_deg, boresight_az_deg);
  const eb = boresight_el_deg * r;
  const et = target_el_deg * r;
  const c = Math.sin(eb) * Math.sin(et) + Math.cos(eb) * Math.cos(et) * Math.cos(daz * r); // spherical law of cosines
  const theta_deg = Math.acos(Math.max(-1, Math.min(1, c))) / r;
  const del = target_el_deg - boresight_el_deg;
  const horiz = Math.abs(daz) * Math.cos(eb);
  const psi_deg = horiz === 0 && del === 0 ? 0 : (Math.atan2(Math.abs(del), horiz) * 180) / Math.PI;
  return { theta_deg, azimuth_deg: daz, elevation_deg: del, psi_deg };
}
