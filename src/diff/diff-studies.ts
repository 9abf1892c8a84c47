import type { AnalyzedStudy } from "../analysis/analyze-study.ts";
import { compareStudyInputs } from "./compare-inputs.ts";
import { compareInterference } from "./compare-interference.ts";
import { compareStudyResults } from "./compare-results.ts";
import type { DiffThresholds, StudyDiff } from "./study-diff.ts";

/** Compare two analysed sets of studies, matched by id; studies in sorted id order. */
export function diffStudies(before: AnalyzedStudy[], after: AnalyzedStudy[], thresholds: DiffThresholds): StudyDiff[] {
  const bm = new Map(before.map((s) => [s.study.id, s]));
  const am = new Map(after.map((s) => [s.study.id, s]));
  const ids = [...new Set([...bm.keys(), ...am.keys()])].sort();
  return ids.map((id) => {
    const b = bm.get(id) ?? null;
    const a = am.get(id) ?? null;
    const inputs = compareStudyInputs(b?.study ?? null, a?.study ?? null);
    const results = compareStudyResults(b?.result ?? null, a?.result ?? null, thresholds);
    const interference = compareInterference(b?.result ?? null, a?.result ?? null);
    const status = !b ? "added" : !a ? "removed" : inputs.length || results.length || interference.length ? "changed" : "unchanged";
    return { id, status, inputs, results, interference };
  });
}
