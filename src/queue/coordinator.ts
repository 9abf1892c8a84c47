import { Queue, QueueEvents, type ConnectionOptions } from "bullmq";
import type { Redis } from "ioredis";
import type { ResultCache } from "../cache/result-cache.ts";
import { RidgelineError } from "../errors.ts";
import type { Study } from "../study/study.ts";
import { connectRedis, redisOptions } from "./connect.ts";
import { queueIdentity } from "./identity.ts";
import { planStudy } from "./plan-tasks.ts";
import type { RedisTarget } from "./redis-url.ts";
import { deleteChunked, getChunked, KEY_PREFIX, putChunked, resultKey, studyKey } from "./result-store.ts";
import { trace } from "./trace.ts";
import { QUEUE_NAME, taskEntries, taskJobId, type TaskData, type TaskResult } from "./task.ts";

/** Attempts of a task before the build fails (BullMQ retries a failed task, on any worker). */
export const TASK_ATTEMPTS = 3;

/** A task failed TASK_ATTEMPTS times (or stalled too often): the build fails naming it, its last worker and the error. */
export class QueueTaskError extends RidgelineError {}

/** What the workers did for a build. */
export interface QueueReport {
  tasks: number;
  /** cache entries received from the workers */
  entries: number;
  /** per worker: tasks done and seconds of compute they reported */
  workers: Record<string, { done: number; compute_s: number; store_s: number }>;
  /** seconds from the first task queued to the last result stored in the local cache */
  wall_s: number;
  /** seconds spent fetching results from Redis into the local cache */
  fetch_s: number;
  /**
   * Where the time went (ms since the epoch; the workers' own clocks for their tasks): when the
   * coordinator began (before planning), when its tasks were on the queue, and each task as
   * its worker reported it, in the order they completed.
   */
  timeline: { began_at_ms: number; queued_at_ms: number; tasks: { kind: TaskData["kind"]; worker: string; compute_s: number; store_s: number; started_at_ms: number; stored_at_ms: number }[] };
}

interface Progress {
  done: number;
  failed: number;
  total: number;
  running: Map<string, string>; // job id → worker
  perWorker: Map<string, { done: number; running: number }>;
}

/** A progress line: "tasks 12/50 done, 0 failed, 2 running — host-a:41 7 done, 1 running; …". */
export function progressLine(p: Progress): string {
  const running = new Map<string, number>();
  for (const w of p.running.values()) running.set(w, (running.get(w) ?? 0) + 1);
  const names = [...new Set([...p.perWorker.keys(), ...running.keys()])].sort();
  const each = names.map((w) => `${w} ${p.perWorker.get(w)?.done ?? 0} done, ${running.get(w) ?? 0} running`).join("; ");
  return `queue: tasks ${p.done}/${p.total} done, ${p.failed} failed, ${p.running.size} running${each ? ` — ${each}` : ""}`;
}

/**
 * Compute on the workers every cache entry the studies need that `cache` lacks, and store the
 * results in `cache`: afterwards the ordinary build finds them there, assembles and renders.
 * Tasks are queued under content-addressed job ids; results come back through Redis (chunked,
 * result-store.ts). Progress goes to `log` (a line on a terminal, every 10 s otherwise).
 * @throws QueueConnectionError when Redis cannot be used, QueueTaskError when a task fails for good
 */
export async function distributeStudies(studies: Study[], cache: ResultCache, target: RedisTarget, o: { log?: (line: string, final: boolean) => void } = {}): Promise<QueueReport> {
  trace("coord", "begin");
  const began_at_ms = performance.timeOrigin + performance.now();
  // connecting while the studies are planned (the TCP handshake needs no help from this thread)
  const connecting = connectRedis(target);
  let plans: ReturnType<typeof planStudy>[];
  try {
    const identity = queueIdentity();
    plans = studies.map((s) => planStudy(s, cache, identity));
  } catch (e) {
    void connecting.then((r) => r.disconnect(), () => {});
    throw e;
  }
  const tasks = plans.flatMap((p) => p.tasks);
  trace("coord", "plans");
  const report: QueueReport = { tasks: tasks.length, entries: 0, workers: {}, wall_s: 0, fetch_s: 0, timeline: { began_at_ms, queued_at_ms: NaN, tasks: [] } };
  const redis = await connecting;
  trace("coord", "connected");
  const byId = new Map(tasks.map((t) => [taskJobId(t.kind, t.keys), t])); // two studies may share a task
  // Each map's assembly waits for its tiles: queued when the last of them is done.
  const maps = new Map<string, { task: TaskData; waiting: Set<string> }>();
  const mapOfTile = new Map<string, string>();
  for (const m of plans.flatMap((p) => p.maps)) {
    const id = taskJobId(m.task.kind, m.task.keys);
    if (maps.has(id)) continue;
    const waiting = new Set(m.tiles.map((t) => taskJobId(t.kind, t.keys)));
    for (const t of waiting) mapOfTile.set(t, id);
    maps.set(id, { task: m.task, waiting });
    byId.set(id, m.task);
  }
  const tileKeysQueued = new Set(tasks.filter((t) => t.kind === "coverage-tile").map((t) => t.keys[0]));
  const tileKeysInRedis = new Set<string>(); // deleted when the build ends
  if (byId.size === 0) {
    redis.disconnect();
    return report;
  }
  const t0 = performance.now();
  trace("coord", "planned");
  const connection = redisOptions(target) as ConnectionOptions; // ioredis options; BullMQ opens its own connections with them
  const queue = new Queue<TaskData, TaskResult>(QUEUE_NAME, { connection, prefix: KEY_PREFIX });
  const events = new QueueEvents(QUEUE_NAME, { connection, prefix: KEY_PREFIX });
  queue.on("error", () => {}); // connection errors: ioredis reconnects; a lasting outage stalls the wait
  events.on("error", () => {});
  report.tasks = byId.size;
  const jobOptions = (jobId: string) => ({ jobId, attempts: TASK_ATTEMPTS, backoff: { type: "fixed" as const, delay: 500 }, removeOnComplete: true, removeOnFail: true });
  /** Queue a map's assembly: its tiles this build did not compute go to Redis from the local cache first. */
  const startMap = async (mapId: string): Promise<void> => {
    const m = maps.get(mapId)!;
    const local: [string, Uint8Array][] = [];
    for (const key of m.task.tileKeys ?? []) {
      tileKeysInRedis.add(key);
      if (tileKeysQueued.has(key)) continue;
      const bytes = cache.getBytes("coverage-tile", key); // absent: the worker computes that tile itself
      if (bytes) local.push([resultKey("coverage-tile", key), bytes]);
    }
    if (local.length) await putChunked(redis, local);
    await queue.add(m.task.kind, m.task, { ...jobOptions(mapId), lifo: true });
    trace("coord", `added ${mapId}`); // next: a worker still holds the map's elevations
  };
  let fail: (e: unknown) => void = () => {};
  const p: Progress = { done: 0, failed: 0, total: byId.size, running: new Map(), perWorker: new Map() };
  const log = o.log ?? (() => {});
  let lastLog = 0;
  const show = (final = false) => {
    const now = performance.now();
    if (!final && now - lastLog < (process.stderr.isTTY ? 250 : 10_000)) return;
    lastLog = now;
    log(progressLine(p), final);
  };
  const refusals = new Set<string>();
  const fetching: Promise<void>[] = [];
  try {
    await Promise.all([events.waitUntilReady(), putChunked(redis, plans.filter((plan) => plan.tasks.length || plan.maps.length).map((plan) => [studyKey(plan.sha), plan.bytes] as const))]);
    trace("coord", "events-ready");
    const finished = new Promise<void>((resolve, reject) => {
      fail = reject;
      const pending = new Set(byId.keys());
      const finish = (id: string) => {
        pending.delete(id);
        if (pending.size === 0) Promise.all(fetching).then(() => resolve(), reject);
      };
      events.on("progress", ({ jobId, data }) => {
        const d = data as { worker?: string; refused?: string };
        if (!byId.has(jobId) || !d || typeof d !== "object") return;
        if (d.refused && !refusals.has(`${d.worker}`)) {
          refusals.add(`${d.worker}`);
          log(`queue: worker ${d.worker} refused the tasks: ${d.refused}`, true);
        } else if (d.worker) {
          p.running.set(jobId, d.worker);
          show();
        }
      });
      events.on("completed", ({ jobId, returnvalue }) => {
        const task = byId.get(jobId);
        if (!task || !pending.has(jobId)) return;
        trace("coord", `completed ${jobId}`);
        const r = (typeof returnvalue === "string" ? JSON.parse(returnvalue) : returnvalue) as TaskResult;
        p.running.delete(jobId);
        p.done++;
        const w = (report.workers[r.worker] ??= { done: 0, compute_s: 0, store_s: 0 });
        w.done++;
        w.compute_s += r.compute_s;
        w.store_s += r.store_s;
        report.timeline.tasks.push({ kind: task.kind, worker: r.worker, compute_s: r.compute_s, store_s: r.store_s, started_at_ms: r.started_at_ms ?? NaN, stored_at_ms: r.stored_at_ms ?? NaN });
        const pw = p.perWorker.get(r.worker) ?? { done: 0, running: 0 };
        pw.done++;
        p.perWorker.set(r.worker, pw);
        show();
        // a map whose last tile this was: its assembly queued first (a worker may be waiting for it), then the results fetched
        const mapId = mapOfTile.get(jobId);
        const map = mapId ? maps.get(mapId) : undefined;
        if (map && map.waiting.delete(jobId) && map.waiting.size === 0) fetching.push(startMap(mapId!).catch(reject));
        // a tile stays in Redis for its map's assembly; the map's entries are taken
        fetching.push(fetchResults(redis, cache, task, report, { remove: task.kind !== "coverage-tile" }));
        finish(jobId);
      });
      events.on("failed", ({ jobId, failedReason }) => {
        const task = byId.get(jobId);
        if (!task || !pending.has(jobId)) return;
        p.failed++;
        p.running.delete(jobId);
        show(true);
        const why = /stalled/i.test(failedReason)
          ? `its workers stopped answering while running it (${failedReason}): a worker was killed each time, or the task kept a worker busy longer than its --stall-seconds`
          : `last error: ${failedReason}`;
        reject(new QueueTaskError(`task "${task.label}" failed and will not be retried (up to ${TASK_ATTEMPTS} attempts, on any worker); ${why}`));
      });
    });
    finished.catch(() => {}); // handled below
    await queue.addBulk([...byId].filter(([jobId]) => !maps.has(jobId)).map(([jobId, t]) => ({ name: t.kind, data: t, opts: jobOptions(jobId) })));
    for (const [mapId, m] of maps) if (m.waiting.size === 0) await startMap(mapId).catch(fail);
    trace("coord", "queued");
    report.timeline.queued_at_ms = performance.timeOrigin + performance.now();
    log(`queue: ${byId.size} task${byId.size === 1 ? "" : "s"} queued on ${target.display}`, true);
    await finished;
    trace("coord", "finished");
    show(true);
    report.wall_s = (performance.now() - t0) / 1000;
    return report;
  } catch (e) {
    // A failed build takes its remaining tasks off the queue (those running finish on their own).
    await Promise.all([...byId.keys()].map((id) => queue.remove(id).catch(() => 0)));
    throw e;
  } finally {
    await Promise.allSettled(fetching);
    const leftovers = [...plans.filter((plan) => plan.tasks.length || plan.maps.length).map((plan) => studyKey(plan.sha)), ...[...new Set([...tileKeysQueued, ...tileKeysInRedis])].map((key) => resultKey("coverage-tile", key))];
    await Promise.allSettled([deleteChunked(redis, leftovers), events.close(), queue.close()]);
    redis.disconnect();
    trace("coord", "closed");
  }
}

/**
 * Copy a finished task's entries from Redis into the local cache, then (`remove`) delete them there. An
 * entry missing from Redis (taken by another coordinator, say) is simply computed by the local
 * build that follows.
 */
async function fetchResults(redis: Redis, cache: ResultCache, task: TaskData, report: QueueReport, o: { remove: boolean }): Promise<void> {
  const t0 = performance.now();
  const entries = taskEntries(task);
  const got = await getChunked(redis, entries.map(({ kind, key }) => resultKey(kind, key)), { remove: o.remove });
  for (const { kind, key } of entries) {
    const bytes = got.get(resultKey(kind, key));
    if (bytes) {
      cache.putBytes(kind, key, bytes);
      report.entries++;
    }
  }
  report.fetch_s += (performance.now() - t0) / 1000;
  trace("coord", `fetched ${taskJobId(task.kind, task.keys)}`);
}
