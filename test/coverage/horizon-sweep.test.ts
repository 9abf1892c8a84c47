import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { prepareCoverage, runCoverage } from "../../src/coverage/compute-coverage.ts";
import type { CoverageJob } from "../../src/coverage/coverage-job.ts";
import { CoverageTally } from "../../src/coverage/coverage-tally.ts";
import { computeCoverage } from "../../src/coverage/compute-coverage.ts";
import { CoveragePool } from "../../src/coverage/coverage-pool.ts";
import { fillHorizonTileTable, fillLineOfSightRaster, horizonSweep, horizonSweepApplies, horizonTileTable, horizonTileTableOf, warmUpHorizonSweep } from "../../src/coverage/horizon-sweep.ts";
import { HorizonVisitor } from "../../src/coverage/level-visitors.ts";
import { rayCount, sweepRays } from "../../src/coverage/radial-sweep.ts";
import { mulberry32 } from "../../src/terrain/mulberry32.ts";
import { INT16_NODATA } from "../../src/terrain/tiff-band-reader.ts";
import { openGeoTiff } from "../../src/terrain/geotiff.ts";
import type { Terrain } from "../../src/terrain/terrain.ts";
import { cellLatLon, request, roughTerrain, writeUtmDem } from "./coverage-fixtures.ts";

// The wavefront line-of-sight sweep (horizon-sweep.ts) against the general radial sweep with
// the line-of-sight visitor (radial-sweep.ts + HorizonVisitor): the project's own invariant —
// the same value in every cell, the same cells computed and failed, the same areas up to the
// order of summation — for sites on and off cell centres, near the grid's edge (radials that
// leave it), over nodata holes, at k = 4/3 and k = ∞, and for any split of the radials into
// chunks (the worker threads' units of work, which may straddle faces).

const N = 181;
const CELL = 30;
const DEM = { x0: 400000, y0: 5010000, cell: CELL };
let dir: string;
let terrain: Terrain;

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), "ridgeline-horizon-sweep-"));
  const h = roughTerrain(4242);
  const hole = (c: number, r: number) => (c >= 120 && c < 126 && r >= 30 && r < 34) || (r === 150 && c > 40 && c < 44);
  writeUtmDem(join(dir, "dem.tif"), N, CELL, (c, r) => (hole(c, r) ? -9999 : h(c / (N - 1), r / (N - 1))), [DEM.x0, DEM.y0]);
  terrain = await openGeoTiff(join(dir, "dem.tif"), { deferPixels: true });
});

afterAll(() => rmSync(dir, { recursive: true, force: true }));

function job(col: number, row: number, k: number, radius_m: number, int16 = false): CoverageJob {
  const [lat, lon] = cellLatLon(DEM, col, row);
  const prep = prepareCoverage(terrain, request({ site: { lat_deg: lat, lon_deg: lon }, method: "visibility", k, radius_m }));
  const cells = prep.grid.width * prep.grid.height;
  const j = { ...prep.job, out: new SharedArrayBuffer(cells) };
  if (!int16 || j.dem_int16) return j;
  // the same terrain as whole metres in Int16, nodata −32768: the elevations an Int16 GeoTIFF gives
  const f = new Float32Array(j.dem);
  const dem = new SharedArrayBuffer(f.length * 2);
  const h = new Int16Array(dem);
  for (let i = 0; i < f.length; i++) h[i] = f[i] === f[i] ? Math.round(f[i]) : INT16_NODATA;
  return { ...j, dem, dem_int16: true };
}

/** Visibility raster and tally of radials split at `cuts` (sorted), by one sweep or the other. */
function run(j: CoverageJob, which: "general" | "wavefront" | "wavefront-zeroed" | "wavefront-zeroed-outside-after", cuts: number[]): { raster: Uint8Array; tally: ReturnType<CoverageTally["data"]> } {
  const raster = new Uint8Array(j.out).fill(255);
  // 0 inside the radius, nodata outside, then only what differs written
  if (which === "wavefront-zeroed") fillLineOfSightRaster(raster.fill(0), j, 255);
  // as `ridgeline coverage` computes: all 0, only what differs written, nodata outside the radius set strip by strip as the file is written
  if (which === "wavefront-zeroed-outside-after") raster.fill(0);
  const dem = j.dem_int16 ? new Int16Array(j.dem) : new Float32Array(j.dem);
  const total = new CoverageTally(j.thresholds_dbm);
  const bounds = [0, ...cuts, rayCount(j.rc)];
  for (let c = 0; c + 1 < bounds.length; c++) {
    const part = new CoverageTally(j.thresholds_dbm);
    if (which === "general") sweepRays(j, dem, j.rc, bounds[c], bounds[c + 1], new HorizonVisitor(j, part));
    else horizonSweep(j, dem, j.rc, bounds[c], bounds[c + 1], { hts_m: j.site_ground_m + j.antenna_m, receiver_m: j.receiver_m, k2: j.ae_m === Infinity ? 0 : 1 / (2 * j.ae_m) }, raster, j.cell_area_m2, part, undefined, which.startsWith("wavefront-zeroed"));
    total.addSums(part.data());
  }
  if (which === "wavefront-zeroed-outside-after") {
    // strips of 7 rows (the last one shorter), each filled in a copy as geotiff-writer's fillStrip does
    const W = j.width;
    for (let r0 = 0; r0 < j.height; r0 += 7) {
      const r1 = Math.min(j.height, r0 + 7);
      const strip = raster.slice(r0 * W, r1 * W);
      fillLineOfSightRaster(strip, j, 255, r0, r1);
      raster.set(strip, r0 * W);
    }
  }
  return { raster: raster.slice(), tally: total.data() };
}

describe("wavefront line-of-sight sweep", () => {
  const sites: [string, number, number, number][] = [
    ["centre of the grid", 90, 90, 2400],
    ["between cell centres", 61.37, 97.81, 2000],
    ["near the edge (radials leave the grid)", 8, 170, 2600],
    ["beside a nodata hole", 118, 36, 1500],
  ];
  for (const [name, col, row, radius] of sites) {
    for (const [k, int16] of [[4 / 3, false], [Infinity, false], [4 / 3, true]] as const) {
      it(`${name}, k = ${k === Infinity ? "∞" : "4/3"}, ${int16 ? "Int16" : "Float32"} elevations: the same raster and tally as the general sweep, whatever the chunks`, () => {
        const j = job(col, row, k, radius, int16);
        expect(j.dem_int16).toBe(int16);
        expect(horizonSweepApplies(j)).toBe(true);
        const n = rayCount(j.rc);
        const rnd = mulberry32(Math.round(col * 1000 + row));
        const splits = [[], [Math.floor(n / 4), Math.floor(n / 2)], Array.from(new Set(Array.from({ length: 7 }, () => 1 + Math.floor(rnd() * (n - 1))))).sort((a, b) => a - b)];
        const ref = run(j, "general", []);
        expect(ref.tally.cells).toBeGreaterThan(1000);
        for (const [cuts, which] of splits.flatMap((cuts) => [[cuts, "wavefront"], [cuts, "wavefront-zeroed"], [cuts, "wavefront-zeroed-outside-after"]] as const)) {
          const got = run(j, which, cuts);
          expect(Buffer.compare(Buffer.from(got.raster), Buffer.from(ref.raster)), `${which}, chunks at ${cuts.join(", ")}`).toBe(0);
          expect([got.tally.cells, got.tally.failed, got.tally.min, got.tally.max]).toEqual([ref.tally.cells, ref.tally.failed, ref.tally.min, ref.tally.max]);
          expect(Math.abs(got.tally.area_m2 - ref.tally.area_m2)).toBeLessThan(1e-9 * ref.tally.area_m2);
          expect(Math.abs(got.tally.at_least_m2[0] - ref.tally.at_least_m2[0])).toBeLessThan(1e-9 * ref.tally.area_m2);
        }
        if (name.startsWith("beside")) expect(ref.tally.failed).toBeGreaterThan(0);
      });
    }
  }

  it("threads that fill the tile table while the elevations are read, and nodata outside the radius set strip by strip as `ridgeline coverage` writes: the same raster and tally", async () => {
    const [lat, lon] = cellLatLon(DEM, 118, 36); // beside the nodata hole
    const req = request({ site: { lat_deg: lat, lon_deg: lon }, method: "visibility", radius_m: 2600 });
    const pool = CoveragePool.start(2, { warmUp: "line-of-sight" });
    try {
      const a = await computeCoverage(terrain, req, { pool });
      expect(a.outside_pending).toBeUndefined();
      const prepared = prepareCoverage(terrain, req, { tileTableWhileReading: pool, elevationsInsideRadiusOnly: true });
      expect(prepared.job.dem_tile_max).toBeInstanceOf(SharedArrayBuffer);
      const b = await runCoverage(prepared, { pool, outsideOnWrite: true });
      expect(b.outside_pending).toBe(true);
      const W = b.grid.width;
      const got = new Uint8Array(b.values as Uint8Array);
      for (let r0 = 0; r0 < b.grid.height; r0 += 16) {
        const r1 = Math.min(b.grid.height, r0 + 16);
        fillLineOfSightRaster(got.subarray(r0 * W, r1 * W), b.job, 255, r0, r1);
      }
      expect(Buffer.compare(Buffer.from(got), Buffer.from(a.values.buffer as ArrayBuffer))).toBe(0);
      expect(b.tally).toEqual(a.tally);
      expect(a.tally.failed).toBeGreaterThan(0);
      // the table the threads filled is the one this thread makes from the same elevations
      const own = horizonTileTable(b.grid.width, b.grid.height);
      fillHorizonTileTable(own, prepared.dem, b.job);
      const theirs = horizonTileTableOf(prepared.job.dem_tile_max!);
      expect(Buffer.compare(Buffer.from(theirs.buffer, theirs.byteOffset, theirs.byteLength), Buffer.from(own.buffer, own.byteOffset, own.byteLength))).toBe(0);
      expect(theirs.some((v) => v === Infinity) && theirs.some((v) => v > 0 && v < Infinity)).toBe(true);
    } finally {
      await pool.close();
    }
  });

  it("a pool whose threads warmed up on a made-up grid computes the same raster as this thread", async () => {
    expect(warmUpHorizonSweep(2)).toBeGreaterThan(0);
    expect(warmUpHorizonSweep(2)).toBeLessThan(1);
    const [lat, lon] = cellLatLon(DEM, 70, 64);
    const req = request({ site: { lat_deg: lat, lon_deg: lon }, method: "visibility", radius_m: 2500 });
    const pool = CoveragePool.start(2, { warmUp: "line-of-sight" });
    try {
      const a = await computeCoverage(terrain, req, { pool: null });
      const b = await computeCoverage(terrain, req, { pool });
      expect(Buffer.compare(Buffer.from(a.values.buffer as ArrayBuffer), Buffer.from(b.values.buffer as ArrayBuffer))).toBe(0);
      expect(b.tally).toEqual(a.tally);
    } finally {
      await pool.close();
    }
  });
});
