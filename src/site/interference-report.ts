import type { AnalyzedStudy } from "../analysis/analyze-study.ts";
import type { InterferenceEntry, InterferenceReceiver, InterferenceResult } from "../analysis/interference-result.ts";
import type { StudyResult } from "../analysis/results.ts";

/** One direction of one link in the frequency plan table. */
export interface FrequencyPlanRow {
  link: string;
  direction: "go" | "return";
  from: string;
  to: string;
  frequency_mhz: number;
  bandwidth_mhz: number;
  polarization: "h" | "v";
  radio: string;
}

/** What the study page shows of the frequency plan and the interference analysis. */
export interface InterferenceReport {
  plan: FrequencyPlanRow[];
  result: InterferenceResult | null;
  /** The worst entries (all failing ones, then up to 20 more). */
  worst: InterferenceEntry[];
  /** Counted entries left out of the worst list. */
  more: number;
  /** Antenna patterns used, for the basis of the study. */
  patterns: string[];
  /** Interference paths drawn on the overview map. */
  map_paths: number;
}

/** A link's part of the interference result: its two receivers and the entries into each. */
export interface LinkInterference {
  receivers: (InterferenceReceiver & { entries_list: InterferenceEntry[] })[];
}

/** How many of the strongest computed interference paths the overview map draws (besides every failing one). */
export const MAP_STRONGEST_PATHS = 40;

/**
 * Interferers drawn on the overview map: every one over its receiver's limit, and the
 * strongest others by interference-to-noise ratio after the receiver's filter (up to
 * MAP_STRONGEST_PATHS). Same-site entries have no path and are left out.
 */
export function mapEntries(r: InterferenceResult): InterferenceEntry[] {
  const noise = new Map(r.receivers.map((x) => [x.id, x.noise_dbm]));
  const withPath = r.entries.filter((e) => !e.same_site && e.interference_long_term_dbm !== null);
  const iOverN = (e: InterferenceEntry) => e.interference_long_term_dbm! - e.filter_discrimination_db - (noise.get(e.receiver) ?? 0);
  const failing = withPath.filter((e) => !e.met);
  const strongest = withPath.filter((e) => e.met).sort((a, b) => iOverN(b) - iOverN(a)).slice(0, MAP_STRONGEST_PATHS);
  return [...failing, ...strongest];
}

/** The frequency plan and interference tables of a study (null when it has no frequency plan). */
export function interferenceReport(s: AnalyzedStudy): InterferenceReport | null {
  const plan: FrequencyPlanRow[] = [];
  for (const l of s.study.links) {
    const fp = l.frequency_plan;
    if (!fp) continue;
    const radio = s.study.radios.find((r) => r.id === l.radio);
    const name = radio?.name ?? l.radio;
    plan.push({ link: l.id, direction: "go", from: l.from.site, to: l.to.site, frequency_mhz: fp.go_mhz, bandwidth_mhz: fp.bandwidth_mhz, polarization: fp.go_polarization ?? l.polarization, radio: name });
    plan.push({ link: l.id, direction: "return", from: l.to.site, to: l.from.site, frequency_mhz: fp.return_mhz, bandwidth_mhz: fp.bandwidth_mhz, polarization: fp.return_polarization ?? l.polarization, radio: name });
  }
  const result = s.result.interference ?? null;
  if (!plan.length && !result) return null;
  plan.sort((a, b) => a.frequency_mhz - b.frequency_mhz || a.link.localeCompare(b.link));
  const failing = result ? result.entries.filter((e) => !e.met) : [];
  const rest = result ? result.entries.filter((e) => e.met).slice(0, 20) : [];
  const labelOf = (p: unknown) => (p === undefined || p === "f699" ? "ITU-R F.699-8 reference envelope" : p === "f1245" ? "ITU-R F.1245-3 average pattern" : `tabulated envelope ${(p as { envelope_csv: string }).envelope_csv}`);
  const patterns = [...new Set(s.study.links.flatMap((l) => [labelOf(l.from.pattern), labelOf(l.to.pattern)]))].sort();
  return { plan, result, worst: [...failing, ...rest], more: result ? result.entries.length - failing.length - rest.length : 0, patterns, map_paths: result ? mapEntries(result).length : 0 };
}

/** The receivers of one link with the entries into each (worst first), or null without interference results. */
export function linkInterference(r: StudyResult, linkId: string): LinkInterference | null {
  if (!r.interference) return null;
  const receivers = r.interference.receivers
    .filter((x) => x.link === linkId)
    .sort((a, b) => a.direction.localeCompare(b.direction))
    .map((x) => ({ ...x, entries_list: r.interference!.entries.filter((e) => e.receiver === x.id) }));
  return { receivers };
}
