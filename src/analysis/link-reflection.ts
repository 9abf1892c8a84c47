import { EARTH_RADIUS_M, wavelengthM } from "../physics/constants.ts";
import { divergenceFactor } from "../physics/divergence-factor.ts";
import { earthBulgeM } from "../physics/earth-bulge.ts";
import { groundConstants, type GroundClass } from "../physics/ground-constants.ts";
import { reflectionCoefficient } from "../physics/reflection-coefficient.ts";
import { reflectionPoints, type SpecularPoint } from "../physics/reflection-point.ts";
import { roughnessFactor } from "../physics/surface-roughness.ts";
import { twoRayRelativeLevelDb } from "../physics/two-ray.ts";
import type { Study } from "../study/study.ts";
import type { LinkProfile } from "./link-profile.ts";
import type { LinkEndResult } from "./results.ts";

export interface ReflectionPointResult {
  distance_m: number;
  grazing_angle_mrad: number;
  path_difference_m: number;
  delay_ns: number;
  coefficient_magnitude: number;
  coefficient_phase_deg: number;
  /** Height irregularity of the terrain around the point (m), detrended. */
  roughness_sigma_m: number;
  /** |R| × divergence × roughness: the strength of the reflected ray relative to the direct one. */
  effective_coefficient: number;
  /** Two-ray level relative to free space with this point alone (dB). */
  relative_level_db: number;
}

export interface ReflectionResult {
  ground: string;
  epsilon_r: number;
  sigma_s_m: number;
  per_k: { k_label: string; points: ReflectionPointResult[] }[];
  /** Height step of the height-gain curve (m). */
  height_gain_step_m: number;
  /**
   * Half the period of the height-gain lobes at the receiving end (m), from the dominant point
   * at the first k; null without one. A property of one reflection, not a diversity design:
   * the diversity improvement (ITU-R P.530-16 §6.2) is in LinkResult.diversity.
   */
  height_gain_half_period_m: number | null;
}

/**
 * The height-gain curve at the receiving end: level relative to free space against the
 * receive-antenna height, at the first k, dominant reflection only. Two columns of the same
 * length: row i is rx_antenna_m[i] (m above ground) and relative_db[i] (dB). Figure data (a
 * plot series, like the profile's samples), not part of the link's JSON result.
 */
export interface HeightGainCurve {
  rx_antenna_m: Float64Array;
  relative_db: Float64Array;
}

/** Half-width (samples) of the window for the terrain roughness around a reflection point. */
const ROUGHNESS_HALF_WINDOW = 5;
/** Height-gain range either side of the design height (m) and the bounds of its step (m). */
const HG_HALF_RANGE_M = 15;
const HG_MAX_STEP_M = 0.1;
const HG_MIN_STEP_M = 0.02;

/** Standard deviation (m) of the terrain about its straight-line fit over a few samples around i. */
function localRoughnessM(d: ArrayLike<number>, h: ArrayLike<number>, i: number): number {
  const a = Math.max(0, i - ROUGHNESS_HALF_WINDOW);
  const b = Math.min(d.length - 1, i + ROUGHNESS_HALF_WINDOW);
  const n = b - a + 1;
  if (n < 3) return 0;
  let sx = 0, sy = 0, sxx = 0, sxy = 0;
  for (let k = a; k <= b; k++) {
    sx += d[k];
    sy += h[k];
    sxx += d[k] * d[k];
    sxy += d[k] * h[k];
  }
  const den = n * sxx - sx * sx;
  const slope = den === 0 ? 0 : (n * sxy - sx * sy) / den;
  const icpt = (sy - slope * sx) / n;
  let ss = 0;
  for (let k = a; k <= b; k++) ss += (h[k] - (icpt + slope * d[k])) ** 2;
  return Math.sqrt(ss / n);
}

interface Ray {
  point: SpecularPoint;
  R: { magnitude: number; phase_rad: number };
  divergence: number;
  roughness: number;
  sigma_m: number;
}

/**
 * Specular reflection analysis of a link (geometrical optics): reflection points at each k,
 * their path difference, delay and reflection coefficient for the study's ground class
 * (ITU-R P.527 classes), reduced by the divergence of a curved Earth and by the terrain's
 * roughness around the point (Ament factor); the height-gain curve at the receiving end from
 * the dominant reflection (the largest effective coefficient — common practice: one
 * reflected ray off the plane tangent at that point, not a coherent sum of every specular point
 * of a rugged profile) sampled finely enough to resolve the interference lobes, and half the
 * lobe period.
 */
export function linkReflection(study: Study, profile: LinkProfile, ends: { from: LinkEndResult; to: LinkEndResult }, frequency_ghz: number, polarization: "h" | "v"): { reflection: ReflectionResult; height_gain: HeightGainCurve } {
  const cls = study.climate.ground.replace(/_/g, "-") as GroundClass;
  const g = groundConstants(cls, frequency_ghz);
  const d_m = Array.from(profile.d_m);
  const h_m = Array.from(profile.terrain_m);
  const n = d_m.length;
  const D = d_m[n - 1];
  const lambda_m = wavelengthM(frequency_ghz);
  const pol = polarization === "h" ? "horizontal" : "vertical";
  const rays = (hrs_m: number, ae_m: number): Ray[] =>
    reflectionPoints({ d_m, h_m, hts_m: ends.from.antenna_amsl_m, hrs_m, ae_m }).map((point) => {
      const R = reflectionCoefficient({ epsilon_r: g.epsilon_r, sigma_s_m: g.sigma_s_m, frequency_ghz, grazing_angle_rad: point.grazing_angle_rad, polarization: pol });
      const divergence = divergenceFactor({ d1_m: point.distance_m, d2_m: D - point.distance_m, grazing_angle_rad: point.grazing_angle_rad, ae_m });
      const sigma_m = localRoughnessM(d_m, h_m, Math.min(n - 2, point.segment));
      const roughness = roughnessFactor({ sigma_h_m: sigma_m, grazing_angle_rad: point.grazing_angle_rad, lambda_m });
      return { point, R, divergence, roughness, sigma_m };
    });
  const strength = (r: Ray) => r.R.magnitude * r.divergence * r.roughness;
  const dominant = (list: Ray[]) => list.reduce<Ray | null>((best, r) => (best === null || strength(r) > strength(best) ? r : best), null);

  const per_k = study.design.k_factors.map((kf) => ({
    k_label: kf.label,
    points: rays(ends.to.antenna_amsl_m, kf.k * EARTH_RADIUS_M).map((r) => ({
      distance_m: r.point.distance_m,
      grazing_angle_mrad: r.point.grazing_angle_rad * 1000,
      path_difference_m: r.point.path_difference_m,
      delay_ns: r.point.delay_ns,
      coefficient_magnitude: r.R.magnitude,
      coefficient_phase_deg: (r.R.phase_rad * 180) / Math.PI,
      roughness_sigma_m: r.sigma_m,
      effective_coefficient: strength(r),
      relative_level_db: twoRayRelativeLevelDb({ path_difference_m: r.point.path_difference_m, lambda_m, reflection: { magnitude: r.R.magnitude * r.roughness, phase_rad: r.R.phase_rad }, divergence: r.divergence }),
    })),
  }));

  // Height gain (common practice, image method): the reflecting plane is the local tangent of
  // the effective-Earth surface at the dominant reflection point for the design height. For each
  // receive height the two antennas' heights above that plane (h1', h2') and their separation
  // along it (L) give Δ = sqrt(L² + (h1'+h2')²) − sqrt(L² + (h1'−h2')²) and ψ = atan((h1'+h2')/L);
  // the level is the two-ray sum with the plane's Fresnel coefficient, divergence and roughness.
  const ae0 = study.design.k_factors[0].k * EARTH_RADIUS_M;
  const main = dominant(rays(ends.to.antenna_amsl_m, ae0));
  const bulged = (k: number) => h_m[k] + earthBulgeM(d_m[k], D - d_m[k], ae0);
  let plane: { xp: number; zp: number; c: number; s: number } | null = null;
  if (main && strength(main) > 0) {
    const i = Math.min(n - 2, Math.max(0, main.point.segment));
    const beta = Math.atan2(bulged(i + 1) - bulged(i), d_m[i + 1] - d_m[i]);
    const xp = main.point.distance_m;
    plane = { xp, zp: main.point.height_m + earthBulgeM(xp, D - xp, ae0), c: Math.cos(beta), s: Math.sin(beta) };
  }
  // Half the interference period at the receiver (one antenna this far from another sits in
  // the opposite phase of this one reflection). On the tangent plane the phase kΔ
  // advances by 2π when h2' grows by λL/(2h1'); a vertical step dh raises h2' by dh·cos β.
  let height_gain_half_period_m: number | null = null;
  let period_m = Infinity;
  if (main && plane && strength(main) >= 0.1) {
    const h1p = -(0 - plane.xp) * plane.s + (ends.from.antenna_amsl_m - plane.zp) * plane.c;
    const L = (D - plane.xp) * plane.c + (ends.to.antenna_amsl_m - plane.zp) * plane.s - ((0 - plane.xp) * plane.c + (ends.from.antenna_amsl_m - plane.zp) * plane.s);
    const spacing = (lambda_m * L) / (4 * h1p * plane.c);
    period_m = 2 * spacing;
    height_gain_half_period_m = spacing > 0 && Number.isFinite(spacing) ? spacing : null;
  }
  // About three lobes either side of the design height (at least 2 m, at most 15 m) and at
  // least ten points per lobe, steps between 2 cm and 10 cm.
  const lobes = period_m > 0 && Number.isFinite(period_m);
  const half = lobes ? Math.min(HG_HALF_RANGE_M, Math.max(2, 3 * period_m)) : HG_HALF_RANGE_M;
  const h0 = ends.to.antenna_m;
  const lo = Math.max(1, h0 - half);
  const hi = h0 + half;
  const hgStep = lobes ? Math.min(HG_MAX_STEP_M, Math.max(HG_MIN_STEP_M, period_m / 10)) : HG_MAX_STEP_M;
  const steps = Math.round((hi - lo) / hgStep);
  const height_gain: HeightGainCurve = { rx_antenna_m: new Float64Array(steps + 1), relative_db: new Float64Array(steps + 1) };
  for (let step = 0; step <= steps; step++) {
    const h = lo + step * hgStep;
    let level = 0;
    if (main && plane) {
      // Coordinates along (u) and above (v) the plane, for the two antennas.
      const rel = (x: number, z: number) => ({ u: (x - plane!.xp) * plane!.c + (z - plane!.zp) * plane!.s, v: -(x - plane!.xp) * plane!.s + (z - plane!.zp) * plane!.c });
      const T = rel(0, ends.from.antenna_amsl_m);
      const R = rel(D, ends.to.ground_m + h);
      const L = R.u - T.u;
      if (T.v > 0 && R.v > 0 && L > 0) {
        const delta = Math.hypot(L, T.v + R.v) - Math.hypot(L, T.v - R.v);
        const psi = Math.atan((T.v + R.v) / L);
        const d1 = (L * T.v) / (T.v + R.v);
        const coef = reflectionCoefficient({ epsilon_r: g.epsilon_r, sigma_s_m: g.sigma_s_m, frequency_ghz, grazing_angle_rad: psi, polarization: pol });
        const rough = roughnessFactor({ sigma_h_m: main.sigma_m, grazing_angle_rad: psi, lambda_m });
        const div = divergenceFactor({ d1_m: d1, d2_m: L - d1, grazing_angle_rad: psi, ae_m: ae0 });
        level = twoRayRelativeLevelDb({ path_difference_m: delta, lambda_m, reflection: { magnitude: coef.magnitude * rough, phase_rad: coef.phase_rad }, divergence: div });
      }
    }
    height_gain.rx_antenna_m[step] = Math.round(h * 100) / 100;
    height_gain.relative_db[step] = Math.round(level * 1000) / 1000;
  }

  return { reflection: { ground: study.climate.ground, epsilon_r: g.epsilon_r, sigma_s_m: g.sigma_s_m, per_k, height_gain_step_m: hgStep, height_gain_half_period_m }, height_gain };
}
