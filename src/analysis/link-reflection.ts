import { EARTH_RADIUS_M, wavelengthM } from "../physics/constants.ts";
import { divergenceFactor } from "../physics/divergence-factor.ts";
import { groundConstants, type GroundClass } from "../physics/ground-constants.ts";
import { reflectionCoefficient } from "../physics/reflection-coefficient.ts";
import { reflectionPoints, type SpecularPoint } from "../physics/reflection-point.ts";
import { roughnessFactor } from "../physics/surface-roughness.ts";
import { spaceDiversitySpacing, twoRayRelativeLevelDb } from "../physics/two-ray.ts";
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
  /** Receive-antenna height against level relative to free space, at the first k, dominant reflection only. */
  height_gain: { rx_antenna_m: number; relative_db: number }[];
  height_gain_step_m: number;
  /** Vertical spacing for space diversity at the first k, from the dominant point (m); null without one. */
  space_diversity_spacing_m: number | null;
}

/** Half-width (samples) of the window for the terrain roughness around a reflection point. */
const ROUGHNESS_HALF_WINDOW = 5;
/** Height-gain range either side of the design height (m), coarse geometry step and fine step (m). */
const HG_HALF_RANGE_M = 15;
const HG_COARSE_STEP_M = 1.5;
const HG_FINE_STEP_M = 0.1;

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
 * roughness around the point (Ament factor); the height-gain curve at the receiving end with
 * the dominant reflection (the largest effective coefficient — common practice: one
 * reflected ray, not a coherent sum of every specular point of a rugged profile) sampled
 * finely enough to resolve the interference lobes; and a suggested space-diversity spacing.
 */
export function linkReflection(study: Study, profile: LinkProfile, ends: { from: LinkEndResult; to: LinkEndResult }, frequency_ghz: number, polarization: "h" | "v"): ReflectionResult {
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

  // Height gain: geometry at coarse heights, the dominant ray's path difference, grazing angle
  // and divergence interpolated linearly between them (smooth in height while the same
  // reflection stays dominant), the level evaluated at every fine step.
  const ae0 = study.design.k_factors[0].k * EARTH_RADIUS_M;
  const h0 = ends.to.antenna_m;
  const lo = Math.max(1, h0 - HG_HALF_RANGE_M);
  const hi = h0 + HG_HALF_RANGE_M;
  const coarse: { h: number; ray: Ray | null }[] = [];
  for (let h = lo; h <= hi + 1e-9; h += HG_COARSE_STEP_M) coarse.push({ h, ray: dominant(rays(ends.to.ground_m + h, ae0)) });
  const height_gain: ReflectionResult["height_gain"] = [];
  const steps = Math.round((hi - lo) / HG_FINE_STEP_M);
  for (let s = 0; s <= steps; s++) {
    const h = lo + s * HG_FINE_STEP_M;
    const j = Math.min(coarse.length - 2, Math.max(0, Math.floor((h - lo) / HG_COARSE_STEP_M)));
    const a = coarse[j];
    const b = coarse[j + 1] ?? a;
    let level = 0;
    // Interpolate while the same reflection stays dominant (its point moves little between nodes).
    if (a.ray && b.ray && Math.abs(a.ray.point.distance_m - b.ray.point.distance_m) <= 0.05 * D) {
      const t = b.h === a.h ? 0 : (h - a.h) / (b.h - a.h);
      const lerp = (x: number, y: number) => x + t * (y - x);
      const psi = lerp(a.ray.point.grazing_angle_rad, b.ray.point.grazing_angle_rad);
      const R = reflectionCoefficient({ epsilon_r: g.epsilon_r, sigma_s_m: g.sigma_s_m, frequency_ghz, grazing_angle_rad: psi, polarization: pol });
      const rough = roughnessFactor({ sigma_h_m: lerp(a.ray.sigma_m, b.ray.sigma_m), grazing_angle_rad: psi, lambda_m });
      level = twoRayRelativeLevelDb({ path_difference_m: lerp(a.ray.point.path_difference_m, b.ray.point.path_difference_m), lambda_m, reflection: { magnitude: R.magnitude * rough, phase_rad: R.phase_rad }, divergence: lerp(a.ray.divergence, b.ray.divergence) });
    } else {
      const r = (h - a.h <= b.h - h ? a : b).ray;
      if (r) level = twoRayRelativeLevelDb({ path_difference_m: r.point.path_difference_m, lambda_m, reflection: { magnitude: r.R.magnitude * r.roughness, phase_rad: r.R.phase_rad }, divergence: r.divergence });
    }
    height_gain.push({ rx_antenna_m: Math.round(h * 100) / 100, relative_db: Math.round(level * 1000) / 1000 });
  }

  const main = dominant(rays(ends.to.antenna_amsl_m, ae0));
  let space_diversity_spacing_m: number | null = null;
  if (main && strength(main) > 0.1) {
    const plane = main.point.height_m;
    const s = spaceDiversitySpacing({ lambda_m, d_m: D, h1_m: ends.from.antenna_amsl_m - plane, h2_m: ends.to.antenna_amsl_m - plane, ae_m: ae0 });
    space_diversity_spacing_m = Number.isFinite(s.spacing_m) ? s.spacing_m : null;
  }
  return { ground: study.climate.ground, epsilon_r: g.epsilon_r, sigma_s_m: g.sigma_s_m, per_k, height_gain, height_gain_step_m: HG_FINE_STEP_M, space_diversity_spacing_m };
}
