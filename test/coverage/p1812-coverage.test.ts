import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { computeCoverage } from "../../src/coverage/compute-coverage.ts";
import { PROBABILITY_NODATA } from "../../src/coverage/coverage-job.ts";
import { servedSites } from "../../src/coverage/served-sites.ts";
import { writeGeoTiff } from "../../src/geo/geotiff-writer.ts";
import { openGeoTiff } from "../../src/terrain/geotiff.ts";
import { cellLatLon, request, roughTerrain, writeUtmDem } from "./coverage-fixtures.ts";
import { expectClose } from "../helpers/expect-close.ts";

// The check: a P.1812 coverage cell equals the full-profile physics function
// (p1812Loss, src/physics/p1812.ts, validated on the 36 ITU-R cases) on the same geometry
// within 0.1 dB. servedSites evaluates p1812Loss on the radial profile the sweep used for a
// cell (cell-profile.ts); the raster holds the incremental evaluation.
const dir = mkdtempSync(join(tmpdir(), "ridgeline-p1812-cov-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
const N = 240;
const CELL = 50;
const terrainFn = roughTerrain(12);
const dem = writeUtmDem(join(dir, "dem.tif"), N, CELL, (c, r) => terrainFn(c / N, r / N));
const lcPath = join(dir, "lc.tif");
{
  // classes 1 open, 2 forest, 3 town, 4 lake, on the DEM's grid
  const data = new Uint8Array(N * N);
  for (let r = 0; r < N; r++) for (let c = 0; c < N; c++) data[r * N + c] = (c * 7 + r * 3) % 53 < 9 ? 2 : Math.hypot(c - 60, r - 170) < 14 ? 4 : Math.hypot(c - 180, r - 60) < 10 ? 3 : 1;
  writeGeoTiff(lcPath, { width: N, height: N, data, geoTransform: [dem.x0, CELL, 0, dem.y0, 0, -CELL], epsg: 32632, nodata: 0 });
}
const site = cellLatLon(dem, 120, 120);

async function run(p_pct: number, pL: number, withCover: boolean) {
  const lc = withCover ? await openGeoTiff(lcPath) : null;
  const classes = withCover
    ? [
        { value: 1, name: "open", category: "open" as const, height_m: 0 },
        { value: 2, name: "forest", category: "urban" as const, height_m: 15 },
        { value: 3, name: "town", category: "suburban" as const, height_m: 10 },
        { value: 4, name: "lake", category: "water" as const, height_m: 0 },
      ]
    : [{ value: null, name: "suburban", category: "suburban" as const, height_m: 10 }];
  const req = request({
    site: { lat_deg: site[0], lon_deg: site[1] },
    method: "p1812",
    radius_m: 5500,
    resolution_m: CELL,
    frequency_ghz: 0.46,
    antenna_m: 25,
    receiver_m: 3,
    thresholds_dbm: [-100, -90],
    p1812: { time_pct: p_pct, location_pct: pL, sigma_l_db: null, dn: 45, n0: 325, classes, land_cover: lc ? { raster: lc.raster, label: "lc.tif", values: [1, 2, 3, 4] } : null, receiver_clutter_loss: "none", indoor: null },
  });
  const terrain = await openGeoTiff(join(dir, "dem.tif"));
  return computeCoverage(terrain, req);
}

describe("p1812 coverage: a cell equals p1812Loss on the same geometry (within 0.1 dB)", () => {
  for (const [p, pL, cover] of [
    [50, 50, true],
    [10, 90, true],
    [1, 50, false],
  ] as const) {
    it(`p = ${p} %, pL = ${pL} %, ${cover ? "land cover" : "one class"}`, async () => {
      const c = await run(p, pL, cover);
      const values = c.values as Float32Array;
      const prob = new Float32Array(c.job.p1812!.probability);
      // probe cells spread over the grid, each as a "site"
      const probes: { id: string; name: string; lat_deg: number; lon_deg: number; col: number; row: number }[] = [];
      for (let k = 0; k < 24; k++) {
        const a = (2 * Math.PI * k) / 24;
        const rr = 10 + ((k * 37) % 95);
        const col = Math.round(120 + rr * Math.cos(a));
        const row = Math.round(120 + rr * Math.sin(a));
        const [lat, lon] = cellLatLon(dem, col, row);
        probes.push({ id: `P${k}`, name: `probe ${k}`, lat_deg: lat, lon_deg: lon, col, row });
      }
      const rows = servedSites(c.job, c.grid, c.dem, probes, { tx_power_dbm: 40 });
      expect(rows.length).toBeGreaterThan(20);
      for (const r of rows) {
        const pr = probes.find((x) => x.id === r.site)!;
        const col = Math.round((dem.x0 + (pr.col + 0.5) * CELL - c.grid.geoTransform[0]) / c.grid.geoTransform[1] - 0.5);
        const row = Math.round((c.grid.geoTransform[3] - (dem.y0 - (pr.row + 0.5) * CELL)) / -c.grid.geoTransform[5] - 0.5);
        const i = row * c.grid.width + col;
        expectClose(values[i], r.level_at_pl_dbm, { abs: 0.1 }, { site: r.site, col, row, d_km: r.distance_km });
        expect(prob[i]).not.toBe(PROBABILITY_NODATA);
        expectClose(100 * prob[i], r.location_probability_pct, { abs: 0.5 }, { site: r.site, q: "location probability" });
      }
    });
  }
});
