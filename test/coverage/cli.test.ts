import { execFileSync } from "node:child_process";
import { mkdirSync, mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { computeCoverage } from "../../src/coverage/compute-coverage.ts";
import { openGeoTiff } from "../../src/terrain/geotiff.ts";
import { writeHgtTile } from "../../src/terrain/write-hgt.ts";
import { writeGeoTiff } from "../../src/geo/geotiff-writer.ts";
import { cellLatLon, request, roughTerrain } from "./coverage-fixtures.ts";
import { runCliInProcess as runCli } from "../helpers/run-cli.ts";

// `ridgeline coverage` end to end on a folder of .hgt tiles (no raster of its own: a UTM grid
// at the requested resolution), read back with GDAL; and the same raster whichever number of
// worker threads computes it.

let dir: string;
let hgt: string;

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), "ridgeline-coverage-cli-"));
  hgt = join(dir, "dem");
  mkdirSync(hgt);
  writeHgtTile(join(hgt, "N46E007.hgt"), 46, 7, 3, (la, lo) => 900 + 400 * Math.sin(17 * la + 1) * Math.cos(13 * lo) + 30 * Math.sin(400 * la) * Math.cos(350 * lo));
});

afterAll(() => rmSync(dir, { recursive: true, force: true }));

const args = (method: string, out: string, extra: string[] = []) => [
  "coverage", "--site", "46.52,7.48", "--antenna-m", "25", "--receiver-m", "1.5", "--terrain", hgt, "--radius-km", "6",
  "--resolution-m", "60", "--frequency-ghz", "0.9", "--method", method, "--out", out, ...extra,
];

describe("ridgeline coverage on a folder of .hgt tiles", () => {
  it.each(["visibility", "delta-bullington", "hata"])("%s: a UTM GeoTIFF GDAL reads, with the summary and --json", async (method) => {
    const out = join(dir, `${method}.tif`);
    const r = await runCli(args(method, out, ["--thresholds-dbm", "-100,-80", "--json"]));
    expect(r.code, r.stderr).toBe(0);
    expect(r.stderr).toMatch(/Wrote .*: \d+×\d+ cells, EPSG:32632 \(WGS84 \/ UTM zone 32N\); 0\.\d+ M cells inside 6 km/);
    const info = JSON.parse(execFileSync("gdalinfo", ["-json", "-stats", out]).toString());
    expect(info.coordinateSystem.wkt).toContain('"EPSG",32632');
    expect(info.geoTransform[1]).toBe(60);
    expect(info.bands[0].type).toBe(method === "visibility" ? "Byte" : "Float32");
    const json = JSON.parse(r.stdout);
    expect(json.method).toBe(method);
    expect(json.grid.width).toBe(info.size[0]);
    // GDAL's mean over valid cells equals ours for the visibility share
    if (method === "visibility") expect(info.bands[0].mean).toBeCloseTo(json.thresholds[0].pct / 100, 2);
  });

  it.each([-9999, -32768])("visibility on an uncompressed Float32 GeoTIFF with nodata holes (%d): the file holds computeCoverage's raster, byte for byte, with 0 and 2 worker threads", async (nodata) => {
    // the command sets nodata outside the radius as it writes the file, its threads make the
    // sweep's tile table while the elevations are read, and it keeps a Float32 nodata of −32768
    // as read: none may change a cell
    const dem = join(dir, `utm${nodata}.tif`);
    const h = roughTerrain(77);
    const n = 241;
    const fix = { x0: 400000, y0: 5010000, cell: 30 };
    const data = new Float32Array(n * n).map((_, i) => {
      const c = i % n;
      const r = Math.floor(i / n);
      return (c >= 150 && c < 156 && r >= 60 && r < 63) || (r === 130 && c > 60 && c < 64) ? nodata : h(c / (n - 1), r / (n - 1));
    });
    writeGeoTiff(dem, { width: n, height: n, data, geoTransform: [fix.x0, fix.cell, 0, fix.y0, 0, -fix.cell], epsg: 32632, nodata });
    const [lat, lon] = cellLatLon(fix, 120.3, 118.6);
    const terrain = await openGeoTiff(dem, { deferPixels: true });
    const want = await computeCoverage(terrain, request({ site: { lat_deg: lat, lon_deg: lon }, method: "visibility", radius_m: 3000, antenna_m: 25, receiver_m: 1.5 }), { pool: null });
    expect(want.tally.failed).toBeGreaterThan(0);
    for (const t of ["0", "2"]) {
      const out = join(dir, `vis-${t}${nodata}.tif`);
      const r = await runCli(["coverage", "--site", `${lat},${lon}`, "--antenna-m", "25", "--receiver-m", "1.5", "--terrain", dem, "--radius-km", "3", "--resolution-m", "30", "--frequency-ghz", "0.9", "--method", "visibility", "--out", out, "--threads", t]);
      expect(r.code, r.stderr).toBe(0);
      execFileSync("gdal_translate", ["-q", "-of", "ENVI", out, join(dir, `vis-${t}${nodata}.bin`)]);
      const got = readFileSync(join(dir, `vis-${t}${nodata}.bin`));
      expect(got.length).toBe(want.values.length);
      expect(Buffer.compare(got, Buffer.from(want.values.buffer as ArrayBuffer)), `${t} threads`).toBe(0);
    }
  });

  it("delta-Bullington: the same bytes with 0, 1 and 2 worker threads", async () => {
    const files = [];
    for (const t of ["0", "1", "2"]) {
      const out = join(dir, `db-${t}.tif`);
      const r = await runCli(args("delta-bullington", out, ["--threads", t]));
      expect(r.code, r.stderr).toBe(0);
      expect(r.stderr).toMatch(new RegExp(`on ${t === "0" ? 1 : t} thread`));
      files.push(readFileSync(out));
    }
    expect(files[1].equals(files[0])).toBe(true);
    expect(files[2].equals(files[0])).toBe(true);
  });
});
