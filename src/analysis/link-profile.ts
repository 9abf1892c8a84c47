import { geodesicPath, type GeodesicPath } from "../geo/geodesic-path.ts";
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

/**
 * Sample the terrain along a geodesic no coarser than the terrain's own spacing: the step is
 * the smaller of `maxStep_m` (if given) and the DEM spacing at mid-path latitude.
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
  const step = Math.min(maxStep_m ?? Infinity, Number.isFinite(native) ? native : CONSTANT_TERRAIN_STEP_M);
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
