// Benchmark: incremental rebuild. Compute a 200-link study without the cache (full), fill the
// cache, change one link's antenna height, and compute again with the cache (one link).
// Compute only, no rendering; loading study.yaml (YAML parse and validation, the same work in
// both cases and untouched by the cache) is timed apart. bench/run.ts prints the figures.
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { analyzeStudy } from "../src/analysis/analyze-study.ts";
import { ResultCache } from "../src/cache/result-cache.ts";
import { loadStudy } from "../src/study/load-study.ts";
import { makeBenchStudy } from "./make-study.ts";

export interface RebuildBench {
  /** Analysis of every link without the cache (s), best of the repeats. */
  full_s: number;
  /** Analysis after one link's antenna height changed, the other links from the cache (s), best of the repeats. */
  one_link_s: number;
  /** one_link_s / full_s; target ≤ 0.05. */
  ratio: number;
  /** Loading study.yaml (parse + validation), needed by both (s). */
  load_s: number;
  /** (one_link_s + load_s) / (full_s + load_s): the ratio of what `ridgeline build` reports as compute. */
  ratio_with_load: number;
  links: number;
  /** Links that came from the cache in the one-link rebuild (links − 1 expected). */
  from_cache: number;
}

const round = (x: number) => Math.round(x * 1000) / 1000;

/** Full compute against compute after a one-link change, on the 200-link benchmark study. */
export async function benchRebuild(links = 200, repeats = 5): Promise<RebuildBench> {
  const dir = mkdtempSync(join(tmpdir(), "ridgeline-bench-rebuild-"));
  try {
    const file = makeBenchStudy(join(dir, "bench"), links);
    const cache = new ResultCache(join(dir, "cache"));
    const load: number[] = [];
    const loaded = () => {
      const t0 = performance.now();
      const s = loadStudy(file);
      load.push((performance.now() - t0) / 1000);
      return s;
    };
    const full: number[] = [];
    for (let i = 0; i < repeats; i++) {
      const s = loaded();
      const t0 = performance.now();
      await analyzeStudy(s, { cache: null });
      full.push((performance.now() - t0) / 1000);
    }
    await analyzeStudy(loaded(), { cache }); // fill the cache
    const original = readFileSync(file, "utf8");
    const one: number[] = [];
    let from_cache = 0;
    for (let i = 0; i < repeats; i++) {
      // A new height each time, so the changed link is a miss every time.
      const changed = original.replace(/(- id: l000\n\s+from: \{ site: \w+, antenna_m: )(\d+)/, (_m, head: string, h: string) => `${head}${Number(h) + 1 + i}`);
      if (changed === original) throw new Error("bench/rebuild.ts: link l000's antenna height was not found in the study");
      writeFileSync(file, changed);
      const s = loaded();
      const t0 = performance.now();
      const r = await analyzeStudy(s, { cache });
      one.push((performance.now() - t0) / 1000);
      from_cache = r.cache.hits;
    }
    const full_s = Math.min(...full);
    const one_link_s = Math.min(...one);
    const load_s = Math.min(...load);
    return { full_s: round(full_s), one_link_s: round(one_link_s), ratio: round(one_link_s / full_s), load_s: round(load_s), ratio_with_load: round((one_link_s + load_s) / (full_s + load_s)), links, from_cache };
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}
