import { execFileSync, spawn } from "node:child_process";
import { mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, symlinkSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { writeGeoTiff } from "../../src/geo/geotiff-writer.ts";
import { internalErrorLine } from "../../src/cli/main.ts";
import { InternalError } from "../../src/errors.ts";
import { svgId, urlPathSegment } from "../../src/render/svg/escape.ts";
import { relativeUrl } from "../../src/site/relative-url.ts";
import { runCase, type CaseResult } from "../fuzz/run-case.ts";
import { expectClean, sub } from "../helpers/hostile-case.ts";
import { PROJECT_ROOT } from "../helpers/run-cli.ts";
import { studyHead, TINY_STUDY } from "../helpers/tiny-study.ts";
import { loadCoverageOutputStage } from "../../src/render/coverage-output-loader.ts";

// Regression tests for the crashes, hangs, impossible results, injections, leaks and poor
// messages found by feeding Ridgeline hostile studies (issue: hardening). Each case runs the
// pipeline in-process as `ridgeline check` does (test/fuzz/run-case.ts) and must end in a
// clean input error, or in results that are physically possible, within seconds.

let root: string;
beforeAll(() => {
  root = mkdtempSync(join(tmpdir(), "ridgeline-hostile-"));
});
afterAll(() => rmSync(root, { recursive: true, force: true }));

let n = 0;
/** Write a study (yaml text, or a function making study.yaml itself) with extra files; run it. */
async function run(yaml: string | null, extra: (dir: string) => void = () => {}, id = `s${n++}`): Promise<CaseResult> {
  const studies = join(root, `r${n++}`);
  const dir = join(studies, id);
  mkdirSync(dir, { recursive: true });
  extra(dir);
  if (yaml !== null) writeFileSync(join(dir, "study.yaml"), yaml);
  return runCase(studies, id, null);
}

const COVERAGE = (site = "A", id = "cov", extra = "") => `coverage:
  - id: ${id}
    site: ${site}
    method: hata
    frequency_ghz: 0.9
    antenna_m: 20
    radius_km: 0.5
    resolution_m: 100
${extra}`;

describe("crashes become clean input errors", () => {
  it.each([
    ["an alias bomb (> 100 alias expansions) is bad input, not 'Excessive alias count'", `${TINY_STUDY}a: &a [1,1,1,1,1,1,1,1,1,1]\nb: &b [${Array(10).fill("*a").join(",")}]\nc: [${Array(20).fill("*b").join(",")}]\n`, /aliases that expand more than 100 times/],
    ["an alias without anchor", sub("title: Tiny test study", "title: *nowhere"), /each alias \(\*name\) after an anchor/],
    ["profile_step_m 1e-9 (was RangeError: Invalid typed array length)", `${TINY_STUDY}design:\n  profile_step_m: 1.0e-9\n`, /design\.profile_step_m[\s\S]*≥ 0\.1/],
    ["profile_step_m 0.001 (was 3 GB and a hang)", `${TINY_STUDY}design:\n  profile_step_m: 0.001\n`, /design\.profile_step_m/],
    ["antenna_search.step_m 1e-6 (was a hang)", `${TINY_STUDY}design:\n  antenna_search: { step_m: 1.0e-6 }\n`, /antenna_search\.step_m/],
    ["a link id too long for a file name (ENAMETOOLONG)", sub("  - id: a-b", `  - id: ${"a".repeat(300)}`), /links\[0\]\.id[\s\S]*1–64 characters/],
    ["a NUL in a site name with coverage (sharp's SVG parser rejected it)", sub("name: Alpha", 'name: "Al\\0pha"') + COVERAGE(), /sites\[0\]\.name[\s\S]*without control characters/],
    ["a 1 MB site name with coverage (was a hang)", sub("name: Alpha", `name: ${"N".repeat(1_000_000)}`) + COVERAGE(), /at most 200 characters/],
  ])("%s", async (_name, yaml, message) => {
    expectClean(await run(yaml), message);
  });

  it("a study folder name too long for a study id (ENAMETOOLONG)", async () => {
    expectClean(await run(TINY_STUDY, undefined, "x".repeat(250)), /a folder name usable as a study id[\s\S]*1–64 characters/);
  });

  it("study.yaml that is a directory (was EISDIR)", async () => {
    expectClean(await run(null, (d) => mkdirSync(join(d, "study.yaml"))), /a folder named study\.yaml; expected a study\.yaml that is a regular file/);
  });

  it("study.yaml, a GeoTIFF or an HGT tile symlinked to /dev/zero is refused before it is hashed (was 7.5 GB and std::bad_alloc)", async () => {
    expectClean(await run(null, (d) => symlinkSync("/dev/zero", join(d, "study.yaml"))), /a device named study\.yaml/);
    expectClean(await run(sub("constant_m: 50", "file: dem.tif"), (d) => symlinkSync("/dev/zero", join(d, "dem.tif"))), /terrain\.file[\s\S]*outside the study folder|a device/);
    expectClean(await run(sub("constant_m: 50", "file: S34W071.hgt"), (d) => symlinkSync("/dev/zero", join(d, "S34W071.hgt"))), /terrain\.file/);
  });

  it("a composite of two far-apart coverages is not made over the cell limit (was 450 M cells, 4 GB)", async () => {
    const yaml = `${studyHead("Far apart", "constant_m: 0")}sites:
  - { id: A, name: Alpha, lat_deg: 10.0, lon_deg: 12.5 }
  - { id: B, name: Bravo, lat_deg: 60.0, lon_deg: 17.5 }
${COVERAGE("A", "ca")}${COVERAGE("B", "cb").replace("coverage:\n", "")}`.replace(/resolution_m: 100/g, "resolution_m: 50");
    const studies = join(root, "far");
    mkdirSync(join(studies, "far"), { recursive: true });
    writeFileSync(join(studies, "far", "study.yaml"), yaml);
    const { analyzeStudies } = await import("../../src/analysis/analyze-study.ts");
    const { loadStudies, findStudies } = await import("../../src/analysis/load-all.ts");
    const [s] = await analyzeStudies(loadStudies(findStudies(studies, ["far"])), { cache: null, coverageOutputs: loadCoverageOutputStage });
    expect(s.result.coverage.map((c) => c.id)).toEqual(["ca", "cb"]);
    expect(s.result.warnings.join(" ")).toMatch(/No multi-site composite: the composite would need \d+ × \d+ = [\d.]+ M cells, more than the limit of 200 M/);
    expect((await runCase(studies, "far", null)).outcome).toBe("success");
  }, 60_000);
});

describe("hangs end at once", () => {
  it.each([
    ["a named pipe given as study.yaml", null, "study.yaml", /a named pipe named study\.yaml/],
    ["a named pipe given as terrain", sub("constant_m: 50", "file: dem.tif"), "dem.tif", /terrain\.file[\s\S]*a named pipe/],
    ["a named pipe given as profile_csv", sub("    radio: r1\n", "    radio: r1\n    profile_csv: p.csv\n"), "p.csv", /profile_csv[\s\S]*a named pipe/],
  ])("%s", async (_name, yaml, pipe, message) => {
    expectClean(await run(yaml, (d) => execFileSync("mkfifo", [join(d, pipe)])), message);
  }, 10_000);
});

describe("silent nonsense becomes an error or a warning", () => {
  it.each([
    ["two coverage entries with the same id (outputs overwrote each other)", sub("name: Alpha", "name: Alpha") + COVERAGE("A", "cov") + COVERAGE("B", "cov").replace("coverage:\n", ""), /coverage\[1\]\.id[\s\S]*not used before/],
    ["the coverage id 'composite' (overwrote the combined map)", TINY_STUDY + COVERAGE("A", "composite"), /"composite" names the study's combined map/],
    ["link ids differing only in letter case (one folder on macOS and Windows)", `${TINY_STUDY}  - { id: A-B, from: { site: A, antenna_m: 30, gain_dbi: 34 }, to: { site: B, antenna_m: 30, gain_dbi: 34 }, radio: r1 }\n`, /in other letter case/],
    ["sites 1 nm apart (free-space loss was −129.6 dB, received +227.6 dBm)", sub("lat_deg: -33.5000", "lat_deg: -33.45000000001").replace("lon_deg: -70.6000", "lon_deg: -70.6600"), /sites at least [\d.]+ m apart/],
    ["frequency_ghz 1e-6", sub("frequency_ghz: 6", "frequency_ghz: 1.0e-6"), /radios\[0\]\.frequency_ghz[\s\S]*≥ 0\.03/],
    ["a 1 mm surveyed profile", sub("    radio: r1\n", "    radio: r1\n    profile_csv: p.csv\n"), /a surveyed profile 0\.001 m long/, { "p.csv": "distance_m,elevation_m\n0,50\n0.001,50\n" }],
    ["constant_m 1e308 (ground heights had no bound)", sub("constant_m: 50", "constant_m: 1.0e308"), /terrain\.constant_m[\s\S]*≤ 9000/],
    ["constant_m −30 km", sub("constant_m: 50", "constant_m: -30000"), /terrain\.constant_m[\s\S]*≥ -500/],
    ["two sites at one point (zero-length link; pages showed y=\"NaN\")", sub("lat_deg: -33.5000", "lat_deg: -33.4500").replace("lon_deg: -70.6000", "lon_deg: -70.6600"), /are 0\.00 m apart/],
    ["lon 180 against −180 at one latitude (zero-length link)", sub("lon_deg: -70.6600", "lon_deg: 180").replace("lon_deg: -70.6000", "lon_deg: -180").replace("lat_deg: -33.5000", "lat_deg: -33.4500"), /are 0\.00 m apart/],
    ["both sites at a pole (zero-length link; 'range Infinity–45 GHz')", sub("lat_deg: -33.4500", "lat_deg: 90").replace("lat_deg: -33.5000", "lat_deg: 90"), /are 0\.00 m apart/],
    ["sites 3250 km apart (multipath outage was NaN, shown as not available)", sub("lat_deg: -33.5000", "lat_deg: 0.0000"), /at most 300 km apart/],
    ["the date 2026-13-45", sub("date: 2026-01-15", "date: 2026-13-45"), /date[\s\S]*a calendar date that exists/],
    ["the date 0000-00-00", sub("date: 2026-01-15", "date: 0000-00-00"), /date[\s\S]*a calendar date that exists/],
  ] as [string, string, RegExp, Record<string, string>?][])("%s", async (_name, yaml, message, files) => {
    expectClean(await run(yaml, (d) => Object.entries(files ?? {}).forEach(([f, t]) => writeFileSync(join(d, f), t))), message);
  });

  it("a 227 km path at 80 GHz with 1 m masts: multipath outage 100 % with a warning (was NaN, availability not available)", async () => {
    const yaml = sub("lat_deg: -33.5000", "lat_deg: -35.5000").replace("frequency_ghz: 6", "frequency_ghz: 80").replace(/antenna_m: 30/g, "antenna_m: 1") + "climate:\n  dn1: -860\n";
    const studies = join(root, "mp");
    mkdirSync(join(studies, "mp"), { recursive: true });
    writeFileSync(join(studies, "mp", "study.yaml"), yaml);
    const { analyzeStudies } = await import("../../src/analysis/analyze-study.ts");
    const { loadStudies, findStudies } = await import("../../src/analysis/load-all.ts");
    const [s] = await analyzeStudies(loadStudies(findStudies(studies, ["mp"])), { cache: null, coverageOutputs: loadCoverageOutputStage });
    const l = s.result.links[0];
    expect(l.availability?.multipath_worst_month_pct).toBe(100);
    expect(l.availability_pct).toBe(0);
    expect(l.warnings.join(" ")).toMatch(/beyond the method's interpolation/);
    expect((await runCase(studies, "mp", null)).outcome).toBe("success");
  });

  it("random bytes in an HGT tile (heights of ±30 km were accepted)", async () => {
    const bytes = Buffer.alloc(1201 * 1201 * 2);
    let x = 12345;
    for (let i = 0; i < bytes.length; i++) bytes[i] = (x = (x * 1103515245 + 12345) >>> 0) >>> 24;
    expectClean(await run(sub("constant_m: 50", "file: S34W071.hgt"), (d) => writeFileSync(join(d, "S34W071.hgt"), bytes)), /outside -500…9000 m|terrain heights from -500 to 9000 m/);
  });

  it("terrain far coarser than the path: a warning, an unreliable clearance verdict and no 'Infinity' (a 1-pixel GeoTIFF met every link)", async () => {
    const studies = join(root, "coarse");
    const dir = join(studies, "coarse");
    mkdirSync(dir, { recursive: true });
    writeGeoTiff(join(dir, "dem.tif"), { width: 1, height: 1, data: new Float32Array([100]), geoTransform: [-71, 1, 0, -33, 0, -1], epsg: 4326, nodata: -9999 });
    writeFileSync(join(dir, "study.yaml"), sub("constant_m: 50", "file: dem.tif"));
    const { analyzeStudies } = await import("../../src/analysis/analyze-study.ts");
    const { loadStudies, findStudies } = await import("../../src/analysis/load-all.ts");
    const [s] = await analyzeStudies(loadStudies(findStudies(studies, ["coarse"])), { cache: null, coverageOutputs: loadCoverageOutputStage });
    const link = s.result.links[0];
    expect(link.clearance_reliable).toBe(false);
    expect(link.warnings.join(" ")).toMatch(/Clearance verdict unreliable: the terrain's spacing \(\d+ m\) is coarser than a 10th of the path/);
    expect(JSON.stringify(s.result)).not.toMatch(/Infinity|NaN/);
    expect(link.profile.samples).toBeGreaterThanOrEqual(17);
    const out = join(root, "coarse-site");
    expect((await runCase(studies, "coarse", out)).outcome).toBe("success");
    const page = readFileSync(join(out, "studies", "coarse", "links", "a-b", "index.html"), "utf8");
    expect(page).toMatch(/short of criteria — unreliable: terrain too coarse for this path|meets criteria — unreliable: terrain too coarse for this path/);
    // the page's text, not the base64 of its embedded images (where "NaN" occurs by chance)
    expect(page.replace(/data:image\/[a-z+]+;base64,[A-Za-z0-9+/=]+/g, "")).not.toMatch(/Infinity|NaN/);
  }, 60_000);
});

describe("security", () => {
  it.each([`x" onmouseover="alert(1)`, "a<b", "CON", "trailing."])("the study folder %j is rejected with the id rule", async (folder) => {
    expectClean(await run(TINY_STUDY, undefined, folder), /a folder name usable as a study id[\s\S]*letters, digits/);
  });

  it("profile_csv: ../../../../etc/passwd is not read, and no line of it is printed", async () => {
    const r = await run(sub("    radio: r1\n", "    radio: r1\n    profile_csv: ../../../../etc/passwd\n"));
    expectClean(r, /links\[0\]\.profile_csv[\s\S]*outside the study folder/);
    expect(r.detail).not.toMatch(/root:/);
  });

  it("a profile_csv symlinked out of the study folder is refused", async () => {
    const r = await run(sub("    radio: r1\n", "    radio: r1\n    profile_csv: p.csv\n"), (d) => symlinkSync("/etc/passwd", join(d, "p.csv")));
    expectClean(r, /a symbolic link to \/etc\/passwd, outside the study folder/);
  });

  it("ids, element ids and hrefs follow one escaping rule", () => {
    expect(svgId(`map-x" onmouseover="alert(1)`)).not.toMatch(/["'<>& ]/);
    expect(svgId("map-kestrel-vale")).toBe("map-kestrel-vale");
    expect(urlPathSegment(`a"b<c d#e?f/g`)).toBe("a%22b%3Cc%20d%23e%3Ff%2Fg");
    expect(relativeUrl("/studies/a/", "/studies/a/links/x y/")).toBe("links/x%20y/index.html");
    expect(relativeUrl("/", "/studies/kestrel-vale/")).toBe("studies/kestrel-vale/index.html");
  });
});

describe("messages", () => {
  it("the GeoTIFF decode error gives its fix once and the path as written", async () => {
    const r = await run(sub("constant_m: 50", "file: dem.tif"), (d) => writeFileSync(join(d, "dem.tif"), "II*\0junkjunkjunkjunk"));
    expectClean(r, /received dem\.tif; expected GeoTIFF dem\.tif: not a readable TIFF/);
    expect(r.detail.match(/gdal_translate/g)?.length ?? 0).toBeLessThanOrEqual(1);
    expect(r.detail).not.toMatch(/received \/.*dem\.tif/);
  });

  it("1000-deep nesting says so instead of 'Maximum call stack size exceeded'", async () => {
    const r = await run(`${TINY_STUDY}summary: ${"[".repeat(1000)}${"]".repeat(1000)}\n`);
    expectClean(r, /nested too deeply/);
    expect(r.detail).not.toMatch(/call stack/);
  });

  it("%YAML 1.1 keeps the date a date (it became a timestamp and was rejected)", async () => {
    expect((await run(`%YAML 1.1\n---\n${TINY_STUDY}`)).outcome).toBe("success");
  });

  it("a dangling study.yaml symlink is named as such instead of listing every study id", async () => {
    const r = await run(null, (d) => symlinkSync(join(d, "gone.yaml"), join(d, "study.yaml")));
    expectClean(r, /a symbolic link to .*gone\.yaml, which does not exist/);
    expect(r.detail).not.toMatch(/one of the studies/);
  });

  it("--studies-dir naming a file is bad input (was ENOTDIR, an internal error)", async () => {
    const { findStudies } = await import("../../src/analysis/load-all.ts");
    expect(() => findStudies("/etc/passwd")).toThrow(/received a file, not a folder/);
  });

  it("an internal error is one line naming the study", () => {
    const line = internalErrorLine("check", new InternalError("kestrel-vale", new TypeError("x is undefined\n    at f (a.ts:1:2)")));
    expect(line).toBe("ridgeline check: internal error in study kestrel-vale: TypeError: x is undefined — a bug; please report it with the study (RIDGELINE_DEBUG=1 prints the stack trace)");
  });
});

describe("no temporary folders are left", () => {
  const coverageStudy = (dir: string) => {
    mkdirSync(join(dir, "cov"), { recursive: true });
    writeFileSync(join(dir, "cov", "study.yaml"), TINY_STUDY + COVERAGE());
  };
  const bin = join(PROJECT_ROOT, "bin", "ridgeline.js");
  const leftovers = (tmp: string) => readdirSync(tmp).filter((f) => f.startsWith("ridgeline-coverage-"));

  it("after a check with coverage that succeeds and one that fails", () => {
    const tmp = mkdtempSync(join(root, "tmp-"));
    const studies = mkdtempSync(join(root, "st-"));
    coverageStudy(studies);
    execFileSync(process.execPath, [bin, "check", "--studies-dir", studies], { env: { ...process.env, TMPDIR: tmp }, stdio: "ignore" });
    expect(leftovers(tmp)).toEqual([]);
    // a failure after the coverage folder exists: a coverage site outside the DEM
    writeFileSync(join(studies, "cov", "study.yaml"), TINY_STUDY + COVERAGE("A", "cov", "    thresholds: [-90]\n").replace("radius_km: 0.5", "radius_km: 400").replace("resolution_m: 100", "resolution_m: 1"));
    try {
      execFileSync(process.execPath, [bin, "check", "--studies-dir", studies], { env: { ...process.env, TMPDIR: tmp }, stdio: "ignore" });
    } catch {
      // exit 2 expected
    }
    expect(leftovers(tmp)).toEqual([]);
  }, 60_000);

  it("after a build interrupted by SIGINT", async () => {
    const tmp = mkdtempSync(join(root, "tmp-"));
    const studies = mkdtempSync(join(root, "st-"));
    coverageStudy(studies);
    // a coverage large enough to be interrupted while computing
    writeFileSync(join(studies, "cov", "study.yaml"), TINY_STUDY + COVERAGE().replace("method: hata", "method: delta-bullington").replace("radius_km: 0.5", "radius_km: 60").replace("resolution_m: 100", "resolution_m: 10"));
    const child = spawn(process.execPath, [bin, "check", "--studies-dir", studies], { env: { ...process.env, TMPDIR: tmp }, stdio: "ignore" });
    const t0 = Date.now();
    while (leftovers(tmp).length === 0 && Date.now() - t0 < 30_000) await new Promise((r) => setTimeout(r, 50));
    expect(leftovers(tmp).length).toBe(1);
    child.kill("SIGINT");
    const code = await new Promise<number | null>((r) => child.on("exit", (c, sig) => r(c ?? (sig ? 128 : null))));
    expect(code).not.toBe(0);
    expect(leftovers(tmp)).toEqual([]);
  }, 60_000);
});
