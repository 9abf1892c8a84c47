// Worker-thread entry of the wave pool (wave-pool.ts): receives the study once, then solves
// links' wave jobs one at a time, answering each with linkWave's outcome or the error it threw.
import { parentPort } from "node:worker_threads";
import type { Study } from "../study/study.ts";
import { solveLinkWave, type LinkWaveJob, type LinkWaveOutcome } from "./link-wave-job.ts";

/** A study as posted to a thread: everything but `locate`, a function (no wave job needs it). */
export type PostedStudy = Omit<Study, "locate">;

/** Messages from the pool to a thread. */
export type ToWaveWorker = { type: "study"; study: PostedStudy } | { type: "solve"; id: number; job: LinkWaveJob };

/** Messages from a thread to the pool. */
export type FromWaveWorker = { type: "ready" } | { type: "solved"; id: number; outcome: LinkWaveOutcome } | { type: "failed"; id: number; error: unknown };

const port = parentPort!;
let study: Study | null = null;
port.on("message", (m: ToWaveWorker) => {
  if (m.type === "study") {
    study = {
      ...m.study,
      locate: () => {
        throw new Error("Study.locate is not available on a wave thread");
      },
    };
    return;
  }
  let outcome: LinkWaveOutcome;
  try {
    outcome = solveLinkWave(study!, m.job);
  } catch (e) {
    // the error itself (its class, message and stack survive the copy for JavaScript's own
    // errors), or its name, message and stack when it cannot be copied
    try {
      port.postMessage({ type: "failed", id: m.id, error: e } satisfies FromWaveWorker);
    } catch {
      const err = e as Error;
      port.postMessage({ type: "failed", id: m.id, error: { name: err?.name, message: err?.message ?? String(e), stack: err?.stack } } satisfies FromWaveWorker);
    }
    return;
  }
  port.postMessage({ type: "solved", id: m.id, outcome } satisfies FromWaveWorker);
});
port.postMessage({ type: "ready" } satisfies FromWaveWorker);
