import { spawnSync } from "node:child_process";
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { parse as parseYaml } from "yaml";
import { analyzeCoverage } from "../../src/coverage/analyze-coverage.ts";
import { InputError } from "../../src/study/input-error.ts";
import { studyHead } from "../helpers/tiny-study.ts";
import { loadStudy } from "../../src/study/load-study.ts";
import { studySchema } from "../../src/study/schema.ts";
import { ConstantTerrain } from "../../src/terrain/constant.ts";
import { runCliInProcess as runCli } from "../helpers/run-cli.ts";
import { cellLatLon, writeUtmDem } from "./coverage-fixtures.ts";

// Bad coverage input must end in a clear message and exit code 2, never a stack trace,
// from the command line and from a study file.

let dir: string;
let demPath: string;
let site: string;

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), "ridgeline-coverage-bad-"));
  demPath = join(dir, "dem.tif");
  const dem = writeUtmDem(demPath, 101, 30, (c, r) => 200 + c + r);
  site = cellLatLon(dem, 50, 50).join(",");
});

afterAll(() => rmSync(dir, { recursive: true, force: true }));

const base = (over: Record<string, string> = {}): string[] => {
  const o: Record<string, string> = {
    site,
    "antenna-m": "30",
    "receiver-m": "1.5",
    terrain: demPath,
    "radius-km": "1",
    "resolution-m": "30",
    "frequency-ghz": "0.9",
    method: "delta-bullington",
    out: join(dir, "out.tif"),
    ...over,
  };
  return ["coverage", ...Object.entries(o).flatMap(([k, v]) => [`--${k}`, v])];
};

describe("ridgeline coverage: bad input → exit 2 with a clear message", () => {
  it.each([
    ["a request over 200 M cells", { terrain: "constant:0", "radius-km": "100", "resolution-m": "5" }, /= 1\d{3}\.\d M cells on a 5 m grid, more than the limit of 200 M.*reduce the radius or coarsen the resolution/s],
    ["a site outside the DEM", { site: "46.5,9.5" }, /site is not on the terrain: point 46\.50000, 9\.50000 is outside .*dem\.tif, which covers x 400000…403030 m/],
    ["unsorted thresholds", { "thresholds-dbm": "-80,-90,-100" }, /--thresholds-dbm: received \[-80, -90, -100\]; expected levels in strictly ascending order .*e\.g\. \[-100, -90, -80\]/],
    ["an unknown method", { method: "okumura" }, /--method: received "okumura"; expected one of visibility, delta-bullington, hata/],
    ["an antenna on the ground for delta-Bullington", { "antenna-m": "0" }, /--antenna-m: received 0; expected a height above ground greater than 0/],
    ["a missing terrain file", { terrain: join("no", "such.tif") }, /--terrain: terrain no\/such\.tif not found/],
  ])("%s", async (_name, over, message) => {
    const r = await runCli(base(over));
    expect(r.code, r.stderr).toBe(2);
    expect(r.stderr).toMatch(message);
    expect(r.stderr).not.toMatch(/\n\s+at /); // no stack trace
  });

  it("a pattern table that does not cover 0–360°", async () => {
    const csv = join(dir, "pattern.csv");
    writeFileSync(csv, "azimuth_deg,attenuation_db\n0,0\n90,10\n180,25\n270,10\n350,1\n");
    const r = await runCli(base({ pattern: csv }));
    expect(r.code, r.stderr).toBe(2);
    expect(r.stderr).toMatch(/--pattern\.horizontal: the azimuth pattern needs a table covering 0° to 360°: its first angle must be 0° and its last 360° \(received 0° to 350°\)/);
  });

  it("the real process exits 2 without a stack trace and leaves no output file", () => {
    const out = join(dir, "never.tif");
    const r = spawnSync(process.execPath, [join(process.cwd(), "bin/ridgeline.js"), ...base({ "thresholds-dbm": "-70,-90", out })], { encoding: "utf8" });
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/^ridgeline coverage: --thresholds-dbm: received \[-70, -90\]/);
    expect(r.stderr).not.toMatch(/\n\s+at /);
    expect(spawnSync("test", ["-e", out]).status).not.toBe(0);
  });
});

const STUDY = (coverage: string) => `${studyHead("Coverage input checks", "constant_m: 50", "Test", "Test")}sites:
  - id: A
    name: Alpha
    lat_deg: 46.0
    lon_deg: 7.5
coverage:
  - id: cov-a
    site: A
    method: delta-bullington
    frequency_ghz: 0.9
    antenna_m: 30
    radius_km: 5
${coverage}`;

describe("study coverage entries: bad input → exit 2 naming file, line and field", () => {
  it.each([
    ["a request over 200 M cells", "    resolution_m: 0.5\n", /coverage\[0\]\.radius_km \(cov-a\)\n {4}received a request of \d+ × \d+ = \d+\.\d M cells on a 0.5 m grid; expected at most 200 M cells; reduce the radius/],
    ["a site that is not in sites", "    site: Z\n", /coverage\[0\]\.site \(cov-a\)\n {4}received "Z"; expected the id of a site in sites \(A\)/],
  ])("when computed: %s", async (_name, yaml, message) => {
    const file = join(dir, `computed-${Math.random().toString(36).slice(2)}`, "study.yaml");
    mkdirSync(join(file, ".."), { recursive: true });
    const text = STUDY(yaml).replace(/\n {4}site: A\n(?=[\s\S]*\n {4}site: Z)/, "\n");
    writeFileSync(file, text);
    const study = loadStudy(file);
    study.coverage = studySchema.parse(parseYaml(text)).coverage;
    const err = await analyzeCoverage(study, study.coverage[0], new ConstantTerrain(50), { outDir: join(dir, "never"), index: 0 }).then(
      () => null,
      (e) => e,
    );
    expect(err).toBeInstanceOf(InputError);
    expect(err.message).toMatch(message);
    expect(err.message).toMatch(/study\.yaml:\d+:\d+/);
  });

  it.each([
    ["unsorted thresholds", "    thresholds: [-80, -100]\n", /study\.yaml:\d+:\d+ {2}coverage\[0\]\.thresholds\n {4}received \[-80,-100\]; expected levels in strictly ascending order, e\.g\. \[-100, -90, -80\]/],
    [
      "a horizontal pattern that does not reach 360°",
      "    pattern:\n      azimuth_deg: 90\n      horizontal: [[0, 0], [180, 20], [300, 5]]\n",
      /coverage\[0\]\.pattern\.horizontal\n {4}received .*; expected a table covering 0° to 360°: its first angle must be 0° and its last 360° \(received 0° to 300°\)/,
    ],
    ["check radials out of range", "    wave_check_radials: 100\n", /study\.yaml:\d+:\d+ {2}coverage\[0\]\.wave_check_radials\n {4}received 100; expected a number ≤ 72/],
    ["check radials not a whole number", "    wave_check_radials: 2.5\n", /study\.yaml:\d+:\d+ {2}coverage\[0\]\.wave_check_radials\n {4}received 2\.5; expected a whole number/],
    ["a vertical pattern with falling angles", "    pattern:\n      vertical: [[-90, 20], [10, 0], [0, 3], [90, 20]]\n", /coverage\[0\]\.pattern\.vertical\n .*expected angles strictly rising \(entry 2, 0°, follows 10°\)/],
  ])("%s", async (_name, yaml, message) => {
    const root = join(dir, `studies-${Math.random().toString(36).slice(2)}`);
    mkdirSync(join(root, "s1"), { recursive: true });
    writeFileSync(join(root, "s1", "study.yaml"), STUDY(yaml));
    const r = await runCli(["check", "--studies-dir", root]);
    expect(r.code, r.stderr).toBe(2);
    expect(r.stderr).toMatch(message);
  });
});
