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
 * @returns step(ur, ui, α?), which overwrites its arguments (α: a mixed boundary's coefficient
 *   for this step, default the one given here)
 */
export function makeVerticalPropagator(o: VerticalPropagatorOptions): (ur: Float64Array, ui: Float64Array, alpha?: Complex) => void {
  const { n, dz_m: dz, dx_m: dx, k_rad_m: k } = o;
  const m2 = 2 * n;
  const cosine = o.boundary.kind === "neumann";
  const fft = cosine ? (o.fft ?? new FFT(m2)) : null;
  const data = new Float64Array(cosine ? 2 * m2 : 0);
  const out = new Float64Array(cosine ? 2 * m2 : 0);
  const pr = new Float64Array(m2);
  const pi = new Float64Array(m2);
  const pLimit = Math.min(o.p_limit_rad_m ?? Infinity, Math.PI / dz);
  /** the angular filter's factor for vertical wavenumber p (rad/m) */
  const filterAt = (p: number): number => {
    const t = Math.abs(p) / pLimit; // |p| / p_max
    const filter = t <= SPECTRAL_FILTER_FROM ? 1 : t >= 1 ? 0 : 0.5 * (1 + Math.cos((Math.PI * (t - SPECTRAL_FILTER_FROM)) / (1 - SPECTRAL_FILTER_FROM)));
    return filter ** (o.filter_exponent ?? 1);
  };
  for (let q = 0; q < m2; q++) {
    const p = (Math.PI * (q <= n ? q : q - m2)) / (n * dz);
    const ph = p >= k || p <= -k ? 0 : (dx * -(p * p)) / (Math.sqrt(k * k - p * p) + k); // Feit–Fleck: Δx·(√(k² − p²) − k), cancellation-free
    const f = filterAt(p);
    pr[q] = f * Math.cos(ph);
    pi[q] = f * Math.sin(ph);
  }
  /** data ← propagate(data) in the spectral domain. */
  const spectral = () => {
    fft!.transform(out, data);
    for (let q = 0; q < m2; q++) {
      const re = out[2 * q];
      const im = out[2 * q + 1];
      out[2 * q] = re * pr[q] - im * pi[q];
      out[2 * q + 1] = re * pi[q] + im * pr[q];
    }
    fft!.inverseTransform(data, out);
  };
  const sine = cosine ? null : makeSineTransform(n);
  const sr = new Float64Array(n + 1);
  const si = new Float64Array(n + 1);
  // the propagator with the inverse's factor 2/n folded in (the sine transform is its own
  // inverse up to 2/n)
  const sPr = Float64Array.from(pr.subarray(0, n), (v) => (2 / n) * v);
  const sPi = Float64Array.from(pi.subarray(0, n), (v) => (2 / n) * v);
  /** (ar + i·ai)[1..n−1] ← propagate by the sine transform (values at 0 and n taken as 0). */
  const sinePropagate = (ar: Float64Array, ai: Float64Array) => {
    sine!(ar, ai, sr, si, sPr, sPi); // the propagator applied as the transform is unpacked
    sine!(sr, si, ar, ai);
  };
  if (o.boundary.kind === "dirichlet") {
    return (ur, ui) => {
      ur[0] = 0;
      ui[0] = 0;
      sinePropagate(ur, ui);
      ur[n] = 0;
      ui[n] = 0;
    };
  }
  if (o.boundary.kind === "neumann") {
    return (ur, ui) => {
      for (let j = 0; j <= n; j++) {
        data[2 * j] = j === n ? 0 : ur[j];
        data[2 * j + 1] = j === n ? 0 : ui[j];
        if (j > 0 && j < n) {
          data[2 * (m2 - j)] = ur[j];
          data[2 * (m2 - j) + 1] = ui[j];
        }
      }
      spectral();
      for (let j = 0; j < n; j++) {
        ur[j] = data[2 * j];
        ui[j] = data[2 * j + 1];
      }
      ur[n] = 0;
      ui[n] = 0;
    };
  }
  // mixed: discrete mixed Fourier transform; the mode's constants depend on α (which the
  // terrain-following frame changes with the slope), so they are made per α and kept
  const setups = new Map<string, ModeSetup>();
  const setupFor = (alpha: Complex): ModeSetup => {
    const key = `${alpha.re.toPrecision(7)},${alpha.im.toPrecision(7)}`;
    let m = setups.get(key);
    if (!m) {
      m = modeSetup(alpha, n, dz, dx, k, filterAt);
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
  return (ur, ui, alphaNow) => {
    const alpha = alphaNow ?? fixed;
    const setup = setupFor(alpha);
    const { powRe, powIm, J, modeRe, modeIm } = setup;
    // scalars in locals: the loops below are the closure's whole cost
    const rr = setup.rho.re;
    const ri = setup.rho.im;
    const ar = alpha.re;
    const ai = alpha.im;
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
    sine!(wr, wi, sr, si, sPr, sPi);
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
}

interface ModeSetup {
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
function modeSetup(alpha: Complex, n: number, dz: number, dx: number, k: number, filterAt: (p: number) => number): ModeSetup {
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
  let kz = csqrt({ re: k * k + lamRe, im: lamIm });
  if (kz.im < 0) kz = { re: -kz.re, im: -kz.im };
  // the angular filter at the mode's vertical wavenumber p = Re √(−λm)
  const pm = csqrt({ re: -lamRe, im: -lamIm });
  const decay = Math.exp(-dx * kz.im) * filterAt(pm.re);
  return { rho, powRe, powIm, J: powRe.length, nr, ni, modeRe: decay * Math.cos(dx * (kz.re - k)), modeIm: decay * Math.sin(dx * (kz.re - k)) };
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
export function makeSineTransform(n: number): (ar: Float64Array, ai: Float64Array, xr: Float64Array, xi: Float64Array, mr?: Float64Array, mi?: Float64Array, rec?: { rhoRe: number; rhoIm: number; c: number }) => void {
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
      // the same unpacking, each output multiplied by mr + i·mi as it is written
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
          xr[e] = -yaI * mr[e] + ybI * mi[e];
          xi[e] = -yaI * mi[e] - ybI * mr[e];
          oa += yaR;
          ob += ybR;
        } else {
          oa = 0.5 * yaR;
          ob = 0.5 * ybR;
        }
        const o = 2 * k + 1;
        xr[o] = oa * mr[o] - ob * mi[o];
        xi[o] = oa * mi[o] + ob * mr[o];
      }
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
