import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { analyzeCoverage } from "../../src/coverage/analyze-coverage.ts";
import { writeGeoTiff } from "../../src/geo/geotiff-writer.ts";
import { coverageOutputStage } from "../../src/render/coverage-outputs.ts";
import { InputError } from "../../src/study/input-error.ts";
import { loadStudy } from "../../src/study/load-study.ts";
import { ConstantTerrain } from "../../src/terrain/constant.ts";
import { studyHead } from "../helpers/tiny-study.ts";

// Bad P.1812 coverage input ends in an InputError naming study.yaml:line, the field, what was
// received and the allowed range or the fix — never a stack trace (the CLI exits 2 on it).

let dir: string;
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), "ridgeline-p1812-bad-"));
  // land cover around (46.0, 7.5): the western half holds value 1, the eastern half value 7
  const W = 200;
  const data = new Uint8Array(W * W);
  for (let r = 0; r < W; r++) for (let c = 0; c < W; c++) data[r * W + c] = c < W / 2 ? 1 : 7;
  writeGeoTiff(join(dir, "lc.tif"), { width: W, height: W, data, geoTransform: [7.4, 0.001, 0, 46.1, 0, -0.001], epsg: 4326, nodata: 0 });
  // a small land cover that does not reach the radius
  const S = 20;
  writeGeoTiff(join(dir, "small.tif"), { width: S, height: S, data: new Uint8Array(S * S).fill(1), geoTransform: [7.49, 0.001, 0, 46.01, 0, -0.001], epsg: 4326, nodata: 0 });
  writeFileSync(join(dir, "bowtie.geojson"), JSON.stringify({ type: "Polygon", coordinates: [[[7.48, 45.98], [7.52, 46.02], [7.52, 45.98], [7.48, 46.02], [7.48, 45.98]]] }));
  writeFileSync(join(dir, "open-ring.geojson"), JSON.stringify({ type: "Polygon", coordinates: [[[7.48, 45.98], [7.52, 45.98], [7.52, 46.02], [7.48, 46.02]]] }));
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const STUDY = (entry: string) => `${studyHead("P.1812 input checks", "constant_m: 50")}sites:
  - id: A
    name: Alpha
    lat_deg: 46.0
    lon_deg: 7.5
coverage:
  - id: cov-a
    site: A
    method: p1812
    antenna_m: 30
    radius_km: 2
    resolution_m: 100
    thresholds: [-100]
${entry}`;

function write(entry: string): string {
  const sub = join(dir, Math.random().toString(36).slice(2));
  mkdirSync(sub);
  for (const f of ["lc.tif", "small.tif", "bowtie.geojson", "open-ring.geojson"]) writeFileSync(join(sub, f), "");
  const file = join(sub, "study.yaml");
  writeFileSync(file, STUDY(entry));
  return file;
}

describe("p1812 study input: checked when loading (file:line, field, allowed range)", () => {
  it.each([
    ["a frequency outside 0.03–6 GHz", "    frequency_ghz: 7\n", /coverage\[0\]\.frequency_ghz[\s\S]*0\.03–6 GHz/],
    ["p outside 1–50 %", "    frequency_ghz: 0.45\n    p1812: { time_pct: 60 }\n", /coverage\[0\]\.p1812\.time_pct[\s\S]*received 60; expected a number ≤ 50/],
    ["pL outside 1–99 %", "    frequency_ghz: 0.45\n    p1812: { location_pct: 99.5 }\n", /coverage\[0\]\.p1812\.location_pct[\s\S]*received 99\.5; expected a number ≤ 99/],
  ])("%s", (_name, entry, message) => {
    let err: unknown = null;
    try {
      loadStudy(write(entry));
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(InputError);
    expect((err as Error).message).toMatch(message);
    expect((err as Error).message).toMatch(/study\.yaml:\d+:\d+/);
  });
});

describe("p1812 study input: checked when computing (file:line, field, value, file)", () => {
  const LC = (file: string) => `    p1812:\n      land_cover:\n        file: ${file}\n        classes:\n          - { value: 1, category: open }\n`;
  it.each([
    ["a land-cover value missing from the class table", LC("lc.tif"), /coverage\[0\]\.p1812\.land_cover\.classes[\s\S]*value 7 in lc\.tif[\s\S]*listed: 1/],
    ["a land cover that does not cover the radius", LC("small.tif"), /coverage\[0\]\.p1812\.land_cover[\s\S]*small\.tif does not cover the radius|small\.tif \(no class at/],
    ["a service area that crosses itself", "    service_area: bowtie.geojson\n", /coverage\[0\]\.service_area[\s\S]*bowtie\.geojson: polygon 1 crosses itself/],
    ["a service area whose ring is not closed", "    service_area: open-ring.geojson\n", /coverage\[0\]\.service_area[\s\S]*ring 1 is not closed/],
  ])("%s", async (_name, entry, message) => {
    const file = write(`    frequency_ghz: 0.45\n${entry}`);
    for (const f of ["lc.tif", "small.tif", "bowtie.geojson", "open-ring.geojson"]) writeFileSync(join(file, "..", f), await import("node:fs").then((fs) => fs.readFileSync(join(dir, f))));
    const study = loadStudy(file);
    const err = await analyzeCoverage(study, study.coverage![0], new ConstantTerrain(50), { outDir: join(dir, "out"), outputs: coverageOutputStage, index: 0 }).then(
      () => null,
      (e) => e,
    );
    expect(err).toBeInstanceOf(InputError);
    expect(err.message).toMatch(message);
    expect(err.message).toMatch(/study\.yaml:\d+:\d+/);
  });
});

describe("ridgeline coverage --method p1812: bad flags → exit 2 naming the flag and the range", () => {
  const args = (over: string[]) => ["coverage", "--site", "46,7.5", "--antenna-m", "30", "--receiver-m", "3", "--terrain", "constant:100", "--radius-km", "1", "--resolution-m", "100", "--method", "p1812", "--out", join(dir, "x.tif"), ...over];
  it.each([
    [["--frequency-ghz", "7"], /--frequency-ghz: received 7; expected a frequency from 0\.03 to 6 GHz/],
    [["--frequency-ghz", "0.45", "--time-pct", "60"], /--time-pct: received 60; expected a percentage of time from 1 to 50 %/],
    [["--frequency-ghz", "0.45", "--location-pct", "0.5"], /--location-pct: received 0\.5; expected a percentage of locations from 1 to 99 %/],
  ])("%j", async (over, message) => {
    const { runCliInProcess: runCli } = await import("../helpers/run-cli.ts");
    const r = await runCli(args(over));
    expect(r.code, r.stderr).toBe(2);
    expect(r.stderr).toMatch(message);
    expect(r.stderr).not.toMatch(/\n\s+at /);
  });
});
