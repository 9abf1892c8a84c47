import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";

/**
 * Temporary folders of this process (coverage outputs before the site copies them), removed
 * when their user is done (removeTempDir), and in any case when the process exits, fails or
 * is interrupted (SIGINT, SIGTERM, SIGHUP): a run never leaves `ridgeline-*` folders behind.
 */

const live = new Set<string>();
let hooked = false;
const SIGNALS = ["SIGINT", "SIGTERM", "SIGHUP"] as const;

function onSignal(signal: NodeJS.Signals): void {
  removeTempDirs();
  // Alone, take the default action (end the process by the signal, exit status 128 + n);
  // when the command listens too (serve closes its server), let it finish the process.
  if (process.listenerCount(signal) === 1) {
    for (const s of SIGNALS) process.removeListener(s, onSignal);
    process.kill(process.pid, signal);
  }
}

function hook(): void {
  if (hooked) return;
  hooked = true;
  process.on("exit", removeTempDirs);
  for (const s of SIGNALS) process.on(s, onSignal);
}

/** Make a temporary folder `<tmp>/<prefix>XXXXXX`, removed at the latest when the process ends. */
export function makeTempDir(prefix: string): string {
  hook();
  const dir = mkdtempSync(join(tmpdir(), prefix));
  live.add(dir);
  return dir;
}

/** Remove one temporary folder made by makeTempDir. */
export function removeTempDir(dir: string): void {
  rmSync(dir, { recursive: true, force: true });
  live.delete(dir);
}

/** Remove every temporary folder this process still holds. */
export function removeTempDirs(): void {
  for (const dir of [...live]) {
    try {
      removeTempDir(dir);
    } catch {
      // best effort at exit: a folder that cannot be removed now cannot be removed later either
    }
  }
}
