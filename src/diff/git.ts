import { spawn, spawnSync } from "node:child_process";
import { RidgelineError } from "../errors.ts";

/** A git command that failed; `message` carries git's own words. */
export class GitError extends RidgelineError {}

/** The environment for git: without variables a hook may set that would point git elsewhere. */
function gitEnv(): NodeJS.ProcessEnv {
  const env = { ...process.env };
  for (const k of ["GIT_DIR", "GIT_WORK_TREE", "GIT_INDEX_FILE"]) delete env[k];
  return env;
}

/** Run git in `cwd`; returns stdout (bytes). @throws GitError with git's message, or when git is missing */
export function gitBytes(cwd: string, args: string[]): Buffer {
  const r = spawnSync("git", args, { cwd, env: gitEnv(), maxBuffer: Infinity });
  if (r.error) throw new GitError(`could not run git (${r.error.message}); install git or put it on PATH.`, { cause: r.error });
  if (r.status !== 0) throw new GitError(r.stderr.toString("utf8").trim() || `git ${args[0]} failed with exit code ${r.status}`);
  return r.stdout;
}

/** Run git in `cwd`; returns stdout as text without the trailing newline. */
export function git(cwd: string, args: string[]): string {
  return gitBytes(cwd, args).toString("utf8").replace(/\n$/, "");
}

/** One file of a tree, as `git ls-tree` lists it. */
export interface TreeEntry {
  mode: string;
  type: string;
  object: string;
  /** Path from the repository root. */
  path: string;
}

/** Every file under `paths` (repository-relative) at commit `sha`, recursively. */
export function lsTree(root: string, sha: string, paths: string[]): TreeEntry[] {
  const out = gitBytes(root, ["ls-tree", "-r", "-z", "--full-tree", sha, "--", ...paths]).toString("utf8");
  return out
    .split("\0")
    .filter((l) => l.length > 0)
    .map((l) => {
      const tab = l.indexOf("\t");
      const [mode, type, object] = l.slice(0, tab).split(" ");
      return { mode, type, object, path: l.slice(tab + 1) };
    });
}

/**
 * The contents of many blobs through one `git cat-file --batch` process, in the order asked.
 * @throws GitError when git fails or an object is missing
 */
export async function catBlobs(root: string, objects: string[]): Promise<Buffer[]> {
  if (objects.length === 0) return [];
  const child = spawn("git", ["cat-file", "--batch"], { cwd: root, env: gitEnv() });
  const chunks: Buffer[] = [];
  const errs: Buffer[] = [];
  child.stdout.on("data", (c: Buffer) => chunks.push(c));
  child.stderr.on("data", (c: Buffer) => errs.push(c));
  const done = new Promise<number>((resolve, reject) => {
    child.on("error", (e) => reject(new GitError(`could not run git (${e.message}); install git or put it on PATH.`, { cause: e })));
    child.on("close", (code) => resolve(code ?? 1));
  });
  child.stdin.end(`${objects.join("\n")}\n`);
  const code = await done;
  if (code !== 0) throw new GitError(Buffer.concat(errs).toString("utf8").trim() || `git cat-file failed with exit code ${code}`);
  // Output: "<object> <type> <size>\n<size bytes>\n" per object, or "<object> missing\n".
  const all = Buffer.concat(chunks);
  const blobs: Buffer[] = [];
  let at = 0;
  for (const obj of objects) {
    const nl = all.indexOf(0x0a, at);
    const header = all.toString("utf8", at, nl).split(" ");
    if (nl < 0 || header[1] === "missing" || header.length !== 3) throw new GitError(`git object ${obj} is missing from the repository`);
    const size = Number(header[2]);
    blobs.push(all.subarray(nl + 1, nl + 1 + size));
    at = nl + 1 + size + 1;
  }
  return blobs;
}
