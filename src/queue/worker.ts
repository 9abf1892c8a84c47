import { WaitingError, Worker, type ConnectionOptions, type Job } from "bullmq";
import type { Redis } from "ioredis";
import type { Study } from "../study/study.ts";
import { connectRedis, redisOptions } from "./connect.ts";
import { identityMismatch, queueIdentity } from "./identity.ts";
import type { RedisTarget } from "./redis-url.ts";
import { getChunked, KEY_PREFIX, putChunked, resultKey, studyKey } from "./result-store.ts";
import { closeTaskResources, runTask, warmTaskResources } from "./run-task.ts";
import { trace } from "./trace.ts";
import { decodeStudy, QUEUE_NAME, workerStudyDir, type TaskData, type TaskResult } from "./task.ts";

export interface WorkerOptions {
  /** tasks run at once (default 1; a coverage task already uses every core through its threads) */
  concurrency?: number;
  /** folder that stands for the coordinator's working directory when looking for terrain */
  terrainRoot?: string | null;
  /** name in progress lines and failure messages (default host:pid) */
  name: string;
  /**
   * A task whose worker stops answering for this long is taken back and run elsewhere
   * (BullMQ's lock and stalled-job check; default 30 s).
   */
  stallSeconds?: number;
  log: (line: string) => void;
}

/**
 * Run tasks from the queue until stopped: SIGTERM or SIGINT lets the tasks in hand finish,
 * then returns 0. A task queued by a coordinator whose version, computing code or encoders
 * differ from this worker's is put back for another worker, the coordinator is told why, and
 * the worker stops with 2. Each task's entries go to Redis (result-store.ts); the return
 * value names them.
 * @throws QueueConnectionError when Redis cannot be used at start
 */
export async function runWorker(target: RedisTarget, o: WorkerOptions): Promise<number> {
  const redis = await connectRedis(target);
  const identity = queueIdentity();
  const studies = new Map<string, Promise<Buffer | undefined>>(); // study bytes by sha, fetched once
  let exitCode = 0;
  let stopping: Promise<void> | null = null;
  const stall = (o.stallSeconds ?? 30) * 1000;
  const processor = async (job: Job<TaskData, TaskResult>, token?: string): Promise<TaskResult> => {
    const t = job.data;
    const why = identityMismatch(t.identity, identity);
    if (why) {
      const message = `${why}. This worker takes no task of that build: start workers from the coordinator's Ridgeline checkout (same version and code).`;
      await job.updateProgress({ worker: o.name, refused: message });
      await job.moveToWait(token);
      if (!stopping) {
        o.log(`ridgeline worker ${o.name}: refused task "${t.label}": ${message}`);
        exitCode = 2;
        setImmediate(() => void stop());
      }
      throw new WaitingError();
    }
    trace(o.name, `start ${job.id}`);
    // not waited for: the coordinator's "running" line needs no round trip before the task starts
    void job.updateProgress({ worker: o.name }).catch(() => {});
    o.log(`ridgeline worker ${o.name}: started "${t.label}"${job.attemptsStarted > 1 ? ` (attempt ${job.attemptsStarted})` : ""}`);
    try {
      const t0 = performance.now();
      const study = await loadStudy(redis, studies, t, o.terrainRoot ?? null);
      const entries = await runTask(t, study, { fetchTiles: (keys) => fetchTiles(redis, keys) });
      const t1 = performance.now();
      trace(o.name, `computed ${job.id} ${[...entries.values()].map((b) => b.byteLength).join(",")}`);
      await putChunked(redis, [...entries].map(([id, bytes]) => [resultKey(id.slice(0, id.indexOf(":")), id.slice(id.indexOf(":") + 1)), bytes] as const));
      const t2 = performance.now();
      trace(o.name, `stored ${job.id}`);
      o.log(`ridgeline worker ${o.name}: done "${t.label}" in ${((t2 - t0) / 1000).toFixed(2)} s`);
      const epoch = (t: number) => Math.round((performance.timeOrigin + t) * 10) / 10;
      return { worker: o.name, entries: [...entries.keys()].map((id) => ({ kind: id.slice(0, id.indexOf(":")), key: id.slice(id.indexOf(":") + 1) })), compute_s: (t1 - t0) / 1000, store_s: (t2 - t1) / 1000, started_at_ms: epoch(t0), stored_at_ms: epoch(t2) };
    } catch (e) {
      const m = (e as Error)?.message ?? String(e);
      o.log(`ridgeline worker ${o.name}: task "${t.label}" failed (attempt ${job.attemptsMade + 1}): ${m}`);
      throw new Error(`worker ${o.name}: ${m}`);
    }
  };
  const worker = new Worker<TaskData, TaskResult>(QUEUE_NAME, processor, {
    connection: redisOptions(target) as ConnectionOptions,
    prefix: KEY_PREFIX,
    concurrency: Math.max(1, o.concurrency ?? 1),
    name: o.name,
    lockDuration: stall,
    stalledInterval: stall,
    maxStalledCount: 2,
    autorun: false,
  });
  worker.on("error", () => {}); // connection errors: ioredis reconnects
  worker.on("completed", (job) => trace(o.name, `completed ${job.id}`));
  const stop = (): Promise<void> => (stopping ??= worker.close().then(async () => {
    redis.disconnect();
    await closeTaskResources();
  }));
  const onSignal = () => {
    o.log(`ridgeline worker ${o.name}: stopping after the task${(o.concurrency ?? 1) > 1 ? "s" : ""} in hand`);
    void stop();
  };
  process.on("SIGTERM", onSignal);
  process.on("SIGINT", onSignal);
  warmTaskResources();
  o.log(`ridgeline worker ${o.name}: waiting for tasks on ${target.display} (Ridgeline ${identity.version}, code ${identity.code.slice(0, 12)})`);
  try {
    await worker.run();
    await stop();
  } finally {
    process.off("SIGTERM", onSignal);
    process.off("SIGINT", onSignal);
  }
  return exitCode;
}

/** A map's tiles from Redis (those present), by tile key. */
async function fetchTiles(redis: Redis, keys: string[]): Promise<Map<string, Buffer>> {
  const got = await getChunked(redis, keys.map((k) => resultKey("coverage-tile", k)));
  return new Map(keys.flatMap((k) => (got.has(resultKey("coverage-tile", k)) ? [[k, got.get(resultKey("coverage-tile", k))!] as const] : [])));
}

/** The task's study, fetched from Redis once per worker and placed in this machine's study folder. */
async function loadStudy(redis: Redis, studies: Map<string, Promise<Buffer | undefined>>, t: TaskData, terrainRoot: string | null): Promise<Study> {
  let bytes = studies.get(t.studySha);
  if (!bytes) {
    bytes = getChunked(redis, [studyKey(t.studySha)]).then((m) => m.get(studyKey(t.studySha)));
    studies.set(t.studySha, bytes);
  }
  const b = await bytes;
  const study = b ? decodeStudy(b, workerStudyDir(t, terrainRoot)) : null;
  if (!study) {
    studies.delete(t.studySha);
    throw new Error(`the study of this task is no longer in Redis (its coordinator stopped?)`);
  }
  return study;
}
