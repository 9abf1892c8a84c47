/** Samples per first-level block of the ν bound tree (second level: BLOCK1 · BLOCK1). */
export const BLOCK1 = 16;
export const BLOCK2 = BLOCK1 * BLOCK1;

/**
 * One radial from the site, grown one terrain sample at a time, keeping what the
 * delta-Bullington method (ITU-R P.526-15 §4.5) needs for a receiver beyond the last sample
 * without revisiting the samples:
 * - index 0 is the transmitter's ground (d = 0); indices 1…n−1 are the inner samples of a
 *   receiver placed beyond them;
 * - z = h − d²/(2·ae): heights in the frame where the effective Earth is flat. In that frame
 *   the bulge term of §4.5.1, d_i·(d − d_i)/(2·ae), turns every slope of the method into a
 *   straight-line slope (plus a term in d alone), which is what makes the running maxima and
 *   hulls below exact;
 * - running maxima of the slopes from the transmitter: (z_i − hts)/d_i (Stim) and
 *   (h_i − hts)/d_i (αobt of §4.5.2, no curvature);
 * - upper convex hulls of (d_i, z_i) and (d_i, h_i), built by the monotone-chain rule
 *   (amortised O(1) per sample); the receiver-side maxima Srim and αobr and the highest
 *   point above the Tx–Rx line hobs are attained at hull vertices and found by binary search;
 * - trapezoid sums v1, v2 of the least-squares smooth surface (§4.5.2), which are prefix sums
 *   (distances in km, as the method writes them);
 * - maxima of z over blocks of BLOCK1 and BLOCK2 samples, bounding ν over a whole block in the
 *   line-of-sight νmax search (see delta-bullington-incremental.ts).
 * Preallocated once per worker for the longest radial; `reset` starts a new radial. No
 * allocation per sample.
 */
export class RadialProfile {
  readonly d: Float64Array;
  readonly h: Float64Array;
  readonly z: Float64Array;
  /** number of stored points including the transmitter at index 0 */
  n = 0;
  /** transmitter antenna height (m amsl) */
  hts = 0;
  /** 1/(2·ae) (1/m); 0 for k = ∞ */
  invTwoAe = 0;
  maxSlopeZ = -Infinity;
  /** index of the first sample attaining maxSlopeZ (the transmitter's horizon point) */
  argMaxSlopeZ = -1;
  maxSlopeH = -Infinity;
  v1 = 0;
  v2 = 0;
  readonly hullZ: Int32Array;
  nHullZ = 0;
  readonly hullH: Int32Array;
  nHullH = 0;
  readonly blockMax1: Float64Array;
  readonly blockMax2: Float64Array;
  /** index of the last νmax maximiser found on this radial (a good first guess for the next receiver) */
  lastNuIndex = 0;

  constructor(capacity: number) {
    const cap = capacity + 2;
    this.d = new Float64Array(cap);
    this.h = new Float64Array(cap);
    this.z = new Float64Array(cap);
    this.hullZ = new Int32Array(cap);
    this.hullH = new Int32Array(cap);
    this.blockMax1 = new Float64Array(Math.ceil(cap / BLOCK1) + 1);
    this.blockMax2 = new Float64Array(Math.ceil(cap / BLOCK2) + 1);
  }

  get capacity(): number {
    return this.d.length - 2;
  }

  /**
   * Start a radial at the transmitter.
   * @param ground_m ground height at the site (m amsl)
   * @param hts_m transmitter antenna height (m amsl)
   * @param ae_m effective Earth radius (m), Infinity allowed
   */
  reset(ground_m: number, hts_m: number, ae_m: number): void {
    this.d[0] = 0;
    this.h[0] = ground_m;
    this.z[0] = ground_m;
    this.n = 1;
    this.hts = hts_m;
    this.invTwoAe = ae_m === Infinity ? 0 : 1 / (2 * ae_m);
    this.maxSlopeZ = -Infinity;
    this.argMaxSlopeZ = -1;
    this.maxSlopeH = -Infinity;
    this.v1 = 0;
    this.v2 = 0;
    this.nHullZ = 0;
    this.nHullH = 0;
    this.lastNuIndex = 0;
  }

  /**
   * Append a sample at distance d_m (> every earlier one) with ground height h_m. The caller
   * keeps n below the capacity.
   */
  push(d_m: number, h_m: number): void {
    const i = this.n;
    const z = h_m - d_m * d_m * this.invTwoAe;
    this.d[i] = d_m;
    this.h[i] = h_m;
    this.z[i] = z;
    this.n = i + 1;
    // v1, v2 in km·m and km²·m, accumulated in the order of smoothEarthHeights (same rounding)
    const di = d_m / 1000;
    const dp = this.d[i - 1] / 1000;
    const hp = this.h[i - 1];
    this.v1 += (di - dp) * (h_m + hp); // P.526-15 §4.5.2 (v1)
    this.v2 += (di - dp) * (h_m * (2 * di + dp) + hp * (di + 2 * dp)); // P.526-15 §4.5.2 (v2)
    const sz = (z - this.hts) / d_m;
    if (sz > this.maxSlopeZ) (this.maxSlopeZ = sz), (this.argMaxSlopeZ = i);
    const sh = (h_m - this.hts) / d_m;
    if (sh > this.maxSlopeH) this.maxSlopeH = sh;
    this.nHullZ = pushUpperHull(this.hullZ, this.nHullZ, this.d, this.z, i);
    this.nHullH = pushUpperHull(this.hullH, this.nHullH, this.d, this.h, i);
    // Block maxima of z (a block's entry is valid as soon as its first sample arrives).
    const b1 = (i / BLOCK1) | 0;
    if (i % BLOCK1 === 0 || i === 1) this.blockMax1[b1] = z;
    else if (z > this.blockMax1[b1]) this.blockMax1[b1] = z;
    const b2 = (i / BLOCK2) | 0;
    if (i % BLOCK2 === 0 || i === 1) this.blockMax2[b2] = z;
    else if (z > this.blockMax2[b2]) this.blockMax2[b2] = z;
  }
}

/**
 * Add point i (x increasing) to an upper hull held as indices; returns the new length.
 * A middle vertex is kept only when it lies strictly above the chord of its neighbours.
 */
function pushUpperHull(hull: Int32Array, len: number, x: Float64Array, y: Float64Array, i: number): number {
  const xi = x[i];
  const yi = y[i];
  while (len >= 2) {
    const a = hull[len - 2];
    const b = hull[len - 1];
    // b strictly above segment a→i ⟺ (yb − ya)(xi − xa) > (yi − ya)(xb − xa)
    if ((y[b] - y[a]) * (xi - x[a]) > (yi - y[a]) * (x[b] - x[a])) break;
    len--;
  }
  hull[len] = i;
  return len + 1;
}

/**
 * The hull vertex maximising the slope seen back from a point (X, Y) to the right of every
 * vertex: max_j (y_j − Y)/(X − x_j). Along an upper hull that slope rises then falls, so a
 * binary search on consecutive vertices finds it.
 * @returns the point index (not the hull position); −1 for an empty hull
 */
export function hullTangentFromRight(hull: Int32Array, len: number, x: Float64Array, y: Float64Array, X: number, Y: number): number {
  if (len === 0) return -1;
  let lo = 0;
  let hi = len - 1;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    const a = hull[mid];
    const b = hull[mid + 1];
    // slope(b) ≥ slope(a) ⟺ (yb − Y)(X − xa) ≥ (ya − Y)(X − xb), both X − x > 0
    if ((y[b] - Y) * (X - x[a]) >= (y[a] - Y) * (X - x[b])) lo = mid + 1;
    else hi = mid;
  }
  return hull[lo];
}

/**
 * The hull vertex maximising y_j − S·x_j (the point highest above a line of slope S).
 * Edge slopes of an upper hull decrease, so the first edge no steeper than S ends the search.
 * @returns the point index; −1 for an empty hull
 */
export function hullHighestAboveSlope(hull: Int32Array, len: number, x: Float64Array, y: Float64Array, S: number): number {
  if (len === 0) return -1;
  let lo = 0;
  let hi = len - 1;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    const a = hull[mid];
    const b = hull[mid + 1];
    if (y[b] - y[a] >= S * (x[b] - x[a])) lo = mid + 1;
    else hi = mid;
  }
  return hull[lo];
}
