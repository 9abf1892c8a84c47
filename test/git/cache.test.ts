import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { createHash } from "node:crypto";
import { join, resolve } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { analyzeStudy, type AnalyzedStudy } from "../../src/analysis/analyze-study.ts";
import fc from "fast-check";
import { linkKeyer } from "../../src/cache/cache-keys.ts";
import { canonicalJson } from "../../src/cache/canonical-json.ts";
import { encodeEntry } from "../../src/cache/entry-codec.ts";
import { ResultCache } from "../../src/cache/result-cache.ts";
import { loadStudy } from "../../src/study/load-study.ts";
import { bcProfileCsv, smallStudyYaml, writeSmallStudy, writeSmallTile } from "./small-study.ts";

// Issue 6, acceptance: the cache reports hits and misses, recomputes only what changed, and
// invalidates when a terrain file changes. Results with the cache must equal results without.

let root: string;
let dir: string;
let cache: ResultCache;
const analyze = (withCache = true) => analyzeStudy(loadStudy(join(dir, "study.yaml")), { cache: withCache ? cache : null });
const figures = (a: AnalyzedStudy) => [...a.figures].map(([id, f]) => [id, Array.from(f.profile.d_m), Array.from(f.profile.terrain_m), Array.from(f.profile.obstruction_m), f.ks]);

beforeAll(() => {
  root = mkdtempSync(join(tmpdir(), "ridgeline-cache-"));
  dir = writeSmallStudy(root);
  cache = new ResultCache(join(root, "cache"));
});
afterAll(() => rmSync(root, { recursive: true, force: true }));

describe("canonical JSON of key parts", () => {
  it("writes sorted keys, non-finite numbers as strings, and leaves out undefined members", () => {
    expect(canonicalJson({ z: [1, -0.5, Infinity, NaN], a: { y: "″", x: undefined, b: null }, k: Float64Array.of(2, 0.1) })).toBe('{"a":{"b":null,"y":"″"},"k":[2,0.1],"z":[1,-0.5,"Infinity","NaN"]}');
  });

  it("gives the same text whatever order the keys were written in (property)", () => {
    fc.assert(
      fc.property(fc.dictionary(fc.string(), fc.jsonValue()), (o) => {
        const reversed = Object.fromEntries(Object.entries(o).reverse());
        expect(canonicalJson(reversed)).toBe(canonicalJson(o));
        expect(JSON.parse(canonicalJson(o))).toEqual(JSON.parse(JSON.stringify(o)));
      }),
    );
  });
});

describe("link keys", () => {
  it("do not depend on the order keys are written in study.yaml, and change with a link's antenna height", () => {
    const base = readFileSync(join(dir, "study.yaml"), "utf8");
    const m = /\n(\s+)from: \{ ([^}]+) \}\n\s+to: \{ ([^}]+) \}/.exec(base);
    expect(m, "the small study writes link ends as flow mappings").not.toBeNull();
    const [whole, indent, from, to] = m!;
    const reverse = (fields: string) => fields.split(", ").reverse().join(", ");
    const reordered = base.replace(whole, `\n${indent}to: { ${reverse(to)} }\n${indent}from: { ${reverse(from)} }`);
    expect(reordered).not.toBe(base);
    const keysOf = (yaml: string, name: string) => {
      const d = writeSmallStudy(root, `keys-${name}`);
      writeFileSync(join(d, "study.yaml"), yaml);
      const s = loadStudy(join(d, "study.yaml"));
      const keyOf = linkKeyer(s, "terrain");
      return s.links.map((l) => keyOf(l, null));
    };
    const a = keysOf(base, "a");
    expect(keysOf(reordered, "b")).toEqual(a);
    const taller = base.replace(/antenna_m: (\d+)/, (_x, h: string) => `antenna_m: ${Number(h) + 1}`);
    const c = keysOf(taller, "c");
    expect(c[0]).not.toBe(a[0]);
    expect(c.slice(1)).toEqual(a.slice(1));
  });
});

describe("content-addressed link cache", () => {
  it("misses everything on an empty cache, then hits everything, with identical results", async () => {
    const plain = await analyze(false);
    const cold = await analyze();
    expect(cold.cache).toMatchObject({ hits: 0, misses: 3 });
    const warm = await analyze();
    expect(warm.cache).toMatchObject({ hits: 3, misses: 0 });
    expect(warm.terrain).toBeNull(); // a full hit never opens the terrain
    for (const a of [cold, warm]) {
      expect(JSON.stringify(a.result)).toBe(JSON.stringify(plain.result));
      expect(figures(a)).toEqual(figures(plain));
    }
    expect(warm.figures.get("a-b")!.profile.d_m).toBeInstanceOf(Float64Array);
  });

  it("recomputes only the link whose antenna height changed, without opening the terrain", async () => {
    writeFileSync(join(dir, "study.yaml"), smallStudyYaml({ antennaAB: 25 }));
    const a = await analyze();
    expect(a.cache).toMatchObject({ hits: 2, misses: 1 });
    // The path did not move: its terrain samples came from the cache too.
    expect(a.terrain).toBeNull();
    const plain = await analyze(false);
    expect(JSON.stringify(a.result)).toBe(JSON.stringify(plain.result));
    expect(a.result.links.find((l) => l.id === "a-b")!.ends.from.antenna_m).toBe(25);
  });

  it("recomputes only the link whose surveyed profile CSV changed", async () => {
    writeFileSync(join(dir, "b-c.csv"), bcProfileCsv(25));
    const a = await analyze();
    expect(a.cache).toMatchObject({ hits: 2, misses: 1 });
    const plain = await analyze(false);
    expect(JSON.stringify(a.result)).toBe(JSON.stringify(plain.result));
  });

  it("recomputes the terrain-sampled links when the terrain file changes", async () => {
    const before = await analyze();
    expect(before.cache.hits).toBe(3);
    const sha = before.result.provenance.inputs_sha256;
    writeSmallTile(dir, 2); // same size, a ridge twice as high
    const after = await analyze();
    // a-b and a-c sample the DEM; b-c uses its surveyed profile, which did not change.
    expect(after.cache).toMatchObject({ hits: 1, misses: 2 });
    expect(after.result.provenance.inputs_sha256).not.toBe(sha);
    const fm = (x: AnalyzedStudy) => x.result.links.find((l) => l.id === "a-b")!.fade_margin_db!;
    expect(fm(after)).toBeLessThan(fm(before) - 1); // a higher ridge costs the obstructed link
    const plain = await analyze(false);
    expect(JSON.stringify(after.result)).toBe(JSON.stringify(plain.result));
  });

  it("remembers a value computed from the terrain, so a later build need not open it", async () => {
    const calls: string[] = [];
    const ridgeTop = async (a: AnalyzedStudy) =>
      a.remember("ridge-top", { lon_deg: -32.5 }, [import.meta.url], (t) => {
        calls.push(t.description);
        return { h_m: Float64Array.from([-41.6, -41.5, -41.4], (lat) => t.elevation(lat, -32.5)) };
      });
    const first = await analyze();
    const v1 = await ridgeTop(first);
    expect(calls).toHaveLength(1);
    const second = await analyze();
    const v2 = await ridgeTop(second);
    expect(calls).toHaveLength(1);
    expect(second.terrain).toBeNull();
    expect(Array.from(v2.h_m)).toEqual(Array.from(v1.h_m));
    expect(v1.h_m[1]).toBeCloseTo(100 + 2 * 60, 6); // the doubled ridge of the previous test, on its crest
    await ridgeTop(await analyze(false)); // without a cache: computed every time
    expect(calls).toHaveLength(2);
  });

  it("treats a corrupt entry as a miss and rewrites it", async () => {
    const c = new ResultCache(join(root, "cache2"));
    const s = loadStudy(join(dir, "study.yaml"));
    await analyzeStudy(s, { cache: c });
    const { readdirSync } = await import("node:fs");
    const linkDir = join(c.dir, "link");
    const packDir = join(c.dir, "pack");
    for (const d of [linkDir, packDir]) for (const sub of readdirSync(d)) for (const f of readdirSync(join(d, sub))) writeFileSync(join(d, sub, f), readFileSync(join(d, sub, f)).subarray(0, 40));
    const again = await analyzeStudy(s, { cache: c });
    expect(again.cache).toMatchObject({ hits: 0, misses: 3 });
    expect((await analyzeStudy(s, { cache: c })).cache).toMatchObject({ hits: 3, misses: 0 });
  });

  it("reads a rebuild's unchanged links from the study's packs, and the changed one on its own", async () => {
    const c = new ResultCache(join(root, "cache3"));
    const load = () => loadStudy(join(dir, "study.yaml"));
    writeFileSync(join(dir, "study.yaml"), smallStudyYaml({ antennaAB: 31 }));
    await analyzeStudy(load(), { cache: c });
    const { readdirSync } = await import("node:fs");
    const entries = (kind: string) => readdirSync(join(c.dir, kind), { recursive: true }).filter((f) => String(f).endsWith(".bin")).map((f) => join(c.dir, kind, String(f)));
    const packBytes = () => Buffer.concat(entries("pack").sort().map((f) => readFileSync(f)));
    expect(entries("pack")).toHaveLength(2); // results, and figure data
    // With the single entries gone, every link still comes from the packs.
    for (const f of [...entries("link"), ...entries("link-figure")]) rmSync(f);
    const packed = await analyzeStudy(load(), { cache: c });
    expect(packed.cache).toMatchObject({ hits: 3, misses: 0 });
    // One link changed: computed and stored on its own; the packs (1 of 3 links not in them) are rewritten.
    writeFileSync(join(dir, "study.yaml"), smallStudyYaml({ antennaAB: 32 }));
    const before = packBytes();
    const changed = await analyzeStudy(load(), { cache: c });
    expect(changed.cache).toMatchObject({ hits: 2, misses: 1 });
    expect(entries("link")).toHaveLength(1);
    expect(entries("link-figure")).toHaveLength(1);
    expect(packBytes().equals(before)).toBe(false);
    for (const f of [...entries("link"), ...entries("link-figure")]) rmSync(f);
    const again = await analyzeStudy(load(), { cache: c });
    expect(again.cache).toMatchObject({ hits: 3, misses: 0 });
    const plain = await analyzeStudy(load(), { cache: null });
    expect(JSON.stringify(again.result)).toBe(JSON.stringify(plain.result));
    expect(figures(again)).toEqual(figures(plain));
  });

  it("reads a pack's keys from its index alone, and none from a pack whose index length is damaged", () => {
    const c = new ResultCache(join(root, "cache5"));
    const name = "ab".repeat(32);
    c.writePack(name, [["k1", encodeEntry({ a: 1 })], ["k2", encodeEntry({ b: 2 })]]);
    expect([...c.readPackKeys(name)]).toEqual(["k1", "k2"]);
    expect(c.readPackKeys("cd".repeat(32)).size).toBe(0); // no such pack
    const file = join(c.dir, "pack", "ab", `${name}.bin`);
    const bytes = readFileSync(file);
    bytes.writeUInt32LE(0xfffffff0, 8); // an index "4 GB long"
    writeFileSync(file, bytes);
    expect(c.readPackKeys(name).size).toBe(0);
  });

  it("reads a cached link's figure data only when a figure is drawn, and computes links again whose figure data is gone", async () => {
    const c = new ResultCache(join(root, "cache4"));
    const file = join(dir, "study.yaml");
    const load = () => loadStudy(file);
    writeFileSync(file, smallStudyYaml({ antennaAB: 33 }));
    const plain = await analyzeStudy(load(), { cache: null });
    await analyzeStudy(load(), { cache: c });
    const { readdirSync } = await import("node:fs");
    const singles = () => readdirSync(join(c.dir, "link-figure"), { recursive: true }).filter((f) => String(f).endsWith(".bin")).map((f) => join(c.dir, "link-figure", String(f)));
    // the study's figure pack, named as analyze-study.ts names it
    const name = createHash("sha256").update(`study-pack-v2\0figures\0${resolve(file)}`).digest("hex");
    const figurePack = join(c.dir, "pack", name.slice(0, 2), `${name}.bin`);
    expect(singles()).toHaveLength(3);
    expect(readFileSync(figurePack).length).toBeGreaterThan(0);
    // Damage all stored figure data after the analysis: the analysis did not read it; drawing
    // does, and says so.
    const warm = await analyzeStudy(load(), { cache: c });
    expect(warm.cache).toMatchObject({ hits: 3, misses: 0 });
    for (const f of [...singles(), figurePack]) writeFileSync(f, "not an entry");
    expect(() => warm.figures.get("a-b")).toThrow(/figure data of link a-b is gone or cannot be read: build again/);
    // With the figure data gone from the cache, the links are computed again, with the same results.
    for (const f of [...singles(), figurePack]) rmSync(f);
    const again = await analyzeStudy(load(), { cache: c });
    expect(again.cache).toMatchObject({ hits: 0, misses: 3 });
    expect(JSON.stringify(again.result)).toBe(JSON.stringify(plain.result));
    expect(figures(again)).toEqual(figures(plain));
  });
});
