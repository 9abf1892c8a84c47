import { spawnSync } from "node:child_process";
import { fileURLToPath } from "node:url";

export const PROJECT_ROOT = fileURLToPath(new URL("../../", import.meta.url));
const BIN = fileURLToPath(new URL("../../bin/ridgeline.js", import.meta.url));

/** Run `ridgeline <args>` as a child process from `cwd` (default: the project root). */
export function runCli(args: string[], cwd = PROJECT_ROOT): { status: number | null; stdout: string; stderr: string } {
  const r = spawnSync(process.execPath, [BIN, ...args], { cwd, encoding: "utf8", env: { ...process.env, FORCE_COLOR: "0" } });
  return { status: r.status, stdout: r.stdout, stderr: r.stderr };
}
