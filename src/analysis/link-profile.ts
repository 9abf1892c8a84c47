import { geodesicDistanceM, geodesicPath, type GeodesicPath } from "../geo/geodesic-path.ts";
import type { Terrain } from "../terrain/terrain.ts";

/** A path profile ready for geometry and loss calculations. */
export interface LinkProfile {
  /** "terrain: <description>" or "surveyed: <file>" */
  source: string;
  d_m: Float64Array;
  terrain_m: Float64Array;
  obstruction_m: Float64Array;
  step_m: number;
  /** Samples whose elevation came from a filled void in the DEM. */
  void_filled: number;
  /** Samples outside the terrain (NaN heights). */
  outside: number;
}

/** Default spacing (m) on terrain with no native spacing (constant height). */
export const CONSTANT_TERRAIN_STEP_M = 50;

/** Fewest intervals a terrain profile has, however coarse the terrain: a path is never two points. */
export const MIN_PROFILE_INTERVALS = 16;
/** Most samples a terrain profile may have (a design.profile_step_m finer than path/this is refused). */
export const MAX_PROFILE_SAMPLES = 100_000;

/**
 * The spacing (m) a terrain profile of a path `distance_m` long is sampled at: the smaller of
 * `maxStep_m` (if given), the DEM spacing at mid-path latitude (50 m on constant terrain) and
 * a sixteenth of the path.
 */
export function profileStepM(distance_m: number, native_m: number, maxStep_m?: number): number {
  return Math.min(maxStep_m ?? Infinity, Number.isFinite(native_m) ? native_m : CONSTANT_TERRAIN_STEP_M, distance_m / MIN_PROFILE_INTERVALS);
}

/**
 * Sample the terrain along a geodesic no coarser than the terrain's own spacing: the step is
 * profileStepM of the path, the DEM spacing at mid-path latitude and `maxStep_m` (if given).
 */
export function terrainProfile(
  from: readonly [lat_deg: number, lon_deg: number],
  to: readonly [lat_deg: number, lon_deg: number],
  terrain: Terrain,
  maxStep_m?: number,
  pathOf: typeof geodesicPath = geodesicPath,
): { profile: LinkProfile; geo: GeodesicPath } {
  const [lat1, lon1] = from;
  const [lat2, lon2] = to;
  const native = terrain.resolutionM((lat1 + lat2) / 2);
  const step = profileStepM(geodesicDistanceM(lat1, lon1, lat2, lon2), native, maxStep_m);
  const geo = pathOf(lat1, lon1, lat2, lon2, step);
  const s = terrain.sample(geo.lat_deg, geo.lon_deg);
  return {
    geo,
    profile: {
      source: `terrain: ${terrain.description}`,
      d_m: geo.d_m,
      terrain_m: s.h_m,
      obstruction_m: new Float64Array(geo.d_m.length),
      step_m: geo.step_m,
      void_filled: s.voidFilled,
      outside: s.outside,
    },
  };
}
