/** Smooth-Earth surface heights of a profile and the effective antenna heights over it. */
export interface SmoothEarthHeights {
  /** least-squares smooth-surface height at Tx, hst (m amsl) */
  hst_m: number;
  /** least-squares smooth-surface height at Rx, hsr (m amsl) */
  hsr_m: number;
  /** hst lowered for the highest obstruction, hstp (m amsl) */
  hstp_m: number;
  /** hsr lowered for the highest obstruction, hsrp (m amsl) */
  hsrp_m: number;
  /** hstp clipped to the ground height at Tx, hstd (m amsl) */
  hstd_m: number;
  /** hsrp clipped to the ground height at Rx, hsrd (m amsl) */
  hsrd_m: number;
  /** Tx antenna height above the smooth surface, hts' = hts − hstd (m) */
  hts_prime_m: number;
  /** Rx antenna height above the smooth surface, hrs' = hrs − hsrd (m) */
  hrs_prime_m: number;
  /** height of the highest obstruction above the Tx–Rx line, hobs (m) */
  hobs_m: number;
}

/**
 * Smooth-Earth surface for the delta-Bullington method and the effective antenna heights
 * above it.
 *
 * Method: ITU-R P.526-15 §4.5.2 with the surface of P.452-17 (least-squares straight line,
 * then lowered so that the highest obstruction does not rise above the line joining the
 * antennas; d_i in km, h_i in m):
 *   v1 = Σ_{i=2..n} (d_i − d_{i−1})(h_i + h_{i−1}),
 *   v2 = Σ_{i=2..n} (d_i − d_{i−1})[h_i(2d_i + d_{i−1}) + h_{i−1}(d_i + 2d_{i−1})],
 *   hst = (2·v1·d − v2)/d², hsr = (v2 − v1·d)/d²;
 *   HH_i = h_i − [hts·(d − d_i) + hrs·d_i]/d, hobs = max HH_i, αobt = max HH_i/d_i,
 *   αobr = max HH_i/(d − d_i) over inner samples; gt = αobt/(αobt + αobr), gr = αobr/(αobt + αobr);
 *   hobs ≤ 0: hstp = hst, hsrp = hsr; else hstp = hst − hobs·gt, hsrp = hsr − hobs·gr;
 *   hstd = min(hstp, h_1), hsrd = min(hsrp, h_n); hts' = hts − hstd, hrs' = hrs − hsrd
 *   (P.452-17 eq. (38)).
 * No Earth curvature enters (the heights are the profile's). (Equation numbers other than
 * (38) are not quoted: the tags name the section and the quantity.)
 * @param d_m distances from Tx (m), strictly increasing, first 0
 * @param h_m heights amsl (m)
 * @param hts_m Tx antenna height amsl (m)
 * @param hrs_m Rx antenna height amsl (m)
 * @returns the surface heights and effective antenna heights (m)
 */
export function smoothEarthHeights(d_m: ArrayLike<number>, h_m: ArrayLike<number>, hts_m: number, hrs_m: number): SmoothEarthHeights {
  return smoothSurface(d_m, 1 / 1000, h_m, hts_m, hrs_m, newSmoothEarthHeights());
}

/** A `SmoothEarthHeights` filled with NaN, for reuse by `smoothSurface`. */
export function newSmoothEarthHeights(): SmoothEarthHeights {
  return { hst_m: NaN, hsr_m: NaN, hstp_m: NaN, hsrp_m: NaN, hstd_m: NaN, hsrd_m: NaN, hts_prime_m: NaN, hrs_prime_m: NaN, hobs_m: NaN };
}

/**
 * The computation of `smoothEarthHeights` for distances in any unit (`d_to_km` converts them
 * to km), written into `out` without allocating: the one home of the smooth-surface fit,
 * used by the delta-Bullington method (distances in m) and by the ITU path analysis of
 * P.1812-6 / P.452-18 (`itu-path-geometry.ts`, distances in km; there the equations are
 * P.1812-6 eq. (85)–(89)).
 * @param d distances from Tx, first 0
 * @param d_to_km factor from the unit of `d` to km (1/1000 for m, 1 for km)
 * @param h_m heights amsl (m)
 * @param hts_m Tx antenna height amsl (m)
 * @param hrs_m Rx antenna height amsl (m)
 * @param out object to fill
 * @returns `out`
 */
export function smoothSurface(d: ArrayLike<number>, d_to_km: number, h_m: ArrayLike<number>, hts_m: number, hrs_m: number, out: SmoothEarthHeights): SmoothEarthHeights {
  const n = d.length;
  const dt = d[n - 1] * d_to_km;
  let v1 = 0;
  let v2 = 0;
  for (let i = 1; i < n; i++) {
    const di = d[i] * d_to_km;
    const dp = d[i - 1] * d_to_km;
    const hi = h_m[i];
    const hp = h_m[i - 1];
    v1 += (di - dp) * (hi + hp); // P.526-15 §4.5.2 (v1); P.1812-6 eq. (85)
    v2 += (di - dp) * (hi * (2 * di + dp) + hp * (di + 2 * dp)); // P.526-15 §4.5.2 (v2); P.1812-6 eq. (86)
  }
  const hst = (2 * v1 * dt - v2) / (dt * dt); // P.526-15 §4.5.2 (hst)
  const hsr = (v2 - v1 * dt) / (dt * dt); // P.526-15 §4.5.2 (hsr)

  let hobs = -Infinity;
  let aobt = -Infinity;
  let aobr = -Infinity;
  for (let i = 1; i < n - 1; i++) {
    const di = d[i] * d_to_km;
    const HH = h_m[i] - (hts_m * (dt - di) + hrs_m * di) / dt; // P.526-15 §4.5.2 (HH_i); P.1812-6 eq. (87d)
    if (HH > hobs) hobs = HH;
    const at = HH / di;
    if (at > aobt) aobt = at;
    const ar = HH / (dt - di);
    if (ar > aobr) aobr = ar;
  }
  let hstp = hst;
  let hsrp = hsr;
  if (hobs > 0) {
    const gt = aobt / (aobt + aobr); // P.526-15 §4.5.2 (gt); P.1812-6 eq. (88e)
    const gr = aobr / (aobt + aobr); // P.526-15 §4.5.2 (gr); P.1812-6 eq. (88f)
    hstp = hst - hobs * gt; // P.526-15 §4.5.2 (hstp)
    hsrp = hsr - hobs * gr; // P.526-15 §4.5.2 (hsrp)
  }
  const hstd = hstp > h_m[0] ? h_m[0] : hstp; // P.526-15 §4.5.2 (hstd); P.1812-6 eq. (89)
  const hsrd = hsrp > h_m[n - 1] ? h_m[n - 1] : hsrp; // P.526-15 §4.5.2 (hsrd); P.1812-6 eq. (89)
  out.hst_m = hst;
  out.hsr_m = hsr;
  out.hstp_m = hstp;
  out.hsrp_m = hsrp;
  out.hstd_m = hstd;
  out.hsrd_m = hsrd;
  out.hts_prime_m = hts_m - hstd; // P.452-17 eq. (38a)
  out.hrs_prime_m = hrs_m - hsrd; // P.452-17 eq. (38b)
  out.hobs_m = hobs;
  return out;
}
