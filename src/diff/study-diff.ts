/** What changed between two revisions of the studies: inputs and results per link. */
import type { InterferenceChange } from "./compare-interference.ts";

/** Kinds of input change, by the part of the study they touch. */
export type InputChangeKind = "study" | "meta" | "terrain" | "design" | "target" | "climate" | "radio" | "site" | "site-moved" | "link" | "antenna" | "profile" | "chain" | "coverage" | "interference";

export type DiffValue = string | number | boolean | null;

/** One changed input. */
export interface InputChange {
  kind: InputChangeKind;
  /** What it belongs to: "link harr-kvtw", "site HARR", "radio bh11", "design", "climate", "terrain". */
  subject: string;
  /** Field as written in study.yaml ("from.antenna_m", "frequency_ghz"); "position" for a moved site. */
  field: string;
  /** Value before; null when the subject was added. */
  before: DiffValue;
  /** Value after; null when the subject was removed. */
  after: DiffValue;
  /** after − before for numbers; for a moved site the geodesic distance moved (m); else null. */
  delta: number | null;
  /** Unit of before/after/delta ("m", "dB", "GHz", "%"), or "". */
  unit: string;
  /** Ids of the links whose results depend on this input. */
  links: string[];
  /** One line for people. */
  text: string;
}

/** Result quantities compared per link. */
export type ResultQuantity = "fade_margin_db" | "availability_pct" | "performance_pct" | "min_clearance_f1" | "clearance_met" | "target_met";

/** One result of a link that moved beyond its threshold (or changed verdict). */
export interface ResultChange {
  quantity: ResultQuantity;
  /** For clearance: the k it is at ("4/3"); else null. */
  k_label: string | null;
  before: number | boolean | null;
  after: number | boolean | null;
  /** after − before for numbers; null when either is missing. */
  delta: number | null;
  text: string;
}

/** The result changes of one link. */
export interface LinkResultDiff {
  link: string;
  status: "added" | "removed" | "changed";
  changes: ResultChange[];
}

/** Everything that changed in one study. */
export interface StudyDiff {
  id: string;
  status: "added" | "removed" | "changed" | "unchanged";
  inputs: InputChange[];
  results: LinkResultDiff[];
  /** Receivers whose interference verdict or figures moved (compare-interference.ts). */
  interference: InterferenceChange[];
}

/** Result changes smaller than these (absolute) are not reported. */
export interface DiffThresholds {
  /** fade margin (dB) */
  fade_margin_db: number;
  /** availability (year) and performance (worst month), percentage points */
  availability_pct: number;
  /** least clearance at each k (fraction of F1) */
  clearance_f1: number;
}

export const DEFAULT_THRESHOLDS: DiffThresholds = { fade_margin_db: 0.5, availability_pct: 0.001, clearance_f1: 0.05 };

/** One side of the comparison. */
export interface RevisionInfo {
  rev: string;
  commit: string | null;
  label: string;
}

/** The whole comparison, as `ridgeline diff --json` prints it. */
export interface StudiesDiff {
  from: RevisionInfo;
  to: RevisionInfo;
  thresholds: DiffThresholds;
  studies: StudyDiff[];
  /** Remarks on how the revisions were read (e.g. a terrain file taken from the working tree). */
  notes: string[];
}
