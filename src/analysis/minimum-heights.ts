import { earthBulgeM } from "../physics/earth-bulge.ts";
import { fresnelRadiusM } from "../physics/fresnel-radius.ts";

export interface MinimumHeightsInput {
  d_m: ArrayLike<number>;
  /** Ground + obstruction height amsl at each sample (m). */
  ground_m: ArrayLike<number>;
  /** Ground elevation amsl under each antenna (m). */
  from_ground_m: number;
  to_ground_m: number;
  lambda_m: number;
  /** The clearance criteria: at effective radius ae_m, clearance ≥ min_f1 × F1. */
  criteria: { ae_m: number; min_f1: number }[];
  /** Candidate heights are multiples of step_m from step_m up to max_m (m). */
  step_m: number;
  max_m: number;
}

export interface MinimumHeights {
  from_antenna_m: number;
  to_antenna_m: number;
}

/**
 * The lowest pair of antenna heights (above ground), on the candidate step, that meets every
 * clearance criterion; "lowest" is the least total height, ties broken by the smaller taller
 * mast. Null when no pair up to max_m meets them.
 *
 * Method: the criterion at sample i is linear in the two antenna heights amsl,
 * (1 − t)·HA + t·HB ≥ g_i + b_i + c·F1_i with t = d_i/D, so for each candidate HA the least
 * HB is a maximum over the samples — O(n) per candidate, no search over HB (common practice
 * geometry; the criteria are the study's).
 */
export function minimumAntennaHeights(input: MinimumHeightsInput): MinimumHeights | null {
  const { d_m, ground_m, lambda_m, criteria, step_m, max_m } = input;
  const n = d_m.length;
  const D = d_m[n - 1];
  // Required height amsl of the ray at each interior sample, worst over the criteria.
  const need = new Float64Array(n);
  for (let i = 1; i < n - 1; i++) {
    const d1 = d_m[i];
    const d2 = D - d1;
    const f1 = fresnelRadiusM(1, lambda_m, d1, d2);
    let r = -Infinity;
    for (const c of criteria) r = Math.max(r, ground_m[i] + earthBulgeM(d1, d2, c.ae_m) + c.min_f1 * f1);
    need[i] = r;
  }
  let best: MinimumHeights | null = null;
  const steps = Math.floor(max_m / step_m + 1e-9);
  for (let a = 1; a <= steps; a++) {
    const hA = a * step_m;
    const HA = input.from_ground_m + hA;
    let HB = -Infinity;
    for (let i = 1; i < n - 1; i++) {
      const t = d_m[i] / D;
      HB = Math.max(HB, (need[i] - (1 - t) * HA) / t);
    }
    const hB = Math.max(step_m, Math.ceil((HB - input.to_ground_m) / step_m - 1e-9) * step_m);
    if (!(hB <= max_m)) continue;
    if (best === null || hA + hB < best.from_antenna_m + best.to_antenna_m || (hA + hB === best.from_antenna_m + best.to_antenna_m && Math.max(hA, hB) < Math.max(best.from_antenna_m, best.to_antenna_m))) {
      best = { from_antenna_m: hA, to_antenna_m: hB };
    }
  }
  return best;
}
