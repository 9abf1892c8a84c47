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
  const n = d_m.length;
  const d = d_m[n - 1] / 1000;
  let v1 = 0;
  let v2 = 0;
  for (let i = 1; i < n; i++) {
    const di = d_m[i] / 1000;
    const dp = d_m[i - 1] / 1000;
    const hi = h_m[i];
    const hp = h_m[i - 1];
    v1 += (di - dp) * (hi + hp); // P.526-15 §4.5.2 (v1)
    v2 += (di - dp) * (hi * (2 * di + dp) + hp * (di + 2 * dp)); // P.526-15 §4.5.2 (v2)
  }
  const hst = (2 * v1 * d - v2) / (d * d); // P.526-15 §4.5.2 (hst)
  const hsr = (v2 - v1 * d) / (d * d); // P.526-15 §4.5.2 (hsr)

  let hobs = -Infinity;
  let aobt = -Infinity;
  let aobr = -Infinity;
  for (let i = 1; i < n - 1; i++) {
    const di = d_m[i] / 1000;
    const HH = h_m[i] - (hts_m * (d - di) + hrs_m * di) / d; // P.526-15 §4.5.2 (HH_i)
    if (HH > hobs) hobs = HH;
    const at = HH / di;
    if (at > aobt) aobt = at;
    const ar = HH / (d - di);
    if (ar > aobr) aobr = ar;
  }
  let hstp = hst;
  let hsrp = hsr;
  if (hobs > 0) {
    const gt = aobt / (aobt + aobr); // P.526-15 §4.5.2 (gt)
    const gr = aobr / (aobt + aobr); // P.526-15 §4.5.2 (gr)
    hstp = hst - hobs * gt; // P.526-15 §4.5.2 (hstp)
    hsrp = hsr - hobs * gr; // P.526-15 §4.5.2 (hsrp)
  }
  const hstd = hstp > h_m[0] ? h_m[0] : hstp; // P.526-15 §4.5.2 (hstd)
  const hsrd = hsrp > h_m[n - 1] ? h_m[n - 1] : hsrp; // P.526-15 §4.5.2 (hsrd)
  return {
    hst_m: hst,
    hsr_m: hsr,
    hstp_m: hstp,
    hsrp_m: hsrp,
    hstd_m: hstd,
    hsrd_m: hsrd,
    hts_prime_m: hts_m - hstd, // P.452-17 eq. (38a)
    hrs_prime_m: hrs_m - hsrd, // P.452-17 eq. (38b)
    hobs_m: hobs,
  };
}
