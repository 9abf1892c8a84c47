import { propagatorTablesBytes } from "./vertical-propagator.ts";

/**
 * Grid of the split-step parabolic-equation solver and how it is chosen.
 *
 * The vertical step follows from the largest propagation angle the grid must carry: the
 * discrete Fourier transform of N points of step Δz holds vertical wavenumbers up to π/Δz, so
 * angles up to θmax = asin(λ/(2·Δz)), i.e. Δz = λ/(2·sin θmax) (Nyquist; common practice, e.g.
 * M. Levy, "Parabolic Equation Methods for Electromagnetic Wave Propagation", IEE 2000, §3 —
 * from memory). θmax is three times the steepest angle of the geometry (the line of sight's slope
 * plus the larger of the ground reflection's grazing angle and the bending over terrain above
 * the line of sight), but no more than the source's aim plus two beamwidths (a narrow beam
 * sends nothing that matters, −48 dB, beyond that), so that the
 * angles that matter sit well inside the transform's band, where the discrete impedance
 * boundary is accurate; at least the source's aim plus its beamwidth (so that the antenna's
 * pattern, not the grid, shapes the illumination); no less than 2° (finer steps resolve the
 * field deep beyond the horizon: 4 dB error at 80 km with 1°) and no more than
 * PE_MAX_ANGLE_DEG. Above 75 % of the band the spectrum is absorbed (vertical-propagator.ts).
 * The range step is the profile's own spacing
 * (terrain is not resampled coarser than surveyed) within [D/3000, D/200]: the wide-angle
 * propagator is exact for any step in a uniform medium, so the step only limits how finely
 * terrain and refraction are followed. Convergence is measured by halving both steps with
 * θmax held (test/reference/parabolic-equation-convergence.test.ts, README validation table):
 * θmax is the model's angle limit, so the solver's angular filter stays at θmax when Δz is
 * overridden finer, and a refined grid samples the same model more finely. After a solution on
 * this grid, the band check (band-check.ts) may find that its answer depends on the band's edge;
 * linkWave then solves the link again with θmax three times this rule's (up to 30°).
 */

/** Largest propagation angle (°) for which the wide-angle (Feit–Fleck) split-step propagator is trusted (common practice for the split-step Fourier method; from memory). */
export const PE_MAX_ANGLE_DEG = 15;
/** Smallest θmax (°) the grid is given. */
export const PE_MIN_GRID_ANGLE_DEG = 2;
/** Default memory limit of one solution (bytes): 256 MiB. */
export const PE_DEFAULT_MEMORY_LIMIT_BYTES = 256 * 1024 * 1024;
/**
 * Work limit: transform points (2N, the odd extension's) × range steps a solution may take by
 * default (250 million: about 10 s of CPU on the project's machine, from the 50 km, 18 GHz
 * path across the demo's mountains, 52 million in 2.2 s with the half-size sine transform, 1.75 s of CPU with the merged per-step passes).
 * Long paths at high frequencies need far more (227 km at 80 GHz: billions, 10 min or more),
 * and a study computes every link, so such a grid is refused with the reason instead.
 */
export const PE_DEFAULT_WORK_LIMIT_CELL_STEPS = 250e6;

export interface PeGridChoice {
  /** vertical step (m) */
  dz_m: number;
  /** range step (m) */
  dx_m: number;
  /** the range step the grid chooses for this path when not overridden (m): the angular
   * filter's reference length, so that a refined grid absorbs the same per metre */
  dx_reference_m: number;
  /** range steps from end to end */
  steps: number;
  /** largest angle the grid carries (°) */
  max_angle_deg: number;
  /** steepest angle of the geometry (°) */
  geometry_angle_deg: number;
  /** FFT half-size N: heights 0..N·Δz above the local ground; the transform has 2N points */
  n: number;
  /** absolute height (m) where the absorbing layer begins, at each profile sample */
  top_m: Float64Array;
  /** largest slope of the terrain-following frame (split-step.ts): the ground's slope clamped
   * to ±this; steeper ground is a staircase in the frame */
  max_frame_slope: number;
  /** thickness of the absorbing layer (cells) */
  absorber_cells: number;
  /** lowest and highest absolute heights of interest (m) — the figure's range */
  z_low_m: number;
  z_high_m: number;
  /** bytes the solution needs (transform buffers, field, tables, figure) */
  memory_bytes: number;
}

export interface PeGridInput {
  d_m: ArrayLike<number>;
  ground_m: ArrayLike<number>;
  lambda_m: number;
  tx_amsl_m: number;
  rx_amsl_m: number;
  /** effective Earth radius for the geometry (m) */
  ae_m: number;
  /** 3 dB beamwidth of the source (°): the grid carries the beam's aim plus this */
  beamwidth_deg: number;
  /** figure size (columns × rows) kept in memory */
  figure_cells: number;
  overrides?: { dz_m?: number; dx_m?: number; max_angle_deg?: number };
}

/** Bytes per FFT half-size point: 2N complex points in three Float64 buffers (data, out, propagator), fft.js's tables (~3 doubles per point), the field and its helpers (~10 doubles per height); the propagator's tables per class of frame slope are added (propagatorTablesBytes). */
const BYTES_PER_N = 2 * (3 * 16 + 24) + 10 * 8;

/** The grid for a path (see the module comment). NaN fields for bad input. */
export function choosePeGrid(input: PeGridInput): PeGridChoice {
  const { d_m, ground_m, lambda_m, tx_amsl_m: zT, rx_amsl_m: zR, ae_m } = input;
  const n = d_m.length;
  const D = d_m[n - 1] - d_m[0];
  let gMin = Infinity;
  let gMax = -Infinity;
  for (let i = 0; i < n; i++) {
    gMin = Math.min(gMin, ground_m[i]);
    gMax = Math.max(gMax, ground_m[i]);
  }
  // angles that matter: the line of sight's slope, plus the larger of the ground reflection's
  // grazing angle over the mean ground and the angle by which rays must bend over the terrain
  // that rises above the line of sight (middle 80 % of the path, flattened-Earth heights)
  const los = (zR - zT) / D;
  let sum = 0;
  let count = 0;
  let bend = 0;
  for (let i = 0; i < n; i++) {
    const x = d_m[i] - d_m[0];
    if (x < 0.1 * D || x > 0.9 * D) continue;
    const rayZ = zT + los * x - (x * (D - x)) / (2 * ae_m);
    bend = Math.max(bend, (ground_m[i] - rayZ) / Math.min(x, D - x));
    sum += ground_m[i];
    count++;
  }
  const gMean = count > 0 ? sum / count : (ground_m[0] + ground_m[n - 1]) / 2;
  const specular = Math.max(0, (zT + zR - 2 * gMean) / D - D / (2 * ae_m));
  const slope = Math.abs(los) + Math.max(specular, bend);
  const geometry_angle_deg = (Math.atan(slope) * 180) / Math.PI;
  const aim = Math.abs((Math.atan(los - D / (2 * ae_m)) * 180) / Math.PI);
  // a narrow beam puts nothing that matters beyond its aim ± 2 beamwidths (−48 dB)
  const wanted = Math.max(Math.min(3 * geometry_angle_deg, aim + 2 * input.beamwidth_deg), aim + input.beamwidth_deg);
  const max_angle_deg = input.overrides?.max_angle_deg ?? Math.min(PE_MAX_ANGLE_DEG, Math.max(PE_MIN_GRID_ANGLE_DEG, wanted));
  const dz_m = input.overrides?.dz_m ?? lambda_m / (2 * Math.sin((max_angle_deg * Math.PI) / 180));
  let profileStep = Infinity;
  for (let i = 1; i < n; i++) profileStep = Math.min(profileStep, d_m[i] - d_m[i - 1] > 0 ? d_m[i] - d_m[i - 1] : Infinity);
  const dxChosen = Math.min(Math.max(profileStep, D / 3000), D / 200);
  const dxWanted = input.overrides?.dx_m ?? dxChosen;
  const steps = Math.max(1, Math.ceil(D / dxWanted - 1e-9));
  const dx_m = D / steps;
  const f1Max = 0.5 * Math.sqrt(lambda_m * D);
  // top of the region of interest: the upper hull of the ends and the terrain (the taut string
  // over every obstacle, straight in the Earth-bulge frame), plus room for the Fresnel zone,
  // and a tenth of the relief (the figure shows the field above the path), for rays that graze and rise again in the flattened frame (D²/2ae) and a few wavelengths;
  // above it a Hann absorbing layer half as thick as the tallest region
  const grazingRise = ae_m > 0 ? (D * D) / (2 * ae_m) : 0;
  const margin = Math.max(3 * f1Max, 20 * lambda_m, 0.1 * (Math.max(zT, zR, gMax) - gMin)) + grazingRise;
  const bulge = (x: number) => (x * (D - x)) / (2 * ae_m);
  const hx: number[] = [0];
  const hz: number[] = [zT];
  for (let i = 0; i <= n; i++) {
    const x = i < n ? d_m[i] - d_m[0] : D;
    const z = i < n ? Math.max(ground_m[i] + bulge(x), i === 0 ? zT : -Infinity) : zR;
    if (i === n - 1 || i === 0) continue;
    while (hx.length >= 2) {
      const a = hx.length - 2;
      const cross = (hx[a + 1] - hx[a]) * (z - hz[a]) - (hz[a + 1] - hz[a]) * (x - hx[a]);
      if (cross >= 0) {
        hx.pop();
        hz.pop();
      } else break;
    }
    hx.push(x);
    hz.push(z);
  }
  const max_frame_slope = 0.25 * Math.sin(0.75 * ((max_angle_deg * Math.PI) / 180));
  const top_m = new Float64Array(n);
  let tallest = 0;
  for (let i = 0, h = 0; i < n; i++) {
    const x = d_m[i] - d_m[0];
    while (h < hx.length - 2 && hx[h + 1] < x) h++;
    const t = hx[h + 1] > hx[h] ? (x - hx[h]) / (hx[h + 1] - hx[h]) : 0;
    top_m[i] = Math.max(hz[h] + t * (hz[h + 1] - hz[h]) - bulge(x), ground_m[i]) + margin;
    // the solver drops the cells below the ground (they hold no field): its domain starts at
    // the lower of neighbouring samples' ground
    const low = Math.min(ground_m[i], ground_m[Math.max(0, i - 1)], ground_m[Math.min(n - 1, i + 1)]);
    tallest = Math.max(tallest, top_m[i] - low);
  }
  const absorber_cells = Math.max(16, Math.ceil((0.5 * tallest) / dz_m));
  const cells = Math.ceil(tallest / dz_m) + absorber_cells + 2;
  const N = cells <= 4 ? 4 : 2 ** Math.ceil(Math.log2(cells));
  const memory_bytes = N * BYTES_PER_N + propagatorTablesBytes(N) + input.figure_cells * 4;
  let zTop = -Infinity;
  for (let i = 0; i < n; i++) zTop = Math.max(zTop, top_m[i]);
  return {
    dz_m,
    dx_m,
    dx_reference_m: D / Math.max(1, Math.ceil(D / dxChosen - 1e-9)),
    steps,
    max_angle_deg,
    geometry_angle_deg,
    n: N,
    top_m,
    max_frame_slope,
    absorber_cells,
    z_low_m: gMin,
    z_high_m: zTop,
    memory_bytes,
  };
}
