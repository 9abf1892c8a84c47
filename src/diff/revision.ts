import { existsSync, realpathSync } from "node:fs";
import { dirname, relative, resolve, sep } from "node:path";
import { UsageError } from "../cli/args.ts";
import { git, GitError } from "./git.ts";

/** A revision the diff compares: a commit, or the working tree (commit null). */
export interface Revision {
  /** As given on the command line ("HEAD~1", "main"), or "working tree". */
  rev: string;
  /** Full commit id; null for the working tree. */
  commit: string | null;
  /** Short id and subject ("1a2b3c4 Raise the Harrow Top antenna"), or "working tree". */
  label: string;
}

/** Where a studies folder sits in its git repository. */
export interface StudiesLocation {
  /** Repository root (real path). */
  root: string;
  /** The studies folder relative to the root, with "/" separators ("" for the root itself). */
  studiesRel: string;
  /** The studies folder in the working tree (real path when it exists). */
  studiesDir: string;
}

/**
 * Find the git repository holding `studiesDir` (which need not exist in the working tree).
 * @throws UsageError when the folder is not inside a git repository
 */
export function locateStudies(studiesDir: string): StudiesLocation {
  let probe = resolve(studiesDir);
  while (!existsSync(probe) && dirname(probe) !== probe) probe = dirname(probe);
  const real = realpathSync(probe);
  let root: string;
  try {
    root = realpathSync(git(real, ["rev-parse", "--show-toplevel"]));
  } catch (e) {
    if (e instanceof GitError) throw new UsageError(`${studiesDir} is not inside a git repository (${e.message.split("\n")[0]}); diff compares studies between git revisions.`, { cause: e });
    throw e;
  }
  const full = resolve(real, relative(probe, resolve(studiesDir)));
  const studiesRel = relative(root, full).split(sep).join("/");
  if (studiesRel.startsWith("..")) throw new UsageError(`${studiesDir} lies outside the git repository at ${root}.`);
  return { root, studiesRel, studiesDir: full };
}

/**
 * Resolve a revision name to a commit.
 * @throws UsageError naming the revision when git does not know it as a commit
 */
export function resolveRevision(root: string, rev: string): Revision {
  const bad = () =>
    new UsageError(`unknown revision "${rev}": it is not a commit in the repository at ${root}. Give a commit id, branch or tag (e.g. HEAD~1, main, v1.2); \`git log --oneline\` lists commits.`);
  if (rev.trim() === "" || rev.startsWith("-")) throw bad();
  let commit: string;
  try {
    commit = git(root, ["rev-parse", "--verify", "--quiet", `${rev}^{commit}`]);
  } catch (e) {
    if (e instanceof GitError) throw bad();
    throw e;
  }
  if (!/^[0-9a-f]{40,64}$/.test(commit)) throw bad();
  const summary = git(root, ["log", "-1", "--format=%h %s", commit]);
  return { rev, commit, label: summary };
}

/** The working tree as a revision. */
export const WORKING_TREE: Revision = { rev: "working tree", commit: null, label: "working tree" };
