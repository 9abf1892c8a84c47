import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { computeCoverage, type ComputedCoverage } from "../../src/coverage/compute-coverage.ts";
import { CoveragePool } from "../../src/coverage/coverage-pool.ts";
import { writeGeoTiff } from "../../src/geo/geotiff-writer.ts";
import { openGeoTiff } from "../../src/terrain/geotiff.ts";
import type { Terrain } from "../../src/terrain/terrain.ts";
import { cellLatLon, request, roughTerrain } from "./coverage-fixtures.ts";

// A grid read from an Int16 GeoTIFF keeps its elevations as Int16 (half the memory of
// Float32; −32768 marks nodata). The project's own invariant: the same whole-metre DEM written
// as Int16 (plain and Deflate-compressed, which the pool's threads read together) and as
// Float32 gives byte-identical coverage rasters and tallies, nodata holes included, in the
// calling thread and on worker threads.

const N = 241;
const CELL = 30;
const X0 = 400000;
const Y0 = 5010000;
let dir: string;
let int16: Terrain;
let int16Deflate: Terrain;
let float32: Terrain;
let float32Deferred: Terrain;
let pool: CoveragePool;

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), "ridgeline-int16-dem-"));
  const h = roughTerrain(77);
  const hole = (c: number, r: number) => (c >= 150 && c < 156 && r >= 40 && r < 43) || (c === 60 && r === 200);
  const metres = (c: number, r: number) => Math.round(h(c / (N - 1), r / (N - 1)));
  const i16 = new Int16Array(N * N);
  const f32 = new Float32Array(N * N);
  for (let r = 0; r < N; r++) {
    for (let c = 0; c < N; c++) {
      i16[r * N + c] = hole(c, r) ? -9999 : metres(c, r);
      f32[r * N + c] = hole(c, r) ? -9999 : metres(c, r);
    }
  }
  const common = { width: N, height: N, geoTransform: [X0, CELL, 0, Y0, 0, -CELL] as [number, number, number, number, number, number], epsg: 32632, nodata: -9999 };
  writeGeoTiff(join(dir, "i16.tif"), { ...common, data: i16 });
  writeGeoTiff(join(dir, "f32.tif"), { ...common, data: f32 });
  writeGeoTiff(join(dir, "i16z.tif"), { ...common, data: i16, compression: "deflate" }); // compressed: read by the pool's threads together
  int16 = await openGeoTiff(join(dir, "i16.tif"), { deferPixels: true });
  // decoded whole, so that its windows are Float32 (a window read from the file would be Int16: whole metres)
  float32 = await openGeoTiff(join(dir, "f32.tif"));
  float32Deferred = await openGeoTiff(join(dir, "f32.tif"), { deferPixels: true });
  int16Deflate = await openGeoTiff(join(dir, "i16z.tif"), { deferPixels: true });
  pool = CoveragePool.start(2);
});

afterAll(async () => {
  await pool?.close();
  rmSync(dir, { recursive: true, force: true });
});

const bytes = (c: ComputedCoverage) => Buffer.from(c.values.buffer as ArrayBuffer, c.values.byteOffset, c.values.byteLength);

describe("coverage on an Int16 DEM", () => {
  const [lat, lon] = cellLatLon({ x0: X0, y0: Y0, cell: CELL }, 120, 120);
  const cases = [
    { method: "visibility" as const, clearance_f1: 0 },
    { method: "visibility" as const, clearance_f1: 0.6 },
    { method: "delta-bullington" as const, clearance_f1: 0 },
  ];
  for (const k of cases) {
    it(`${k.method}${k.clearance_f1 ? ` (${k.clearance_f1} F1 clear)` : ""}: the same raster as from Float32, in this thread and on worker threads`, async () => {
      const req = request({ site: { lat_deg: lat, lon_deg: lon }, method: k.method, clearance_f1: k.clearance_f1, radius_m: 3500, thresholds_dbm: [-90, -80] });
      for (const p of [null, pool]) {
        const a = await computeCoverage(int16, req, { pool: p, shareDecode: p ? (...x) => p.shareDecode(...x) : undefined });
        const b = await computeCoverage(float32, req, { pool: p, shareDecode: p ? (...x) => p.shareDecode(...x) : undefined });
        const z = await computeCoverage(int16Deflate, req, { pool: p, shareDecode: p ? (...x) => p.shareDecode(...x) : undefined });
        expect(a.dem).toBeInstanceOf(Int16Array);
        expect(z.dem).toBeInstanceOf(Int16Array);
        expect(b.dem).toBeInstanceOf(Float32Array);
        expect(Buffer.compare(bytes(a), bytes(b))).toBe(0);
        expect(Buffer.compare(bytes(z), bytes(b))).toBe(0);
        expect(a.tally).toEqual(b.tally);
        expect(z.tally).toEqual(b.tally);
        expect(a.tally.failed).toBeGreaterThan(0); // the holes are inside the radius: nodata reached the sweep
      }
    });
  }

  it("reading the elevations only within the radius (the one-off command) changes no cell, for every method", async () => {
    const [lat2, lon2] = cellLatLon({ x0: X0, y0: Y0, cell: CELL }, 100, 130);
    for (const k of [...cases, { method: "hata" as const, clearance_f1: 0 }]) {
      const req = request({ site: { lat_deg: lat2, lon_deg: lon2 }, method: k.method, clearance_f1: k.clearance_f1, radius_m: 2500, thresholds_dbm: [-90, -80] });
      for (const terrain of [int16, float32Deferred, int16Deflate]) {
        const share = { pool, shareDecode: (...x: Parameters<CoveragePool["shareDecode"]>) => pool.shareDecode(...x) }; // the Deflate file is read by the threads together
        const all = await computeCoverage(terrain, req, share);
        const disc = await computeCoverage(terrain, req, { ...share, elevationsInsideRadiusOnly: true });
        expect(Buffer.compare(bytes(disc), bytes(all)), `${k.method} ${k.clearance_f1}`).toBe(0);
        expect(disc.tally).toEqual(all.tally);
        // the corners were not read: zero there, the terrain elsewhere
        expect(disc.dem[0]).toBe(0);
        expect(all.dem[0]).not.toBe(0);
      }
    }
  });
});
