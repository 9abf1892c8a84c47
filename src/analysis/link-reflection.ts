import { EARTH_RADIUS_M, wavelengthM } from "../physics/constants.ts";
import { groundConstants, type GroundClass } from "../physics/ground-constants.ts";
import { reflectionCoefficient } from "../physics/reflection-coefficient.ts";
import { reflectionPoints } from "../physics/reflection-point.ts";
import { heightGainCurve, spaceDiversitySpacing, twoRayRelativeLevelDb } from "../physics/two-ray.ts";
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
  /** Two-ray level relative to free space with this point alone (dB). */
  relative_level_db: number;
}

export interface ReflectionResult {
  ground: string;
  epsilon_r: number;
  sigma_s_m: number;
  per_k: { k_label: string; points: ReflectionPointResult[] }[];
  /** Receive-antenna height against level relative to free space, at the first k. */
  height_gain: { rx_antenna_m: number; relative_db: number }[];
  /** Vertical spacing for space diversity at the first k, from the dominant point (m); null without one. */
  space_diversity_spacing_m: number | null;
}

/**
 * Specular reflection analysis of a link (geometrical optics): reflection points at each k,
 * their path difference, delay and reflection coefficient for the study's ground class, the
 * height-gain curve at the receiving end and a suggested space-diversity spacing.
 */
export function linkReflection(study: Study, profile: LinkProfile, ends: { from: LinkEndResult; to: LinkEndResult }, frequency_ghz: number, polarization: "h" | "v"): ReflectionResult {
  const cls = study.climate.ground.replace(/_/g, "-") as GroundClass;
  const g = groundConstants(cls, frequency_ghz);
  const d_m = Array.from(profile.d_m);
  const h_m = Array.from(profile.terrain_m);
  const lambda_m = wavelengthM(frequency_ghz);
  const pol = polarization === "h" ? "horizontal" : "vertical";
  const per_k = study.design.k_factors.map((kf) => {
    const pts = reflectionPoints({ d_m, h_m, hts_m: ends.from.antenna_amsl_m, hrs_m: ends.to.antenna_amsl_m, ae_m: kf.k * EARTH_RADIUS_M });
    return {
      k_label: kf.label,
      points: pts.map((p) => {
        const R = reflectionCoefficient({ epsilon_r: g.epsilon_r, sigma_s_m: g.sigma_s_m, frequency_ghz, grazing_angle_rad: p.grazing_angle_rad, polarization: pol });
        return {
          distance_m: p.distance_m,
          grazing_angle_mrad: p.grazing_angle_rad * 1000,
          path_difference_m: p.path_difference_m,
          delay_ns: p.delay_ns,
          coefficient_magnitude: R.magnitude,
          coefficient_phase_deg: (R.phase_rad * 180) / Math.PI,
          relative_level_db: twoRayRelativeLevelDb({ path_difference_m: p.path_difference_m, lambda_m, reflection: R }),
        };
      }),
    };
  });
  const ae0 = study.design.k_factors[0].k * EARTH_RADIUS_M;
  const h0 = ends.to.antenna_m;
  const heights = Array.from({ length: 61 }, (_, i) => Math.max(1, h0 - 30) + i);
  const height_gain = heightGainCurve({ d_m, h_m, ae_m: ae0, tx_antenna_m: ends.from.antenna_m, rx_antennas_m: heights, frequency_ghz, ground: g, polarization: pol }).map((p) => ({ rx_antenna_m: p.rx_antenna_m, relative_db: p.relative_db }));
  const dominant = per_k[0]?.points.reduce<ReflectionPointResult | null>((best, p) => (best === null || p.coefficient_magnitude > best.coefficient_magnitude ? p : best), null) ?? null;
  let space_diversity_spacing_m: number | null = null;
  if (dominant) {
    const i = Math.min(d_m.length - 1, Math.max(0, Math.round(dominant.distance_m / profile.step_m)));
    const plane = h_m[i];
    const s = spaceDiversitySpacing({ lambda_m, d_m: d_m[d_m.length - 1], h1_m: ends.from.antenna_amsl_m - plane, h2_m: ends.to.antenna_amsl_m - plane, ae_m: ae0 });
    space_diversity_spacing_m = Number.isFinite(s.spacing_m) ? s.spacing_m : null;
  }
  return { ground: study.climate.ground, epsilon_r: g.epsilon_r, sigma_s_m: g.sigma_s_m, per_k, height_gain, space_diversity_spacing_m };
}
