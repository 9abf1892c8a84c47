// Benchmark: the coverage check along radials (src/coverage/coverage-wave-check.ts) on the demo
// study's level coverages (two P.1812 coverages at 458.5 MHz, 26 and 15 km), 8 radials each:
// what it adds to a cold build. Each coverage is computed first (not timed); the check is then
// timed on its first run in this process (the JIT cold, as in a build) and as the best of 3.
// Wall and CPU seconds (process.cpuUsage: robust on a shared machine); bench/run.ts prints them.
import { openStudyTerrain } from "../src/analysis/analyze-study.ts";
import { coverageRequestOf, p1812RequestOf } from "../src/coverage/analyze-coverage.ts";
import { computeCoverage, type ComputedCoverage } from "../src/coverage/compute-coverage.ts";
import { coverageWaveCheck, WAVE_CHECK_DEFAULT_RADIALS } from "../src/coverage/coverage-wave-check.ts";
import { loadStudy } from "../src/study/load-study.ts";

export async function benchCoverageWaveCheck(): Promise<Record<string, number>> {
  const study = loadStudy("content/studies/kestrel-vale/study.yaml");
  const terrain = await openStudyTerrain(study);
  const computed: ComputedCoverage[] = [];
  for (const [i, e] of (study.coverage ?? []).entries()) {
    if (e.method === "visibility") continue;
    const req = coverageRequestOf(study, e);
    const p = await p1812RequestOf(study, e, i);
    if (p) req.p1812 = p;
    computed.push(await computeCoverage(terrain, req));
  }
  const run = () => {
    const c0 = process.cpuUsage();
    const t0 = performance.now();
    for (const c of computed) coverageWaveCheck(c.job, c.dem, c.values, WAVE_CHECK_DEFAULT_RADIALS);
    const cpu = process.cpuUsage(c0);
    return { wall_s: (performance.now() - t0) / 1000, cpu_s: (cpu.user + cpu.system) / 1e6 };
  };
  const first = run();
  let best = { wall_s: Infinity, cpu_s: Infinity };
  for (let i = 0; i < 3; i++) {
    const r = run();
    if (r.wall_s < best.wall_s) best = r;
  }
  return { coverages: computed.length, radials_each: WAVE_CHECK_DEFAULT_RADIALS, first_run_wall_s: first.wall_s, first_run_cpu_s: first.cpu_s, best_of_3_wall_s: best.wall_s, best_of_3_cpu_s: best.cpu_s };
}
