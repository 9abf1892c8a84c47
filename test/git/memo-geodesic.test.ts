import { mkdtempSync, readdirSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { memoGeodesicPath } from "../../src/cache/memo-geodesic.ts";
import { ResultCache } from "../../src/cache/result-cache.ts";
import { geodesicPath } from "../../src/geo/geodesic-path.ts";

// Remembered geodesics (memo-geodesic.ts) give back exactly what geodesicPath computes — the
// project's own invariant for anything the build cache remembers — and one entry per path.

const root = mkdtempSync(join(tmpdir(), "ridgeline-memo-geodesic-"));
afterAll(() => rmSync(root, { recursive: true, force: true }));

const entries = (dir: string) => readdirSync(dir, { recursive: true }).filter((f) => String(f).endsWith(".bin")).length;

describe("remembered geodesic paths", () => {
  it("a second request is read from the cache, bit for bit the computed path", () => {
    const cache = new ResultCache(join(root, "cache"));
    const pathOf = memoGeodesicPath(cache);
    const args = [-41.21, -32.44, -41.05, -32.19, 30.5] as const;
    const fresh = geodesicPath(...args);
    const first = pathOf(...args);
    expect(entries(join(root, "cache", "geodesic-path"))).toBe(1);
    const again = memoGeodesicPath(new ResultCache(join(root, "cache")))(...args);
    for (const p of [first, again]) {
      expect([p.distance_m, p.azimuth_from_deg, p.azimuth_to_deg, p.step_m]).toEqual([fresh.distance_m, fresh.azimuth_from_deg, fresh.azimuth_to_deg, fresh.step_m]);
      for (const k of ["lat_deg", "lon_deg", "d_m"] as const) {
        expect(p[k]).toBeInstanceOf(Float64Array);
        expect(Buffer.from(p[k].buffer, p[k].byteOffset, p[k].byteLength).equals(Buffer.from(fresh[k].buffer))).toBe(true);
      }
    }
    pathOf(-41.21, -32.44, -41.05, -32.19, 30); // another step: another path
    expect(entries(join(root, "cache", "geodesic-path"))).toBe(2);
  });
});
