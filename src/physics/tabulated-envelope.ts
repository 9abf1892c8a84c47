/**
 * A tabulated radiation pattern envelope: attenuation relative to the boresight gain (dB,
 * ≥ 0) against off-axis angle 0–180°, co-polar and cross-polar, in the horizontal and the
 * vertical plane (the neutral CSV of `src/study/envelope-csv.ts`). Symmetric about the
 * boresight: the angle is taken as its magnitude.
 */
export interface TabulatedEnvelope {
  /** off-axis angles (deg), strictly rising from 0 to 180 */
  angle_deg: Float64Array;
  /** attenuations (dB) at each angle */
  h_copolar_db: Float64Array;
  h_crosspolar_db: Float64Array;
  v_copolar_db: Float64Array;
  v_crosspolar_db: Float64Array;
}

/**
 * Linear interpolation of one column at an angle folded into 0–180°.
 * @param angle_deg rising angles (deg) from 0 to 180
 * @param att_db attenuations (dB)
 * @param phi_deg off-axis angle (deg)
 */
export function interpolateEnvelopeDb(angle_deg: ArrayLike<number>, att_db: ArrayLike<number>, phi_deg: number): number {
  if (!Number.isFinite(phi_deg)) return NaN;
  let phi = Math.abs(phi_deg) % 360;
  if (phi > 180) phi = 360 - phi;
  let lo = 0;
  let hi = angle_deg.length - 1;
  if (hi < 1 || phi < angle_deg[0] || phi > angle_deg[hi]) return NaN;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (angle_deg[mid] <= phi) lo = mid;
    else hi = mid;
  }
  const t = (phi - angle_deg[lo]) / (angle_deg[hi] - angle_deg[lo]);
  return att_db[lo] + t * (att_db[hi] - att_db[lo]);
}

/**
 * Attenuation (dB) of a tabulated envelope toward a direction `theta_deg` off the boresight,
 * whose offset lies at `psi_deg` from the horizontal plane (0: purely in azimuth, 90: purely
 * in elevation). Between the planes the two cuts are weighted by cos²ψ and sin²ψ, an
 * interpolation commonly used when only the two principal cuts are known (common practice;
 * the weighting is our choice, stated in the report).
 * @param env the envelope
 * @param theta_deg total off-axis angle (deg)
 * @param psi_deg direction of the offset from the horizontal plane (deg)
 * @param cross true for the cross-polar columns
 */
export function envelopeAttenuationDb(env: TabulatedEnvelope, theta_deg: number, psi_deg: number, cross: boolean): number {
  const h = interpolateEnvelopeDb(env.angle_deg, cross ? env.h_crosspolar_db : env.h_copolar_db, theta_deg);
  const v = interpolateEnvelopeDb(env.angle_deg, cross ? env.v_crosspolar_db : env.v_copolar_db, theta_deg);
  const c = Math.cos((psi_deg * Math.PI) / 180) ** 2;
  return h * c + v * (1 - c);
}
