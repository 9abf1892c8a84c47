import type { AnalyzedStudy } from "../analysis/analyze-study.ts";
import type { LinkResult, StudyResult } from "../analysis/results.ts";
import { linkInterference, type LinkInterference } from "./interference-report.ts";
import { DISCLAIMER } from "./disclaimer.ts";
import { linkReport, type LinkReport } from "./link-report.ts";
import { studyReport, type StudyReport } from "./study-report.ts";

/** One link as the templates see it: its result, its study's identity and its report tables. */
export type SiteLink = LinkResult & { study_id: string; study_title: string; revision: string; provenance: StudyResult["provenance"]; report: LinkReport; interference: LinkInterference | null };

/** What the templates see as the global `ridgeline`. */
export interface SiteData {
  /** The studies' results exactly as written to results.json. */
  studies: StudyResult[];
  /** Every link of every study, with its study id, for one page per link. */
  links: SiteLink[];
  /** Per study id: assumptions, summaries and cautions for the study page. */
  reports: Record<string, StudyReport>;
  /** Options of this build. */
  options: { path_prefix: string };
  /** The one disclaimer of every page's footer, on screen and in print. */
  disclaimer: string;
}

/**
 * The hand-over between the CLI and Eleventy lives on globalThis: Eleventy loads its config
 * (and so this module) through Node's own loader, which under a test runner such as vitest is
 * a second instance of this module beside the one the caller imported.
 */
const HANDOVER = Symbol.for("ridgeline.site-data.handover");
type Handover = { analyzed: AnalyzedStudy[] | null; prefix: string };
function handover(): Handover {
  const g = globalThis as typeof globalThis & { [HANDOVER]?: Handover };
  g[HANDOVER] ??= { analyzed: null, prefix: "/" };
  return g[HANDOVER];
}

/** Hand the analysed studies to the site before Eleventy runs (the CLI does this). */
export function setAnalyzedStudies(studies: AnalyzedStudy[], pathPrefix = "/"): void {
  const h = handover();
  h.analyzed = [...studies].sort((a, b) => (a.study.id < b.study.id ? -1 : a.study.id > b.study.id ? 1 : 0));
  h.prefix = pathPrefix;
}

/** The analysed studies handed over by setAnalyzedStudies, or null. */
export function getAnalyzedStudies(): AnalyzedStudy[] | null {
  return handover().analyzed;
}

/** Build the templates' data from the analysed studies. */
export function siteData(studies: AnalyzedStudy[]): SiteData {
  return {
    studies: studies.map((s) => s.result),
    links: studies.flatMap((s) =>
      s.result.links.map((l) => ({
        ...l,
        study_id: s.result.id,
        study_title: s.result.title,
        revision: s.result.revision,
        provenance: s.result.provenance,
        report: linkReport(l, s.study.radios.find((r) => r.id === l.radio)?.name, s.study.design.diffraction_method),
        interference: linkInterference(s.result, l.id),
      })),
    ),
    reports: Object.fromEntries(studies.map((s) => [s.result.id, studyReport(s)])),
    options: { path_prefix: handover().prefix },
    disclaimer: DISCLAIMER,
  };
}

/** Find the analysed study by id (for shortcodes that draw figures). */
export function analyzedStudy(id: string): AnalyzedStudy {
  const s = handover().analyzed?.find((a) => a.study.id === id);
  if (!s) throw new Error(`Study ${id} has not been analysed in this build.`);
  return s;
}
