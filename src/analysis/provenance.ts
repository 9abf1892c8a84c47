import { execFileSync } from "node:child_process";
import { readFileSync } from "node:fs";

/** Ridgeline's version, from package.json. */
export const TOOL_VERSION: string = JSON.parse(readFileSync(new URL("../../package.json", import.meta.url), "utf8")).version;

/** The git commit holding `dir` and whether files under it differ from that commit (null outside git). */
export function gitState(dir: string): { git_commit: string | null; git_dirty: boolean | null } {
  try {
    const commit = execFileSync("git", ["rev-parse", "HEAD"], { cwd: dir, stdio: ["ignore", "pipe", "ignore"] }).toString().trim();
    const status = execFileSync("git", ["status", "--porcelain", "--", "."], { cwd: dir, stdio: ["ignore", "pipe", "ignore"] }).toString().trim();
    return { git_commit: commit, git_dirty: status.length > 0 };
  } catch {
    return { git_commit: null, git_dirty: null };
  }
}
