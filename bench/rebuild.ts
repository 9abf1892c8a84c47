// Benchmark: incremental rebuild. On a 200-link study, time the analysis without any cache
// (full: every link computed, the terrain opened and its files hashed — what
// `ridgeline build --no-cache` does before rendering) against the analysis after one link's
// antenna height changed, with a cache filled by an earlier build (one link computed, the
// other 199 read from the cache). Compute only, no rendering; loading study.yaml (YAML parse
// and validation, the same work in both cases and untouched by the cache) is timed apart.
// The two are run alternately, so that a busy machine slows both alike, and the medians are
// reported. bench/run.ts prints the figures.
import { mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { setFlagsFromString } from "node:v8";
import { runInNewContext } from "node:vm";
import { analyzeStudy } from "../src/analysis/analyze-study.ts";
import { fileDigest } from "../src/cache/file-digest.ts";
import { ResultCache } from "../src/cache/result-cache.ts";
import { loadStudy } from "../src/study/load-study.ts";
import { makeBenchStudy } from "./make-study.ts";

export interface RebuildBench {
  /** Analysis of every link without a cache (s), median of the repeats. */
  full_s: number;
  /** The part of full_s spent hashing the two DEM tiles (s): done by a build without a cache for the provenance; a cache remembers it. */
  terrain_digest_s: number;
  /** First analysis into an empty cache (s): full_s plus encoding and writing every entry. */
  cold_s: number;
  /** Analysis after one link's antenna height changed, the other links from the cache (s), median of the repeats. */
  one_link_s: number;
  /** one_link_s / full_s; target ≤ 0.05. */
  ratio: number;
  /** CPU time of full_s and of one_link_s (s), medians: less disturbed than wall time by other work on a busy machine. */
  full_cpu_s: number;
  one_link_cpu_s: number;
  /** one_link_cpu_s / full_cpu_s. */
  ratio_cpu: number;
  /** Loading study.yaml (parse + validation), needed by both (s), median. */
  load_s: number;
  /** (one_link_s + load_s) / (full_s + load_s): the ratio of what `ridgeline build` reports as compute. */
  ratio_with_load: number;
  links: number;
  repeats: number;
  /** Links that came from the cache in the one-link rebuild (links − 1 expected). */
  from_cache: number;
}

const round = (x: number) => Math.round(x * 1000) / 1000;
const median = (xs: number[]): number => {
  const s = [...xs].sort((a, b) => a - b);
  return s.length % 2 ? s[(s.length - 1) / 2] : (s[s.length / 2 - 1] + s[s.length / 2]) / 2;
};
// A full garbage collection before each timed run, so that no run pays for collecting what
// the one before it left (a full build leaves the DEM tiles and 200 profiles behind).
setFlagsFromString("--expose-gc");
const collect = runInNewContext("gc") as () => void;
const seconds = async (f: () => unknown): Promise<number> => (await timed(f)).wall_s;
/** Wall-clock time of a run, and the CPU time of this process in it (every thread: I/O, GC). */
const timed = async (f: () => unknown): Promise<{ wall_s: number; cpu_s: number }> => {
  collect();
  const c0 = process.cpuUsage();
  const t0 = performance.now();
  await f();
  const wall_s = (performance.now() - t0) / 1000;
  const c = process.cpuUsage(c0);
  return { wall_s, cpu_s: (c.user + c.system) / 1e6 };
};

/** Full compute against compute after a one-link change, on the 200-link benchmark study. */
export async function benchRebuild(links = 200, repeats = 9): Promise<RebuildBench> {
  const dir = mkdtempSync(join(tmpdir(), "ridgeline-bench-rebuild-"));
  try {
    const written = Date.now();
    const file = makeBenchStudy(join(dir, "bench"), links);
    const cache = new ResultCache(join(dir, "cache"));
    const load: number[] = [];
    const loaded = () => {
      const t0 = performance.now();
      const s = loadStudy(file);
      load.push((performance.now() - t0) / 1000);
      return s;
    };
    await analyzeStudy(loaded(), { cache: null }); // warm-up (JIT), not counted
    // A file's digest is remembered only once the file is 2 s old (file-digest.ts); DEM tiles
    // in real use are older than that, so wait rather than time a re-hash on every rebuild.
    await new Promise((r) => setTimeout(r, Math.max(0, written + 2100 - Date.now())));
    const cold_s = await seconds(async () => analyzeStudy(loaded(), { cache }));
    const dem = join(dir, "bench", "dem");
    const terrain_digest_s = await seconds(() => readdirSync(dem).forEach((f) => fileDigest(join(dem, f), null)));
    const original = readFileSync(file, "utf8");
    const withHeight = (dh: number): string => {
      const changed = original.replace(/(- id: l000\n\s+from: \{ site: \w+, antenna_m: )(\d+)/, (_m, head: string, h: string) => `${head}${Number(h) + dh}`);
      if (changed === original) throw new Error("bench/rebuild.ts: link l000's antenna height was not found in the study");
      return changed;
    };
    // Warm-up of the rebuild path too (not counted), so both are timed with compiled code, as
    // in `ridgeline serve`; the full path was warmed above and by the cold build.
    for (const dh of [-1, -2]) {
      writeFileSync(file, withHeight(dh));
      await analyzeStudy(loaded(), { cache });
    }
    const full: { wall_s: number; cpu_s: number }[] = [];
    const one: { wall_s: number; cpu_s: number }[] = [];
    let from_cache = 0;
    for (let i = 0; i < repeats; i++) {
      const s = loaded();
      full.push(await timed(() => analyzeStudy(s, { cache: null })));
      writeFileSync(file, withHeight(1 + i)); // a new height each time: l000 is a miss every time
      const c = loaded();
      one.push(
        await timed(async () => {
          from_cache = (await analyzeStudy(c, { cache })).cache.hits;
        }),
      );
      writeFileSync(file, original);
    }
    const full_s = median(full.map((t) => t.wall_s));
    const one_link_s = median(one.map((t) => t.wall_s));
    const full_cpu_s = median(full.map((t) => t.cpu_s));
    const one_link_cpu_s = median(one.map((t) => t.cpu_s));
    const load_s = median(load);
    return {
      full_s: round(full_s),
      terrain_digest_s: round(terrain_digest_s),
      cold_s: round(cold_s),
      one_link_s: round(one_link_s),
      ratio: round(one_link_s / full_s),
      full_cpu_s: round(full_cpu_s),
      one_link_cpu_s: round(one_link_cpu_s),
      ratio_cpu: round(one_link_cpu_s / full_cpu_s),
      load_s: round(load_s),
      ratio_with_load: round((one_link_s + load_s) / (full_s + load_s)),
      links,
      repeats,
      from_cache,
    };
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}
