import { createHash } from "node:crypto";
import type { RasterGrid, Terrain } from "../terrain/terrain.ts";
import { toolIdentity } from "./cache-keys.ts";
import type { ResultCache } from "./result-cache.ts";

/** Thrown by a MemoTerrain that has no terrain behind it when a query is not in the cache. */
export class TerrainQueryMiss extends Error {
  constructor(query: string) {
    super(`terrain query ${query} is not in the cache`);
    this.name = "TerrainQueryMiss";
  }
}

/** What a MemoTerrain answers about its terrain without opening it. */
export interface TerrainIdentity {
  kind: Terrain["kind"];
  description: string;
  synthetic: boolean;
}

const f64 = (...xs: number[]): Uint8Array => new Uint8Array(Float64Array.from(xs).buffer);
const bytesOf = (a: ArrayLike<number>): Uint8Array => {
  const f = a instanceof Float64Array ? a : Float64Array.from(a);
  return new Uint8Array(f.buffer, f.byteOffset, f.byteLength);
};

/**
 * A terrain whose answers are remembered in the cache, keyed by the terrain's source key,
 * the tool identity and the exact bytes of the query (latitudes and longitudes as float64).
 * Terrain queries are pure functions of those, so a remembered answer is the answer.
 *
 * With `real` null the terrain is never opened: a query the cache holds is answered from it
 * and any other throws TerrainQueryMiss, after which the caller opens the terrain and asks
 * again through a MemoTerrain with `real` set (which stores what it computes). This is what
 * lets a link whose path did not move — an antenna height, radio or target changed — be
 * recomputed without reading a DEM tile or generating synthetic terrain.
 */
export class MemoTerrain implements Terrain {
  readonly kind: Terrain["kind"];
  readonly description: string;
  readonly synthetic: boolean;

  constructor(
    private readonly cache: ResultCache,
    private readonly terrainKey: string,
    identity: TerrainIdentity,
    private readonly real: Terrain | null,
  ) {
    this.kind = identity.kind;
    this.description = identity.description;
    this.synthetic = identity.synthetic;
  }

  private memo<T>(query: string, parts: Uint8Array[], compute: (t: Terrain) => T): T {
    const h = createHash("sha256").update(`terrain-query-v1\0${toolIdentity()}\0${this.terrainKey}\0${query}`);
    for (const p of parts) h.update(p);
    const key = h.digest("hex");
    const hit = this.cache.get<{ v: T }>("terrain-query", key);
    if (hit !== undefined && "v" in hit) return hit.v;
    if (!this.real) throw new TerrainQueryMiss(query);
    const v = compute(this.real);
    this.cache.put("terrain-query", key, { v });
    return v;
  }

  resolutionM(lat_deg: number): number {
    return this.memo("resolutionM", [f64(lat_deg)], (t) => t.resolutionM(lat_deg));
  }

  elevation(lat_deg: number, lon_deg: number): number {
    return this.memo("elevation", [f64(lat_deg, lon_deg)], (t) => t.elevation(lat_deg, lon_deg));
  }

  sample(lat_deg: ArrayLike<number>, lon_deg: ArrayLike<number>): { h_m: Float64Array; voidFilled: number; outside: number } {
    const n = Math.min(lat_deg.length, lon_deg.length);
    return this.memo("sample", [f64(n), bytesOf(lat_deg), bytesOf(lon_deg)], (t) => t.sample(lat_deg, lon_deg));
  }

  whyOutside(lat_deg: number, lon_deg: number): string | null {
    return this.memo("whyOutside", [f64(lat_deg, lon_deg)], (t) => t.whyOutside(lat_deg, lon_deg));
  }

  fingerprint(): string {
    return this.real ? this.real.fingerprint() : this.terrainKey;
  }

  get raster(): RasterGrid | undefined {
    if (!this.real) throw new TerrainQueryMiss("raster");
    return this.real.raster;
  }
}
