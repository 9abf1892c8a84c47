import type { StudyInput } from "./schema.ts";

/** An effective Earth-radius factor with the text it was given as (for reports). */
export interface KFactor {
  /** k (dimensionless); Infinity for a flat Earth. */
  k: number;
  /** As written in the study: "4/3", "inf", "1.2", "P.453 from −40 N/km". */
  label: string;
}

export type TerrainInput = StudyInput["terrain"];
export type RadioInput = StudyInput["radios"][number];
export type SiteInput = StudyInput["sites"][number];
export type LinkInput = StudyInput["links"][number];
export type CoverageInput = StudyInput["coverage"][number];

/** A validated study: plain objects, units in names, references resolved. */
export interface Study {
  id: string;
  /** Absolute folder of the study. */
  dir: string;
  /** Absolute path of study.yaml. */
  file: string;
  meta: { title: string; client: string; prepared_by: string; revision: string; date: string; summary?: string };
  /** Document control: number, paper, revision history, sign-off (absent in hand-built studies). */
  document?: StudyInput["document"];
  terrain: TerrainInput;
  design: Omit<StudyInput["design"], "k_factors" | "clearance_criteria"> & {
    k_factors: KFactor[];
    clearance_criteria: { k: KFactor; min_f1: number }[];
  };
  climate: StudyInput["climate"];
  radios: RadioInput[];
  sites: SiteInput[];
  links: (LinkInput & { index: number })[];
  chains: StudyInput["chains"];
  /** Interference analysis asked for (absent: none). */
  interference?: StudyInput["interference"];
  /** Coverage maps (optional until every loader fills it). */
  coverage?: CoverageInput[];
  /** Where a field path sits in study.yaml (for errors found after loading). */
  locate(path: ReadonlyArray<PropertyKey>): { line: number; col: number };
  /** sha256 of the study file's bytes. */
  file_sha256: string;
}
