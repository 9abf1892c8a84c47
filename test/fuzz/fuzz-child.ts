import { rmSync } from "node:fs";
import { join } from "node:path";
import { caseRoot, fuzzCase } from "./generate.ts";
import { runCase, type CaseResult } from "./run-case.ts";

// One worker process of the fuzzer: receives {seed, index, buildEvery, root} over IPC, writes
// the case, runs it in this process and answers with its outcome and the resident memory.
// The parent kills and replaces it when a case runs over its time or memory budget.

interface Job {
  seed: number;
  index: number;
  buildEvery: number;
  root: string;
}

process.on("message", async (job: Job) => {
  const c = fuzzCase(job.seed, job.index, job.buildEvery);
  let result: CaseResult & { unwritable?: boolean };
  try {
    const dir = caseRoot(job.root, job.index);
    c.write(dir);
    result = await runCase(dir, c.id, c.build ? join(dir, "..", "_site") : null);
  } catch (e) {
    result = { outcome: "clean-error", detail: `case not writable here: ${(e as Error).message}`, unwritable: true };
  }
  rmSync(join(job.root, `case-${job.index}`), { recursive: true, force: true });
  process.send!({ index: job.index, mutations: c.mutations, build: c.build, rss: process.memoryUsage().rss, ...result });
});
process.send!({ ready: true });
