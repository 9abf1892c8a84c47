/**
 * The field between grid heights by band-limited (windowed-sinc) interpolation of its complex
 * values. The vertical step is chosen at the Nyquist rate of the largest angle the grid
 * carries (pe-grid.ts), so the field changes on the scale of one cell: interpolating the
 * amplitude linearly between two cells, as a first version did, is off by several dB near an
 * interference minimum and made the receiver's value depend on Δz (mill-cobb: 2.6 dB when Δz
 * alone was halved). The propagator keeps the spectrum within SPECTRAL_FILTER_FROM (75 %) of
 * the band, so a sinc of the full band windowed by a Kaiser window of ±HALF_TAPS cells
 * (β = 8) reproduces it: the window's transition (about ±0.06 of the sampling rate for 24
 * taps each side) ends before the field's content begins to be cut (common practice for
 * resampling band-limited signals; J. F. Kaiser's window, from memory).
 * Below the first cell the field is continued as an odd function (a ground that reflects with
 * about −1 at grazing: a perfect conductor in horizontal polarisation, real ground at grazing
 * in both) or, for a Neumann ground, as an even one.
 */
export const HALF_TAPS = 24;
const BETA = 8;

function besselI0(x: number): number {
  let sum = 1;
  let term = 1;
  const q = (x * x) / 4;
  for (let m = 1; m < 60; m++) {
    term *= q / (m * m);
    sum += term;
    if (term < 1e-17 * sum) break;
  }
  return sum;
}
const I0_BETA = besselI0(BETA);

/**
 * Complex field at fractional cell t (0 ≤ t ≤ n) from cells ur/ui[0..n] (zero above n).
 * @param even continue the field below cell 0 as even (Neumann ground) instead of odd
 * @returns [re, im]; NaN for t outside [0, n]
 */
export function bandLimitedSample(ur: ArrayLike<number>, ui: ArrayLike<number>, t: number, even: boolean): [number, number] {
  const n = ur.length - 1;
  if (!(t >= 0 && t <= n)) return [NaN, NaN];
  const j0 = Math.floor(t);
  if (t === j0) return [ur[j0], ui[j0]];
  let re = 0;
  let im = 0;
  for (let j = j0 - HALF_TAPS + 1; j <= j0 + HALF_TAPS; j++) {
    const x = t - j;
    const r = x / HALF_TAPS;
    if (r <= -1 || r >= 1) continue;
    const w = (besselI0(BETA * Math.sqrt(1 - r * r)) / I0_BETA) * (Math.sin(Math.PI * x) / (Math.PI * x)); // Kaiser-windowed sinc
    let a = j;
    let sign = 1;
    if (a < 0) {
      a = -a;
      sign = even ? 1 : -1;
    }
    if (a > n) continue;
    re += sign * w * ur[a];
    im += sign * w * ui[a];
  }
  return [re, im];
}
