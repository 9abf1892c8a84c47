// Benchmark: the interference matrix of the 200-link study (every transmitter into every
// receiver within its adjacent-channel range; ITU-R P.452-18 at 20 % and at each link's
// outage budget), without a cache: first run and best of three, after the links are analysed.
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { analyzeStudy, openStudyTerrain, terrainSpecOf } from "../src/analysis/analyze-study.ts";
import { analyzeInterference } from "../src/analysis/interference.ts";
import { loadStudy } from "../src/study/load-study.ts";
import { makeBenchStudy } from "./make-study.ts";

export async function benchInterference(): Promise<Record<string, number | string>> {
  const dir = mkdtempSync(join(tmpdir(), "ridgeline-bench-ifx-"));
  try {
    const file = makeBenchStudy(join(dir, "bench-200"), 200, { interference: true });
    const study = loadStudy(file);
    const withoutMatrix = { ...study, interference: undefined };
    const { result } = await analyzeStudy(withoutMatrix, { cache: null });
    const times: number[] = [];
    let last: Awaited<ReturnType<typeof analyzeInterference>> | null = null;
    for (let i = 0; i < 3; i++) {
      const t0 = performance.now();
      const terrain = openStudyTerrain(study); // opened inside the timing, as a build would
      last = await analyzeInterference(study, result.links, { sites: result.sites, openTerrain: () => terrain, cache: null, terrainKey: JSON.stringify(terrainSpecOf(study)) });
      times.push((performance.now() - t0) / 1000);
    }
    return {
      links: 200,
      receivers: last!.receivers_total,
      pairs_in_frequency_range: last!.paths.in_frequency_range,
      paths_computed: last!.paths.computed,
      pairs_below_bound: last!.paths.below_bound,
      matrix_first_s: round(times[0]),
      matrix_best_s: round(Math.min(...times)),
    };
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

const round = (x: number) => Math.round(x * 1000) / 1000;
