import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { analyzeStudy } from "../../src/analysis/analyze-study.ts";
import type { StudyResult } from "../../src/analysis/results.ts";
import { linksCsv, networkGeoJson, networkKml, sitesCsv } from "../../src/site/exchange-files.ts";
import { importNetwork } from "../../src/study/import-network.ts";
import { loadStudy } from "../../src/study/load-study.ts";
import { PROJECT_ROOT, runCli } from "../helpers/run-cli.ts";
import { loadCoverageOutputStage } from "../../src/render/coverage-output-loader.ts";

// Files in and out (issue 18 §8): the demo's sites and links exported as CSV, imported into a
// new study with `ridgeline import`, analysed again: the same link results, number for number.

const DEMO = join(PROJECT_ROOT, "content/studies/kestrel-vale/study.yaml");
let work: string;
let demo: StudyResult;

beforeAll(async () => {
  work = mkdtempSync(join(tmpdir(), "ridgeline-exchange-"));
  demo = (await analyzeStudy(loadStudy(DEMO), { coverageOutputs: loadCoverageOutputStage })).result;
}, 120_000);
afterAll(() => rmSync(work, { recursive: true, force: true }));

describe("export → import → analyse", () => {
  it("gives the same link results as the demo", async () => {
    writeFileSync(join(work, "sites.csv"), sitesCsv(demo));
    writeFileSync(join(work, "links.csv"), linksCsv(demo));
    const r = runCli(["import", join(work, "sites.csv"), join(work, "links.csv"), "--study", "round-trip", "--like", DEMO, "--studies-dir", join(work, "studies")]);
    expect(r.status, r.stderr).toBe(0);
    const text = readFileSync(join(work, "studies/round-trip/study.yaml"), "utf8");
    expect(text).toMatch(/# Links imported by `ridgeline import` from sites\.csv, links\.csv/);
    const again = (await analyzeStudy(loadStudy(join(work, "studies/round-trip/study.yaml")), { coverageOutputs: loadCoverageOutputStage })).result;
    expect(again.links.map((l) => l.id)).toEqual(demo.links.map((l) => l.id));
    for (const [i, l] of again.links.entries()) expect(l, l.id).toEqual(demo.links[i]);
  }, 120_000);

  it("links.csv carries each link's frequency plan (go_mhz, return_mhz, bandwidth_mhz, polarisations) without --like", () => {
    const net = importNetwork([{ file: "sites.csv", text: sitesCsv(demo) }, { file: "links.csv", text: linksCsv(demo) }]);
    const study = loadStudy(DEMO);
    const plan = (p: { go_mhz: number; return_mhz: number; bandwidth_mhz: number; go_polarization?: string; return_polarization?: string } | undefined, pol: string) =>
      p && { go_mhz: p.go_mhz, return_mhz: p.return_mhz, bandwidth_mhz: p.bandwidth_mhz, go: p.go_polarization ?? pol, ret: p.return_polarization ?? pol };
    expect(study.links.some((l) => l.frequency_plan)).toBe(true);
    expect(net.links.map((l) => plan(l.frequency_plan, l.polarization))).toEqual(study.links.map((l) => plan(l.frequency_plan, l.polarization)));
  });

  it("a row with only part of the frequency plan is an error naming the missing column", () => {
    expect(() => importNetwork([{ file: "l.csv", text: "id,from_site,to_site,frequency_ghz,tx_power_dbm,rx_threshold_dbm,from_antenna_m,from_gain_dbi,to_antenna_m,to_gain_dbi,go_mhz,return_mhz\nx,A,B,18,20,-70,10,30,10,30,18000,19000\n" }])).toThrow(/bandwidth_mhz/);
  });

  it("reads the exported GeoJSON and KML points back as the same sites", () => {
    for (const [file, text] of [["network.geojson", networkGeoJson(demo)], ["network.kml", networkKml(demo)]]) {
      const net = importNetwork([{ file, text }]);
      expect(net.sites.map((s) => [s.id, s.name, s.lat_deg, s.lon_deg, s.ground_m]), file).toEqual(demo.sites.map((s) => [s.id, s.name, s.lat_deg, s.lon_deg, s.ground_m]));
    }
  });

  it("links.csv lists every link with its verdict; GeoJSON marks the rejected one", () => {
    const rows = linksCsv(demo).trim().split("\n");
    expect(rows).toHaveLength(demo.links.length + 1);
    const geo = JSON.parse(networkGeoJson(demo));
    expect(geo.features.find((f: { id: string }) => f.id === "mill-aldr").properties.verdict).toBe("rejected");
    expect(networkKml(demo)).toMatch(/<styleUrl>#link-rejected<\/styleUrl>/);
  });

  it("bad input names the file, line, column, value and fix; exit 2", () => {
    const bad = join(work, "bad-sites.csv");
    writeFileSync(bad, "id,name,lat_deg,lon_deg\nA,Alpha,-41.0,-32.2\nB,Bravo,north,-32.3\n");
    const r = runCli(["import", bad, "--study", "bad", "--studies-dir", join(work, "studies")]);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/bad-sites\.csv/);
    expect(r.stderr).toMatch(/bad-sites\.csv:3 /);
    expect(r.stderr).toMatch(/lat_deg/);
    expect(r.stderr).toMatch(/"north"/);
    expect(r.stderr).not.toMatch(/\n\s+at /);
  });
});

describe("ridgeline new", () => {
  it("scaffolds a commented study that loads, and never overwrites", () => {
    const dir = join(work, "new-studies");
    const r = runCli(["new", "my-net", "--studies-dir", dir, "--date", "2026-12-04"]);
    expect(r.status, r.stderr).toBe(0);
    const text = readFileSync(join(dir, "my-net/study.yaml"), "utf8");
    expect(text.match(/^\s*#/gm)!.length).toBeGreaterThan(10);
    const study = loadStudy(join(dir, "my-net/study.yaml"));
    expect(study.links).toHaveLength(1);
    expect(study.document?.revisions[0].date).toBe("2026-12-04");
    const again = runCli(["new", "my-net", "--studies-dir", dir]);
    expect(again.status).toBe(2);
    expect(again.stderr).toMatch(/already exists/);
  });
});
