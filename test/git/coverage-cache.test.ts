import { mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, afterEach, beforeAll, describe, expect, it } from "vitest";
import { analyzeStudy, type AnalyzedStudy } from "../../src/analysis/analyze-study.ts";
import { ResultCache } from "../../src/cache/result-cache.ts";
import { buildSummary, type BuildReport } from "../../src/cli/commands/build.ts";
import { loadStudy } from "../../src/study/load-study.ts";
import { smallStudyYaml, writeSmallStudy, writeSmallTile } from "./small-study.ts";
import { loadCoverageOutputStage } from "../../src/render/coverage-output-loader.ts";

// Issue 6, acceptance for coverage maps: a content-addressed cache of per-coverage results,
// keyed by everything they depend on. The checks are the project's own invariants (common
// practice for build caches, not an outside reference): a rebuild of an unchanged study reads
// every map from the cache without opening the terrain; a changed entry recomputes only that
// map (and the composite when it is a level map); changed terrain bytes recompute every map;
// and the results, page SVGs and every output file are byte-identical with and without the cache.

/** The small study (3″ tile, three links) with two level coverages and one line-of-sight map. */
const yaml = (o: { radiusA?: number; radiusC?: number } = {}) => `${smallStudyYaml()}coverage:
  - { id: a-db, site: A, method: delta-bullington, frequency_ghz: 0.9, antenna_m: 30, tx_power_dbm: 40, radius_km: ${o.radiusA ?? 2}, thresholds: [-90, -80, -70] }
  - { id: b-hata, site: B, method: hata, frequency_ghz: 0.9, antenna_m: 30, tx_power_dbm: 40, radius_km: 2, thresholds: [40, 50], threshold_unit: dBuV/m }
  - { id: c-los, site: C, method: visibility, frequency_ghz: 0.9, antenna_m: 20, radius_km: ${o.radiusC ?? 2} }
`;

let root: string;
let dir: string;
let cache: ResultCache;
const made: AnalyzedStudy[] = [];
const analyze = async (withCache = true, c: ResultCache = cache) => {
  const a = await analyzeStudy(loadStudy(join(dir, "study.yaml")), { cache: withCache ? c : null, coverageOutputs: loadCoverageOutputStage });
  made.push(a);
  return a;
};
/** Names and bytes of every file in a study's coverage folder. */
const files = (a: AnalyzedStudy) => readdirSync(a.coverage!.dir).sort().map((f) => [f, readFileSync(join(a.coverage!.dir, f))] as const);
const coverageEntries = (c: ResultCache) => readdirSync(join(c.dir, "coverage"), { recursive: true }).filter((f) => String(f).endsWith(".bin")).map((f) => join(c.dir, "coverage", String(f)));

/** Everything a build writes for the study's coverage is the same bytes as a build without the cache. */
function expectSameAsPlain(a: AnalyzedStudy, plain: AnalyzedStudy): void {
  expect(JSON.stringify(a.result)).toBe(JSON.stringify(plain.result));
  expect(a.coverage!.maps).toEqual(plain.coverage!.maps);
  const [x, y] = [files(a), files(plain)];
  expect(x.map(([f]) => f)).toEqual(y.map(([f]) => f));
  const differing = x.filter(([, b], i) => !b.equals(y[i][1])).map(([f]) => f);
  expect(differing).toEqual([]);
}

beforeAll(() => {
  root = mkdtempSync(join(tmpdir(), "ridgeline-coverage-cache-"));
  dir = writeSmallStudy(root);
  writeFileSync(join(dir, "study.yaml"), yaml());
  cache = new ResultCache(join(root, "cache"));
});
afterEach(() => {
  for (const a of made.splice(0)) if (a.coverage) rmSync(a.coverage.dir, { recursive: true, force: true });
});
afterAll(() => rmSync(root, { recursive: true, force: true }));

describe("content-addressed coverage cache", () => {
  it("misses every map on an empty cache, then reads every map from it without opening the terrain", async () => {
    const plain = await analyze(false);
    expect(plain.result.coverage.map((c) => c.id)).toEqual(["a-db", "b-hata", "c-los", "composite"]);
    const cold = await analyze();
    expect(cold.cache.coverage).toEqual({ hits: 0, misses: 4 }); // three entries and the composite
    const warm = await analyze();
    expect(warm.cache).toEqual({ hits: 3, misses: 0, coverage: { hits: 4, misses: 0 } });
    expect(warm.terrain).toBeNull();
    expect(files(warm).map(([f]) => f)).toContain("composite-best-server.tif");
    expectSameAsPlain(cold, plain);
    expectSameAsPlain(warm, plain);
  });

  it("recomputes only the level coverage whose radius changed, and the composite", async () => {
    const before = coverageEntries(cache).length;
    writeFileSync(join(dir, "study.yaml"), yaml({ radiusA: 2.5 }));
    const a = await analyze();
    expect(a.cache.coverage).toEqual({ hits: 2, misses: 2 });
    expect(coverageEntries(cache).length).toBe(before + 2); // a new a-db entry and a new composite
    expect(a.result.coverage.find((c) => c.id === "a-db")!.radius_m).toBe(2500);
    expectSameAsPlain(a, await analyze(false));
  });

  it("recomputes only the line-of-sight map whose radius changed, not the composite", async () => {
    writeFileSync(join(dir, "study.yaml"), yaml({ radiusA: 2.5, radiusC: 1.5 }));
    const a = await analyze();
    expect(a.cache.coverage).toEqual({ hits: 3, misses: 1 });
    expectSameAsPlain(a, await analyze(false));
  });

  it("recomputes every map when the terrain file's bytes change", async () => {
    writeSmallTile(dir, 2); // same size, a ridge twice as high
    const a = await analyze();
    expect(a.cache.coverage).toEqual({ hits: 0, misses: 4 });
    expectSameAsPlain(a, await analyze(false));
  });

  it("treats a corrupt coverage entry as a miss and rewrites it", async () => {
    const c = new ResultCache(join(root, "cache2"));
    await analyze(true, c);
    for (const f of coverageEntries(c)) writeFileSync(f, readFileSync(f).subarray(0, 40));
    const again = await analyze(true, c);
    expect(again.cache.coverage).toEqual({ hits: 0, misses: 4 });
    const warm = await analyze(true, c);
    expect(warm.cache.coverage).toEqual({ hits: 4, misses: 0 });
    expectSameAsPlain(warm, await analyze(false));
  });

  it("counts no coverage maps for a study without coverage", async () => {
    writeFileSync(join(dir, "study.yaml"), smallStudyYaml());
    const a = await analyze();
    expect(a.cache.coverage).toEqual({ hits: 0, misses: 0 });
    expect(a.coverage).toBeNull();
  });
});

describe("build summary line", () => {
  const report = (maps: number, fromCache: number): BuildReport => ({ outDir: "_site", studies: [], links: 3, fromCache: 2, coverageMaps: maps, coverageFromCache: fromCache, cacheUsed: true, compute_s: 1, render_s: 2 });

  it("says how many coverage maps came from the cache beside the links", () => {
    expect(buildSummary(report(4, 3))).toContain("(2 of 3 links from cache, 3 of 4 coverage maps from cache;");
  });

  it("leaves coverage out when no study has coverage maps", () => {
    expect(buildSummary(report(0, 0))).toContain("(2 of 3 links from cache;");
  });
});
