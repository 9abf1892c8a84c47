import { createHash } from "node:crypto";
import { join, resolve } from "node:path";
import { decodeEntry, encodeEntry } from "../cache/entry-codec.ts";
import type { Study } from "../study/study.ts";
import type { QueueIdentity } from "./identity.ts";

/** Name of the BullMQ queue holding the tasks (its keys begin with KEY_PREFIX). */
export const QUEUE_NAME = "tasks";

/**
 * One task: cache entries of one study to compute, named by their cache keys (content
 * addressed: the same inputs, code and terrain give the same key and the same bytes).
 * `links`: a batch of links (entries "link" and "link-figure" of each key); `coverage-tile`:
 * one tile of a coverage map (entry "coverage-tile", coverage-tiles.ts); `coverage`: the
 * assembly of a map from its tiles (read from Redis) into its files, figures and rasters
 * (entry "coverage"), queued once its tiles are done.
 */
export interface TaskData {
  kind: "links" | "coverage-tile" | "coverage";
  /** For messages: "links l000–l024 of study bench". */
  label: string;
  /** sha256 of the study as sent (encodeStudy), stored in Redis under studyKey(sha). */
  studySha: string;
  /** The coordinator's study folder, absolute, and relative to its working directory (null outside it). */
  studyDir: string;
  studyDirRel: string | null;
  /** The study's terrain source key on the coordinator (the worker's must match). */
  terrainKey: string;
  /** Cache keys (one per link, or the tile's). */
  keys: string[];
  /** Link ids, or the coverage entry's id, in the order of `keys`. */
  ids: string[];
  /** coverage-tile: which tile of how many, of the map with this cache key */
  tile?: { index: number; count: number; mapKey: string };
  /** coverage: the keys of the map's tiles, in order (their entries are in Redis, resultKey) */
  tileKeys?: string[];
  identity: QueueIdentity;
}

/** What a worker returns for a task (BullMQ keeps it as the job's return value). */
export interface TaskResult {
  worker: string;
  /** The cache entries now stored in Redis (resultKey). */
  entries: { kind: string; key: string }[];
  /** Seconds spent computing, and storing the results in Redis. */
  compute_s: number;
  store_s: number;
  /** When the worker began the task and when its entries were stored (ms since the epoch, the worker's clock). */
  started_at_ms?: number;
  stored_at_ms?: number;
}

/** A job id from the task's keys: a task queued twice (two coordinators, same study) runs once. */
export function taskJobId(kind: TaskData["kind"], keys: string[]): string {
  return `${kind}-${createHash("sha256").update(keys.join(",")).digest("hex").slice(0, 40)}`;
}

/** The cache entries a task produces. */
export function taskEntries(t: Pick<TaskData, "kind" | "keys">): { kind: string; key: string }[] {
  return t.kind === "links" ? t.keys.flatMap((key) => [{ kind: "link-figure", key }, { kind: "link", key }]) : t.keys.map((key) => ({ kind: t.kind, key }));
}

/**
 * A validated study as bytes for the workers (the entry codec: numbers bit for bit, k = ∞
 * included, keys in order), without its folder, file and YAML positions.
 */
export function encodeStudy(study: Study): Buffer {
  const { locate: _locate, dir: _dir, file: _file, ...plain } = study;
  return encodeEntry(plain);
}

/** A study decoded on a worker, placed in `dir` (where its terrain is found). */
export function decodeStudy(bytes: Buffer, dir: string): Study | null {
  const plain = decodeEntry(bytes) as Omit<Study, "locate" | "dir" | "file"> | null;
  if (!plain || typeof plain !== "object" || !Array.isArray(plain.links)) return null;
  return { ...plain, dir, file: join(dir, "study.yaml"), locate: () => ({ line: 1, col: 1 }) };
}

/** The study folder on a worker: the coordinator's, or with --terrain-root the same folder under that root. */
export function workerStudyDir(t: Pick<TaskData, "studyDir" | "studyDirRel">, terrainRoot: string | null): string {
  return terrainRoot && t.studyDirRel !== null ? resolve(terrainRoot, t.studyDirRel) : t.studyDir;
}
