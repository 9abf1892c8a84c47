import type { AnalyzedStudy } from "../analysis/analyze-study.ts";
import type { LinkResult, StudyResult } from "../analysis/results.ts";

/** What the templates see as the global `ridgeline`. */
export interface SiteData {
  studies: StudyResult[];
  /** Every link of every study, with its study id, for one page per link. */
  links: (LinkResult & { study_id: string; study_title: string; revision: string; provenance: StudyResult["provenance"] })[];
  /** Options of this build. */
  options: { path_prefix: string };
}

let analyzed: AnalyzedStudy[] | null = null;
let prefix = "/";

/** Hand the analysed studies to the site before Eleventy runs (the CLI does this). */
export function setAnalyzedStudies(studies: AnalyzedStudy[], pathPrefix = "/"): void {
  analyzed = [...studies].sort((a, b) => a.study.id.localeCompare(b.study.id));
  prefix = pathPrefix;
}

/** The analysed studies handed over by setAnalyzedStudies, or null. */
export function getAnalyzedStudies(): AnalyzedStudy[] | null {
  return analyzed;
}

/** Build the templates' data from the analysed studies. */
export function siteData(studies: AnalyzedStudy[]): SiteData {
  return {
    studies: studies.map((s) => s.result),
    links: studies.flatMap((s) => s.result.links.map((l) => ({ ...l, study_id: s.result.id, study_title: s.result.title, revision: s.result.revision, provenance: s.result.provenance }))),
    options: { path_prefix: prefix },
  };
}

/** Find the analysed study by id (for shortcodes that draw figures). */
export function analyzedStudy(id: string): AnalyzedStudy {
  const s = analyzed?.find((a) => a.study.id === id);
  if (!s) throw new Error(`Study ${id} has not been analysed in this build.`);
  return s;
}
