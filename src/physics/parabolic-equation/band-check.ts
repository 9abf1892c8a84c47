import FFT from "fft.js";

/**
 * An a-posteriori check of the model's band (θmax) from the solved field itself, and the wider
 * band a link is solved again with when the check says the answer depends on the band's edge.
 *
 * Why. The solver's angular filter (vertical-propagator.ts) absorbs what reaches θmax; the grid
 * rule (pe-grid.ts) sets θmax from the geometry and the beam, and on most paths the answer does
 * not depend on it. On some it does: the field the receiver gets, or the field on its way,
 * lies at the band's edge (a reflection off ground steeper than the band, a frame tilted
 * towards a falling beam that puts the horizontal near the edge, a climb steeper than θmax into
 * a shadow), and there the answer moves with the grid (grid halving by 0.3-3 dB on three of the
 * demo's twelve links) because what the filter takes changes with the sampling. No measure of
 * the path's geometry picked those links alone (DEVELOPERS.md); two measures of the field do:
 * - the share of the field's power the angular filter absorbed over the march,
 *   1 − Π(kept per step): above BAND_CHECK_ABSORBED_SHARE (a half) the band took most of what
 *   was radiated, so the model is the band, not the path;
 * - the share of the receiver's local angular spectrum (the field over ±RECEIVER_WINDOW_CELLS
 *   around it, Hann window, in the frame's angles that the filter sees) in the upper half of the
 *   band: the filter acts from 75 % of it, and what survives above half is the tail of what it
 *   cut; above BAND_CHECK_RECEIVER_SHARE (1 %, −20 dB) the answer depends on the edge.
 * Either one flags the band as too narrow.
 *
 * The wider band: θmax times BAND_WIDENING_FACTOR (3: what reached three quarters of the old
 * band, where the filter begins, sits at a quarter of the new one; measured: 1.5, 2 and 2.5
 * times left mill-aldr 2.75, 3.84 and 0.25 dB under halving, 3 times 0.12 dB), up to
 * PE_WIDENED_MAX_ANGLE_DEG; when that ceiling binds, Δz is λ/2, a grid that carries every
 * propagating angle, so that what the staircase's cuts scatter beyond the ceiling is absorbed by
 * the filter instead of folded back into the band by the sampling. The wider solution is kept
 * when its grid is within PE_WIDENING_WORK_LIMIT_CELL_STEPS and the memory limit and it is not
 * refused; otherwise the narrow answer stands, with a warning naming the band.
 * Thresholds: a half is "most of the power"; 1 % of the power is a tenth of the amplitude,
 * which added coherently moves the answer by up to 0.9 dB (20·log10(1 ± 0.1)), several times the
 * 0.2 dB goal. Measured on the demo's links (DEVELOPERS.md) they flag the three that did not
 * halve within 0.2 dB and none of the other nine (the largest of those: 0.32 absorbed, 0.2 %
 * at the receiver).
 */

/** The band is too narrow when the angular filter absorbed more than this share of the field's power over the march. */
export const BAND_CHECK_ABSORBED_SHARE = 0.5;
/** … or when more than this share of the receiver's local angular spectrum lies in the upper half of the band. */
export const BAND_CHECK_RECEIVER_SHARE = 0.01;
/** Half-width (cells) of the window about the receiver whose spectrum is measured: 64 cells resolve 1/32 of the band. */
export const RECEIVER_WINDOW_CELLS = 32;
/** θmax of a band found too narrow is multiplied by this. */
export const BAND_WIDENING_FACTOR = 3;
/** Ceiling (°) of the widened band. Beyond PE_MAX_ANGLE_DEG (15°), where the wide-angle split-step is trusted for the geometry's own angles; the propagator is exact in a uniform medium at any angle, and the demo's links were measured to 40° (DEVELOPERS.md). */
export const PE_WIDENED_MAX_ANGLE_DEG = 30;
/** Work limit (transform points × range steps) of the wider solution: 25 million, about 1 s of CPU on the project's machine (item 6 of issue #15 budgets the build's wave solutions; the 50 km, 18 GHz link's own grid is 52 million). */
export const PE_WIDENING_WORK_LIMIT_CELL_STEPS = 25e6;

export interface BandCheck {
  /** share of the field's power the angular filter absorbed over the march (0-1) */
  absorbed_share: number;
  /** share of the receiver's local angular spectrum in the upper half of the band (0-1) */
  receiver_upper_share: number;
  /** either share over its threshold */
  too_narrow: boolean;
}

/** The check from the filter's record (sum of ln of the power kept per step) and the receiver's share. */
export function bandCheck(logKept: number, receiverUpperShare: number): BandCheck {
  const absorbed_share = 1 - Math.exp(logKept);
  return {
    absorbed_share,
    receiver_upper_share: receiverUpperShare,
    too_narrow: absorbed_share > BAND_CHECK_ABSORBED_SHARE || receiverUpperShare > BAND_CHECK_RECEIVER_SHARE,
  };
}

/**
 * Share of the power of the field's local spectrum in the upper half of the band (|p| above
 * half of pLimit): cells ur/ui[0..n] (Δz apart), a Hann window of 2·RECEIVER_WINDOW_CELLS cells
 * (fewer on an array shorter than that, at least 8) about fractional cell t (moved inside the
 * array near its ends), zero-padded to four times its length. NaN when the array has fewer than
 * 8 cells or holds no field there.
 */
export function receiverUpperBandShare(ur: ArrayLike<number>, ui: ArrayLike<number>, t: number, dz_m: number, pLimit_rad_m: number): number {
  const n = ur.length - 1;
  const W = Math.min(RECEIVER_WINDOW_CELLS, 2 ** Math.floor(Math.log2(Math.max(1, n / 2))));
  if (!(W >= 4) || !Number.isFinite(t)) return NaN;
  const j0 = Math.max(0, Math.min(n - 2 * W, Math.round(t) - W));
  const c = j0 + W;
  const M = 8 * W;
  const fft = new FFT(M);
  // typed arrays as everywhere else fft.js is called: a plain array here made its transform
  // polymorphic for every later solution (the 50 km link 1.9 → 3.0 s of CPU)
  const input = new Float64Array(2 * M);
  const out = new Float64Array(2 * M);
  for (let j = j0; j <= j0 + 2 * W; j++) {
    const w = 0.5 * (1 + Math.cos((Math.PI * (j - c)) / W)); // Hann window (common practice)
    input[2 * (j - j0)] = w * ur[j];
    input[2 * (j - j0) + 1] = w * ui[j];
  }
  fft.transform(out, input);
  let total = 0;
  let upper = 0;
  for (let m = 0; m < M; m++) {
    const p = (2 * Math.PI * (m <= M / 2 ? m : m - M)) / (M * dz_m);
    const pw = out[2 * m] * out[2 * m] + out[2 * m + 1] * out[2 * m + 1];
    total += pw;
    if (Math.abs(p) > 0.5 * pLimit_rad_m) upper += pw;
  }
  return total > 0 ? upper / total : NaN;
}

/** The grid overrides of the wider band (see the module comment) for a band of maxAngleDeg at wavelength lambda_m. */
export function widenedBand(maxAngleDeg: number, lambda_m: number): { max_angle_deg: number; dz_m?: number } {
  const wanted = BAND_WIDENING_FACTOR * maxAngleDeg;
  if (wanted < PE_WIDENED_MAX_ANGLE_DEG) return { max_angle_deg: wanted };
  return { max_angle_deg: PE_WIDENED_MAX_ANGLE_DEG, dz_m: lambda_m / 2 };
}
