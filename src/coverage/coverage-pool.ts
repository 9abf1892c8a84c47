import { Worker } from "node:worker_threads";
import type { PixelWindow, TiffBandSource } from "../terrain/tiff-band-reader.ts";
import type { CoverageJob } from "./coverage-job.ts";
import { coverageUnits, createChunkRunner } from "./coverage-kernel.ts";
import { mergeTallies, type TallyData } from "./coverage-tally.ts";
import { coverageWorkerCode } from "./worker-code.ts";
import type { ToWorker } from "./coverage-worker.ts";
import type { SweepGeometry } from "./radial-sweep.ts";

/** Progress callback: units done of units total. */
export type CoverageProgress = (done: number, total: number) => void;

/**
 * Worker threads for coverage jobs. Start it early (the threads load their code while the
 * caller reads the terrain); `run` hands out chunks of a job — radials or rows — one at a
 * time to whichever thread is free, so uneven chunks balance out. Elevations and results
 * live in SharedArrayBuffers: the terrain is not copied per thread, and each cell is written
 * by exactly one thread.
 */
export class CoveragePool {
  private readonly workers: Worker[];
  private readonly ready: Promise<void>[];
  private failure: Error | null = null;

  private constructor(count: number) {
    const code = coverageWorkerCode();
    this.workers = [];
    this.ready = [];
    for (let i = 0; i < count; i++) {
      const w = new Worker(code, { eval: true });
      this.workers.push(w);
      this.ready.push(
        new Promise<void>((resolve, reject) => {
          w.once("message", () => resolve());
          w.once("error", reject);
        }),
      );
      w.on("error", (e) => (this.failure ??= e));
    }
  }

  /**
   * Start `count` threads (≥ 1). `warmUp: "line-of-sight"`: each thread first runs the
   * line-of-sight sweep on a small made-up grid (warmUpHorizonSweep), while this thread reads
   * the terrain, so the real sweep starts in optimised code.
   */
  static start(count: number, options: { warmUp?: "line-of-sight" } = {}): CoveragePool {
    const pool = new CoveragePool(Math.max(1, Math.floor(count)));
    if (options.warmUp === "line-of-sight") for (const w of pool.workers) w.postMessage({ type: "warm-up" } satisfies ToWorker);
    return pool;
  }

  /**
   * Have each thread run the line-of-sight sweep on a small made-up grid of elevations of this
   * type (warmUpHorizonSweep), as `start` does with `warmUp`, for a caller that learns the
   * elevations' type (from the terrain's header) after starting the threads.
   */
  warmUp(elements: "int16" | "float32"): void {
    for (const w of this.workers) w.postMessage({ type: "warm-up", elements } satisfies ToWorker);
  }

  /**
   * Have every thread decode shares of a GeoTIFF window too (see decodeBands); the caller
   * decodes its own shares and waits for theirs. Threads still loading join when ready.
   */
  shareDecode(src: TiffBandSource, window: PixelWindow, out: Float32Array | Int16Array, ctrl: Int32Array): void {
    for (const w of this.workers) w.postMessage({ type: "decode", src, window, out, ctrl } satisfies ToWorker);
  }

  /**
   * Have every thread fill a line-of-sight job's horizon tile table as the elevations are
   * read into `dem` (fillHorizonTileTable; the reader reports its rows with
   * horizonTileTableRows), after its warm-up: the table is then ready, or nearly, when the
   * last row is read, instead of being made at the start of the sweep.
   */
  fillTileTable(tiles: Float32Array, dem: Float32Array | Int16Array, g: SweepGeometry): void {
    const geometry: SweepGeometry = { width: g.width, height: g.height, site_col: g.site_col, site_row: g.site_row, radius_m: g.radius_m, east_per_col_m: g.east_per_col_m, north_per_row_m: g.north_per_row_m };
    for (const w of this.workers) w.postMessage({ type: "tile-table", tiles: tiles.buffer as SharedArrayBuffer, dem, geometry } satisfies ToWorker);
  }

  /**
   * Fill a shared result raster with `value` (nodata), a share on each thread and one here:
   * first writes to fresh memory are page faults, which threads take in parallel.
   */
  async fill(values: Float32Array | Uint8Array, value: number): Promise<void> {
    await Promise.all(this.ready);
    const parts = this.workers.length + 1;
    const cut = (k: number) => Math.floor((values.length * k) / parts);
    const acks = this.workers.map(
      (w, k) =>
        new Promise<void>((resolve, reject) => {
          const onMessage = (m: { type: string }) => {
            if (m.type !== "filled") return;
            w.off("message", onMessage);
            w.off("error", reject);
            resolve();
          };
          w.on("message", onMessage);
          w.on("error", reject);
          w.postMessage({ type: "fill", values, value, from: cut(k + 1), to: cut(k + 2) } satisfies ToWorker);
        }),
    );
    values.fill(value, 0, cut(1));
    await Promise.all(acks);
    if (this.failure) throw this.failure;
  }

  /** Resolves when every thread has loaded its code. */
  async whenReady(): Promise<void> {
    await Promise.all(this.ready);
  }

  get size(): number {
    return this.workers.length;
  }

  /**
   * Compute a job over every thread — all of it, or units from…to−1 (`from` a multiple of
   * chunkSize, as a coverage tile's first unit is) in the same chunks; resolves with the
   * merged tally of those chunks. Progress counts units of the range.
   */
  async run(job: CoverageJob, onProgress?: CoverageProgress, range?: readonly [number, number]): Promise<TallyData> {
    await Promise.all(this.ready);
    const [first, total] = range ?? [0, coverageUnits(job)];
    const chunk = chunkSize(coverageUnits(job));
    let next = first;
    let done = 0;
    // Each chunk's tally is kept with the chunk's start and merged in chunk order, so the
    // floating-point sums do not depend on which thread finished first (reproducible builds).
    const tallies: { from: number; tally: TallyData }[] = [];
    await Promise.all(
      this.workers.map(
        (w) =>
          new Promise<void>((resolve, reject) => {
            let current = -1;
            const onError = (e: Error) => reject(e);
            const onMessage = (m: { type: string; tally: TallyData; units: number }) => {
              if (m.type !== "done") return;
              tallies.push({ from: current, tally: m.tally });
              done += m.units;
              onProgress?.(done, total - first);
              send();
            };
            const send = () => {
              if (next >= total) {
                w.off("message", onMessage);
                w.off("error", onError);
                resolve();
                return;
              }
              const from = next;
              const to = Math.min(total, from + chunk);
              next = to;
              current = from;
              w.postMessage({ type: "chunk", from, to } satisfies ToWorker);
            };
            w.on("message", onMessage);
            w.on("error", onError);
            w.postMessage({ type: "job", job } satisfies ToWorker);
            send();
          }),
      ),
    );
    if (this.failure) throw this.failure;
    tallies.sort((a, b) => a.from - b.from);
    return mergeTallies(
      tallies.map((t) => t.tally),
      job.thresholds_dbm.length,
    );
  }

  /** Stop the threads. */
  async close(): Promise<void> {
    await Promise.all(this.workers.map((w) => w.terminate()));
  }
}

/**
 * Units of work per chunk: a fixed share of the job whatever the number of threads, so the
 * chunk tallies — and their sums, merged in chunk order — are the same on every machine.
 */
export function chunkSize(total: number): number {
  return Math.max(1, Math.ceil(total / 96));
}

/**
 * Compute a job (or units from…to−1 of it, as CoveragePool.run) in the calling thread, chunk
 * by chunk (small jobs, tests, or one core),
 * yielding to the event loop between chunks so progress can be drawn.
 */
export async function runInThisThread(job: CoverageJob, onProgress?: CoverageProgress, range?: readonly [number, number]): Promise<TallyData> {
  const runner = createChunkRunner(job);
  const [first, total] = range ?? [0, coverageUnits(job)];
  const chunk = chunkSize(coverageUnits(job));
  const tallies: TallyData[] = [];
  for (let from = first; from < total; from += chunk) {
    const to = Math.min(total, from + chunk);
    tallies.push(runner.run(from, to));
    onProgress?.(to - first, total - first);
    if (onProgress) await new Promise((r) => setImmediate(r));
  }
  return mergeTallies(tallies, job.thresholds_dbm.length);
}
