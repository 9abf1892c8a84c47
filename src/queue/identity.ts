import { createHash } from "node:crypto";
import { hostname } from "node:os";
import sharp from "sharp";
import { TOOL_VERSION } from "../analysis/provenance.ts";
import { coverageCodeFingerprint } from "../coverage/coverage-cache-keys.ts";
import { codeFingerprint, modulesFingerprint } from "../cache/code-fingerprint.ts";

/**
 * What a coordinator and a worker must share for a task's result to be the bytes the
 * coordinator would compute itself: the Ridgeline version, the fingerprint of the code that
 * computes links and coverage maps (and of the task code), and the versions of the image and
 * Deflate encoders the coverage files are written with.
 */
export interface QueueIdentity {
  version: string;
  /** sha256 over the computing code (link and coverage fingerprints, task modules) */
  code: string;
  /** sha256 over sharp's library versions and Node's zlib */
  encoders: string;
}

let memo: QueueIdentity | null = null;

/** This process's identity (computed once). */
export function queueIdentity(): QueueIdentity {
  if (memo) return memo;
  const tasks = modulesFingerprint([new URL("./run-task.ts", import.meta.url).href]);
  const code = createHash("sha256").update(`${codeFingerprint()}\0${coverageCodeFingerprint()}\0${tasks}`).digest("hex");
  const encoders = createHash("sha256").update(JSON.stringify({ ...sharp.versions, node_zlib: process.versions.zlib })).digest("hex");
  memo = { version: TOOL_VERSION, code, encoders };
  return memo;
}

/** Why two identities differ, in words (null when they agree). */
export function identityMismatch(coordinator: QueueIdentity, worker: QueueIdentity): string | null {
  const short = (s: string) => s.slice(0, 12);
  if (coordinator.version !== worker.version) return `the coordinator runs Ridgeline ${coordinator.version}, this worker ${worker.version}`;
  if (coordinator.code !== worker.code) return `both run Ridgeline ${worker.version} but their computing code differs (coordinator code ${short(coordinator.code)}, this worker ${short(worker.code)})`;
  if (coordinator.encoders !== worker.encoders) return `the image or Deflate encoder versions differ (coordinator ${short(coordinator.encoders)}, this worker ${short(worker.encoders)}; sharp and Node's zlib must match)`;
  return null;
}

/** A worker's name in progress lines and failure messages: host and process id unless given. */
export function defaultWorkerName(): string {
  return `${hostname()}:${process.pid}`;
}
