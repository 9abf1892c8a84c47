import { execFile, execFileSync } from "node:child_process";
import { readFileSync } from "node:fs";

/** Ridgeline's version, from package.json. */
export const TOOL_VERSION: string = JSON.parse(readFileSync(new URL("../../package.json", import.meta.url), "utf8")).version;

export interface GitState {
  git_commit: string | null;
  git_dirty: boolean | null;
}

// One git process answers both questions: `status --porcelain=v2 --branch` prints the HEAD
// commit as "# branch.oid <sha>" ("(initial)" before the first commit) and one line per file
// under `dir` that differs from it, untracked files included. `--no-optional-locks`: status
// must not take .git/index.lock, which would make a commit made at the same moment fail.
const STATUS = ["--no-optional-locks", "status", "--porcelain=v2", "--branch", "--", "."];

/** Without the variables a git hook sets (GIT_DIR …), which would point git away from `dir`. */
function gitEnv(): NodeJS.ProcessEnv {
  const env = { ...process.env };
  for (const k of ["GIT_DIR", "GIT_WORK_TREE", "GIT_INDEX_FILE"]) delete env[k];
  return env;
}

function parseStatus(out: string): GitState {
  const lines = out.split("\n").filter((l) => l.length > 0);
  const oid = lines.find((l) => l.startsWith("# branch.oid "))?.slice("# branch.oid ".length).trim();
  if (!oid || !/^[0-9a-f]{40,64}$/.test(oid)) return { git_commit: null, git_dirty: null };
  return { git_commit: oid, git_dirty: lines.some((l) => !l.startsWith("#")) };
}

/**
 * The git commit holding `dir` (HEAD) and whether files under `dir` differ from it, untracked
 * ones included; both null outside git or before the first commit.
 */
export function gitState(dir: string): GitState {
  try {
    return parseStatus(execFileSync("git", STATUS, { cwd: dir, env: gitEnv(), stdio: ["ignore", "pipe", "ignore"] }).toString());
  } catch {
    return { git_commit: null, git_dirty: null };
  }
}

/** gitState without blocking: git runs while other work goes on. */
export function gitStateAsync(dir: string): Promise<GitState> {
  return new Promise((resolve) => {
    try {
      execFile("git", STATUS, { cwd: dir, env: gitEnv() }, (err, stdout) => resolve(err ? { git_commit: null, git_dirty: null } : parseStatus(stdout.toString())));
    } catch {
      resolve({ git_commit: null, git_dirty: null });
    }
  });
}
