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
 * Below the first cell a perfectly conducting ground continues the field exactly: as an odd
 * function (Dirichlet, horizontal polarisation) or an even one (Neumann, vertical). An
 * impedance ground continues it as neither (vertical polarisation near the Brewster angle), so
 * there the window is narrowed to the cells above the ground (at least 2 each side).
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
 * @param below how the field continues below cell 0: "odd" (Dirichlet), "even" (Neumann) or
 *   "none" (impedance ground: the window is narrowed instead)
 * @returns [re, im]; NaN for t outside [0, n]
 */
export function bandLimitedSample(ur: ArrayLike<number>, ui: ArrayLike<number>, t: number, below: "odd" | "even" | "none"): [number, number] {
  const n = ur.length - 1;
  if (!(t >= 0 && t <= n)) return [NaN, NaN];
  const j0 = Math.floor(t);
  if (t === j0) return [ur[j0], ui[j0]];
  const half = below === "none" ? Math.max(2, Math.min(HALF_TAPS, j0 + 1)) : HALF_TAPS;
  let re = 0;
  let im = 0;
  for (let j = j0 - half + 1; j <= j0 + half; j++) {
    const x = t - j;
    const r = x / half;
    if (r <= -1 || r >= 1) continue;
    const w = (besselI0(BETA * Math.sqrt(1 - r * r)) / I0_BETA) * (Math.sin(Math.PI * x) / (Math.PI * x)); // Kaiser-windowed sinc
    let a = j;
    let sign = 1;
    if (a < 0) {
      a = -a;
      sign = below === "even" ? 1 : below === "odd" ? -1 : 0;
    }
    if (a > n) continue;
    re += sign * w * ur[a];
    im += sign * w * ui[a];
  }
  return [re, im];
}
