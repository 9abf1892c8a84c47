import { knifeEdgeLossApprox } from "../physics/knife-edge.ts";

/**
 * Bullington loss Lbull (dB) of the smooth profile of the delta-Bullington method: zero heights
 * at the inner distances D[1…n−1], antenna heights hts', hrs' — `bullingtonFromArrays(d, null,
 * …)` of ITU-R P.526-15 §4.5.1 without scanning the samples.
 *
 * With zero heights each maximum of §4.5.1 is over a smooth function of d_i alone, and the
 * discrete maximum lies at one of the two samples around the continuous maximiser x*:
 * - Stim: (d − x)/(2ae) − hts/x, concave, x* = sqrt(2ae·hts);
 * - Srim: x/(2ae) − hrs/(d − x), concave, d − x* = sqrt(2ae·hrs);
 * - νmax (line of sight): quasi-concave; dν/dx has the sign of the cubic
 *   F(x) = 2c·x³ − 3c·d·x² + (c·d² − s·d − 2·hts)·x + hts·d, c = 1/(2ae), s = (hrs − hts)/d
 *   (from d/dx [N/√u] with u = x(d − x), N = c·u − hts − s·x), whose root in the sample range
 *   is found by safeguarded Newton iteration.
 * The values at the chosen samples use the Recommendation's expressions, so the result equals
 * the scan over all samples (test/coverage/incremental-delta-bullington.test.ts).
 * @param D distances (m), D[0] = 0 (the transmitter), strictly rising
 * @param n number of points including D[0]; inner samples are 1…n−1
 * @param d receiver distance (m), beyond D[n−1]
 * @param hts Tx height above the smooth surface hts' (m), > 0
 * @param hrs Rx height above the smooth surface hrs' (m), > 0
 * @param lambda wavelength (m)
 * @param k2 1/(2ae) (1/m), 0 for k = ∞
 */
export function smoothBullington(D: Float64Array, n: number, d: number, hts: number, hrs: number, lambda: number, k2: number): number {
  const Str = (hrs - hts) / d; // P.526-15 §4.5.1 (Str)
  let nu: number;
  if (n <= 1) {
    nu = -Infinity;
  } else {
    // Stim: (d_i·(d − d_i)/(2ae) − hts)/d_i, maximal next to x* = sqrt(hts/c)
    const iT = bracket(D, n, k2 > 0 ? Math.sqrt(hts / k2) : Infinity);
    const sT0 = stimAt(D[iT], d, hts, k2);
    const sT1 = iT + 1 < n ? stimAt(D[iT + 1], d, hts, k2) : -Infinity;
    const Stim = sT1 > sT0 ? sT1 : sT0; // P.526-15 §4.5.1 (Stim)
    if (Stim < Str) {
      const s = Str;
      const a3 = 2 * k2;
      const a2 = -3 * d * k2;
      const a1 = k2 * d * d - s * d - 2 * hts;
      const a0 = hts * d;
      let lo = D[1];
      let hi = D[n - 1];
      let x: number;
      if (cubic(lo, a3, a2, a1, a0) <= 0) x = lo;
      else if (cubic(hi, a3, a2, a1, a0) >= 0) x = hi;
      else {
        x = (hts * d) / (hts + hrs); // the flat-Earth maximiser, a good start
        if (!(x > lo && x < hi)) x = 0.5 * (lo + hi);
        for (let it = 0; it < 60; it++) {
          const f = cubic(x, a3, a2, a1, a0);
          if (f > 0) lo = x;
          else hi = x;
          const fp = (3 * a3 * x + 2 * a2) * x + a1;
          const xn = x - f / fp;
          const next = xn > lo && xn < hi ? xn : 0.5 * (lo + hi);
          const step = next - x;
          x = next;
          if ((step < 0 ? -step : step) < 1e-3 || hi - lo < 1e-3) break; // a millimetre: far below the sample spacing
        }
      }
      const i = bracket(D, n, x);
      const v0 = nuAt(D[i], d, hts, hrs, lambda, k2);
      const v1 = i + 1 < n ? nuAt(D[i + 1], d, hts, hrs, lambda, k2) : -Infinity;
      nu = v1 > v0 ? v1 : v0;
    } else {
      // Srim: (d_i·(d − d_i)/(2ae) − hrs)/(d − d_i), maximal next to x* = d − sqrt(hrs/c)
      const iR = bracket(D, n, k2 > 0 ? d - Math.sqrt(hrs / k2) : -Infinity);
      const r0 = srimAt(D[iR], d, hrs, k2);
      const r1 = iR + 1 < n ? srimAt(D[iR + 1], d, hrs, k2) : -Infinity;
      const Srim = r1 > r0 ? r1 : r0; // P.526-15 §4.5.1 (Srim)
      const dbp = (hrs - hts + Srim * d) / (Stim + Srim); // P.526-15 §4.5.1 (dbp)
      nu = (hts + Stim * dbp - (hts * (d - dbp) + hrs * dbp) / d) * Math.sqrt((2 * d) / (lambda * dbp * (d - dbp))); // P.526-15 §4.5.1 (νb)
    }
  }
  const Luc = knifeEdgeLossApprox(nu); // P.526-15 §4.5.1 (Luc = J(ν)), eq. (31)
  return Luc + (1 - Math.exp(-Luc / 6)) * (10 + 0.02 * (d / 1000)); // P.526-15 §4.5.1 (Lbull)
}

function stimAt(x: number, d: number, hts: number, k2: number): number {
  return (x * (d - x) * k2 - hts) / x; // P.526-15 §4.5.1 (Stim), zero height
}

function srimAt(x: number, d: number, hrs: number, k2: number): number {
  return (x * (d - x) * k2 - hrs) / (d - x); // P.526-15 §4.5.1 (Srim), zero height
}

function nuAt(x: number, d: number, hts: number, hrs: number, lambda: number, k2: number): number {
  return (x * (d - x) * k2 - (hts * (d - x) + hrs * x) / d) * Math.sqrt((2 * d) / (lambda * x * (d - x))); // P.526-15 §4.5.1 (νmax), zero height
}

function cubic(x: number, a3: number, a2: number, a1: number, a0: number): number {
  return ((a3 * x + a2) * x + a1) * x + a0;
}

/**
 * Index i in 1…n−1 with D[i] ≤ x < D[i+1] (1 when x < D[1], n−1 when x ≥ D[n−1]); the samples
 * are nearly evenly spaced, so a proportional guess is refined by a short walk.
 */
export function bracket(D: Float64Array, n: number, x: number): number {
  const last = n - 1;
  if (!(x > D[1])) return 1;
  if (x >= D[last]) return last;
  let i = 1 + Math.floor(((x - D[1]) / (D[last] - D[1])) * (last - 1));
  if (i < 1) i = 1;
  else if (i > last - 1) i = last - 1;
  while (i > 1 && D[i] > x) i--;
  while (i < last - 1 && D[i + 1] <= x) i++;
  return i;
}
