import { knifeEdgeLossApprox } from "../physics/knife-edge.ts";
import { BLOCK1, BLOCK2, hullHighestAboveSlope, hullTangentFromRight, type RadialProfile } from "./radial-profile.ts";
import { smoothBullington } from "./smooth-bullington.ts";
import { sphericalEarthLossScalar, type SphericalGround } from "./spherical-earth-scalar.ts";

/** J(ν) of P.526-15 eq. (31) is 0 at and below this ν. */
const NU_J_ZERO = -0.78;

/** Per-coverage constants of the incremental delta-Bullington evaluation. */
export interface DeltaBullingtonConstants {
  /** wavelength (m) */
  lambda_m: number;
  /** effective Earth radius (m), Infinity allowed */
  ae_m: number;
  ground: SphericalGround;
}

/** Intermediates of the last evaluation (filled in place, for tests and diagnostics). */
export interface DeltaBullingtonParts {
  Lbulla: number;
  Lbulls: number;
  Ldsph: number;
  hts_prime_m: number;
  hrs_prime_m: number;
}

/**
 * Diffraction loss Ld (dB) of the delta-Bullington method (ITU-R P.526-15 §4.5) for a receiver
 * at distance d_m beyond the inner samples of `p`, evaluated from the radial's running state
 * instead of the whole profile. The profile is p's points 0…n−1 followed by the receiver's
 * ground (d_m, hR_m); the result equals `deltaBullingtonLoss` on that profile (ω = 0) to
 * rounding (test/coverage/incremental-delta-bullington.test.ts).
 *
 * How each quantity is reached (z = h − d²/(2ae), the flat-Earth frame of radial-profile.ts):
 * - Stim = max (z_i − hts)/d_i + d/(2ae): the running maximum;
 * - Srim = max (z_i − zR)/(d − d_i) − d/(2ae), zR = hrs − d²/(2ae): tangent from the receiver
 *   to the upper hull of (d_i, z_i);
 * - νmax (line of sight): exact maximum by branch and bound — each block of samples is
 *   skipped when an upper bound of ν over it, (max z − min L)·w, cannot beat the best value
 *   found (or −0.78, below which J(ν) = 0), w = sqrt(2d/(λ·x·(d − x))) taken at its largest
 *   or smallest over the block as the sign requires;
 * - smooth surface: v1, v2 are prefix sums plus the last segment; hobs = max h_i − line, at the
 *   hull vertex of (d_i, h_i) whose edges straddle the line's slope; αobt from the running
 *   maximum; αobr from the hull tangent;
 * - Lbulls (zero heights): each maximum over the inner samples is of a smooth function of d_i
 *   with a known continuous maximiser (smooth-bullington.ts);
 * - Ldsph by `sphericalEarthLossScalar`.
 * @param p the radial with its inner samples
 * @param d_m receiver distance (m), beyond p's last sample
 * @param hR_m receiver ground height (m amsl)
 * @param hrs_m receiver antenna height (m amsl)
 * @param c wavelength, effective radius and ground
 * @param parts optional: receives Lbulla, Lbulls, Ldsph, hts', hrs'
 * @returns Ld (dB); NaN for non-finite input
 */
export function deltaBullingtonIncremental(p: RadialProfile, d_m: number, hR_m: number, hrs_m: number, c: DeltaBullingtonConstants, parts?: DeltaBullingtonParts): number {
  const d = d_m;
  const hts = p.hts;
  const hrs = hrs_m;
  const lambda = c.lambda_m;
  const k2 = p.invTwoAe; // 1/(2ae)
  const n = p.n; // inner samples are 1…n−1
  const dkm = d / 1000;

  // --- Bullington, actual profile (P.526-15 §4.5.1) ---
  const Lbulla = bullingtonActualIncremental(p, d, hrs, lambda);

  // --- Smooth surface and effective heights (P.526-15 §4.5.2) ---
  const hLast = p.h[n - 1];
  const dLast = p.d[n - 1] / 1000;
  const v1 = p.v1 + (dkm - dLast) * (hR_m + hLast); // P.526-15 §4.5.2 (v1)
  const v2 = p.v2 + (dkm - dLast) * (hR_m * (2 * dkm + dLast) + hLast * (dkm + 2 * dLast)); // P.526-15 §4.5.2 (v2)
  const hst = (2 * v1 * dkm - v2) / (dkm * dkm); // P.526-15 §4.5.2 (hst)
  const hsr = (v2 - v1 * dkm) / (dkm * dkm); // P.526-15 §4.5.2 (hsr)
  let hstp = hst;
  let hsrp = hsr;
  if (n > 1) {
    const S = (hrs - hts) / d;
    const jo = hullHighestAboveSlope(p.hullH, p.nHullH, p.d, p.h, S);
    const hobs = p.h[jo] - (hts * (d - p.d[jo]) + hrs * p.d[jo]) / d; // P.526-15 §4.5.2 (hobs = max HH_i)
    if (hobs > 0) {
      const aobt = p.maxSlopeH - S; // P.526-15 §4.5.2 (αobt = max HH_i/d_i)
      const jr = hullTangentFromRight(p.hullH, p.nHullH, p.d, p.h, d, hrs);
      const aobr = (p.h[jr] - hrs) / (d - p.d[jr]) + S; // P.526-15 §4.5.2 (αobr = max HH_i/(d − d_i))
      const gt = aobt / (aobt + aobr); // P.526-15 §4.5.2 (gt)
      const gr = aobr / (aobt + aobr); // P.526-15 §4.5.2 (gr)
      hstp = hst - hobs * gt; // P.526-15 §4.5.2 (hstp)
      hsrp = hsr - hobs * gr; // P.526-15 §4.5.2 (hsrp)
    }
  }
  const h0 = p.h[0];
  const hstd = hstp > h0 ? h0 : hstp; // P.526-15 §4.5.2 (hstd)
  const hsrd = hsrp > hR_m ? hR_m : hsrp; // P.526-15 §4.5.2 (hsrd)
  const htsP = hts - hstd; // P.452-17 eq. (38a)
  const hrsP = hrs - hsrd; // P.452-17 eq. (38b)

  // --- Bullington, smooth profile of zero heights with hts', hrs' ---
  const Lbulls = smoothBullington(p.d, n, d, htsP, hrsP, lambda, k2);
  const Ldsph = sphericalEarthLossScalar(d, htsP, hrsP, c.ae_m, lambda, c.ground);
  const Ld = Lbulla + Math.max(Ldsph - Lbulls, 0); // P.526-15 §4.5.2 (Ld)
  if (parts !== undefined) {
    parts.Lbulla = Lbulla;
    parts.Lbulls = Lbulls;
    parts.Ldsph = Ldsph;
    parts.hts_prime_m = htsP;
    parts.hrs_prime_m = hrsP;
  }
  return Ldsph !== Ldsph ? NaN : Ld;
}

/**
 * Bullington loss Lbull (dB) of the actual profile (P.526-15 §4.5.1) for a receiver antenna at
 * hrs_m (m amsl) at distance d_m beyond p's inner samples, from the radial's running maximum
 * (Stim), hull tangent (Srim) and, for line of sight, the bounded νmax search.
 */
export function bullingtonActualIncremental(p: RadialProfile, d_m: number, hrs_m: number, lambda_m: number): number {
  const d = d_m;
  const hts = p.hts;
  const hrs = hrs_m;
  const k2 = p.invTwoAe;
  const Stim = p.n > 1 ? p.maxSlopeZ + d * k2 : -Infinity; // P.526-15 §4.5.1 (Stim)
  const Str = (hrs - hts) / d; // P.526-15 §4.5.1 (Str)
  let nu: number;
  if (Stim < Str) {
    nu = nuMaxLineOfSight(p, d, hrs, lambda_m);
  } else {
    const zR = hrs - d * d * k2;
    const j = hullTangentFromRight(p.hullZ, p.nHullZ, p.d, p.z, d, zR);
    const Srim = (p.z[j] - zR) / (d - p.d[j]) - d * k2; // P.526-15 §4.5.1 (Srim)
    const dbp = (hrs - hts + Srim * d) / (Stim + Srim); // P.526-15 §4.5.1 (dbp)
    nu = (hts + Stim * dbp - (hts * (d - dbp) + hrs * dbp) / d) * Math.sqrt((2 * d) / (lambda_m * dbp * (d - dbp))); // P.526-15 §4.5.1 (νb)
  }
  const Luca = knifeEdgeLossApprox(nu); // P.526-15 §4.5.1 (Luc = J(ν)), eq. (31)
  return Luca + (1 - Math.exp(-Luca / 6)) * (10 + 0.02 * (d / 1000)); // P.526-15 §4.5.1 (Lbull)
}

/**
 * νmax of P.526-15 §4.5.1 case 1 for the actual profile: max over inner samples of
 * (z_i − L(d_i))·w(d_i), L the Tx–Rx line in the flat-Earth frame, w = sqrt(2d/(λ·d_i·(d − d_i))).
 * Exact when the result exceeds `floor0` (default −0.78: below it J(ν) is 0, so any value
 * ≤ −0.78 will do); pass −Infinity for the exact maximiser, which is left in p.lastNuIndex.
 */
export function nuMaxLineOfSight(p: RadialProfile, d: number, hrs: number, lambda: number, floor0 = NU_J_ZERO): number {
  const n = p.n;
  if (n <= 1) return -Infinity;
  const hts = p.hts;
  const sL = (hrs - hts) / d - d * p.invTwoAe; // slope of L in the flat-Earth frame
  const twoD_lambda = (2 * d) / lambda;
  const D = p.d;
  const Z = p.z;
  // First guesses: the newest sample and the previous maximiser on this radial.
  let bestI = n - 1;
  let best = nuPoint(D[n - 1], Z[n - 1], hts, sL, d, twoD_lambda);
  const g = p.lastNuIndex;
  if (g >= 1 && g < n - 1) {
    const v = nuPoint(D[g], Z[g], hts, sL, d, twoD_lambda);
    if (v > best) (best = v), (bestI = g);
  }
  let floor = best > floor0 ? best : floor0;
  const last = n - 1;
  const nb2 = ((last / BLOCK2) | 0) + 1;
  for (let b2 = 0; b2 < nb2; b2++) {
    const a2 = b2 === 0 ? 1 : b2 * BLOCK2;
    const e2 = Math.min(last, b2 * BLOCK2 + BLOCK2 - 1);
    if (a2 > e2) continue;
    if (blockBound(p.blockMax2[b2], D[a2], D[e2], hts, sL, d, twoD_lambda) <= floor) continue;
    const nb1a = (a2 / BLOCK1) | 0;
    const nb1e = (e2 / BLOCK1) | 0;
    for (let b1 = nb1a; b1 <= nb1e; b1++) {
      const a1 = b1 === 0 ? 1 : b1 * BLOCK1;
      const e1 = Math.min(last, b1 * BLOCK1 + BLOCK1 - 1);
      if (a1 > e1) continue;
      if (blockBound(p.blockMax1[b1], D[a1], D[e1], hts, sL, d, twoD_lambda) <= floor) continue;
      for (let i = a1; i <= e1; i++) {
        const v = nuPoint(D[i], Z[i], hts, sL, d, twoD_lambda);
        if (v > best) {
          best = v;
          bestI = i;
          if (v > floor) floor = v;
        }
      }
    }
  }
  p.lastNuIndex = bestI;
  return best;
}

/** ν of one sample: (z − L(x))·sqrt(2d/(λ·x·(d − x))), twoD_lambda = 2d/λ. */
function nuPoint(x: number, z: number, hts: number, sL: number, d: number, twoD_lambda: number): number {
  return (z - hts - sL * x) * Math.sqrt(twoD_lambda / (x * (d - x))); // P.526-15 §4.5.1 (νmax)
}

/** Upper bound of ν over samples with z ≤ zMax and da ≤ x ≤ de. */
function blockBound(zMax: number, da: number, de: number, hts: number, sL: number, d: number, twoD_lambda: number): number {
  const gap = zMax - hts - sL * (sL > 0 ? da : de); // ≥ z_i − L(x_i) over the block
  let x: number;
  if (gap >= 0) {
    // w is convex in x with its minimum at d/2: largest at the end farther from d/2
    x = Math.abs(da - d / 2) > Math.abs(de - d / 2) ? da : de;
  } else {
    x = d / 2 < da ? da : d / 2 > de ? de : d / 2;
  }
  return gap * Math.sqrt(twoD_lambda / (x * (d - x)));
}

/**
 * Whether some inner sample of `p` has ν > nuLimit against the line from the antenna to a
 * receiver at (d_m, hrs_m) — ν of P.526-15 §4.5.1 (the Fresnel–Kirchhoff ν of eq. (22) with
 * the Earth bulge), so ν ≤ −√2·f means a clearance of at least f·F1. Blocks whose bound
 * (see nuMaxLineOfSight) does not exceed the limit are skipped; stops at the first sample
 * that does.
 */
export function nuExceeds(p: RadialProfile, d_m: number, hrs_m: number, lambda_m: number, nuLimit: number): boolean {
  const n = p.n;
  if (n <= 1) return false;
  const d = d_m;
  const hts = p.hts;
  const sL = (hrs_m - hts) / d - d * p.invTwoAe;
  const twoD_lambda = (2 * d) / lambda_m;
  const D = p.d;
  const Z = p.z;
  const last = n - 1;
  if (nuPoint(D[last], Z[last], hts, sL, d, twoD_lambda) > nuLimit) return true;
  const nb2 = ((last / BLOCK2) | 0) + 1;
  for (let b2 = nb2 - 1; b2 >= 0; b2--) {
    const a2 = b2 === 0 ? 1 : b2 * BLOCK2;
    const e2 = Math.min(last, b2 * BLOCK2 + BLOCK2 - 1);
    if (a2 > e2 || blockBound(p.blockMax2[b2], D[a2], D[e2], hts, sL, d, twoD_lambda) <= nuLimit) continue;
    for (let b1 = (e2 / BLOCK1) | 0; b1 >= ((a2 / BLOCK1) | 0); b1--) {
      const a1 = b1 === 0 ? 1 : b1 * BLOCK1;
      const e1 = Math.min(last, b1 * BLOCK1 + BLOCK1 - 1);
      if (a1 > e1 || blockBound(p.blockMax1[b1], D[a1], D[e1], hts, sL, d, twoD_lambda) <= nuLimit) continue;
      for (let i = e1; i >= a1; i--) if (nuPoint(D[i], Z[i], hts, sL, d, twoD_lambda) > nuLimit) return true;
    }
  }
  return false;
}
