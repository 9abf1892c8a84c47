// Coverage maps computed tile by tile (coverage-tiles.ts) against the same map computed in
// one piece: the project's own invariant — every cell the same, bit for bit, whatever the
// tiles, whether a tile is computed here, read back, or computed alone on a fresh raster (as a
// queue worker does), and the same tile bytes in each case; areas equal up to the order of
// summation. Methods: line of sight (wavefront sweep), Fresnel clearance, delta-Bullington,
// Hata and P.1812-6 (with its location-probability raster); sites on and off cell centres,
// one near the grid's edge.
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { prepareCoverage } from "../../src/coverage/compute-coverage.ts";
import { LEVEL_NODATA, VISIBILITY_NODATA, type CoverageJob } from "../../src/coverage/coverage-job.ts";
import { runInThisThread } from "../../src/coverage/coverage-pool.ts";
import { computeCoverageTile, computeCoverageTiles, coverageTileCount, encodeCoverageTile, tileUnits, type CoverageTileStore } from "../../src/coverage/coverage-tiles.ts";
import type { CoverageRequest } from "../../src/coverage/coverage-request.ts";
import { openGeoTiff } from "../../src/terrain/geotiff.ts";
import type { Terrain } from "../../src/terrain/terrain.ts";
import { expectClose } from "../helpers/expect-close.ts";
import { cellLatLon, request, roughTerrain, writeUtmDem } from "./coverage-fixtures.ts";

const N = 121;
const CELL = 50;
const DEM = { x0: 400000, y0: 5010000, cell: CELL };
let dir: string;
let terrain: Terrain;

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), "ridgeline-coverage-tiles-"));
  const h = roughTerrain(77);
  writeUtmDem(join(dir, "dem.tif"), N, CELL, (c, r) => h(c / (N - 1), r / (N - 1)), [DEM.x0, DEM.y0]);
  terrain = await openGeoTiff(join(dir, "dem.tif"));
});

afterAll(() => rmSync(dir, { recursive: true, force: true }));

const p1812 = { time_pct: 50, location_pct: 50, sigma_l_db: null, dn: 45, n0: 325, classes: [{ value: null, name: "suburban", category: "suburban" as const, height_m: 10 }], land_cover: null, receiver_clutter_loss: "none" as const, indoor: null };

const CASES: { name: string; over: Partial<CoverageRequest> & Pick<CoverageRequest, "method">; col: number; row: number }[] = [
  { name: "line of sight, site on a cell centre", over: { method: "visibility" }, col: 60, row: 60 },
  { name: "line of sight, site near the edge, off centre", over: { method: "visibility" }, col: 12.3, row: 100.6 },
  { name: "Fresnel clearance", over: { method: "visibility", clearance_f1: 0.6 }, col: 55, row: 70 },
  { name: "delta-Bullington", over: { method: "delta-bullington", thresholds_dbm: [-90, -70] }, col: 60.4, row: 59.7 },
  { name: "Hata (rows)", over: { method: "hata", thresholds_dbm: [-90] }, col: 60, row: 60 },
  { name: "P.1812-6 with its probability raster", over: { method: "p1812", frequency_ghz: 0.46, thresholds_dbm: [-95, -80], p1812 }, col: 61, row: 58 },
];

/** A fresh job of a case (its own result rasters: zeros, as a worker's new raster). */
function freshJob(c: (typeof CASES)[number]): CoverageJob {
  const [lat, lon] = cellLatLon(DEM, c.col, c.row);
  const prep = prepareCoverage(terrain, request({ site: { lat_deg: lat, lon_deg: lon }, radius_m: 2600, resolution_m: CELL, ...c.over }));
  const cells = prep.grid.width * prep.grid.height;
  const level = c.over.method !== "visibility";
  const p = prep.job.p1812 ? { ...prep.job.p1812, probability: new SharedArrayBuffer(cells * 4) } : undefined;
  return { ...prep.job, out: new SharedArrayBuffer(level ? cells * 4 : cells), ...(p ? { p1812: p } : {}) };
}

/** The job with its rasters filled with nodata (as runCoverage does). */
function filledJob(c: (typeof CASES)[number]): CoverageJob {
  const j = freshJob(c);
  if (j.method === "visibility") new Uint8Array(j.out).fill(VISIBILITY_NODATA);
  else new Float32Array(j.out).fill(LEVEL_NODATA);
  if (j.p1812) new Float32Array(j.p1812.probability).fill(-1);
  return j;
}

const bytesOf = (j: CoverageJob) => [Buffer.from(new Uint8Array(j.out)), ...(j.p1812 ? [Buffer.from(new Uint8Array(j.p1812.probability))] : [])];

function memoryStore(): CoverageTileStore & { map: Map<string, Uint8Array> } {
  const map = new Map<string, Uint8Array>();
  return { map, get: async (k, n) => map.get(`${k}/${n}`), put: (k, n, b) => void map.set(`${k}/${n}`, b) };
}

describe("coverage tiles: the same cells as the map in one piece", () => {
  for (const c of CASES) {
    it(c.name, async () => {
      const whole = filledJob(c);
      const wholeTally = await runInThisThread(whole); // one piece, every chunk
      for (const count of [2, 7]) {
        // tiles computed into one raster, without a store
        const direct = filledJob(c);
        const tDirect = await computeCoverageTiles(direct, count, {});
        expect(bytesOf(direct)).toEqual(bytesOf(whole));
        // with a store: each tile's box extracted, the raster still the whole map
        const store = memoryStore();
        const stored = filledJob(c);
        const tStored = await computeCoverageTiles(stored, count, { store });
        expect(bytesOf(stored)).toEqual(bytesOf(whole));
        expect(store.map.size).toBe(count);
        expect(tStored).toEqual(tDirect); // the same sums in the same order
        // every tile read back from the store: nothing computed, the same raster and tally
        const read = filledJob(c);
        const tRead = await computeCoverageTiles(read, count, { store: { get: store.get, put: () => expect.unreachable("a stored tile was computed again") } });
        expect(bytesOf(read)).toEqual(bytesOf(whole));
        expect(tRead).toEqual(tDirect);
        // each tile alone on a fresh raster (a queue worker), in reverse order: the same bytes
        const worker = freshJob(c);
        for (let k = count - 1; k >= 0; k--) {
          const tile = await computeCoverageTile(worker, k, count, { extract: true });
          expect(encodeCoverageTile(tile).equals(Buffer.from(store.map.get(`${k}/${count}`)!)), `tile ${k}/${count}`).toBe(true);
        }
        // areas: the whole map's up to the order of summation
        expectClose(tDirect.area_m2, wholeTally.area_m2, { rel: 1e-12 }, "area_m2");
        for (const [j, a] of wholeTally.at_least_m2.entries()) expectClose(tDirect.at_least_m2[j], a, { rel: 1e-12, abs: 1e-6 }, `at_least_m2[${j}]`);
        expect(tDirect.cells).toBe(wholeTally.cells);
        expect(tDirect.failed).toBe(wholeTally.failed);
      }
      // the tiles cover every unit, in order, without overlap
      const j = freshJob(c);
      let next = 0;
      for (let k = 0; k < 7; k++) {
        const [from, to] = tileUnits(j, k, 7);
        expect(from).toBe(next);
        next = to;
      }
      expect(next).toBe(j.method === "hata" ? j.height : 4 * (2 * j.rc + 1));
    });
  }

  it("a map is cut into at least 2 tiles, about one per 4 M cells, at most 96", () => {
    expect(coverageTileCount(3000, 30)).toBe(2);
    expect(coverageTileCount(150_000, 30)).toBe(Math.ceil((Math.PI * 5000 ** 2) / 4e6)); // 20
    expect(coverageTileCount(2_000_000, 10)).toBe(96);
  });
});
