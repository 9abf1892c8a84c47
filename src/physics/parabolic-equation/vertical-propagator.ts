import FFT from "fft.js";
import { csqrt, type Complex } from "../complex.ts";

/**
 * Fraction of the band (|p|/p_max) above which the spectrum is tapered to zero at every step
 * (a Hann taper): the modified-refractivity screen is a linear phase ramp that moves energy
 * steadily to higher vertical wavenumbers, and what crosses p_max would otherwise wrap round to
 * steep downward angles and pollute the shadow (measured: 30 dB of spurious field beyond the
 * horizon without it). The grid carries angles up to this fraction of θmax.
 */
export const SPECTRAL_FILTER_FROM = 0.75;

export type PeBoundary = { kind: "dirichlet" } | { kind: "neumann" } | { kind: "mixed"; alpha: Complex };

export interface VerticalPropagatorOptions {
  /** heights 0..n·Δz; the transform has 2n points */
  n: number;
  dz_m: number;
  dx_m: number;
  k_rad_m: number;
  boundary: PeBoundary;
  /** an fft.js instance of size 2n, for the cosine transform (made here when not given; the
   * sine transforms use one of size n of their own) */
  fft?: FFT;
  /** vertical wavenumber (rad/m) where the angular filter reaches zero, k·sin θmax of the
   * model; default the grid's band π/Δz. Kept fixed when the grid is refined, so that a finer
   * grid carries the same angles (the model) more finely sampled. */
  p_limit_rad_m?: number;
  /** the angular filter's factor is raised to this power (default 1): Δx over a reference
   * step, so that the filter absorbs the same per metre whatever the range step */
  filter_exponent?: number;
}

/**
 * One range step of free-space propagation over a flat boundary, in place on the field
 * (u_j = ur[j] + i·ui[j], z_j = j·Δz, j = 0..n; u_n = 0 at the top):
 * u ← F⁻¹[exp(iΔx·(√(k² − p²) − k))·F[u]] with the transform that fits the boundary:
 * - dirichlet (u = 0: perfectly conducting ground, horizontal polarisation): sine transform;
 * - neumann (∂u/∂z = 0: perfectly conducting ground, vertical polarisation): cosine transform;
 * - mixed (∂u/∂z + αu = 0, impedance ground): the discrete mixed Fourier transform. With
 *   w_j = (u_{j+1} − u_{j−1})/(2Δz) + α·u_j, w satisfies w_0 = 0 and is carried by the sine
 *   transform; the part of u that w cannot see is the discrete surface mode ρ^j, ρ the root
 *   of ρ² + 2αΔz·ρ − 1 = 0 with |ρ| < 1, carried with the eigenvalue (ln ρ/Δz)² that the
 *   spectral propagator gives ρ^(z/Δz) (not the second difference's (ρ + 1/ρ − 2)/Δz², which
 *   with |ρ| near 1 put a phase between the mode and the waves it pairs with: see modeSetup). u is rebuilt from w by the two
 *   stable first-order recursions v_{j+1} = ρ·v_j + 2Δz·w_j (forward) and
 *   u_{j−1} = ρ·(v_j − u_j) (backward from u_n = 0), plus the mode, whose coefficient is the
 *   projection c = ⟨ρ^j, u⟩/⟨ρ^j, ρ^j⟩ with the bilinear form Σ' (weight ½ at j = 0) under
 *   which the discrete operator is symmetric.
 * Above SPECTRAL_FILTER_FROM of the band (or of p_limit_rad_m) the spectrum is tapered away
 * (an absorber in angle); the surface mode too, at its own vertical wavenumber Re √(−λd): when
 * |α|·Δz < π (a vertically polarised ground whose Brewster angle, sin ψB ≈ |α|/k, lies inside
 * the band) the mode is the Brewster-angle pseudo-mode at the band's edge, and carried
 * unfiltered it grew on a rough staircase (a UHF link on a grid refined to Δz = 0.32 m: −855 dB;
 * test/unit/parabolic-equation-surface-mode.test.ts).
 * The sine transforms take one complex FFT of n points for the field's real and imaginary
 * parts together (makeSineTransform; half the work of the odd extension to 2n points, which a
 * first version transformed); the cosine transform, a complex FFT (fft.js) of the even
 * extension to 2n points.
 * Reference: G. D. Dockery & J. R. Kuttler, "An improved impedance-boundary algorithm for
 * Fourier split-step solutions of the parabolic wave equation", IEEE Trans. Antennas Propag.
 * 44(12), 1996 (from memory; the recursions and projection are derived afresh above).
 * In a terrain-following frame of slope s (split-step.ts) the phase is the frame's own,
 * frameEvenPhase (the Feit–Fleck phase above when s = 0), from a table per class of slope
 * (FRAME_SLOPE_CLASS_STEP; tables made when first asked for, the least recently used refilled
 * beyond propagatorTablesBytes), and the mixed boundary's coefficient is α·cos ψ (the normal
 * derivative in the frame's vertical coordinate).
 * @returns step(ur, ui, s?, α?), which overwrites its arguments (s: the frame's slope over this
 *   step, default 0; α: a mixed boundary's coefficient on the ground's normal for this step,
 *   default the one given here), with `absorbed`, what its angular filter took, and
 *   `p_limit_rad_m`, the vertical wavenumber where that filter reaches 0 (VerticalPropagator)
 */
export function makeVerticalPropagator(o: VerticalPropagatorOptions): VerticalPropagator {
  const { step, absorbed } = verticalPropagator(o);
  return Object.assign(step, { absorbed, p_limit_rad_m: filterLimit(o) });
}

/** The angular filter's limit (rad/m): the one asked for, at most the grid's band π/Δz. */
function filterLimit(o: VerticalPropagatorOptions): number {
  return Math.min(o.p_limit_rad_m ?? Infinity, Math.PI / o.dz_m);
}

/**
 * One range step (see makeVerticalPropagator), and what the angular filter took: `absorbed.log_kept`
 * sums over the steps taken ln(Σ|X·F|²/Σ|X|²), the share of the spectrum's power the filter F
 * kept (X the spectrum the propagator multiplies: the field's for a perfectly conducting ground,
 * the mixed transform's w = ∂u/∂z + αu for an impedance ground).
 */
export type VerticalPropagator = ((ur: Float64Array, ui: Float64Array, slope?: number, alpha?: Complex) => void) & { absorbed: { log_kept: number }; p_limit_rad_m: number };

function verticalPropagator(o: VerticalPropagatorOptions): { step: (ur: Float64Array, ui: Float64Array, slope?: number, alpha?: Complex) => void; absorbed: { log_kept: number } } {
  const { n, dz_m: dz, dx_m: dx, k_rad_m: k } = o;
  const m2 = 2 * n;
  const cosine = o.boundary.kind === "neumann";
  const fft = cosine ? (o.fft ?? new FFT(m2)) : null;
  const data = new Float64Array(cosine ? 2 * m2 : 0);
  const out = new Float64Array(cosine ? 2 * m2 : 0);
  const pLimit = filterLimit(o);
  /** the angular filter's factor for vertical wavenumber p (rad/m) */
  const filterAt = (p: number): number => {
    const t = Math.abs(p) / pLimit; // |p| / p_max
    const filter = t <= SPECTRAL_FILTER_FROM ? 1 : t >= 1 ? 0 : 0.5 * (1 + Math.cos((Math.PI * (t - SPECTRAL_FILTER_FROM)) / (1 - SPECTRAL_FILTER_FROM)));
    return filter ** (o.filter_exponent ?? 1);
  };
  // the angular filter's factor at each transform point (the same for every class of slope)
  const count = cosine ? m2 : n;
  const filt = new Float64Array(count);
  for (let q = 0; q < count; q++) filt[q] = filterAt((Math.PI * (q <= n ? q : q - m2)) / (n * dz));
  /** the propagator's factors for frame-slope class `cls` into (ar, ai)[0..count−1], times `scale` */
  const fillTable = (cls: number, scale: number, ar: Float64Array, ai: Float64Array) => {
    const { kSigma, kCos } = frameGauge(cls * FRAME_SLOPE_CLASS_STEP, k);
    for (let q = 0; q < count; q++) {
      const f = scale * filt[q];
      if (f === 0) continue; // beyond the angular filter: left zero
      const p = (Math.PI * (q <= n ? q : q - m2)) / (n * dz);
      const ph = dx * frameEvenPhase(p, k, kSigma, kCos); // Feit–Fleck in the tilted frame (frameEvenPhase)
      ar[q] = f * Math.cos(ph);
      ai[q] = f * Math.sin(ph);
    }
  };
  // the propagator per class of frame slope, made when first asked for and kept (a few
  // dozen classes on a mountainous path); the cosine transform's has 2n factors, the sine
  // transform's n with the inverse's factor 2/n folded in (the sine transform is its own
  // inverse up to 2/n)
  const tables = new Map<number, { re: Float64Array; im: Float64Array }>();
  const maxTables = Math.floor(propagatorTablesBytes(n) / (16 * count));
  const tableFor = (cls: number): { re: Float64Array; im: Float64Array } => {
    let t = tables.get(cls);
    if (t) {
      // most recently used last (a Map keeps insertion order)
      tables.delete(cls);
      tables.set(cls, t);
      return t;
    }
    if (tables.size >= maxTables) {
      // the least recently used table's arrays are refilled for this class
      const [oldest, reuse] = tables.entries().next().value!;
      tables.delete(oldest);
      t = reuse;
      t.re.fill(0);
      t.im.fill(0);
    } else t = { re: new Float64Array(count), im: new Float64Array(count) };
    fillTable(cls, cosine ? 1 : 2 / n, t.re, t.im);
    tables.set(cls, t);
    return t;
  };
  /** data ← propagate(data) in the spectral domain. */
  const spectral = (tr: Float64Array, ti: Float64Array) => {
    fft!.transform(out, data);
    let before = 0;
    let after = 0;
    for (let q = 0; q < m2; q++) {
      const re = out[2 * q];
      const im = out[2 * q + 1];
      const nr = re * tr[q] - im * ti[q];
      const ni = re * ti[q] + im * tr[q];
      out[2 * q] = nr;
      out[2 * q + 1] = ni;
      before += re * re + im * im;
      after += nr * nr + ni * ni;
    }
    fft!.inverseTransform(data, out);
    keep(before, after);
  };
  /** the angular filter's record: the sum over steps of ln(share of the spectrum's power it kept) */
  const absorbed = { log_kept: 0 };
  const keep = (before: number, after: number) => {
    if (before > 0) absorbed.log_kept += Math.log(Math.min(1, after / before)); // −∞ when it took everything
  };
  const sine = cosine ? null : makeSineTransform(n);
  /** the sine transforms' propagator table carries the inverse's factor 2/n: taken out of the power kept */
  const sineScale2 = (n / 2) ** 2;
  const sr = new Float64Array(n + 1);
  const si = new Float64Array(n + 1);
  /** (ar + i·ai)[1..n−1] ← propagate by the sine transform (values at 0 and n taken as 0). */
  const sinePropagate = (ar: Float64Array, ai: Float64Array, cls: number) => {
    const t = tableFor(cls);
    sine!(ar, ai, sr, si, t.re, t.im); // the propagator applied as the transform is unpacked
    keep(sine!.power.before, sine!.power.after * sineScale2);
    sine!(sr, si, ar, ai);
  };
  if (o.boundary.kind === "dirichlet") {
    const step = (ur: Float64Array, ui: Float64Array, slope?: number) => {
      ur[0] = 0;
      ui[0] = 0;
      sinePropagate(ur, ui, slopeClass(slope));
      ur[n] = 0;
      ui[n] = 0;
    };
    return { absorbed, step };
  }
  if (o.boundary.kind === "neumann") {
    const step = (ur: Float64Array, ui: Float64Array, slope?: number) => {
      for (let j = 0; j <= n; j++) {
        data[2 * j] = j === n ? 0 : ur[j];
        data[2 * j + 1] = j === n ? 0 : ui[j];
        if (j > 0 && j < n) {
          data[2 * (m2 - j)] = ur[j];
          data[2 * (m2 - j) + 1] = ui[j];
        }
      }
      const t = tableFor(slopeClass(slope));
      spectral(t.re, t.im);
      for (let j = 0; j < n; j++) {
        ur[j] = data[2 * j];
        ui[j] = data[2 * j + 1];
      }
      ur[n] = 0;
      ui[n] = 0;
    };
    return { absorbed, step };
  }
  // mixed: discrete mixed Fourier transform; the mode's constants depend on α (which the
  // terrain-following frame changes with the slope), so they are made per α and kept
  const setups = new Map<string, ModeSetup>();
  const setupFor = (alpha: Complex, cls: number): ModeSetup => {
    const key = `${alpha.re.toPrecision(7)},${alpha.im.toPrecision(7)},${cls}`;
    let m = setups.get(key);
    if (!m) {
      m = modeSetup(alpha, cls * FRAME_SLOPE_CLASS_STEP, n, dz, dx, k, filterAt);
      if (setups.size > 256) setups.clear();
      setups.set(key, m);
    }
    return m;
  };
  const wr = new Float64Array(n + 1);
  const wi = new Float64Array(n + 1);
  const twoDz = 2 * dz;
  const fixed = o.boundary.alpha;
  const rec = { rhoRe: 0, rhoIm: 0, c: twoDz };
  /** the mode's coefficient ⟨ρ^j, u⟩/⟨ρ^j, ρ^j⟩ (bilinear form Σ', weight ½ at j = 0), into proj */
  const proj = { re: 0, im: 0 };
  const project = (m: ModeSetup, ur: Float64Array, ui: Float64Array): void => {
    const { powRe, powIm, J, nr, ni } = m;
    let sr = 0.5 * ur[0];
    let si = 0.5 * ui[0];
    for (let j = 1; j < J; j++) {
      sr += powRe[j] * ur[j] - powIm[j] * ui[j];
      si += powRe[j] * ui[j] + powIm[j] * ur[j];
    }
    const d2 = nr * nr + ni * ni;
    proj.re = (sr * nr + si * ni) / d2;
    proj.im = (si * nr - sr * ni) / d2;
  };
  const step = (ur: Float64Array, ui: Float64Array, slope?: number, alphaNow?: Complex) => {
    const alpha = alphaNow ?? fixed;
    const cls = slopeClass(slope);
    const setup = setupFor(alpha, cls);
    const table = tableFor(cls);
    const { powRe, powIm, J, modeRe, modeIm } = setup;
    // scalars in locals: the loops below are the closure's whole cost
    const rr = setup.rho.re;
    const ri = setup.rho.im;
    const ar = setup.alpha.re;
    const ai = setup.alpha.im;
    const h = 1 / twoDz;
    ur[n] = 0;
    ui[n] = 0;
    project(setup, ur, ui);
    const cRe = proj.re;
    const cIm = proj.im;
    for (let j = 1; j < n; j++) {
      const u = ur[j];
      const v = ui[j];
      wr[j] = (ur[j + 1] - ur[j - 1]) * h + ar * u - ai * v;
      wi[j] = (ui[j + 1] - ui[j - 1]) * h + ar * v + ai * u;
    }
    wr[0] = 0;
    wi[0] = 0;
    wr[n] = 0;
    wi[n] = 0;
    // w propagated by the sine transform, and v (in wr/wi: wr[j] holds v_j) by the forward
    // recursion v_{j+1} = ρ·v_j + 2Δz·w_j from v_1 = 0, run as the inverse transform is unpacked
    sine!(wr, wi, sr, si, table.re, table.im);
    keep(sine!.power.before, sine!.power.after * sineScale2);
    rec.rhoRe = rr;
    rec.rhoIm = ri;
    sine!(sr, si, wr, wi, undefined, undefined, rec);
    // u backward from u_n = 0
    ur[n] = 0;
    ui[n] = 0;
    let ur1 = 0;
    let ui1 = 0;
    for (let j = n; j >= 1; j--) {
      const dr = wr[j] - ur1;
      const di = wi[j] - ui1;
      ur1 = rr * dr - ri * di;
      ui1 = rr * di + ri * dr;
      ur[j - 1] = ur1;
      ui[j - 1] = ui1;
    }
    // the mode: propagated coefficient minus what the particular solution already holds
    project(setup, ur, ui);
    const tr = cRe * modeRe - cIm * modeIm - proj.re;
    const ti = cRe * modeIm + cIm * modeRe - proj.im;
    for (let j = 0; j < J; j++) {
      ur[j] += tr * powRe[j] - ti * powIm[j];
      ui[j] += tr * powIm[j] + ti * powRe[j];
    }
    ur[n] = 0;
    ui[n] = 0;
  };
  return { absorbed, step };
}

interface ModeSetup {
  /** the boundary's coefficient in the frame, ∂v/∂z' + α'v = 0 */
  alpha: Complex;
  rho: Complex;
  powRe: number[];
  powIm: number[];
  J: number;
  nr: number;
  ni: number;
  modeRe: number;
  modeIm: number;
}

/** The discrete mode of the mixed transform for one α: ρ, its powers, norm and propagator. */
function modeSetup(alphaGround: Complex, slope: number, n: number, dz: number, dx: number, k: number, filterAt: (p: number) => number): ModeSetup {
  // in a frame of slope s the vertical coordinate z' is the normal one stretched by
  // 1/cos ψ (η = z'·cos ψ, tan ψ = s), so ∂u/∂η + αu = 0 reads ∂u/∂z' + α·cos ψ·u = 0
  const { kSigma, kCos } = frameGauge(slope, k);
  const alpha = { re: (alphaGround.re * kCos) / k, im: (alphaGround.im * kCos) / k };
  const a = { re: alpha.re * dz, im: alpha.im * dz };
  const root = csqrt({ re: 1 + a.re * a.re - a.im * a.im, im: 2 * a.re * a.im });
  let rho = { re: -a.re + root.re, im: -a.im + root.im };
  if (Math.hypot(rho.re, rho.im) >= 1) rho = { re: -a.re - root.re, im: -a.im - root.im };
  // powers ρ^j until negligible, and the mode's norm Σ' ρ^{2j}
  const powRe: number[] = [1];
  const powIm: number[] = [0];
  let nr = 0.5;
  let ni = 0;
  for (let j = 1; j < n; j++) {
    const re = powRe[j - 1] * rho.re - powIm[j - 1] * rho.im;
    const im = powRe[j - 1] * rho.im + powIm[j - 1] * rho.re;
    if (Math.hypot(re, im) < 1e-17) break;
    powRe.push(re);
    powIm.push(im);
    nr += re * re - im * im;
    ni += 2 * re * im;
  }
  // mode propagator exp(iΔx(√(k² + λm) − k)), root with Im ≥ 0 (decaying), with the eigenvalue
  // λm = (ln ρ / Δz)² that the spectral propagator of the rest of the field gives the function
  // ρ^(z/Δz) — not the finite-difference one (ρ + 1/ρ − 2)/Δz². Under the bilinear projection the
  // mode pairs with the propagating waves of the same wavenumber; with |ρ| near 1 (vertical
  // polarisation, |α|Δz < 1) those are inside the band, the decomposition u = (w part) + c·ρ^j
  // is two large cancelling parts, and a phase between them that the field does not have left a
  // residue: a wave near the Brewster angle, 65 m above the ground, grew 5.5× in one 4.95 m step
  // (UHF, Δz 0.33 m), and the march blew up (test/unit/parabolic-equation-instability.test.ts).
  const lr = Math.log(Math.hypot(rho.re, rho.im)) / dz;
  const li = Math.atan2(rho.im, rho.re) / dz;
  const lamRe = lr * lr - li * li;
  const lamIm = 2 * lr * li;
  // the mode's vertical wavenumber p = √(−λm), and its phase per metre, the frame's even
  // phase (frameEvenPhase) continued to complex p: ½(√(k² − (p + kσ)²) + √(k² − (p − kσ)²)) − k·cos ψ,
  // each root with Im ≥ 0 (decaying); with s = 0, √(k² + λm) − k
  const pm = csqrt({ re: -lamRe, im: -lamIm });
  let kzRe = 0;
  let kzIm = 0;
  for (const sg of [1, -1]) {
    const qr = pm.re + sg * kSigma;
    const qi = pm.im;
    let kz = csqrt({ re: k * k - (qr * qr - qi * qi), im: -2 * qr * qi });
    if (kz.im < 0) kz = { re: -kz.re, im: -kz.im };
    kzRe += 0.5 * kz.re;
    kzIm += 0.5 * kz.im;
  }
  // the angular filter at the mode's vertical wavenumber Re p
  const decay = Math.exp(-dx * kzIm) * filterAt(pm.re);
  const ph = dx * (kzRe - kCos);
  return { alpha, rho, powRe, powIm, J: powRe.length, nr, ni, modeRe: decay * Math.cos(ph), modeIm: decay * Math.sin(ph) };
}

/**
 * Spacing of the frame-slope classes that share one propagator (see frameEvenPhase): the
 * frame's slope over a step is rounded to it. Measured on the demo's links against 2.5·10⁻⁴:
 * 1·10⁻³ moves no answer by more than 0.02 dB, 2·10⁻³ by 0.03 dB, 4·10⁻³ by 0.04 dB.
 */
export const FRAME_SLOPE_CLASS_STEP = 1e-3;
/**
 * Bytes the propagator tables of the frame-slope classes may take together for a transform
 * half-size n: up to 96 tables, no more than 16 MiB, but at least 8 tables (a table is 16
 * bytes per point, n points for the sine transforms, 2n for the cosine one; counted as 2n
 * here). Beyond it the least recently used table is refilled for the class asked for. A
 * mountainous demo path's frame visits about 80 classes; the 50 km, 18 GHz link (n = 32768)
 * keeps 32 tables.
 */
export function propagatorTablesBytes(n: number): number {
  const table = 32 * n;
  return Math.max(8 * table, Math.min(16 * 1024 * 1024, 96 * table));
}

/** The class of a frame slope (its index in steps of FRAME_SLOPE_CLASS_STEP). */
function slopeClass(slope: number | undefined): number {
  return slope ? Math.round(slope / FRAME_SLOPE_CLASS_STEP) : 0;
}

/**
 * The terrain-following frame's gauge for a frame of slope s = tan ψ: the field in the frame
 * is v = u·exp(−ik·sin ψ·z'), so that v's vertical wavenumber 0 is the wave running along the
 * frame's floor (kσ = k·sin ψ; kCos = k·cos ψ).
 */
export function frameGauge(slope: number, k: number): { kSigma: number; kCos: number } {
  const c = 1 / Math.sqrt(1 + slope * slope);
  return { kSigma: k * slope * c, kCos: k * c };
}

/**
 * Phase per metre of range of the frame component of vertical wavenumber p (rad/m), the even
 * part of the exact one: in a frame z' = z − s·x (s constant) a plane wave of physical vertical
 * wavenumber b = p + kσ has range wavenumber √(k² − b²) + s·b, so with the gauge of frameGauge
 *   D(p) = √(k² − (p + kσ)²) + s·(p + kσ)
 * exactly (Helmholtz equation, no approximation). The transforms that hold the ground condition
 * (sine, cosine, mixed) pair p with −p and so carry only D's even part,
 *   D_e(p) = ½(√(k² − (p + kσ)²) + √(k² − (p − kσ)²)) (+ a constant, dropped: k·cos ψ taken off),
 * whose p² term, −p²/(2k·cos³ψ), is the Fresnel spreading of the rotated frame (normal
 * coordinate η = z'·cos ψ, range ξ = x/cos ψ); the odd part, D − D_e, starts at p³ (the sin ψ
 * gauge makes its p¹ term zero: v's p = 0 runs exactly along the floor), about −k·sin ψ·θ³/2 at
 * angle θ in the frame. With s = 0 this is the Feit–Fleck √(k² − p²) − k. The wide-angle
 * propagator without the frame's terms (what the solver used before) is wrong by about
 * −(3/2)·k·θ²·s²/2 per metre at angle θ, which moved with the frame's slope between grids.
 * Cancellation-free: √(k² − q²) − k·cos ψ = (k²sin²ψ − q²)/(√(k² − q²) + k·cos ψ).
 * Evanescent parts (|p ± kσ| ≥ k, far outside the angular filter) are given no phase.
 */
export function frameEvenPhase(p: number, k: number, kSigma: number, kCos: number): number {
  const a = p + kSigma;
  const b = p - kSigma;
  const s2 = kSigma * kSigma;
  const ra = a < k && a > -k ? (s2 - a * a) / (Math.sqrt(k * k - a * a) + kCos) : 0;
  const rb = b < k && b > -k ? (s2 - b * b) / (Math.sqrt(k * k - b * b) + kCos) : 0;
  return 0.5 * (ra + rb);
}

/**
 * Sine transform (DST-I) of two real sequences at once, X_k = Σ_{j=1}^{n−1} x_j·sin(πjk/n),
 * k = 1..n−1, by one complex FFT of n points (fft.js) instead of the 2n points of the odd
 * extension: with y_j = sin(πj/n)·(x_j + x_{n−j}) + ½·(x_j − x_{n−j}) (x_0 = x_n = 0) and
 * Y = DFT_n(y), X_2k = −Im Y_k, X_1 = ½·Re Y_0 and X_2k+1 = X_2k−1 + Re Y_k (the symmetric part
 * of y gives the cosine sums, the antisymmetric part the sine sums; common practice for fast
 * sine transforms, e.g. W. H. Press et al., Numerical Recipes, §12.3 — from memory, derived
 * afresh here). The two real sequences are packed as the real and imaginary parts of one
 * complex sequence and separated by Y_a = (Z_k + Z̄_{n−k})/2, Y_b = (Z_k − Z̄_{n−k})/(2i).
 * @returns dst(ar, ai, xr, xi, mr?, mi?): xr, xi[1..n−1] ← the transforms of ar, ai[1..n−1]
 *   (as one complex sequence X_k = A_k + i·B_k), multiplied by mr + i·mi when given (a
 *   propagator applied as the transform is unpacked: one pass over the spectrum less); or,
 *   when `rec` is given (and mr, mi are not), the first-order recursion v_1 = 0,
 *   v_{j+1} = ρ·v_j + c·X_j run over the output as it is unpacked, xr, xi[j] ← v_j for
 *   j = 1..n (the mixed transform's forward recursion, without a pass of its own)
 */
export function makeSineTransform(n: number): ((ar: Float64Array, ai: Float64Array, xr: Float64Array, xi: Float64Array, mr?: Float64Array, mi?: Float64Array, rec?: { rhoRe: number; rhoIm: number; c: number }) => void) & { power: SpectrumPower } {
  const power: SpectrumPower = { before: 0, after: 0 };
  return Object.assign(sineTransform(n, power), { power });
}

/** Power of a spectrum before and after the factors a transform applied as it was unpacked (Σ|X|², Σ|X·m|²). */
export interface SpectrumPower {
  before: number;
  after: number;
}

function sineTransform(n: number, power: SpectrumPower): (ar: Float64Array, ai: Float64Array, xr: Float64Array, xi: Float64Array, mr?: Float64Array, mi?: Float64Array, rec?: { rhoRe: number; rhoIm: number; c: number }) => void {
  const fft = new FFT(n);
  const sinT = new Float64Array(n);
  for (let j = 0; j < n; j++) sinT[j] = Math.sin((Math.PI * j) / n);
  const z = new Float64Array(2 * n);
  const Z = new Float64Array(2 * n);
  return (ar, ai, xr, xi, mr, mi, rec) => {
    z[0] = 0;
    z[1] = 0;
    // y_j and y_{n−j} from the same sum and difference
    for (let j = 1, h = n >> 1; j <= h; j++) {
      const m = n - j;
      const sa = sinT[j] * (ar[j] + ar[m]);
      const da = 0.5 * (ar[j] - ar[m]);
      const sb = sinT[j] * (ai[j] + ai[m]);
      const db = 0.5 * (ai[j] - ai[m]);
      z[2 * j] = sa + da;
      z[2 * j + 1] = sb + db;
      z[2 * m] = sa - da;
      z[2 * m + 1] = sb - db;
    }
    fft.transform(Z, z);
    let oa = 0;
    let ob = 0;
    const half = n >> 1;
    if (mr && mi) {
      // the same unpacking, each output multiplied by mr + i·mi as it is written, and the
      // spectrum's power before and after the factors summed (the angular filter's share)
      let before = 0;
      let after = 0;
      for (let k = 0; k < half; k++) {
        const k2 = k === 0 ? 0 : n - k;
        const zr = Z[2 * k];
        const zi = Z[2 * k + 1];
        const cr = Z[2 * k2];
        const ci = -Z[2 * k2 + 1];
        const yaR = 0.5 * (zr + cr);
        const yaI = 0.5 * (zi + ci);
        const ybR = 0.5 * (zi - ci);
        const ybI = -0.5 * (zr - cr);
        if (k > 0) {
          const e = 2 * k;
          const er = -yaI * mr[e] + ybI * mi[e];
          const ei = -yaI * mi[e] - ybI * mr[e];
          xr[e] = er;
          xi[e] = ei;
          before += yaI * yaI + ybI * ybI;
          after += er * er + ei * ei;
          oa += yaR;
          ob += ybR;
        } else {
          oa = 0.5 * yaR;
          ob = 0.5 * ybR;
        }
        const o = 2 * k + 1;
        const or = oa * mr[o] - ob * mi[o];
        const oi = oa * mi[o] + ob * mr[o];
        xr[o] = or;
        xi[o] = oi;
        before += oa * oa + ob * ob;
        after += or * or + oi * oi;
      }
      power.before = before;
      power.after = after;
      return;
    }
    if (rec) {
      // the same unpacking, the output fed to the recursion as it is written
      const rr = rec.rhoRe;
      const ri = rec.rhoIm;
      const c = rec.c;
      let vr = 0;
      let vi = 0;
      for (let k = 0; k < half; k++) {
        const k2 = k === 0 ? 0 : n - k;
        const zr = Z[2 * k];
        const zi = Z[2 * k + 1];
        const cr = Z[2 * k2];
        const ci = -Z[2 * k2 + 1];
        const yaR = 0.5 * (zr + cr);
        const yaI = 0.5 * (zi + ci);
        const ybR = 0.5 * (zi - ci);
        const ybI = -0.5 * (zr - cr);
        if (k > 0) {
          const e = 2 * k;
          xr[e] = vr;
          xi[e] = vi;
          const nvr = rr * vr - ri * vi - c * yaI;
          vi = rr * vi + ri * vr - c * ybI;
          vr = nvr;
          oa += yaR;
          ob += ybR;
        } else {
          oa = 0.5 * yaR;
          ob = 0.5 * ybR;
        }
        const o = 2 * k + 1;
        xr[o] = vr;
        xi[o] = vi;
        const nvr = rr * vr - ri * vi + c * oa;
        vi = rr * vi + ri * vr + c * ob;
        vr = nvr;
      }
      xr[n] = vr;
      xi[n] = vi;
      return;
    }
    for (let k = 0; k < half; k++) {
      const k2 = k === 0 ? 0 : n - k;
      const zr = Z[2 * k];
      const zi = Z[2 * k + 1];
      const cr = Z[2 * k2];
      const ci = -Z[2 * k2 + 1];
      // Y_a = (Z_k + Z̄_{n−k})/2, Y_b = (Z_k − Z̄_{n−k})/(2i)
      const yaR = 0.5 * (zr + cr);
      const yaI = 0.5 * (zi + ci);
      const ybR = 0.5 * (zi - ci);
      const ybI = -0.5 * (zr - cr);
      if (k > 0) {
        xr[2 * k] = -yaI;
        xi[2 * k] = -ybI;
        oa += yaR;
        ob += ybR;
      } else {
        oa = 0.5 * yaR;
        ob = 0.5 * ybR;
      }
      xr[2 * k + 1] = oa;
      xi[2 * k + 1] = ob;
    }
  };
}
