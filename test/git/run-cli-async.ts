import { spawn } from "node:child_process";
import { PROJECT_ROOT } from "../helpers/run-cli.ts";

const BIN = `${PROJECT_ROOT}bin/ridgeline.js`;

/** Run `ridgeline <args>` as a child process without blocking, so several can run at once. */
export function runCliAsync(args: string[], cwd = PROJECT_ROOT): Promise<{ status: number | null; stdout: string; stderr: string }> {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, [BIN, ...args], { cwd, env: { ...process.env, FORCE_COLOR: "0" } });
    let stdout = "";
    let stderr = "";
    child.stdout.on("data", (c) => (stdout += c));
    child.stderr.on("data", (c) => (stderr += c));
    child.on("error", reject);
    child.on("close", (status) => resolve({ status, stdout, stderr }));
  });
}
