import { analyzeStudies, type AnalyzedStudy } from "../../analysis/analyze-study.ts";
import { DEFAULT_CACHE_DIR, ResultCache } from "../../cache/result-cache.ts";
import { numberArg, parseArgs } from "../args.ts";
import { buildSite } from "../build-site.ts";
import { findStudies, loadStudies } from "../../analysis/load-all.ts";
import { progressReporter } from "../progress.ts";
import { makeTempDir, removeTempDir } from "../../temp-dirs.ts";
import { loadCoverageOutputStage } from "../../render/coverage-output-loader.ts";

export interface BuildOptions {
  /** Study ids to build (default: every study under studiesDir). */
  ids?: string[];
  studiesDir?: string;
  outDir?: string;
  pathPrefix?: string;
  /** Cache folder, or null to compute everything. */
  cacheDir?: string | null;
  /** Redis URL: compute on the workers of this queue (src/queue/), then assemble and render here. */
  queue?: string;
  /** Where queue progress lines go (default: nowhere). */
  log?: (line: string, final: boolean) => void;
  /**
   * Worker threads for the links' wave solutions and the coverage maps (default: one per core
   * when the work justifies it, wave-pool.ts and coverage-cache.ts; 0: all in the main thread).
   */
  threads?: number;
}

/** What a build did, for the summary line and for `serve`. */
export interface BuildReport {
  outDir: string;
  studies: AnalyzedStudy[];
  links: number;
  fromCache: number;
  /** coverage maps built (each entry, and each study's composite) and how many came from the cache */
  coverageMaps: number;
  coverageFromCache: number;
  cacheUsed: boolean;
  compute_s: number;
  render_s: number;
  /** what the queue's workers did, with --queue */
  queue?: import("../../queue/coordinator.ts").QueueReport;
}

/** Load, analyse (with the cache) and render; throws InputError on bad input. */
export async function runBuild(options: BuildOptions = {}): Promise<BuildReport> {
  const t0 = performance.now();
  // With a queue the workers' results travel through a cache: a temporary one under --no-cache.
  const scratch = options.queue && options.cacheDir === null ? makeTempDir("ridgeline-queue-cache-") : null;
  const cache = scratch ? new ResultCache(scratch) : options.cacheDir === null ? null : new ResultCache(options.cacheDir ?? DEFAULT_CACHE_DIR);
  const progress = progressReporter("links");
  let studies: AnalyzedStudy[];
  let queue: BuildReport["queue"];
  try {
    const loaded = loadStudies(findStudies(options.studiesDir ?? "content/studies", options.ids));
    if (options.queue) {
      const { parseRedisUrl } = await import("../../queue/redis-url.ts");
      const target = parseRedisUrl(options.queue); // checked before anything is queued
      const { distributeStudies } = await import("../../queue/coordinator.ts");
      queue = await distributeStudies(loaded, cache!, target, { log: options.log });
    }
    studies = await analyzeStudies(loaded, { cache, coverageOutputs: loadCoverageOutputStage, waveWorkers: options.threads, coverageWorkers: options.threads, onProgress: (_s, d, t) => progress.update(d, t) });
  } catch (e) {
    if (scratch) removeTempDir(scratch);
    throw e;
  } finally {
    progress.stop();
  }
  const t1 = performance.now();
  let outDir: string;
  try {
    ({ outDir } = await buildSite(studies, { outDir: options.outDir, pathPrefix: options.pathPrefix }));
  } finally {
    for (const s of studies) if (s.coverage) removeTempDir(s.coverage.dir); // copied into the site
    if (scratch) removeTempDir(scratch); // after rendering: figure data is read from the cache while pages are drawn
  }
  return {
    outDir,
    studies,
    links: studies.reduce((n, s) => n + s.result.links.length, 0),
    fromCache: studies.reduce((n, s) => n + s.cache.hits, 0),
    coverageMaps: studies.reduce((n, s) => n + s.cache.coverage.hits + s.cache.coverage.misses, 0),
    coverageFromCache: studies.reduce((n, s) => n + s.cache.coverage.hits, 0),
    cacheUsed: cache !== null,
    compute_s: (t1 - t0) / 1000,
    render_s: (performance.now() - t1) / 1000,
    ...(queue ? { queue } : {}),
  };
}

/**
 * The one-line summary of a build, e.g. "Built 1 study, 8 links into _site (8 of 8 links from
 * cache, 3 of 4 coverage maps from cache; …)"; the coverage count only when there are maps.
 */
export function buildSummary(r: BuildReport): string {
  const n = r.studies.length;
  const workers = r.queue ? Object.keys(r.queue.workers).length : 0;
  const queued = r.queue ? `; ${r.queue.tasks} task${r.queue.tasks === 1 ? "" : "s"} on ${workers} worker${workers === 1 ? "" : "s"}` : "";
  const maps = r.coverageMaps > 0 ? `, ${r.coverageFromCache} of ${r.coverageMaps} coverage maps from cache` : "";
  const cache = r.cacheUsed ? `${r.fromCache} of ${r.links} links from cache${maps}` : "cache off";
  return `Built ${n} stud${n === 1 ? "y" : "ies"}, ${r.links} links into ${r.outDir} (${cache}; compute ${r.compute_s.toFixed(2)} s${queued}, render ${r.render_s.toFixed(2)} s).`;
}

/** `ridgeline build [study-id…] [--out DIR] [--path-prefix /sub/] [--studies-dir DIR] [--cache-dir DIR] [--no-cache] [--queue URL] [--threads N]` */
export async function buildCommand(argv: string[]): Promise<number> {
  const args = parseArgs(argv, { values: ["out", "path-prefix", "studies-dir", "cache-dir", "queue", "threads"], flags: ["no-cache"] });
  const threads = args.values.get("threads")?.[0];
  const report = await runBuild({
    ids: args.positional,
    studiesDir: args.values.get("studies-dir")?.[0],
    outDir: args.values.get("out")?.[0],
    pathPrefix: args.values.get("path-prefix")?.[0],
    cacheDir: args.flags.has("no-cache") ? null : args.values.get("cache-dir")?.[0],
    queue: args.values.get("queue")?.[0],
    log: queueLog(),
    threads: threads === undefined ? undefined : numberArg("threads", threads, (x) => Number.isInteger(x) && x >= 0 && x <= 256, "a whole number of threads from 0 to 256"),
  });
  process.stderr.write(`${buildSummary(report)}\n`);
  return 0;
}

/** Queue progress on stderr: one line rewritten in place on a terminal, whole lines otherwise. */
function queueLog(): (line: string, final: boolean) => void {
  const tty = Boolean(process.stderr.isTTY);
  return (line, final) => process.stderr.write(tty ? `\r\x1b[K${line}${final ? "\n" : ""}` : `${line}\n`);
}
