import type { StudyResult } from "../analysis/results.ts";
import { showBeforeAfter } from "./diff-format.ts";

/** One receiver whose interference verdict or figures moved between two revisions. */
export interface InterferenceChange {
  receiver: string;
  status: "added" | "removed" | "changed";
  met_before: boolean | null;
  met_after: boolean | null;
  threshold_degradation_before_db: number | null;
  threshold_degradation_after_db: number | null;
  worst_ci_margin_before_db: number | null;
  worst_ci_margin_after_db: number | null;
  text: string;
}

/** Threshold degradation (dB) and C/I margin (dB) moves smaller than these are not reported. */
export const INTERFERENCE_DIFF_THRESHOLDS = { threshold_degradation_db: 0.1, ci_margin_db: 0.5 };

/**
 * Interference changes per receiver: a verdict that flipped, a long-term threshold
 * degradation or worst C/I margin that moved beyond INTERFERENCE_DIFF_THRESHOLDS, receivers
 * added or removed (a study that gained or lost the analysis lists every receiver).
 */
export function compareInterference(before: StudyResult | null, after: StudyResult | null): InterferenceChange[] {
  const bm = new Map((before?.interference?.receivers ?? []).map((r) => [r.id, r]));
  const am = new Map((after?.interference?.receivers ?? []).map((r) => [r.id, r]));
  const out: InterferenceChange[] = [];
  const verdict = (m: boolean | null) => (m === null ? "—" : m ? "met" : "MISSED");
  for (const id of [...new Set([...am.keys(), ...bm.keys()])].sort()) {
    const b = bm.get(id) ?? null;
    const a = am.get(id) ?? null;
    const td = [b?.threshold_degradation_long_term_db ?? null, a?.threshold_degradation_long_term_db ?? null] as const;
    const ci = [b?.worst_ci_margin_db ?? null, a?.worst_ci_margin_db ?? null] as const;
    const moved = (x: readonly [number | null, number | null], t: number) => x[0] !== x[1] && (x[0] === null || x[1] === null || Math.abs(x[1] - x[0]) > t);
    const flip = (b?.met ?? null) !== (a?.met ?? null);
    const status = !b ? "added" : !a ? "removed" : "changed";
    if (status === "changed" && !flip && !moved(td, INTERFERENCE_DIFF_THRESHOLDS.threshold_degradation_db) && !moved(ci, INTERFERENCE_DIFF_THRESHOLDS.ci_margin_db)) continue;
    const parts = [`interference ${verdict(b?.met ?? null)} → ${verdict(a?.met ?? null)}`, `threshold degradation ${showBeforeAfter(td[0], td[1], "dB", 2, true)}`, `worst C/I margin ${showBeforeAfter(ci[0], ci[1], "dB", 1, true)}`];
    out.push({
      receiver: id,
      status,
      met_before: b?.met ?? null,
      met_after: a?.met ?? null,
      threshold_degradation_before_db: td[0],
      threshold_degradation_after_db: td[1],
      worst_ci_margin_before_db: ci[0],
      worst_ci_margin_after_db: ci[1],
      text: parts.join("; "),
    });
  }
  return out;
}
