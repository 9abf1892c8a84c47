// ridgeline commands as child processes running side by side (a coordinator and its workers).
import { spawn, type ChildProcess } from "node:child_process";
import { readdirSync, readFileSync, statSync } from "node:fs";
import { join, relative } from "node:path";
import { fileURLToPath } from "node:url";
import { PROJECT_ROOT } from "../helpers/run-cli.ts";

const BIN = fileURLToPath(new URL("../../bin/ridgeline.js", import.meta.url));

export interface CliProcess {
  proc: ChildProcess;
  /** stderr and stdout so far */
  output(): string;
  /** resolves with the exit code (or the signal's name) */
  exited: Promise<number | string>;
  /** resolves when the output matches `re` (rejects after `ms`) */
  waitFor(re: RegExp, ms?: number): Promise<void>;
}

/** Start `node <bin> …args` (default: this checkout's bin) from the project root. */
export function startCli(args: string[], bin = BIN, cwd = PROJECT_ROOT, env: NodeJS.ProcessEnv = {}): CliProcess {
  const proc = spawn(process.execPath, [bin, ...args], { cwd, env: { ...process.env, FORCE_COLOR: "0", ...env }, stdio: ["ignore", "pipe", "pipe"] });
  let out = "";
  const watchers: { re: RegExp; done: () => void }[] = [];
  const onData = (d: Buffer) => {
    out += d.toString();
    for (const w of [...watchers]) if (w.re.test(out)) {
      watchers.splice(watchers.indexOf(w), 1);
      w.done();
    }
  };
  proc.stdout!.on("data", onData);
  proc.stderr!.on("data", onData);
  const exited = new Promise<number | string>((r) => proc.once("exit", (code, signal) => r(code ?? signal ?? -1)));
  return {
    proc,
    output: () => out,
    exited,
    waitFor(re, ms = 60_000) {
      if (re.test(out)) return Promise.resolve();
      return new Promise((resolve, reject) => {
        const timer = setTimeout(() => reject(new Error(`timed out waiting for ${re} in:\n${out}`)), ms);
        watchers.push({ re, done: () => (clearTimeout(timer), resolve()) });
      });
    },
  };
}

/** Stop a worker (SIGTERM: it finishes the task in hand) and wait for it. */
export async function stopCli(p: CliProcess): Promise<number | string> {
  if (p.proc.exitCode === null && p.proc.signalCode === null) p.proc.kill("SIGTERM");
  return p.exited;
}

/** Every file under `dir` (relative path → bytes), to compare two sites byte for byte. */
export function treeBytes(dir: string): Map<string, Buffer> {
  const out = new Map<string, Buffer>();
  const walk = (d: string) => {
    for (const name of readdirSync(d).sort()) {
      const f = join(d, name);
      if (statSync(f).isDirectory()) walk(f);
      else out.set(relative(dir, f), readFileSync(f));
    }
  };
  walk(dir);
  return out;
}
