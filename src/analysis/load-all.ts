import { existsSync, lstatSync, readdirSync, statSync } from "node:fs";
import { join, resolve } from "node:path";
import { analyzeStudies, type AnalyzedStudy } from "./analyze-study.ts";
import type { CoverageOutputStage } from "../coverage/coverage-output-stage.ts";
import { DEFAULT_CACHE_DIR, ResultCache } from "../cache/result-cache.ts";
import { InputError, type InputProblem } from "../study/input-error.ts";
import { loadStudy } from "../study/load-study.ts";
import type { Study } from "../study/study.ts";

/** Study folders under `root` (those holding a study.yaml), sorted by id; optionally only `ids`. */
export function findStudies(root: string, ids?: string[]): string[] {
  const abs = resolve(root);
  if (existsSync(abs) && !statSync(abs).isDirectory()) {
    throw new InputError([{ file: abs, field: "", received: "a file, not a folder", expected: "the folder holding one sub-folder per study (--studies-dir)" }]);
  }
  const all = existsSync(abs)
    ? readdirSync(abs, { withFileTypes: true })
        .filter((d) => d.isDirectory() && present(join(abs, d.name, "study.yaml")))
        .map((d) => d.name)
        .sort()
    : [];
  if (ids && ids.length) {
    const missing = ids.filter((id) => !all.includes(id));
    if (missing.length) {
      throw new InputError(missing.map((id) => ({ file: join(abs, id, "study.yaml"), field: "", received: `study id "${id}"`, expected: `one of the studies in ${root}: ${all.join(", ") || "(none)"}` })));
    }
    return ids.map((id) => join(abs, id, "study.yaml"));
  }
  return all.map((id) => join(abs, id, "study.yaml"));
}

/** Whether something named `p` is there, a dangling symbolic link included (loading it says what is wrong). */
function present(p: string): boolean {
  try {
    lstatSync(p);
    return true;
  } catch {
    return false;
  }
}

/**
 * Load every study, reporting the problems of all of them together.
 * @param options.roots folders besides each study's own that its files may lie in (load-study.ts)
 */
export function loadStudies(files: string[], options: { roots?: string[] } = {}): Study[] {
  const problems: InputProblem[] = [];
  const studies: Study[] = [];
  for (const f of files) {
    try {
      studies.push(loadStudy(f, options));
    } catch (e) {
      if (e instanceof InputError) problems.push(...e.problems);
      else throw e;
    }
  }
  if (problems.length) throw new InputError(problems);
  return studies;
}

/**
 * Load and analyse the studies under `root` (all, or those named), through the result cache
 * unless `cache` is null.
 */
export async function loadAllStudies(
  root: string,
  options: { ids?: string[]; cache?: ResultCache | null; coverageOutputs?: () => Promise<CoverageOutputStage>; onProgress?: (study: string, done: number, total: number) => void } = {},
): Promise<AnalyzedStudy[]> {
  const cache = options.cache === undefined ? new ResultCache(DEFAULT_CACHE_DIR) : options.cache;
  return analyzeStudies(loadStudies(findStudies(root, options.ids)), { cache, coverageOutputs: options.coverageOutputs, onProgress: options.onProgress });
}
