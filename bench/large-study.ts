// Benchmarks for large studies on one machine and on the job queue:
// - a generated 1 000-link, 300-site study built cold by the whole `ridgeline build` process
//   (compute and render times from its summary, peak RSS from /usr/bin/time);
// - the same links, and a 4-coverage study, computed on the job queue by 1 and then 2 local
//   workers (a redis-server started here), against the same computation in one process;
// - a folder of 100 one-degree HGT tiles (3″) of which a study touches 2: which tiles are read.
import { spawn, spawnSync, type ChildProcess } from "node:child_process";
import * as fs from "node:fs";
import { mkdtempSync, rmSync } from "node:fs";
import { createRequire, syncBuiltinESMExports } from "node:module";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { analyzeStudies } from "../src/analysis/analyze-study.ts";
import { ResultCache } from "../src/cache/result-cache.ts";
import { studyTerrainKey } from "../src/cache/terrain-source-key.ts";
import { buildSite } from "../src/cli/build-site.ts";
import { loadStudies } from "../src/analysis/load-all.ts";
import { distributeStudies, type QueueReport } from "../src/queue/coordinator.ts";
import { parseRedisUrl } from "../src/queue/redis-url.ts";
import { writeHgtTile } from "../src/terrain/write-hgt.ts";
import { startRedis } from "../test/queue/redis-server.ts";
import { benchTerrainM, makeBenchStudy } from "./make-study.ts";
import { loadCoverageOutputStage } from "../src/render/coverage-output-loader.ts";

const ROOT = fileURLToPath(new URL("..", import.meta.url));
const BIN = join(ROOT, "bin", "ridgeline.js");
const r3 = (x: number) => Math.round(x * 1000) / 1000;

/** `ridgeline build` as a whole process under /usr/bin/time -v: its summary's compute and render times, wall time, peak RSS. */
export function timedBuild(args: string[]) {
  const t0 = performance.now();
  const r = spawnSync("/usr/bin/time", ["-v", process.execPath, BIN, "build", ...args], { encoding: "utf8", cwd: ROOT, maxBuffer: 1 << 26 });
  const wall_s = (performance.now() - t0) / 1000;
  if (r.status !== 0) throw new Error(`ridgeline build failed:\n${r.stderr}`);
  const m = /compute ([\d.]+) s.*render ([\d.]+) s/.exec(r.stderr);
  const rss = /Maximum resident set size \(kbytes\): (\d+)/.exec(r.stderr);
  const user = /User time \(seconds\): ([\d.]+)/.exec(r.stderr);
  const sys = /System time \(seconds\): ([\d.]+)/.exec(r.stderr);
  // CPU time beside wall time: on a machine shared with other work, wall time says more about the neighbours
  return { wall_s: r3(wall_s), cpu_s: user && sys ? r3(Number(user[1]) + Number(sys[1])) : NaN, compute_s: m ? Number(m[1]) : NaN, render_s: m ? Number(m[2]) : NaN, max_rss_mib: rss ? Math.round(Number(rss[1]) / 1024) : NaN };
}

/** One 1 000-link, 300-site study built cold (no cache) by the whole command. */
export async function benchLargeStudy(): Promise<Record<string, unknown>> {
  const dir = mkdtempSync(join(tmpdir(), "ridgeline-bench-large-"));
  try {
    makeBenchStudy(join(dir, "studies", "large"), 1000, { siteCount: 300 });
    const run = timedBuild(["--studies-dir", join(dir, "studies"), "--out", join(dir, "site"), "--no-cache"]);
    // CPU time of each phase, in this process (analysis, then Eleventy): figures that the
    // machine's other load does not inflate as it does wall times.
    const cpu = () => { const u = process.cpuUsage(); return (u.user + u.system) / 1e6; };
    const c0 = cpu();
    const w0 = performance.now();
    const analysed = await analyzeStudies(loadStudies([join(dir, "studies", "large", "study.yaml")]), { cache: null, coverageOutputs: loadCoverageOutputStage });
    const c1 = cpu();
    const w1 = performance.now();
    await buildSite(analysed, { outDir: join(dir, "site-in-process") });
    const phases = { compute_cpu_s: r3(c1 - c0), compute_wall_s: r3((w1 - w0) / 1000), render_cpu_s: r3(cpu() - c1), render_wall_s: r3((performance.now() - w1) / 1000) };
    // The default build keeps a cache: cold, it also stores every link's terrain queries and geodesic.
    const cached = timedBuild(["--studies-dir", join(dir, "studies"), "--out", join(dir, "site"), "--cache-dir", join(dir, "cache")]);
    return { links: 1000, sites: 300, dem: "1″ SRTM-format tiles (generated, 2 tiles)", no_cache: run, in_process_no_cache: phases, cold_cache: cached, targets: { compute_s: 10, render_s: 30, max_rss_mib: 2048 } };
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

export const coverageYaml = (sites: string[]) =>
  `coverage:\n${sites
    .map(
      (s, i) => `  - id: cov-${i}
    site: ${s}
    method: delta-bullington
    frequency_ghz: 0.4585
    antenna_m: 30
    gain_dbi: 6
    tx_power_dbm: 37
    tx_losses_db: 2
    receiver_m: 3
    receiver_gain_dbi: 6
    radius_km: 12
    thresholds: [-95, -85, -75]
`,
    )
    .join("")}`;

function startWorker(url: string, name: string): Promise<ChildProcess> {
  const p = spawn(process.execPath, [BIN, "worker", "--queue", url, "--name", name], { cwd: ROOT, stdio: ["ignore", "ignore", "pipe"] });
  return new Promise((resolve, reject) => {
    let out = "";
    p.stderr!.on("data", (d: Buffer) => {
      out += d.toString();
      if (out.includes("waiting for tasks")) resolve(p);
    });
    p.once("exit", (c) => reject(new Error(`worker exited ${c}: ${out}`)));
  });
}

/** CPU seconds (user + system) a process has used so far, from /proc (Linux); NaN elsewhere. */
function processCpuS(pid: number | undefined): number {
  try {
    const stat = fs.readFileSync(`/proc/${pid}/stat`, "utf8");
    const f = stat.slice(stat.lastIndexOf(")") + 2).split(" "); // fields from the 3rd on
    return (Number(f[11]) + Number(f[12])) / 100; // utime, stime in clock ticks (USER_HZ = 100)
  } catch {
    return NaN;
  }
}
const ownCpuS = () => { const u = process.cpuUsage(); return (u.user + u.system) / 1e6; };

/**
 * Where the queue's overhead went in one build, from the tasks' own start and end times (the
 * workers run on this machine: one clock). For each worker, the wall time of the queue
 * phase splits exactly into: waiting before its first task (the coordinator planning — which
 * hashes the terrain for the keys —, connecting and queuing), its tasks (compute, then
 * storing the result in Redis), the gaps between its tasks (BullMQ completing one task and
 * handing over the next, or no task ready), and waiting after its last task (for the other
 * workers, then the coordinator fetching the last result and cleaning up). The sum over the
 * workers of everything but compute is the overhead the bench reports; here per task (ms).
 * A tile task's own cost is what one more tile adds: storing its result and the gap to its
 * worker's next task.
 */
export function overheadBreakdown(report: QueueReport, q0_ms: number, q1_ms: number) {
  const byWorker = new Map<string, QueueReport["timeline"]["tasks"]>();
  for (const t of report.timeline.tasks) byWorker.set(t.worker, [...(byWorker.get(t.worker) ?? []), t]);
  let before = 0, between = 0, after = 0, store = 0;
  const tileCosts: number[] = [];
  const tileCompute: number[] = [];
  for (const tasks of byWorker.values()) {
    tasks.sort((a, b) => a.started_at_ms - b.started_at_ms);
    before += tasks[0].started_at_ms - q0_ms;
    after += q1_ms - tasks[tasks.length - 1].stored_at_ms;
    for (const [i, t] of tasks.entries()) {
      store += t.store_s * 1000;
      const gap = i + 1 < tasks.length ? tasks[i + 1].started_at_ms - t.stored_at_ms : NaN;
      if (i + 1 < tasks.length) between += gap;
      if (t.kind === "coverage-tile") {
        tileCompute.push(t.compute_s);
        if (Number.isFinite(gap)) tileCosts.push(t.store_s * 1000 + gap);
      }
    }
  }
  const n = report.timeline.tasks.length;
  const mean = (xs: number[]) => xs.reduce((a, x) => a + x, 0) / xs.length;
  const r1 = (x: number) => Math.round(x * 10) / 10;
  return {
    /** ms per task, summed over the workers: the parts of overhead_per_task_s */
    before_first_task_ms: r1(before / n),
    store_ms: r1(store / n),
    between_tasks_ms: r1(between / n),
    after_last_task_ms: r1(after / n),
    /** the coordinator's own time before the tasks were on the queue (planning: keys, terrain hash; connecting) */
    coordinator_plan_ms: r1(report.timeline.queued_at_ms - q0_ms),
    /** coverage tile tasks alone: mean compute, and the queue's cost of one more tile (its store and the gap to its worker's next task) */
    tile_tasks: tileCompute.length ? { count: tileCompute.length, mean_compute_s: r3(mean(tileCompute)), queue_cost_ms: r1(mean(tileCosts)), queue_cost_pct: r3((100 * mean(tileCosts)) / (1000 * mean(tileCompute))) } : null,
  };
}

/** Queue figures of one study: computed in this process (no queue), then on 1 and 2 workers, each from an empty cache. */
export async function queueRuns(studyDir: string, url: string) {
  const studies = () => loadStudies([join(studyDir, "study.yaml")]);
  // Twice: the first also loads and compiles this process's modules and starts its threads,
  // as a new worker's first build does, and hashes the terrain; the second is the baseline of
  // the steady state (below).
  const oneProcess = async (terrainKnown: boolean) => {
    const oneDir = mkdtempSync(join(tmpdir(), "ridgeline-bench-cache-"));
    const cache = new ResultCache(oneDir);
    const s = studies();
    if (terrainKnown) for (const study of s) studyTerrainKey(study, cache);
    const t0 = performance.now();
    const c0 = ownCpuS();
    await analyzeStudies(s, { coverageOutputs: loadCoverageOutputStage, cache });
    rmSync(oneDir, { recursive: true, force: true });
    return { s: (performance.now() - t0) / 1000, cpu: ownCpuS() - c0 };
  };
  const first = await oneProcess(false);
  const { s: local_s, cpu: oneCpu } = await oneProcess(true);
  const out: Record<string, unknown> = { one_process_first_s: r3(first.s), one_process_first_cpu_s: r3(first.cpu), one_process_s: r3(local_s), one_process_cpu_s: r3(oneCpu) };
  const workers: ChildProcess[] = [];
  try {
    // Each configuration builds twice, every result computed again: the first build from an
    // empty cache also pays each new worker process's module loading and compilation (once per
    // worker, not per task) and the coordinator's hashing of the terrain files (35-60 ms for
    // the two 26 MB tiles, before any task can be named); the second is the steady state:
    // warm workers and a coordinator that has built on this terrain before — its cache
    // remembers the files' digests (file-digest.ts), as after any earlier build — with no
    // result cached (a study whose every entry changed).
    for (const [n, round] of [[1, "first_build"], [1, ""], [2, "first_build"], [2, ""]] as const) {
      while (workers.length < n) workers.push(await startWorker(url, `bench-${workers.length + 1}`));
      const cacheDir = mkdtempSync(join(tmpdir(), "ridgeline-bench-cache-"));
      const cache = new ResultCache(cacheDir);
      const s = studies();
      if (!round) for (const study of s) studyTerrainKey(study, cache);
      const workersCpu = () => workers.reduce((a, w) => a + processCpuS(w.pid), 0);
      const wc0 = workersCpu();
      const cc0 = ownCpuS();
      const q0 = performance.now();
      const report: QueueReport = await distributeStudies(s, cache, parseRedisUrl(url));
      const q1 = performance.now();
      const wc1 = workersCpu();
      const cc1 = ownCpuS();
      await analyzeStudies(s, { cache, coverageOutputs: loadCoverageOutputStage }); // assembly from the cache (each map from its tiles, the composite from the maps)
      const q2 = performance.now();
      rmSync(cacheDir, { recursive: true, force: true });
      const compute = Object.values(report.workers).reduce((a, w) => a + w.compute_s, 0);
      const store = Object.values(report.workers).reduce((a, w) => a + w.store_s, 0);
      out[`workers_${n}${round ? `_${round}` : ""}`] = {
        tasks: report.tasks,
        queue_wall_s: r3((q1 - q0) / 1000),
        assemble_s: r3((q2 - q1) / 1000),
        /** CPU seconds of the workers and of the coordinator while the tasks ran, and of the coordinator's assembly */
        workers_cpu_s: r3(wc1 - wc0),
        coordinator_queue_cpu_s: r3(cc1 - cc0),
        assemble_cpu_s: r3(ownCpuS() - cc1),
        /**
         * CPU seconds the whole build on the queue used beyond the same build in one process,
         * per task and as a share of the one process's: the queue's cost measured so that other
         * load on the machine does not inflate it (as it does wall times)
         */
        cpu_overhead_per_task_s: r3((wc1 - wc0 + cc1 - cc0 + ownCpuS() - cc1 - oneCpu) / report.tasks),
        cpu_overhead_pct: r3((100 * (wc1 - wc0 + cc1 - cc0 + ownCpuS() - cc1 - oneCpu)) / oneCpu),
        total_s: r3((q2 - q0) / 1000),
        task_compute_total_s: r3(compute),
        mean_task_compute_s: r3(compute / report.tasks),
        store_total_s: r3(store),
        fetch_total_s: r3(report.fetch_s),
        /** (queue wall × workers − compute) / tasks: everything a task costs beyond its computation, idle time at the end included */
        overhead_per_task_s: r3(((q1 - q0) / 1000 * n - compute) / report.tasks),
        overhead_pct_of_task: r3((100 * ((q1 - q0) / 1000 * n - compute)) / compute),
        overhead_breakdown: overheadBreakdown(report, performance.timeOrigin + q0, performance.timeOrigin + q1),
        tasks_per_worker: Object.fromEntries(Object.entries(report.workers).map(([w, x]) => [w, x.done])),
      };
    }
  } finally {
    for (const w of workers) w.kill("SIGTERM");
  }
  const one = out.workers_1 as { total_s: number };
  const two = out.workers_2 as { total_s: number };
  out.speed_up_2_vs_1 = r3(one.total_s / two.total_s);
  return out;
}

/** The 1 000-link study and a 4-coverage study on the job queue with 1 and 2 local workers. */
export async function benchQueue(): Promise<Record<string, unknown>> {
  const dir = mkdtempSync(join(tmpdir(), "ridgeline-bench-queue-"));
  const redis = await startRedis();
  try {
    const linksDir = join(dir, "links");
    makeBenchStudy(linksDir, 1000, { siteCount: 300 });
    const covDir = join(dir, "coverage");
    makeBenchStudy(covDir, 4, { coverage: coverageYaml(["S00", "S11", "S22", "S33"]) });
    return {
      note: "workers are local processes on the same 2 cores as the coordinator; one_process_s: the same computation in one process without the queue (its second run); workers_N: steady state (warm workers, the coordinator's cache remembering the terrain files' digests, every result recomputed); workers_N_first_build: new workers and a coordinator hashing the terrain; overhead_per_task_s = (queue wall × workers − Σ task compute) / tasks, split in overhead_breakdown",
      links_1000: await queueRuns(linksDir, redis.url),
      coverage_4: await queueRuns(covDir, redis.url),
    };
  } finally {
    await redis.stop();
    rmSync(dir, { recursive: true, force: true });
  }
}

/** A study touching 2 of 100 one-degree 3″ HGT tiles: tiles read (by the cache key and the computation), and with the site rendered. */
export async function benchLazyTiles(): Promise<Record<string, unknown>> {
  const dir = mkdtempSync(join(tmpdir(), "ridgeline-bench-tiles-"));
  try {
    const study = join(dir, "studies", "tiles");
    fs.mkdirSync(join(study, "dem"), { recursive: true });
    for (let lat = 40; lat < 50; lat++) for (let lon = 0; lon < 10; lon++) writeHgtTile(join(study, "dem", `N${lat}E${String(lon).padStart(3, "0")}.hgt`), lat, lon, 3, benchTerrainM);
    // the 200-link bench study's links (between N46E007 and N46E008) over this folder
    makeBenchStudy(join(dir, "gen"), 200);
    fs.writeFileSync(join(study, "study.yaml"), fs.readFileSync(join(dir, "gen", "study.yaml")));
    const reads = new Map<string, number>();
    const fsModule = createRequire(import.meta.url)("node:fs") as { readFileSync: typeof fs.readFileSync };
    const original = fsModule.readFileSync;
    const counting = ((path: fs.PathOrFileDescriptor, ...rest: unknown[]) => {
      if (typeof path === "string" && path.endsWith(".hgt")) reads.set(path, (reads.get(path) ?? 0) + 1);
      return (original as (...a: unknown[]) => unknown)(path, ...rest);
    }) as typeof fs.readFileSync;
    fsModule.readFileSync = counting; // and the named export every module imported, below
    syncBuiltinESMExports();
    const measure = async (cache: ResultCache | null) => {
      reads.clear();
      const t0 = performance.now();
      await analyzeStudies(loadStudies([join(study, "study.yaml")]), { cache, coverageOutputs: loadCoverageOutputStage });
      return { s: r3((performance.now() - t0) / 1000), tiles_read: reads.size };
    };
    try {
      const noCache = await measure(null);
      const coldCache = await measure(new ResultCache(join(dir, "cache")));
      // The site: the overview and live maps shade the relief of their whole frame, which
      // reaches beyond the sites (and so into more tiles than the links); no cache.
      reads.clear();
      const analysed = await analyzeStudies(loadStudies([join(study, "study.yaml")]), { cache: null, coverageOutputs: loadCoverageOutputStage });
      const afterAnalysis = reads.size;
      await buildSite(analysed, { outDir: join(dir, "site") });
      return {
        tiles_in_folder: 100,
        tile: "3″ (1201 × 1201), one degree",
        links_between_tiles: "N46E007, N46E008",
        /** the terrain's content key (in every link and coverage key and the provenance) hashes only the tiles the study's extent meets; the computation reads the same */
        no_cache: noCache,
        /** the same with an empty cache */
        cold_cache: coldCache,
        /** analysis and then the site (no cache): tiles read in all, the maps' relief included */
        with_site: { tiles_read_analysis: afterAnalysis, tiles_read_in_all: reads.size, tiles: [...reads.keys()].map((p) => p.slice(p.lastIndexOf("/") + 1)).sort() },
      };
    } finally {
      fsModule.readFileSync = original;
      syncBuiltinESMExports();
    }
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}
