import type { LinkResult, StudyResult } from "../analysis/results.ts";
import { showBeforeAfter } from "./diff-format.ts";
import type { DiffThresholds, LinkResultDiff, ResultChange, ResultQuantity } from "./study-diff.ts";

const LABELS: Record<ResultQuantity, [name: string, unit: string, digits: number]> = {
  fade_margin_db: ["fade margin", "dB", 2],
  availability_pct: ["availability", "%", 5],
  performance_pct: ["performance (worst month)", "%", 5],
  min_clearance_f1: ["least clearance", "F1", 3],
  clearance_met: ["clearance", "", 0],
  target_met: ["targets", "", 0],
};

const verdict = (q: ResultQuantity, v: unknown): string => (v === null || v === undefined ? "—" : q === "target_met" ? (v ? "met" : "MISSED") : v ? "meets" : "SHORT");

/** A number beyond its threshold, a verdict that flipped, or a value that appeared or vanished; else null. */
function compareValue(q: ResultQuantity, k_label: string | null, b: number | boolean | null | undefined, a: number | boolean | null | undefined, threshold: number): ResultChange | null {
  const before = b ?? null;
  const after = a ?? null;
  if (before === after) return null;
  const [name, unit, digits] = LABELS[q];
  const what = k_label ? `${name} at k = ${k_label}` : name;
  if (typeof before === "boolean" || typeof after === "boolean") {
    return { quantity: q, k_label, before, after, delta: null, text: `${what} ${verdict(q, before)} → ${verdict(q, after)}` };
  }
  const delta = before !== null && after !== null ? after - before : null;
  if (delta !== null && !(Math.abs(delta) > threshold)) return null;
  return { quantity: q, k_label, before, after, delta, text: `${what} ${showBeforeAfter(before, after, unit, digits, true)}` };
}

/** Verdicts and numbers of one link against its other revision (null: the link is not there). */
function compareLink(b: LinkResult | null, a: LinkResult | null, t: DiffThresholds): ResultChange[] {
  const changes: (ResultChange | null)[] = [
    compareValue("target_met", null, b?.target_met, a?.target_met, 0),
    compareValue("fade_margin_db", null, b?.fade_margin_db, a?.fade_margin_db, t.fade_margin_db),
    compareValue("availability_pct", null, b?.availability_pct, a?.availability_pct, t.availability_pct),
    // the performance objective (short fades, worst month) has its own target beside availability
    compareValue("performance_pct", null, b?.performance_pct, a?.performance_pct, t.availability_pct),
    compareValue("clearance_met", null, b?.clearance_met, a?.clearance_met, 0),
  ];
  const ks = [...new Set([...(a?.clearance ?? []), ...(b?.clearance ?? [])].map((c) => c.k_label))];
  for (const k of ks) {
    const cb = b?.clearance.find((c) => c.k_label === k);
    const ca = a?.clearance.find((c) => c.k_label === k);
    changes.push(compareValue("min_clearance_f1", k, cb?.min_clearance_f1, ca?.min_clearance_f1, t.clearance_f1));
  }
  return changes.filter((c): c is ResultChange => c !== null);
}

/**
 * Result changes per link between two revisions of a study: fade margin, availability (year),
 * performance (worst month) and the
 * least clearance at each k when they moved by more than the thresholds, and every flip of the
 * clearance or target verdict. Added and removed links are listed with their values. Links
 * whose results did not move beyond the thresholds are left out.
 */
export function compareStudyResults(before: StudyResult | null, after: StudyResult | null, t: DiffThresholds): LinkResultDiff[] {
  const bl = new Map((before?.links ?? []).map((l) => [l.id, l]));
  const al = new Map((after?.links ?? []).map((l) => [l.id, l]));
  const ids = [...new Set([...al.keys(), ...bl.keys()])];
  const out: LinkResultDiff[] = [];
  for (const id of ids) {
    const b = bl.get(id) ?? null;
    const a = al.get(id) ?? null;
    const changes = compareLink(b, a, t);
    const status = !b ? "added" : !a ? "removed" : "changed";
    if (changes.length || status !== "changed") out.push({ link: id, status, changes });
  }
  return out;
}
