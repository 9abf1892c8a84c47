import { spawnSync } from "node:child_process";
import { fileURLToPath } from "node:url";

export const PROJECT_ROOT = fileURLToPath(new URL("../../", import.meta.url));
const BIN = fileURLToPath(new URL("../../bin/ridgeline.js", import.meta.url));

/** Run `ridgeline <args>` as a child process from `cwd` (default: the project root). */
export function runCli(args: string[], cwd = PROJECT_ROOT): { status: number | null; stdout: string; stderr: string } {
  const r = spawnSync(process.execPath, [BIN, ...args], { cwd, encoding: "utf8", env: { ...process.env, FORCE_COLOR: "0" } });
  return { status: r.status, stdout: r.stdout, stderr: r.stderr };
}

/** Run a CLI command in this process, capturing stdout and stderr. */
export async function runCliInProcess(argv: string[]): Promise<{ code: number; stdout: string; stderr: string }> {
  const { main } = await import("../../src/cli/main.ts");
  let stdout = "";
  let stderr = "";
  const ow = process.stdout.write.bind(process.stdout);
  const ew = process.stderr.write.bind(process.stderr);
  process.stdout.write = ((s: string | Uint8Array) => ((stdout += String(s)), true)) as typeof process.stdout.write;
  process.stderr.write = ((s: string | Uint8Array) => ((stderr += String(s)), true)) as typeof process.stderr.write;
  try {
    const code = await main(argv);
    return { code, stdout, stderr };
  } finally {
    process.stdout.write = ow;
    process.stderr.write = ew;
  }
}
