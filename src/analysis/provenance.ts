import { execFile, execFileSync } from "node:child_process";
import { existsSync, readFileSync } from "node:fs";
import { dirname, join, resolve } from "node:path";

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

const notInGit = (): GitState => ({ git_commit: null, git_dirty: null });

function parseStatus(out: string): GitState {
  const lines = out.split("\n").filter((l) => l.length > 0);
  const oid = lines.find((l) => l.startsWith("# branch.oid "))?.slice("# branch.oid ".length).trim();
  if (!oid || !/^[0-9a-f]{40,64}$/.test(oid)) return notInGit();
  return { git_commit: oid, git_dirty: lines.some((l) => !l.startsWith("#")) };
}

/** Whether `dir` or a folder above it holds a `.git` (folder, or file for a worktree); starting git costs more than looking. */
function insideGitWorkTree(dir: string): boolean {
  for (let d = resolve(dir); ; d = dirname(d)) {
    if (existsSync(join(d, ".git"))) return true;
    if (dirname(d) === d) return false;
  }
}

/**
 * The git commit holding `dir` (HEAD) and whether files under `dir` differ from it, untracked
 * ones included; both null outside git or before the first commit.
 */
export function gitState(dir: string): GitState {
  if (!insideGitWorkTree(dir)) return notInGit();
  try {
    return parseStatus(execFileSync("git", STATUS, { cwd: dir, env: gitEnv(), stdio: ["ignore", "pipe", "ignore"] }).toString());
  } catch {
    return notInGit();
  }
}

/** gitState without blocking: git runs while other work goes on. */
export function gitStateAsync(dir: string): Promise<GitState> {
  if (!insideGitWorkTree(dir)) return Promise.resolve(notInGit());
  return new Promise((done) => {
    try {
      execFile("git", STATUS, { cwd: dir, env: gitEnv() }, (err, stdout) => done(err ? notInGit() : parseStatus(stdout.toString())));
    } catch {
      done(notInGit());
    }
  });
}
