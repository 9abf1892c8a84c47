import { fork, type ChildProcess } from "node:child_process";
import { mkdtempSync, readdirSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import type { Outcome } from "./run-case.ts";

/**
 * The fuzzer's driver: `npm run fuzz -- --count N --seed S [--jobs J] [--timeout-ms T]
 * [--memory-mb M] [--build-every B] [--json]`; `--write-case I --seed S --to DIR` writes case I alone. Cases (generate.ts) run in worker processes,
 * each case in-process there (run-case.ts); a case that takes longer than its time budget is
 * a hang and one whose process exceeds the memory budget (or dies) a crash, and the worker is
 * replaced. Prints the count of each outcome and the first few cases of each bad kind, and
 * exits 1 when there is any crash, hang or impossible result.
 */

export interface FuzzOptions {
  count: number;
  seed: number;
  jobs?: number;
  /** Time budget of one case (ms). */
  timeoutMs?: number;
  /** Memory budget of a worker process (MB): V8 heap limit, and resident size checked after each case. */
  memoryMb?: number;
  /** One case in this many runs the full site build (0: none). */
  buildEvery?: number;
  onCase?: (r: FuzzCaseReport) => void;
}

export interface FuzzCaseReport {
  index: number;
  outcome: Outcome;
  detail: string;
  mutations: string[];
  build: boolean;
  unwritable?: boolean;
}

export interface FuzzSummary {
  count: number;
  seed: number;
  counts: Record<Outcome, number>;
  builds: number;
  unwritable: number;
  /** Temporary folders (ridgeline-*) the cases left behind. */
  leftovers: number;
  bad: FuzzCaseReport[];
  seconds: number;
}

const CHILD = fileURLToPath(new URL("./fuzz-child.ts", import.meta.url));

export async function runFuzz(o: FuzzOptions): Promise<FuzzSummary> {
  const jobs = o.jobs ?? 2;
  const timeoutMs = o.timeoutMs ?? 20_000;
  const memoryMb = o.memoryMb ?? 1536;
  const buildEvery = o.buildEvery ?? 100;
  const root = mkdtempSync(join(tmpdir(), "ridgeline-fuzz-"));
  const counts: Record<Outcome, number> = { success: 0, "clean-error": 0, crash: 0, hang: 0, impossible: 0 };
  const bad: FuzzCaseReport[] = [];
  let builds = 0;
  let unwritable = 0;
  let next = 0;
  const t0 = performance.now();
  const record = (r: FuzzCaseReport) => {
    counts[r.outcome]++;
    if (r.build) builds++;
    if (r.unwritable) unwritable++;
    if (r.outcome === "crash" || r.outcome === "hang" || r.outcome === "impossible") bad.push(r);
    o.onCase?.(r);
  };

  const worker = () =>
    new Promise<void>((done) => {
      let child: ChildProcess;
      let current: number | null = null;
      let timer: NodeJS.Timeout | null = null;
      const start = () => {
        child = fork(CHILD, [], {
          execArgv: ["--import", "tsx", `--max-old-space-size=${memoryMb}`],
          stdio: ["ignore", "ignore", "ignore", "ipc"],
          env: { ...process.env, TMPDIR: root },
        });
        child.on("message", (m: { ready?: boolean; rss?: number } & FuzzCaseReport) => {
          if (m.ready) return give();
          if (timer) clearTimeout(timer);
          current = null;
          if ((m.rss ?? 0) > memoryMb * 1024 * 1024 * 1.5) {
            record({ ...m, outcome: "crash", detail: `worker resident memory ${Math.round(m.rss! / 1048576)} MB after the case (budget ${memoryMb} MB)` });
            restart();
          } else {
            record(m);
            give();
          }
        });
        child.on("exit", (code, signal) => {
          if (current !== null) {
            if (timer) clearTimeout(timer);
            const index = current;
            current = null;
            record({ index, outcome: "crash", detail: `worker died (exit ${code}, signal ${signal}): out of memory or a native fault`, mutations: [], build: false });
            start();
          }
        });
      };
      const restart = () => {
        child.removeAllListeners("exit");
        child.kill("SIGKILL");
        start();
      };
      const give = () => {
        if (next >= o.count) {
          child.removeAllListeners("exit");
          child.kill();
          return done();
        }
        current = next++;
        const index = current;
        timer = setTimeout(() => {
          current = null;
          record({ index, outcome: "hang", detail: `no answer within ${timeoutMs} ms`, mutations: [], build: false });
          restart();
        }, timeoutMs);
        child.send({ seed: o.seed, index, buildEvery, root });
      };
      start();
    });

  let leftovers = 0;
  try {
    await Promise.all(Array.from({ length: jobs }, worker));
    // temporary folders the cases left (the workers' TMPDIR is the run's folder); workers
    // killed for a hang or memory cannot clean up, so only a run without those counts
    if (counts.hang === 0) leftovers = readdirSync(root).filter((n) => n.startsWith("ridgeline-")).length;
  } finally {
    rmSync(root, { recursive: true, force: true });
  }
  bad.sort((a, b) => a.index - b.index);
  return { count: o.count, seed: o.seed, counts, builds, unwritable, leftovers, bad, seconds: (performance.now() - t0) / 1000 };
}

/** Counts as one line, e.g. "10000 cases, seed 1: 6123 clean errors, 3877 successes, 0 crashes, 0 hangs, 0 impossible results". */
export function summaryLine(s: FuzzSummary): string {
  const c = s.counts;
  return `${s.count} cases (${s.builds} full builds), seed ${s.seed}: ${c["clean-error"]} clean errors, ${c.success} successes, ${c.crash} crashes, ${c.hang} hangs, ${c.impossible} impossible results; ${s.leftovers} temporary folders left (${s.seconds.toFixed(0)} s)`;
}

async function cli(argv: string[]): Promise<number> {
  const opt = (name: string, dflt: number) => {
    const i = argv.indexOf(`--${name}`);
    if (i < 0) return dflt;
    const v = Number(argv[i + 1]);
    if (!Number.isFinite(v)) throw new Error(`--${name} needs a number`);
    return v;
  };
  const one = argv.indexOf("--write-case");
  if (one >= 0) {
    // reproduce one case: write it under --to DIR, then e.g. `ridgeline check --studies-dir DIR <id>`
    const { fuzzCase } = await import("./generate.ts");
    const c = fuzzCase(opt("seed", 1), Number(argv[one + 1]), opt("build-every", 100));
    const to = argv[argv.indexOf("--to") + 1];
    c.write(to);
    process.stdout.write(`${JSON.stringify({ id: c.id, mutations: c.mutations, build: c.build })}\n`);
    return 0;
  }
  const count = opt("count", 1000);
  const seed = opt("seed", 1);
  let shown = 0;
  const s = await runFuzz({
    count,
    seed,
    jobs: opt("jobs", 2),
    timeoutMs: opt("timeout-ms", 20_000),
    memoryMb: opt("memory-mb", 1536),
    buildEvery: opt("build-every", 100),
    onCase: () => {
      if (++shown % 500 === 0) process.stderr.write(`  ${shown}/${count}\n`);
    },
  });
  if (argv.includes("--json")) process.stdout.write(`${JSON.stringify(s, null, 2)}\n`);
  else {
    process.stdout.write(`${summaryLine(s)}\n`);
    for (const b of s.bad.slice(0, 30)) process.stdout.write(`  case ${b.index} [${b.mutations.join(", ")}]${b.build ? " (build)" : ""}: ${b.outcome}: ${b.detail}\n`);
  }
  return s.counts.crash + s.counts.hang + s.counts.impossible + s.leftovers > 0 ? 1 : 0;
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  cli(process.argv.slice(2)).then((code) => process.exit(code));
}
