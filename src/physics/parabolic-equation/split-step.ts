import { wavelengthM } from "../constants.ts";
import { bandCheck, receiverUpperBandShare, type BandCheck } from "./band-check.ts";
import { bandLimitedSample } from "./band-limited-sample.ts";
import { gaussianAxisAmplitude, gaussianSourceSigmaM } from "./aperture-source.ts";
import { impedanceAlpha, type PeGround } from "./ground-impedance.ts";
import { effectiveRadiusFromRefractivity, modifiedRefractivity, type RefractivityModel } from "./modified-refractivity.ts";
import { choosePeGrid, PE_DEFAULT_MEMORY_LIMIT_BYTES, PE_DEFAULT_WORK_LIMIT_CELL_STEPS, PE_MAX_ANGLE_DEG, type PeGridChoice } from "./pe-grid.ts";
import { frameGauge, makeVerticalPropagator } from "./vertical-propagator.ts";

/** The frame's correction towards the ground's row, at most this fraction of the frame's slope limit per range step (see the doc comment). */
const ALIGN_SLOPE = 0.25;

/**
 * A field above the ground stronger than free space by more than this (dB) is refused as a
 * numerical instability, never reported. The coherent sum of the direct ray and one ground
 * reflection with |R| = 1 reaches +6.02 dB (two-ray model, common practice); concave terrain
 * focuses more, the more so in the solver's two-dimensional geometry: the demo's twelve links
 * reach +13.1 dB by this check's measure (harr-kvtw, on its default and its halved grid alike;
 * measured 2026-12-05), so the margin is 14 dB over the two-ray sum, about 7 dB over the most
 * the demo's terrain gives. The measure is lenient: the free-space amplitude on the beam's axis
 * at the horizontal distance, not the slant one. Not applied in an atmosphere with a trapping
 * layer (M falling with height), where a duct holds the field above free space by an amount
 * that grows with range (common practice). The blow-ups this guards against were 23 dB at
 * 0.1 km growing to 138 dB (test/unit/parabolic-equation-instability.test.ts).
 */
export const PE_FREE_SPACE_EXCESS_LIMIT_DB = 20;

/** The free-space check starts this many default range steps from the source (the aperture's near field and the first steps' transients are left out). */
const EXCESS_CHECK_FROM_STEPS = 10;

export interface ParabolicEquationInput {
  /** profile distances from the transmitter (m), ascending */
  d_m: ArrayLike<number>;
  /** ground heights above the datum (m), obstructions included, one per distance */
  ground_m: ArrayLike<number>;
  frequency_ghz: number;
  /** antenna heights above the ground at the two ends (m) */
  tx_antenna_m: number;
  rx_antenna_m: number;
  polarization: "h" | "v";
  ground: PeGround;
  refractivity: RefractivityModel;
  /** 3 dB beamwidth of the transmitting antenna (°) */
  beamwidth_deg: number;
  /** field kept for a figure: columns (range) × rows (height) */
  figure?: { columns: number; rows: number };
  /** height-gain curve at the receiving end: ± half range about the antenna, step (m) */
  height_gain?: { half_range_m: number; step_m: number };
  /** grid overrides (see pe-grid.ts for the defaults) */
  grid?: { dz_m?: number; dx_m?: number; max_angle_deg?: number };
  /** refuse grids needing more bytes than this (default PE_DEFAULT_MEMORY_LIMIT_BYTES) */
  memory_limit_bytes?: number;
  /** refuse grids needing more transform points × range steps than this (default PE_DEFAULT_WORK_LIMIT_CELL_STEPS) */
  work_limit_cell_steps?: number;
  /** refuse a field above the ground stronger than free space by more than this (dB; default PE_FREE_SPACE_EXCESS_LIMIT_DB) as a numerical instability */
  free_space_excess_limit_db?: number;
}

/** The field over the height–distance plane, dB relative to free space on the beam axis. */
export interface PeField {
  /** distance of each column (m) */
  x_m: Float64Array;
  /** the solver's (stair-stepped) ground under each column (m above the datum) */
  ground_m: Float64Array;
  /** absolute height of row 0 (m) and the row spacing (m) */
  z0_m: number;
  dz_m: number;
  rows: number;
  /** column-major: f_db[c·rows + r]; NaN below the ground */
  f_db: Float32Array;
}

export interface ParabolicEquationResult {
  status: "ok" | "refused" | "bad-input";
  /** why a grid was refused or the input is bad; "" when ok */
  reason: string;
  /** −20·log10 F at the receiver (dB): the loss relative to free space */
  excess_loss_db: number;
  grid: PeGridChoice;
  /** beamwidth of the source actually used (°) and its aim above the horizontal (°) */
  beamwidth_used_deg: number;
  aim_deg: number;
  /** the geometry needs angles beyond PE_MAX_ANGLE_DEG */
  angle_limit_exceeded: boolean;
  field: PeField | null;
  height_gain: { rx_antenna_m: Float64Array; relative_db: Float64Array } | null;
  /** whether the answer depends on the band's edge (band-check.ts); null when not solved */
  band_check: BandCheck | null;
}

/**
 * Field of a transmitting antenna over a terrain profile by the split-step Fourier solution of
 * the wide-angle parabolic equation, expressed as the propagation factor F (dB relative to
 * free space on the beam's axis) over the height–distance plane and at the receiver.
 *
 * Method. The reduced field u = e^{−ikx}·ψ of one polarisation obeys the parabolic
 * approximation of the Helmholtz equation; each range step Δx is the Fresnel–Kirchhoff
 * integral from one vertical plane to the next, evaluated by FFT:
 *   u(x + Δx) = exp(ik·Δx·(m − 1)) · F⁻¹[ exp(iΔx·(√(k² − p²) − k)) · F[u(x)] ]
 * (the Feit–Fleck wide-angle propagator, exact for any angle in a uniform medium; the
 * refraction screen is the splitting's approximation). m is the modified refractive index
 * (modified-refractivity.ts), so the Earth is flat and its curvature and the atmosphere's
 * refraction are both in m. The ground is a Leontovich impedance boundary ∂u/∂z + αu = 0
 * (ground-impedance.ts) handled by the discrete mixed Fourier transform (vertical-
 * propagator.ts); a perfect conductor is a sine (H) or cosine (V) transform.
 * Terrain: a terrain-following (Beilis–Tappert shift-map) frame on the piecewise-linear
 * profile, with a staircase only for what the frame cannot follow. Why this and not a pure
 * staircase: a staircase reflects from its treads, not from the slope, and its heights are
 * rounded to whole cells, so its answer depends on the grid (grid halving moved the demo's
 * links by up to 10 dB); a pure shift map cannot follow slopes steeper than the grid's angles.
 * The frame's floor b(x) takes, over each range step, the ground's own slope clamped to the
 * interval from min(0, tan θaim) − s_max to max(0, tan θaim) + s_max (s_max = max_frame_slope,
 * pe-grid.ts; θaim the beam's aim): the field's angles in the frame are the physical ones less
 * the frame's slope, and the field is mostly at angles between the horizontal (grazing
 * reflections) and the aim (the beam), so a frame tilted by up to the aim keeps it in the band
 * (a frame limited to ±s_max cut a ground running along a falling line of sight into stairs:
 * harr-kvtw moved 3 dB under grid halving, 0.09 dB now). In a frame of slope s = tan ψ the
 * field is carried as v = u·exp(−ik·sin ψ·z') (so v's vertical wavenumber 0 runs along the
 * floor; a change of slope multiplies v by exp(−ik·Δ(sin ψ)·z'), exactly), each range step
 * propagates v with the frame's own phase, the even part of the exact plane-wave phase in the
 * sheared frame (frameEvenPhase in vertical-propagator.ts, one table per class of slope): the
 * flat ground's √(k² − p²) − k used in a tilted frame, as before, was wrong by about
 * (3/4)·k·θ²·s² per metre at angle θ to the frame and put a uniform slope up to 16 dB off the
 * same field over flat ground rotated (test/reference/parabolic-equation.test.ts); the odd part,
 * about k·sin ψ·θ³/2 per metre, the ground's transforms cannot carry (they pair p with −p), and
 * it is what is left (up to 1 dB there with unequal antenna heights). The impedance condition
 * on the normal η = z'·cos ψ, ∂u/∂η + αu = 0, is ∂v/∂z' + α·cos ψ·v = 0 in the frame. Where the ground is no steeper than that, it is flat in the frame
 * and exactly on a row: no height is rounded (sub-cell terrain). Where it is steeper, the rest
 * of the slope is a staircase of Kirchhoff screens in the frame (the field below the ground's
 * row is cut at each range plane, which also makes a thin obstacle a knife edge), and the
 * frame is moved towards the ground's row by at most ALIGN_SLOPE of its slope limit per step,
 * so that it lies exactly on a row again a few steps after the steep part ends. Cells below
 * the ground are dropped (the field array starts at the ground's row). The angular filter
 * (vertical-propagator.ts) holds the model's angles θmax on any grid. The staircase part still
 * depends on Δx on long slopes steeper than the frame's limit (measured in
 * test/reference/parabolic-equation-convergence.test.ts). A Hann taper above the region of
 * interest (the upper hull of terrain and ends plus the Fresnel zone: pe-grid.ts) absorbs what
 * leaves it. The source is a Gaussian aperture of the antenna's 3 dB beamwidth aimed at the receiver (aperture-source.ts); the receiver is a point.
 * References: M. Levy, "Parabolic Equation Methods for Electromagnetic Wave Propagation",
 * IEE 2000 (split-step, modified refractivity, Gaussian source, staircase terrain); the shift
 * map after Beilis & Tappert (1979) as used by Donohue & Kuttler, IEEE TAP 48(2), 2000;
 * G. D. Dockery & J. R. Kuttler, IEEE Trans. Antennas Propag. 44(12), 1996 (discrete mixed
 * Fourier transform) — both from memory; the equations above are restated in the code.
 * Validity: angles to PE_MAX_ANGLE_DEG (15°); forward scattering only (no back-scatter from
 * terrain); the two-dimensional field of a line source scaled to a point source by the
 * free-space reference (common practice). Grid choice: pe-grid.ts.
 * Bad numbers give status "bad-input"; a grid over the memory limit, status "refused"; a field
 * above the ground stronger than free space by more than PE_FREE_SPACE_EXCESS_LIMIT_DB (outside
 * a duct), status "refused" as a numerical instability (no throwing).
 */
export function parabolicEquationField(input: ParabolicEquationInput): ParabolicEquationResult {
  const lambda = wavelengthM(input.frequency_ghz);
  const k = (2 * Math.PI) / lambda;
  const d = input.d_m;
  const g = input.ground_m;
  const np = d.length;
  const cols0 = input.figure?.columns ?? 0;
  const rows = input.figure?.rows ?? 0;
  const mExcess = modifiedRefractivity(input.refractivity);
  const ae = effectiveRadiusFromRefractivity(input.refractivity, g[0] ?? 0);
  const bad = (reason: string, grid?: PeGridChoice): ParabolicEquationResult => ({
    status: "bad-input",
    reason,
    excess_loss_db: NaN,
    grid: grid ?? ({} as PeGridChoice),
    beamwidth_used_deg: NaN,
    aim_deg: NaN,
    angle_limit_exceeded: false,
    field: null,
    height_gain: null,
    band_check: null,
  });
  if (!(lambda > 0) || !Number.isFinite(lambda)) return bad("frequency is not a positive number");
  if (np < 2 || g.length !== np) return bad("the profile needs at least two samples with one ground height each");
  for (let i = 0; i < np; i++) {
    if (!Number.isFinite(d[i]) || !Number.isFinite(g[i]) || (i > 0 && !(d[i] > d[i - 1]))) return bad("profile distances must be ascending and heights finite");
  }
  if (!(input.tx_antenna_m >= 0) || !(input.rx_antenna_m >= 0)) return bad("antenna heights must be ≥ 0");
  if (Number.isNaN(mExcess(g[0])) || Number.isNaN(ae)) return bad("the refractivity description is not usable");
  if (!(input.beamwidth_deg > 0)) return bad("beamwidth must be positive");
  const D = d[np - 1] - d[0];
  const zT = g[0] + input.tx_antenna_m;
  const zR = g[np - 1] + input.rx_antenna_m;
  const grid = choosePeGrid({ d_m: d, ground_m: g, lambda_m: lambda, tx_amsl_m: zT, rx_amsl_m: zR, ae_m: ae, beamwidth_deg: input.beamwidth_deg, figure_cells: cols0 * rows, overrides: input.grid });
  const limit = input.memory_limit_bytes ?? PE_DEFAULT_MEMORY_LIMIT_BYTES;
  const angle_limit_exceeded = grid.geometry_angle_deg > PE_MAX_ANGLE_DEG;
  const thetaMax = (grid.max_angle_deg * Math.PI) / 180;
  const beam = Math.min((input.beamwidth_deg * Math.PI) / 180, 0.7 * thetaMax);
  const aim = Math.atan((zR - zT) / D - D / (2 * ae));
  const common = { grid, beamwidth_used_deg: (beam * 180) / Math.PI, aim_deg: (aim * 180) / Math.PI, angle_limit_exceeded };
  if (!(grid.memory_bytes <= limit)) {
    const mib = (b: number) => (b / 1048576).toFixed(b < 10 * 1048576 ? 1 : 0);
    return {
      status: "refused",
      reason: `the grid (${2 * grid.n} heights of ${(grid.dz_m * 1000).toFixed(1)} mm, ${grid.steps} range steps of ${grid.dx_m.toFixed(1)} m) needs ${mib(grid.memory_bytes)} MiB, above the limit of ${mib(limit)} MiB`,
      excess_loss_db: NaN,
      ...common,
      field: null,
      height_gain: null,
      band_check: null,
    };
  }
  const work = 2 * grid.n * grid.steps;
  const workLimit = input.work_limit_cell_steps ?? PE_DEFAULT_WORK_LIMIT_CELL_STEPS;
  if (!(work <= workLimit)) {
    return {
      status: "refused",
      reason: `the grid (${2 * grid.n} heights of ${(grid.dz_m * 1000).toFixed(1)} mm, ${grid.steps} range steps of ${grid.dx_m.toFixed(1)} m) needs ${(work / 1e6).toFixed(0)} million cell-steps, above the limit of ${(workLimit / 1e6).toFixed(0)} million (the path is too long for its frequency to be solved in reasonable time)`,
      excess_loss_db: NaN,
      ...common,
      field: null,
      height_gain: null,
      band_check: null,
    };
  }
  const N = grid.n;
  const dz = grid.dz_m;
  const dx = grid.dx_m;
  const groundAt = makeGroundInterpolator(d, g);
  const topAt = makeGroundInterpolator(d, grid.top_m);
  // the frame (see the doc comment): floor height bf[i] at range plane i and the ground's row
  // there, row[i] (the ground lies row[i]·Δz above the floor: exactly once the frame has
  // caught up with it, within half a cell on steep parts). The floor's slope is the ground's,
  // clamped to [sLo, sHi], plus a bounded correction towards the ground's row.
  const steps = grid.steps;
  const fs = grid.max_frame_slope;
  // the frame's slopes span the horizontal and the beam's aim, widened by ±fs: a frame tilted
  // towards the beam keeps the beam inside the band (a path whose ground runs along a falling
  // line of sight is followed instead of cut into stairs)
  const tanAim = Math.tan(aim);
  const sLo = Math.min(0, tanAim) - fs;
  const sHi = Math.max(0, tanAim) + fs;
  const bf = new Float64Array(steps + 1);
  const row = new Int32Array(steps + 1);
  bf[0] = groundAt(d[0]);
  let gPrev = bf[0];
  let fMin = bf[0];
  let gTop = -Infinity;
  for (let i = 0; i < np; i++) gTop = Math.max(gTop, g[i]);
  for (let i = 1; i <= steps; i++) {
    const gi = groundAt(d[0] + i * dx);
    const want = bf[i - 1] + Math.max(sLo, Math.min(sHi, (gi - gPrev) / dx)) * dx;
    // the ground's height above the frame in rows, and the correction that brings it onto a
    // row, limited to ALIGN_SLOPE·fs·Δx per step (so the frame's slope stays within the band)
    const rows = (gi - want) / dz;
    const r = Math.round(rows);
    const limit = (ALIGN_SLOPE * fs * dx) / dz;
    const shift = Math.max(-limit, Math.min(limit, rows - r));
    bf[i] = want + shift * dz;
    row[i] = Math.round((gi - bf[i]) / dz);
    fMin = Math.min(fMin, bf[i] + Math.min(0, row[i]) * dz);
    gPrev = gi;
  }
  // phase screen exp(ik·Δx·(m − 1)) by absolute height on the vertical grid, over every height
  // the field array reaches (indices from the lowest)
  // (the screen is indexed from the previous plane's floor: a margin for one step of the frame)
  const margin = Math.ceil(((Math.max(-sLo, sHi) + ALIGN_SLOPE * fs) * dx) / dz) + 2;
  const sMin = Math.floor(fMin / dz) - margin;
  const screenRe = new Float64Array(Math.ceil(gTop / dz) - sMin + N + margin + 6);
  const screenIm = new Float64Array(screenRe.length);
  let trapping = false;
  for (let a = 0; a < screenRe.length; a++) {
    const mHere = mExcess((a + sMin) * dz);
    if (a > 0 && mHere < mExcess((a - 1 + sMin) * dz)) trapping = true; // M falling with height: a duct
    const ph = k * dx * mHere; // Levy 2000: refraction phase screen exp(ik·Δx·(m − 1))
    screenRe[a] = Math.cos(ph);
    screenIm[a] = Math.sin(ph);
  }
  // Hann absorbing layer (common practice) from the top of the region of interest upwards
  const L = grid.absorber_cells;
  const taper = new Float64Array(L);
  for (let j = 0; j < L; j++) taper[j] = 0.5 * (1 + Math.cos((Math.PI * j) / L));
  const alpha = input.ground.kind === "impedance" ? impedanceAlpha(input.ground.epsilon_r, input.ground.sigma_s_m, lambda, input.polarization) : null;
  if (alpha && !(Number.isFinite(alpha.re) && Number.isFinite(alpha.im))) return bad("ground constants are not usable", grid);
  const step = makeVerticalPropagator({
    n: N,
    dz_m: dz,
    dx_m: dx,
    k_rad_m: k,
    boundary: alpha ? { kind: "mixed", alpha } : input.polarization === "h" ? { kind: "dirichlet" } : { kind: "neumann" },
    // the filter holds the model's angles, not the grid's band, and absorbs the same per metre
    // on a refined grid: refining the grid then changes the sampling only, not the model
    p_limit_rad_m: k * Math.sin(thetaMax),
    filter_exponent: dx / grid.dx_reference_m,
  });
  // the field array starts at the ground (row 0 at the transmitter); the source at its height
  let b = bf[0];
  // the field array is a view of N + 1 cells into a larger buffer: moving the array up or down
  // with the ground (shiftField before) moves the view and clears only the cells it uncovers
  const field2 = new FieldWindow(N + 1);
  let ur = field2.re;
  let ui = field2.im;
  const sigma = gaussianSourceSigmaM(beam, k);
  const p0 = k * Math.sin(aim);
  const zs = zT - b;
  for (let j = 0; j < N; j++) {
    const z = j * dz;
    const amp = Math.exp(-((z - zs) ** 2) / (2 * sigma * sigma)); // Levy 2000 §8: Gaussian aperture
    ur[j] = amp * Math.cos(p0 * (z - zs));
    ui[j] = amp * Math.sin(p0 * (z - zs));
  }
  const cols = Math.min(cols0, grid.steps);
  const field: PeField | null =
    cols > 0 && rows > 1
      ? { x_m: new Float64Array(cols), ground_m: new Float64Array(cols), z0_m: grid.z_low_m, dz_m: (grid.z_high_m - grid.z_low_m) / (rows - 1), rows, f_db: new Float32Array(cols * rows) }
      : null;
  let nextCol = 0;
  const below = alpha ? "none" : input.polarization === "v" ? "even" : "odd";
  /** F (dB) at height zRel above the frame's floor, distance x, from the complex field between cells (band-limited-sample.ts): for the receiver and its height-gain curve. */
  const relDbExact = (zRel: number, x: number): number => {
    const t = zRel / dz - q;
    if (t < 0 || t > N) return NaN;
    const [re, im] = bandLimitedSample(ur, ui, t, below);
    const r = Math.hypot(x, b + zRel - zT);
    return 20 * Math.log10(Math.hypot(re, im) / gaussianAxisAmplitude(r, sigma, k)); // F relative to free space on the beam axis
  };
  /** F (dB) at height zRel above the frame's floor, distance x; amplitude interpolated linearly (the figure only: its rows are far coarser than Δz). */
  const relDb = (zRel: number, x: number): number => {
    const t = zRel / dz - q;
    if (t < 0) return NaN;
    const j = Math.floor(t);
    if (j >= N) return NaN;
    const f = t - j;
    const a0 = Math.hypot(ur[j], ui[j]);
    const a1 = Math.hypot(ur[j + 1], ui[j + 1]);
    const amp = a0 + f * (a1 - a0);
    const r = Math.hypot(x, b + zRel - zT);
    return 20 * Math.log10(amp / gaussianAxisAmplitude(r, sigma, k)); // F relative to free space on the beam axis
  };
  // the free-space check (PE_FREE_SPACE_EXCESS_LIMIT_DB) from a distance that does not move with the grid
  const checkFromX = trapping ? Infinity : EXCESS_CHECK_FROM_STEPS * grid.dx_reference_m;
  const excessLimit = input.free_space_excess_limit_db ?? PE_FREE_SPACE_EXCESS_LIMIT_DB;
  /** the refusal of a field that exceeds free space by more than is physically possible */
  const unstable = (excessDb: number, x: number, aboveGround: number): ParabolicEquationResult => {
    return {
      status: "refused",
      reason: `numerical instability: the field reaches ${excessDb.toFixed(1)} dB above free space at ${(x / 1000).toFixed(2)} km, ${aboveGround.toFixed(0)} m above the ground, more than the +${excessLimit} dB that a ground reflection and terrain focusing can give; check the ground constants, or use the default grid or a smaller maximum angle`,
      excess_loss_db: NaN,
      ...common,
      field: null,
      height_gain: null,
      band_check: null,
    };
  };
  // q: the row of the array's first cell (the ground's row, or the lower of two neighbouring
  // planes' rows); array cell j is (j + q)·Δz above the floor
  let q = 0;
  // the floor's slope over range step i: the frame (shift map) multiplies the field by
  // exp(−ik·Δ(sin ψ)·z') where it changes (frameGauge), so that in the frame angles are
  // measured from the local ground; the propagator and the impedance condition take the slope
  // for the step (vertical-propagator.ts)
  const slopeOf = (i: number) => (bf[i] - bf[i - 1]) / dx;
  /** the gauge's vertical wavenumber k·sin ψ of the frame over range step i (frameGauge) */
  const gaugeOf = (i: number) => frameGauge(slopeOf(i), k).kSigma;
  // the tilt before the first step (the later ones are applied with the refraction screen)
  tilt(ur, ui, -gaugeOf(1) * dz, q, N);
  for (let i = 1; i <= steps; i++) {
    const x = i * dx;
    const bNext = bf[i];
    step(ur, ui, slopeOf(i));
    // one pass over the field: the refraction screen exp(ik·Δx·(m − 1)), the absorbing layer
    // above the region of interest, and the next step's tilt exp(ic·(j + q)), c = −k·Δs·Δz (by
    // recurrence: one rotation per cell instead of a cos and a sin; rounding drift about
    // N·1e-16, re-seeded every 1024 cells)
    const off = Math.round(b / dz) + q - sMin;
    const jA = Math.min(N, Math.max(0, Math.ceil((topAt(d[0] + x - dx) - b) / dz) - q));
    const jEnd = Math.min(N + 1, jA + L);
    const c = i < steps ? -(gaugeOf(i + 1) - gaugeOf(i)) * dz : 0;
    // the ground's row at this plane: cells below it are cut after this pass
    const cut = Math.min(N + 1, row[i] - q);
    const checkFrom = x >= checkFromX ? Math.max(0, cut) : jA;
    let peak = 0;
    let peakAt = 0;
    const er = Math.cos(c);
    const ei = Math.sin(c);
    let cr = 1;
    let ci = 0;
    for (let j = 0; j < jEnd; j++) {
      if ((j & 1023) === 0) {
        cr = Math.cos(c * (j + q));
        ci = Math.sin(c * (j + q));
      }
      const t = j < jA ? 1 : taper[j - jA];
      const sr = screenRe[off + j];
      const si = screenIm[off + j];
      const fr = t * (sr * cr - si * ci);
      const fi = t * (sr * ci + si * cr);
      const re = ur[j];
      const nre = re * fr - ui[j] * fi;
      const nim = re * fi + ui[j] * fr;
      ur[j] = nre;
      ui[j] = nim;
      if (j >= checkFrom && j < jA) {
        const a2 = nre * nre + nim * nim;
        if (a2 > peak) {
          peak = a2;
          peakAt = j;
        }
      }
      const nr = cr * er - ci * ei;
      ci = cr * ei + ci * er;
      cr = nr;
    }
    ur.fill(0, jEnd);
    ui.fill(0, jEnd);
    // the field above the ground stronger than free space by more than ground reflection and
    // terrain focusing can make it: a numerical instability, refused (PE_FREE_SPACE_EXCESS_LIMIT_DB)
    if (peak > 0) {
      const excessDb = 10 * Math.log10(peak) - 20 * Math.log10(gaussianAxisAmplitude(x, sigma, k));
      if (excessDb > excessLimit) return unstable(excessDb, x, (peakAt + q) * dz + b - groundAt(d[0] + x));
    }
    // ground above the array's first cell at this plane cuts off the field below it (a
    // Kirchhoff screen); the ground lies on its row, which becomes the array's first cell
    if (cut > 0) {
      ur.fill(0, 0, cut);
      ui.fill(0, 0, cut);
    }
    // the next step starts at the lower of this plane's and the next plane's ground
    const qNew = i < steps ? Math.min(row[i], row[i + 1]) : row[i];
    field2.shift(qNew - q);
    ur = field2.re;
    ui = field2.im;
    q = qNew;
    b = bNext;
    const gx = groundAt(d[0] + x);
    if (field && nextCol < cols && i === Math.round(((nextCol + 1) * grid.steps) / cols)) {
      field.x_m[nextCol] = x;
      field.ground_m[nextCol] = gx;
      const topRel = topAt(d[0] + x) - b;
      for (let r = 0; r < rows; r++) {
        const zRel = field.z0_m + r * field.dz_m - b;
        field.f_db[nextCol * rows + r] = zRel < gx - b || zRel > topRel ? NaN : relDb(zRel, x);
      }
      nextCol++;
    }
  }
  const excess_loss_db = -relDbExact(zR - b, D);
  // the band check (band-check.ts): what the angular filter absorbed over the march, and the
  // receiver's local spectrum in the upper half of the band
  const band_check = bandCheck(step.absorbed.log_kept, receiverUpperBandShare(ur, ui, (zR - b) / dz - q, dz, step.p_limit_rad_m));
  if (!trapping && -excess_loss_db > excessLimit) return unstable(-excess_loss_db, D, input.rx_antenna_m);
  let height_gain: ParabolicEquationResult["height_gain"] = null;
  if (input.height_gain && input.height_gain.step_m > 0) {
    const { half_range_m: h, step_m } = input.height_gain;
    const lo = Math.max(0, input.rx_antenna_m - h);
    const count = Math.floor((input.rx_antenna_m + h - lo) / step_m + 1e-9) + 1;
    height_gain = { rx_antenna_m: new Float64Array(count), relative_db: new Float64Array(count) };
    for (let c = 0; c < count; c++) {
      const z = lo + c * step_m;
      height_gain.rx_antenna_m[c] = z;
      height_gain.relative_db[c] = relDbExact(g[np - 1] + z - b, D);
    }
  }
  return { status: "ok", reason: "", excess_loss_db, ...common, field, height_gain, band_check };
}

/** Ground height (m) at distance x by linear interpolation of the profile (ends held). */
function makeGroundInterpolator(d: ArrayLike<number>, g: ArrayLike<number>): (x: number) => number {
  let i = 0;
  const n = d.length;
  return (x) => {
    if (x <= d[0]) return g[0];
    if (x >= d[n - 1]) return g[n - 1];
    if (x < d[i]) i = 0;
    while (i < n - 2 && d[i + 1] < x) i++;
    const t = (x - d[i]) / (d[i + 1] - d[i]);
    return g[i] + t * (g[i + 1] - g[i]);
  };
}

/** Multiply u[0..n] by exp(ic·(j + q)) (by recurrence, re-seeded every 1024 cells). */
function tilt(ur: Float64Array, ui: Float64Array, c: number, q: number, n: number): void {
  if (c === 0) return;
  const er = Math.cos(c);
  const ei = Math.sin(c);
  let cr = 1;
  let ci = 0;
  for (let j = 0; j <= n; j++) {
    if ((j & 1023) === 0) {
      cr = Math.cos(c * (j + q));
      ci = Math.sin(c * (j + q));
    }
    const re = ur[j];
    ur[j] = re * cr - ui[j] * ci;
    ui[j] = re * ci + ui[j] * cr;
    const nr = cr * er - ci * ei;
    ci = cr * ei + ci * er;
    cr = nr;
  }
}

/**
 * The field array (real and imaginary parts, `length` cells) as a window into buffers with
 * room on both sides: shift(by) moves the window by `by` cells (positive: the bottom cells are
 * dropped and zero cells appear at the top; negative: zero cells are added below), clearing
 * only the cells it uncovers, and copies the window back to the middle only when it reaches
 * an end of the buffers.
 */
class FieldWindow {
  re: Float64Array;
  im: Float64Array;
  private readonly bufRe: Float64Array;
  private readonly bufIm: Float64Array;
  private start: number;
  private readonly slack: number;
  constructor(private readonly length: number) {
    this.slack = Math.max(64, length);
    this.bufRe = new Float64Array(length + 2 * this.slack);
    this.bufIm = new Float64Array(length + 2 * this.slack);
    this.start = this.slack;
    this.re = this.bufRe.subarray(this.start, this.start + length);
    this.im = this.bufIm.subarray(this.start, this.start + length);
  }
  shift(by: number): void {
    if (by === 0) return;
    const n = this.length;
    if (Math.abs(by) >= n) {
      this.re.fill(0);
      this.im.fill(0);
      return;
    }
    let s = this.start + by;
    if (s < 0 || s + n > this.bufRe.length) {
      // back to the middle: the cells that stay in the window, copied
      const keepFrom = Math.max(0, by);
      const keepTo = Math.min(n, n + by);
      const to = this.slack + keepFrom - by;
      this.bufRe.copyWithin(to, this.start + keepFrom, this.start + keepTo);
      this.bufIm.copyWithin(to, this.start + keepFrom, this.start + keepTo);
      s = this.slack;
      // everything else in the new window is cleared below
      this.bufRe.fill(0, s, to);
      this.bufIm.fill(0, s, to);
      this.bufRe.fill(0, to + keepTo - keepFrom, s + n);
      this.bufIm.fill(0, to + keepTo - keepFrom, s + n);
    } else if (by > 0) {
      this.bufRe.fill(0, this.start + n, s + n);
      this.bufIm.fill(0, this.start + n, s + n);
    } else {
      this.bufRe.fill(0, s, this.start);
      this.bufIm.fill(0, s, this.start);
    }
    this.start = s;
    this.re = this.bufRe.subarray(s, s + n);
    this.im = this.bufIm.subarray(s, s + n);
  }
}
