// Worker-thread entry of the coverage pool (coverage-pool.ts): receives a job, then computes
// chunks of it on request and answers with each chunk's tally.
import { parentPort } from "node:worker_threads";
import type { CoverageJob } from "./coverage-job.ts";
import { createChunkRunner } from "./coverage-kernel.ts";

/** Messages from the pool to a worker. */
export type ToWorker = { type: "job"; job: CoverageJob } | { type: "chunk"; from: number; to: number };

const port = parentPort!;
let runner: ReturnType<typeof createChunkRunner> | null = null;
port.on("message", (m: ToWorker) => {
  if (m.type === "job") {
    runner = createChunkRunner(m.job);
  } else {
    const tally = runner!.run(m.from, m.to);
    port.postMessage({ type: "done", units: m.to - m.from, tally });
  }
});
port.postMessage({ type: "ready" });
