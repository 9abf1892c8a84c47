import { earthBulgeM } from "../physics/earth-bulge.ts";
import { fresnelRadiusM } from "../physics/fresnel-radius.ts";

/** Inputs shared by the geometry of one path at one k. */
export interface ClearanceInput {
  /** Distance of each sample from the from-end (m), increasing, first 0. */
  d_m: ArrayLike<number>;
  /** Ground height amsl of each sample (m). */
  terrain_m: ArrayLike<number>;
  /** Height of trees/buildings above ground at each sample (m); absent means none. */
  obstruction_m?: ArrayLike<number>;
  /** Antenna centre heights amsl at the two ends (m). */
  hts_m: number;
  hrs_m: number;
  lambda_m: number;
  /** Effective Earth radius (m); Infinity for k = ∞. */
  ae_m: number;
}

export interface ClearanceResult {
  /** Minimum over the interior samples of clearance / F1 radius. */
  min_clearance_f1: number;
  /** Where that minimum occurs (m from the from-end). */
  at_distance_m: number;
  /** Clearance there (m), ray above terrain + obstruction + bulge. */
  clearance_m: number;
  /** F1 radius there (m). */
  f1_m: number;
  /** Sample index of the minimum. */
  index: number;
}

/**
 * Clearance of the straight ray between the antennas above the terrain, its obstructions and
 * the Earth bulge at effective radius ae, as a fraction of the first Fresnel radius; its
 * minimum over the path and where it occurs. End samples (where F1 = 0) are excluded.
 * Common practice (e.g. ITU-R P.530-18 §2.2.2 planning criteria use the same quantity).
 */
export function pathClearance(input: ClearanceInput): ClearanceResult {
  const { d_m, terrain_m, obstruction_m, hts_m, hrs_m, lambda_m, ae_m } = input;
  const n = d_m.length;
  const D = d_m[n - 1];
  let best: ClearanceResult = { min_clearance_f1: Infinity, at_distance_m: NaN, clearance_m: NaN, f1_m: NaN, index: -1 };
  for (let i = 1; i < n - 1; i++) {
    const d1 = d_m[i];
    const d2 = D - d1;
    const ray = hts_m + ((hrs_m - hts_m) * d1) / D;
    const ground = terrain_m[i] + (obstruction_m ? obstruction_m[i] : 0) + earthBulgeM(d1, d2, ae_m);
    const c = ray - ground;
    const f1 = fresnelRadiusM(1, lambda_m, d1, d2);
    const ratio = c / f1;
    if (ratio < best.min_clearance_f1 || Number.isNaN(ratio)) {
      best = { min_clearance_f1: ratio, at_distance_m: d1, clearance_m: c, f1_m: f1, index: i };
      if (Number.isNaN(ratio)) break;
    }
  }
  if (best.index < 0) best = { min_clearance_f1: Infinity, at_distance_m: D / 2, clearance_m: Infinity, f1_m: 0, index: -1 };
  return best;
}
