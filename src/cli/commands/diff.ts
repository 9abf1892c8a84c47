import { copyFileSync, existsSync, mkdirSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join, relative, resolve, sep } from "node:path";
import { analyzeStudies, type AnalyzedStudy } from "../../analysis/analyze-study.ts";
import { TOOL_VERSION } from "../../analysis/provenance.ts";
import { DEFAULT_CACHE_DIR, ResultCache } from "../../cache/result-cache.ts";
import { diffStudies } from "../../diff/diff-studies.ts";
import { diffText } from "../../diff/diff-text.ts";
import { materializeRevision } from "../../diff/materialize-revision.ts";
import { locateStudies, resolveRevision, WORKING_TREE, type Revision, type StudiesLocation } from "../../diff/revision.ts";
import { DEFAULT_THRESHOLDS, type DiffThresholds, type StudiesDiff } from "../../diff/study-diff.ts";
import { changesPageHtml } from "../../render/html/changes-page.ts";
import { InputError } from "../../study/input-error.ts";
import { numberArg, parseArgs, UsageError } from "../args.ts";
import { findStudies, loadStudies } from "../../analysis/load-all.ts";
import { loadCoverageOutputStage } from "../../render/coverage-output-loader.ts";

export const DIFF_USAGE = `Usage: ridgeline diff <rev> [<rev>] [--studies-dir DIR] [--out DIR] [--json]
         [--fade-margin-db X] [--availability-pct X] [--clearance-f1 X] [--cache-dir DIR] [--no-cache]
Compares the studies at two git revisions (the second defaults to the working tree).
Result changes are shown when they exceed the thresholds (defaults: fade margin ${DEFAULT_THRESHOLDS.fade_margin_db} dB,
availability (year) and performance (worst month) ${DEFAULT_THRESHOLDS.availability_pct} percentage points, least clearance ${DEFAULT_THRESHOLDS.clearance_f1} F1); verdict changes always.
Writes the changes page to <out>/changes/index.html (default out: _site).`;

export interface DiffOptions {
  studiesDir?: string;
  thresholds?: Partial<DiffThresholds>;
  /** Cache folder, or null to compute everything. */
  cacheDir?: string | null;
}

/** Load and analyse the studies of one side; input problems name files as `<commit>:<path>`. */
async function analyzeSide(loc: StudiesLocation, rev: Revision, tmp: string, cache: ResultCache | null, notes: string[]): Promise<AnalyzedStudy[]> {
  if (rev.commit === null) return analyzeStudies(loadStudies(findStudies(loc.studiesDir)), { cache, coverageOutputs: loadCoverageOutputStage });
  const short = rev.label.split(" ")[0];
  const into = mkdtempSync(join(tmp, `${short}-`));
  const side = await materializeRevision(loc, rev.commit, short, into);
  notes.push(...side.notes);
  try {
    // the revision as materialised (its own repository) and the working-tree copies linked into it for files git does not hold
    return await analyzeStudies(loadStudies(findStudies(side.studiesDir), { roots: [loc.root, into] }), { cache, coverageOutputs: loadCoverageOutputStage });
  } catch (e) {
    if (!(e instanceof InputError)) throw e;
    const rename = (f: string) => (f.startsWith(into + sep) ? `${short}:${relative(into, f).split(sep).join("/")}` : f);
    throw new InputError(e.problems.map((p) => ({ ...p, file: rename(p.file) })), { cause: e });
  }
}

/** Compare the studies at two revisions (`to` null: the working tree). */
export async function diffRevisions(fromRev: string, toRev: string | null, options: DiffOptions = {}): Promise<StudiesDiff> {
  const thresholds = { ...DEFAULT_THRESHOLDS, ...options.thresholds };
  const loc = locateStudies(options.studiesDir ?? "content/studies");
  const from = resolveRevision(loc.root, fromRev);
  const to = toRev === null ? WORKING_TREE : resolveRevision(loc.root, toRev);
  const cache = options.cacheDir === null ? null : new ResultCache(options.cacheDir ?? DEFAULT_CACHE_DIR);
  const tmp = mkdtempSync(join(tmpdir(), "ridgeline-diff-"));
  const notes: string[] = [];
  try {
    const before = await analyzeSide(loc, from, tmp, cache, notes);
    const after = await analyzeSide(loc, to, tmp, cache, notes);
    return { from, to, thresholds, studies: diffStudies(before, after, thresholds), notes };
  } finally {
    rmSync(tmp, { recursive: true, force: true });
  }
}

/** Write the changes page into `<outDir>/changes/index.html` (with the style sheet when the site has none yet). */
export function writeChangesPage(diff: StudiesDiff, outDir: string): string {
  const dir = join(resolve(outDir), "changes");
  mkdirSync(dir, { recursive: true });
  const file = join(dir, "index.html");
  writeFileSync(file, changesPageHtml(diff, { tool_version: TOOL_VERSION }));
  const css = join(resolve(outDir), "assets", "ridgeline.css");
  const source = resolve("content/assets/ridgeline.css");
  if (!existsSync(css) && existsSync(source)) {
    mkdirSync(join(resolve(outDir), "assets"), { recursive: true });
    copyFileSync(source, css);
  }
  return file;
}

/** `ridgeline diff <rev> [<rev>] …`: exit 0 whether or not anything changed; 2 on bad input. */
export async function diffCommand(argv: string[]): Promise<number> {
  if (argv.includes("--help")) {
    process.stdout.write(`${DIFF_USAGE}\n`);
    return 0;
  }
  const a = parseArgs(argv, { values: ["studies-dir", "out", "fade-margin-db", "availability-pct", "clearance-f1", "cache-dir"], flags: ["json", "no-cache"] });
  if (a.positional.length < 1 || a.positional.length > 2) throw new UsageError(`expected one or two revisions, received ${a.positional.length}.\n${DIFF_USAGE}`);
  const threshold = (name: string) => {
    const v = a.values.get(name)?.[0];
    return v === undefined ? undefined : numberArg(name, v, (x) => x >= 0, "a threshold ≥ 0");
  };
  const thresholds: Partial<DiffThresholds> = {};
  for (const [opt, key] of [["fade-margin-db", "fade_margin_db"], ["availability-pct", "availability_pct"], ["clearance-f1", "clearance_f1"]] as const) {
    const v = threshold(opt);
    if (v !== undefined) thresholds[key] = v;
  }
  const diff = await diffRevisions(a.positional[0], a.positional[1] ?? null, {
    studiesDir: a.values.get("studies-dir")?.[0],
    thresholds,
    cacheDir: a.flags.has("no-cache") ? null : a.values.get("cache-dir")?.[0],
  });
  const page = writeChangesPage(diff, a.values.get("out")?.[0] ?? "_site");
  const rel = relative(process.cwd(), page);
  const shown = rel && !rel.startsWith("..") ? rel : page;
  if (a.flags.has("json")) {
    process.stdout.write(`${JSON.stringify(diff, null, 2)}\n`);
    process.stderr.write(`Changes page: ${shown}\n`);
  } else {
    process.stdout.write(`${diffText(diff)}\n\nChanges page: ${shown}\n`);
  }
  return 0;
}
