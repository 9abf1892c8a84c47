import { availableParallelism } from "node:os";
import { Worker } from "node:worker_threads";
import { workerThreadCode } from "../coverage/worker-code.ts";
import type { Study } from "../study/study.ts";
import { solveLinkWave, type LinkWaveJob, type LinkWaveOutcome } from "./link-wave-job.ts";
import type { FromWaveWorker, PostedStudy, ToWaveWorker } from "./wave-worker.ts";

/**
 * Fewest wave solutions a build must compute before it starts threads for them. Two threads
 * are ready 0.03-0.07 s after they are started (their bundled code loaded), and each compiles
 * the solver afresh: its first solutions run slower, 0.1-0.2 s of CPU in all on the demo's
 * links, against about 0.15 s for the demo's average link. With one or two links to solve the
 * threads would not pay for themselves, and a rebuild after a small edit solves one or two.
 */
export const WAVE_THREADS_MIN_LINKS = 3;

/**
 * Threads for `jobs` wave solutions: `requested` when given (0: none, this thread solves them),
 * otherwise one per core, at most one per job, and none with fewer than WAVE_THREADS_MIN_LINKS
 * jobs or a single core.
 */
export function waveThreads(jobs: number, requested?: number): number {
  if (requested !== undefined) return Math.max(0, Math.min(Math.floor(requested), jobs));
  const cores = availableParallelism();
  return jobs >= WAVE_THREADS_MIN_LINKS && cores >= 2 ? Math.min(cores, jobs) : 0;
}

interface Pending {
  id: number;
  job: LinkWaveJob;
  resolve: (o: LinkWaveOutcome) => void;
  reject: (e: unknown) => void;
}

interface Thread {
  worker: Worker;
  /** the job it is solving */
  busy: Pending | null;
}

/**
 * Worker threads solving links' wave jobs (linkWave, through link-wave-job.ts) while the
 * caller analyses the other links. Each thread takes the next job as it finishes one (jobs in
 * the order given), so a long path does not hold up the others; each outcome goes back to its
 * caller, who puts them in study order. linkWave is pure: a thread's outcome is the one this
 * thread would compute. A job whose linkWave throws rejects with that error; a thread that
 * dies (it could not load its code, ran out of memory) hands its job and the rest of its work
 * to this thread, so the build's results do not depend on the threads.
 */
export class WavePool {
  private readonly threads: Thread[] = [];
  private readonly queue: Pending[] = [];
  private nextId = 0;
  private closed = false;

  private constructor(
    private readonly study: Study,
    count: number,
  ) {
    const { locate: _, ...posted } = study;
    const code = workerThreadCode(new URL("./wave-worker.ts", import.meta.url), "wave-worker");
    try {
      for (let i = 0; i < count; i++) {
        const worker = new Worker(code, { eval: true });
        const t: Thread = { worker, busy: null };
        this.threads.push(t);
        worker.on("message", (m: FromWaveWorker) => this.onMessage(t, m));
        worker.on("error", () => this.lose(t));
        worker.on("messageerror", () => this.lose(t));
        worker.on("exit", () => this.lose(t));
        worker.postMessage({ type: "study", study: posted satisfies PostedStudy } satisfies ToWaveWorker);
      }
    } catch {
      // a study that cannot be posted (not plain data): no threads, every job solved here
      for (const t of this.threads.splice(0)) void t.worker.terminate();
    }
  }

  /** Start `count` threads (≥ 1) for the study's links. */
  static start(study: Study, count: number): WavePool {
    return new WavePool(study, Math.max(1, Math.floor(count)));
  }

  get size(): number {
    return this.threads.length;
  }

  /** Solve a link's wave job on the first free thread (in this thread when none is left). */
  solve(job: LinkWaveJob): Promise<LinkWaveOutcome> {
    return new Promise<LinkWaveOutcome>((resolve, reject) => {
      this.queue.push({ id: this.nextId++, job, resolve, reject });
      this.dispatch();
    });
  }

  /** Stop the threads (jobs not yet solved are dropped). */
  async close(): Promise<void> {
    this.closed = true;
    const threads = this.threads.splice(0);
    await Promise.all(threads.map((t) => t.worker.terminate()));
  }

  private dispatch(): void {
    if (this.closed) return;
    for (const t of this.threads) {
      if (t.busy || !this.queue.length) continue;
      t.busy = this.queue.shift()!;
      try {
        t.worker.postMessage({ type: "solve", id: t.busy.id, job: t.busy.job } satisfies ToWaveWorker);
      } catch {
        // a job that cannot be posted (not plain data) is solved here
        const p = t.busy;
        t.busy = null;
        this.solveHere(p);
      }
    }
    if (!this.threads.length) while (this.queue.length) this.solveHere(this.queue.shift()!);
  }

  private onMessage(t: Thread, m: FromWaveWorker): void {
    if (m.type === "ready" || !t.busy || t.busy.id !== m.id) return;
    const p = t.busy;
    t.busy = null;
    if (m.type === "solved") p.resolve(m.outcome);
    else p.reject(asError(m.error));
    this.dispatch();
  }

  /** A thread that died: its job and the queue's are solved elsewhere. */
  private lose(t: Thread): void {
    const i = this.threads.indexOf(t);
    if (i < 0) return;
    this.threads.splice(i, 1);
    void t.worker.terminate();
    if (t.busy) this.queue.unshift(t.busy);
    t.busy = null;
    this.dispatch();
  }

  private solveHere(p: Pending): void {
    try {
      p.resolve(solveLinkWave(this.study, p.job));
    } catch (e) {
      p.reject(e);
    }
  }
}

/** A thread's error as an Error: as copied (JavaScript's own error classes survive), or rebuilt from its name, message and stack. */
function asError(e: unknown): Error {
  if (e instanceof Error) return e;
  const o = (e ?? {}) as { name?: string; message?: string; stack?: string };
  const err = new Error(o.message ?? String(e));
  if (o.name) err.name = o.name;
  if (o.stack) err.stack = o.stack;
  return err;
}
