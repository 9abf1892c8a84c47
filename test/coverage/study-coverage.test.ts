import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { geoArea } from "d3-geo";
import sharp from "sharp";
import { parse as parseYaml } from "yaml";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { analyzeStudyCoverage } from "../../src/coverage/analyze-coverage.ts";
import { fieldStrengthDbuvM, isotropicPowerDbm } from "../../src/coverage/field-strength.ts";
import { loadStudy } from "../../src/study/load-study.ts";
import { studySchema } from "../../src/study/schema.ts";
import type { Study } from "../../src/study/study.ts";
import { openGeoTiff } from "../../src/terrain/geotiff.ts";
import { expectClose } from "../helpers/expect-close.ts";
import { studyHead } from "../helpers/tiny-study.ts";
import { cellLatLon, roughTerrain, writeUtmDem } from "./coverage-fixtures.ts";
import { coverageOutputStage } from "../../src/render/coverage-outputs.ts";

// A study with three coverages (delta-Bullington with a sector antenna, Hata, visibility) on
// one GeoTIFF: files written, areas consistent between raster, GeoJSON and the table, the
// antenna pattern applied, and the multi-site composite (strongest level, best server).

let dir: string;
let out: string;
let study: Study;
let run: Awaited<ReturnType<typeof analyzeStudyCoverage>>;
const N = 301;

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), "ridgeline-study-coverage-"));
  out = join(dir, "out");
  const f = roughTerrain(11);
  const dem = writeUtmDem(join(dir, "dem.tif"), N, 30, (c, r) => f(c / (N - 1), r / (N - 1)));
  const [aLat, aLon] = cellLatLon(dem, 100, 150);
  const [bLat, bLon] = cellLatLon(dem, 210, 140);
  const yaml = `${studyHead("Coverage study", "file: dem.tif", "Test", "Test")}sites:
  - { id: A, name: Alpha, lat_deg: ${aLat}, lon_deg: ${aLon} }
  - { id: B, name: Bravo, lat_deg: ${bLat}, lon_deg: ${bLon} }
coverage:
  - id: alpha-db
    site: A
    method: delta-bullington
    frequency_ghz: 0.8
    antenna_m: 25
    gain_dbi: 15
    tx_power_dbm: 43
    pattern:
      azimuth_deg: 90
      horizontal: [[0, 0], [30, 3], [60, 10], [90, 20], [180, 25], [270, 20], [300, 10], [330, 3], [360, 0]]
    radius_km: 3.5
    thresholds: [-95, -85, -75]
  - id: bravo-hata
    site: B
    method: hata
    frequency_ghz: 0.8
    antenna_m: 35
    tx_power_dbm: 40
    radius_km: 3
    thresholds: [40, 50]
    threshold_unit: dBuV/m
  - id: alpha-los
    site: A
    method: visibility
    frequency_ghz: 0.8
    antenna_m: 25
    radius_km: 3.5
`;
  writeFileSync(join(dir, "study.yaml"), yaml);
  study = loadStudy(join(dir, "study.yaml"));
  study.coverage = studySchema.parse(parseYaml(yaml)).coverage;
  const terrain = await openGeoTiff(join(dir, "dem.tif"));
  run = await analyzeStudyCoverage(study, terrain, { outDir: out, outputs: coverageOutputStage, workers: 2 });
});

afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe("study coverage", () => {
  it("computes every entry and the composite of the two level coverages", () => {
    expect(run.results.map((r) => r.id)).toEqual(["alpha-db", "bravo-hata", "alpha-los", "composite"]);
    expect(JSON.stringify(run.results)).not.toMatch(/NaN|Infinity/);
  });

  it("writes GeoTIFF, overlay and map PNGs, GeoJSON and KML for each", async () => {
    for (const r of run.results) {
      for (const f of Object.values(r.files)) expect(existsSync(join(out, f)), f).toBe(true);
      const meta = await sharp(join(out, r.files.map_png)).metadata();
      expect(meta.width).toBeGreaterThan(100);
      const kml = readFileSync(join(out, r.files.kml), "utf8");
      expect(kml).toMatch(/^<\?xml version="1\.0" encoding="UTF-8"\?>\n<kml xmlns="http:\/\/www\.opengis\.net\/kml\/2\.2">/);
      expect((kml.match(/<Placemark>/g) ?? []).length).toBe(r.thresholds.length + r.sites.length);
    }
    expect(existsSync(join(out, "composite-best-server.tif"))).toBe(true);
  });

  it("the GeoJSON regions cover the same area as the raster table (within 3 %)", () => {
    for (const r of run.results.filter((x) => x.id !== "composite")) {
      const gj = JSON.parse(readFileSync(join(out, r.files.geojson), "utf8"));
      expect(gj.features.length).toBe(r.thresholds.length);
      gj.features.forEach((feat: any, i: number) => {
        const km2 = geoArea(feat) * 6371.0088 ** 2; // spherical area, mean Earth radius
        const table = r.thresholds[i].area_km2;
        if (table > 0.5) expectClose(km2, table, { rel: 0.03 }, { coverage: r.id, threshold: r.thresholds[i].label });
      });
    }
  });

  it("the sector antenna (boresight 90°, 20–25 dB behind) makes east stronger than west", () => {
    const c = run.items[0].computed;
    const g = c.grid;
    const row = Math.round(g.site_row);
    const col = Math.round(g.site_col);
    let east = 0;
    let west = 0;
    for (let k = 20; k <= 60; k += 10) {
      east += c.values[row * g.width + col + k];
      west += c.values[row * g.width + col - k];
    }
    expect((east - west) / 5).toBeGreaterThan(15);
  });

  it("dBµV/m thresholds are converted at the coverage's frequency and reported in both units", () => {
    const t = run.results[1].thresholds;
    expectClose(t[0].field_dbuv_m!, 40, { abs: 1e-9 }, "field strength back");
    expectClose(t[0].level_dbm!, isotropicPowerDbm(40, 0.8), { abs: 1e-9 }, "level");
  });

  it("composite: strongest level of the two and the index of the site that gives it", () => {
    const comp = run.results[3];
    expect(comp.sites).toEqual(["A", "B"]);
    const a = run.items[0].computed;
    const b = run.items[1].computed;
    expect(comp.best_server!.map((s) => s.coverage)).toEqual(["alpha-db", "bravo-hata"]);
    // the composite covers at least what each covers
    for (const [i, item] of [a, b].entries()) {
      expect(comp.thresholds[0].area_km2).toBeGreaterThanOrEqual(0);
      expect(comp.area_km2).toBeGreaterThanOrEqual(item.tally.area_m2 / 1e6 - 1e-9);
      expect(comp.best_server![i].area_km2).toBeGreaterThan(0);
    }
    // each cell takes the stronger level (of the float32 rasters): the composite's highest is
    // the higher of the two highest, its lowest no lower than the lower of the two lowest
    expect(comp.level_max_dbm).toBe(Math.fround(Math.max(a.tally.max, b.tally.max)));
    expect(comp.level_min_dbm).toBeGreaterThanOrEqual(Math.fround(Math.min(a.tally.min, b.tally.min)));
    expect(comp.level_min_dbm).toBeLessThan(comp.level_max_dbm!);
  });
});

describe("field strength and received power (isotropic antenna)", () => {
  // P.525-4 §2 form, from memory: Pr(dBW) = E(dBµV/m) − 20·log10 f(GHz) − 167.2
  it.each([
    [40, 0.8],
    [60, 0.1],
    [20, 11],
  ])("E = %d dBµV/m at %d GHz", (e, f) => {
    expectClose(isotropicPowerDbm(e, f), e - 20 * Math.log10(f) - 167.2 + 30, { abs: 0.02 }, { e, f });
    expectClose(fieldStrengthDbuvM(isotropicPowerDbm(e, f), f), e, { abs: 1e-12 }, "round trip");
  });
});
