import { createHash } from "node:crypto";
import { geodesicPath, type GeodesicPath } from "../geo/geodesic-path.ts";
import { toolIdentity } from "./cache-keys.ts";
import type { ResultCache } from "./result-cache.ts";

/** A function sampling a geodesic as geodesicPath does (its signature). */
export type PathSampler = typeof geodesicPath;

/**
 * geodesicPath with its answers remembered in the cache, keyed by the tool identity (which
 * covers the geodesic code) and the exact bytes of the arguments: a path is a pure function of
 * its ends and step. A link whose ends did not move — an antenna height, radio or target
 * changed — then gets its ~500 sample positions without solving the geodesic again.
 */
export function memoGeodesicPath(cache: ResultCache): PathSampler {
  return (lat1_deg, lon1_deg, lat2_deg, lon2_deg, maxStep_m) => {
    const args = new Float64Array([lat1_deg, lon1_deg, lat2_deg, lon2_deg, maxStep_m]);
    const key = createHash("sha256").update(`geodesic-path-v1\0${toolIdentity()}\0`).update(new Uint8Array(args.buffer)).digest("hex");
    const hit = cache.get<{ v: GeodesicPath }>("geodesic-path", key);
    if (hit?.v?.d_m instanceof Float64Array && hit.v.lat_deg instanceof Float64Array && hit.v.lon_deg instanceof Float64Array) return hit.v;
    const v = geodesicPath(lat1_deg, lon1_deg, lat2_deg, lon2_deg, maxStep_m);
    cache.put("geodesic-path", key, { v });
    return v;
  };
}
