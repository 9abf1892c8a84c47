import { SPEED_OF_LIGHT_M_S } from "./constants.ts";
import { cabs, cadd, cexpj, complex, cscale } from "./complex.ts";
import { divergenceFactor } from "./divergence-factor.ts";
import { reflectionCoefficient, type Polarization } from "./reflection-coefficient.ts";
import { isValidProfile, reflectionPoints } from "./reflection-point.ts";
import { smoothEarthReflectionPoint } from "./smooth-earth-reflection-point.ts";
import { roughnessFactor } from "./surface-roughness.ts";

/**
 * Received field of a direct ray plus one ground-reflected ray, relative to free space (dB):
 *   L = 20·log10 |1 + ρ·e^{−j(kΔ − φ)}|,   ρ = |R|·D,   k = 2π/λ,
 * where R = |R|·e^{jφ} is the reflection coefficient, D the divergence factor (default 1) and Δ
 * the path difference. Positive values are gain over free space (up to 20·log10(1 + ρ)),
 * negative values loss (down to 20·log10(1 − ρ)).
 *
 * Reference: the two-ray (plane-Earth) interference formula, e.g. Parsons (2000) §2.4 — common
 * practice, from memory. The ratio of the two ray lengths in the amplitude is taken as 1 and the
 * antenna patterns as equal for both rays (common practice for line-of-sight links, where
 * Δ ≪ d). Non-finite input gives NaN; λ ≤ 0 gives NaN.
 * @param opts.path_difference_m reflected minus direct path length Δ (m)
 * @param opts.lambda_m wavelength λ (m)
 * @param opts.reflection reflection coefficient: magnitude |R| and phase φ (rad)
 * @param opts.divergence divergence factor D (dimensionless), default 1
 */
export function twoRayRelativeLevelDb(opts: {
  path_difference_m: number;
  lambda_m: number;
  reflection: { magnitude: number; phase_rad: number };
  divergence?: number;
}): number {
  const { path_difference_m: delta, lambda_m: lambda, reflection } = opts;
  const D = opts.divergence ?? 1;
  if (!(lambda > 0) || !Number.isFinite(delta) || !Number.isFinite(reflection.magnitude * D + reflection.phase_rad)) {
    return NaN;
  }
  const rho = reflection.magnitude * D;
  const k = (2 * Math.PI) / lambda;
  const sum = cadd(complex(1), cscale(cexpj(-(k * delta - reflection.phase_rad)), rho)); // 1 + ρ·e^{−j(kΔ − φ)}
  return 20 * Math.log10(cabs(sum)); // two-ray relative level (common practice)
}

export interface HeightGainPoint {
  /** receiving antenna height above ground (m) */
  rx_antenna_m: number;
  /** field relative to free space (dB) */
  relative_db: number;
  /** number of specular reflections included */
  reflections: number;
}

/**
 * Height-gain curve: the field relative to free space at a series of receiving-antenna heights,
 * summing the direct ray and every visible specular reflection on the profile coherently:
 *   L = 20·log10 |1 + Σ ρ_i·e^{−j(kΔ_i − φ_i)}|.
 *
 * Method: `reflectionPoints` on the profile for each receiver height; R from
 * `reflectionCoefficient` at each point's grazing angle; optional spherical divergence factor
 * (`divergenceFactor`, using the effective radius ae — common practice also for terrain) and
 * roughness factor (`roughnessFactor`). Diffraction of the direct ray by the terrain is not
 * included: this is the interference pattern of a clear path. References as in those functions.
 * Validity: line-of-sight paths; otherwise as `reflectionPoints`. An unusable profile,
 * frequency or antenna height gives relative_db = NaN for the heights concerned.
 * @param opts.d_m profile distances (m), strictly increasing
 * @param opts.h_m terrain heights amsl (m)
 * @param opts.ae_m effective Earth radius (m); Infinity for a flat Earth
 * @param opts.tx_antenna_m transmitting antenna height above ground at d_m[0] (m)
 * @param opts.rx_antennas_m receiving antenna heights above ground at the last sample (m)
 * @param opts.frequency_ghz frequency (GHz)
 * @param opts.ground ground constants εr and σ (S/m) of the reflecting surface
 * @param opts.polarization "horizontal" or "vertical"
 * @param opts.divergence apply the divergence factor (default true)
 * @param opts.sigma_h_m surface height standard deviation for the roughness factor (m), default 0
 */
export function heightGainCurve(opts: {
  d_m: readonly number[];
  h_m: readonly number[];
  ae_m: number;
  tx_antenna_m: number;
  rx_antennas_m: readonly number[];
  frequency_ghz: number;
  ground: { epsilon_r: number; sigma_s_m: number };
  polarization: Polarization;
  divergence?: boolean;
  sigma_h_m?: number;
}): HeightGainPoint[] {
  const { d_m, h_m, ae_m, frequency_ghz, ground, polarization } = opts;
  const lambda = SPEED_OF_LIGHT_M_S / (frequency_ghz * 1e9);
  const k = (2 * Math.PI) / lambda;
  const n = h_m.length;
  const hts = h_m[0] + opts.tx_antenna_m;
  const D = d_m[n - 1] - d_m[0];
  const usable = isValidProfile(d_m, h_m) && Number.isFinite(hts) && ae_m > 0 && lambda > 0 && Number.isFinite(lambda);
  return opts.rx_antennas_m.map((rx) => {
    if (!usable || !Number.isFinite(rx)) return { rx_antenna_m: rx, relative_db: NaN, reflections: 0 };
    const points = reflectionPoints({ d_m, h_m, hts_m: hts, hrs_m: h_m[n - 1] + rx, ae_m });
    let sum = complex(1);
    for (const p of points) {
      const R = reflectionCoefficient({
        epsilon_r: ground.epsilon_r,
        sigma_s_m: ground.sigma_s_m,
        frequency_ghz,
        grazing_angle_rad: p.grazing_angle_rad,
        polarization,
      });
      const d1 = p.distance_m - d_m[0];
      const Dv = opts.divergence === false ? 1 : divergenceFactor({ d1_m: d1, d2_m: D - d1, grazing_angle_rad: p.grazing_angle_rad, ae_m });
      const rs = roughnessFactor({ sigma_h_m: opts.sigma_h_m ?? 0, grazing_angle_rad: p.grazing_angle_rad, lambda_m: lambda });
      const rho = R.magnitude * Dv * rs;
      sum = cadd(sum, cscale(cexpj(-(k * p.path_difference_m - R.phase_rad)), rho)); // 1 + Σ ρ_i·e^{−j(kΔ_i − φ_i)}
    }
    return { rx_antenna_m: rx, relative_db: 20 * Math.log10(cabs(sum)), reflections: points.length };
  });
}

export interface SpaceDiversitySpacing {
  /** local half-period of the interference pattern at the receiver, λ·d/(4·h1') (m) */
  spacing_m: number;
  /** height increase from h2 that advances the two-ray phase kΔ by exactly π (m) */
  spacing_above_m: number;
  /** height decrease from h2 that retards kΔ by exactly π (m); NaN if the pattern runs out first */
  spacing_below_m: number;
  /** distance from the far (transmitting) end to the reflection point (m) */
  d1_m: number;
  /** height of the transmitting antenna above the reflection plane, h1' (m) */
  h1_eff_m: number;
}

/**
 * Vertical spacing of two receiving antennas so that one sits at a peak of the two-ray
 * interference pattern when the other sits in a null: half the pattern period at the receiver.
 *
 * Method (stated, common practice): the phase of the reflected ray relative to the direct one
 * is kΔ − φ; a peak and the neighbouring null differ by π in kΔ. Locally, Δ = 2·h1'·h2'/d and,
 * since Δ is stationary with respect to the reflection point, dΔ/dh2 = 2·h1'/d, so
 *   spacing_m = λ·d/(4·h1')
 * (h1' = h1 on a flat Earth: the familiar λ·d/(4·h1); on the effective sphere h1' =
 * h1 − d1²/(2·ae) with d1 from `smoothEarthReflectionPoint`). Because the reflection point moves
 * as the antenna height changes, the pattern is not strictly periodic on a sphere (10 % over one
 * half-period is common at low clearance); `spacing_above_m` and `spacing_below_m` therefore
 * solve kΔ(h2 ± Δh) = kΔ(h2) ± π by bisection on the smooth-Earth path difference.
 * The reflection phase φ is taken as independent of height (it varies slowly with ψ).
 * Validity: as `smoothEarthReflectionPoint`; smooth reflecting surface. Bad input gives NaN.
 * @param opts.lambda_m wavelength (m)
 * @param opts.d_m path length (m)
 * @param opts.h1_m transmitting (far-end) antenna height above the reflecting surface (m)
 * @param opts.h2_m receiving antenna height above the reflecting surface (m)
 * @param opts.ae_m effective Earth radius (m); Infinity for a flat Earth
 */
export function spaceDiversitySpacing(opts: {
  lambda_m: number;
  d_m: number;
  h1_m: number;
  h2_m: number;
  ae_m: number;
}): SpaceDiversitySpacing {
  const { d_m: d, h1_m: h1, h2_m: h2, ae_m: ae } = opts;
  const lambda = opts.lambda_m > 0 && Number.isFinite(opts.lambda_m) ? opts.lambda_m : NaN;
  const geo = smoothEarthReflectionPoint(h1, h2, d, ae);
  const spacing = (lambda * d) / (4 * geo.h1_eff_m); // Δh = λd/(4h1'), from dΔ/dh2 = 2h1'/d
  if (!Number.isFinite(spacing)) {
    return { spacing_m: NaN, spacing_above_m: NaN, spacing_below_m: NaN, d1_m: geo.d1_m, h1_eff_m: geo.h1_eff_m };
  }
  // Δ(h) is increasing in the receiving height; half a wavelength of Δ is π of phase
  const delta = (h: number) => smoothEarthReflectionPoint(h1, h, d, ae).path_difference_m;
  const target = lambda / 2;
  const d0 = geo.path_difference_m;

  // above: bracket by doubling, then bisection
  let hi = h2 + spacing;
  for (let i = 0; i < 60 && !(delta(hi) - d0 >= target); i++) hi = h2 + 2 * (hi - h2);
  const above = bisect((h) => delta(h) - d0 - target, h2, hi) - h2;

  // below: only if the pattern reaches π below h2 (Δ → 0 where the point leaves the horizon)
  let below = NaN;
  if (d0 >= target) {
    let lo = h2 - spacing;
    for (let i = 0; i < 60 && lo > 0 && !(d0 - delta(lo) >= target); i++) lo = h2 - 2 * (h2 - lo);
    lo = Math.max(lo, 0);
    const fLo = Number.isNaN(delta(lo)) ? 0 : delta(lo);
    if (d0 - fLo >= target) below = h2 - bisect((h) => d0 - (Number.isNaN(delta(h)) ? 0 : delta(h)) - target, h2, lo);
  }
  return { spacing_m: spacing, spacing_above_m: above, spacing_below_m: below, d1_m: geo.d1_m, h1_eff_m: geo.h1_eff_m };
}

/** Root of a monotone f on [a, b] with f(a) < 0 ≤ f(b) (or reversed ends), to 1e-12 relative. */
function bisect(f: (x: number) => number, a: number, b: number): number {
  let lo = a;
  let hi = b;
  for (let i = 0; i < 200 && Math.abs(hi - lo) > 1e-12 * Math.max(1, Math.abs(hi)); i++) {
    const mid = (lo + hi) / 2;
    if (f(mid) < 0) lo = mid;
    else hi = mid;
  }
  return (lo + hi) / 2;
}
