import type { AnalyzedStudy } from "../../analysis/analyze-study.ts";
import { formatNumber } from "../../format/quantity.ts";
import { parseArgs } from "../args.ts";
import { loadAllStudies } from "../../analysis/load-all.ts";
import { progressReporter } from "../progress.ts";
import { loadCoverageOutputStage } from "../../render/coverage-output-loader.ts";

/** One row of the check table. */
export interface CheckRow {
  study: string;
  link: string;
  clearance_met: boolean;
  /** false when the terrain is too coarse for the path to judge clearance */
  clearance_reliable: boolean;
  fade_margin_db: number | null;
  availability_pct: number | null;
  target_availability_pct: number | null;
  /** Both objectives, each with its outage, target and verdict (absent for a link that was not analysed that far). */
  objectives: { performance: { achieved_pct: number; target_pct: number; met: boolean; counted: string }; availability: { achieved_pct: number; target_pct: number; met: boolean; counted: string }; combined_availability_pct: number } | null;
  capacity_target_met: boolean | null;
  target_met: boolean;
  /** "alternative" or "rejected": shown, not counted in the exit code. */
  design_status: string | null;
}

/** Rows for every link of the analysed studies. */
export function checkRows(studies: AnalyzedStudy[]): CheckRow[] {
  return studies.flatMap((s) =>
    s.result.links.map((l) => ({
      study: s.result.id,
      link: l.id,
      clearance_met: l.clearance_met,
      clearance_reliable: l.clearance_reliable !== false,
      fade_margin_db: l.fade_margin_db ?? null,
      availability_pct: l.availability_pct ?? null,
      target_availability_pct: l.target_availability_pct ?? null,
      objectives: l.objectives
        ? {
            performance: { achieved_pct: l.objectives.performance.achieved_pct, target_pct: l.objectives.performance.target_pct, met: l.objectives.performance.met, counted: "short fades (multipath flat + dispersive + clear-air XPD), average worst month" },
            availability: { achieved_pct: l.objectives.availability.achieved_pct, target_pct: l.objectives.availability.target_pct, met: l.objectives.availability.met, counted: "long outages (rain + rain XPD), average year" },
            combined_availability_pct: l.objectives.combined.availability_pct,
          }
        : null,
      capacity_target_met: l.adaptive_modulation?.target?.met ?? null,
      target_met: l.target_met,
      design_status: l.design_status ?? null,
    })),
  );
}

/** One receiver of the interference analysis in the check. */
export interface InterferenceCheckRow {
  study: string;
  receiver: string;
  link: string;
  threshold_degradation_long_term_db: number | null;
  allowed_degradation_db: number;
  worst_ci_margin_db: number | null;
  fade_margin_left_db: number | null;
  met: boolean;
  reasons: string[];
}

/** Rows for every receiver of the studies that ask for interference, worst first. */
export function interferenceCheckRows(studies: AnalyzedStudy[]): InterferenceCheckRow[] {
  return studies.flatMap((s) =>
    (s.result.interference?.receivers ?? []).map((r) => ({
      study: s.result.id,
      receiver: r.id,
      link: r.link,
      threshold_degradation_long_term_db: r.threshold_degradation_long_term_db,
      allowed_degradation_db: r.allowed_degradation_db,
      worst_ci_margin_db: r.worst_ci_margin_db,
      fade_margin_left_db: r.fade_margin_left_db,
      met: r.met,
      reasons: r.reasons,
    })),
  );
}

/** The terminal table of the interference rows. */
function interferenceTable(rows: InterferenceCheckRow[]): string {
  const header = ["study", "receiver", "degradation dB", "allowed dB", "worst C/I margin dB", "fade margin left dB", "result"];
  const table = rows.map((r) => [r.study, r.receiver, formatNumber(r.threshold_degradation_long_term_db, 2), formatNumber(r.allowed_degradation_db, 1), formatNumber(r.worst_ci_margin_db, 1), formatNumber(r.fade_margin_left_db, 1), r.met ? "met" : "MISSED"]);
  const widths = header.map((h, i) => Math.max(h.length, ...table.map((row) => row[i].length)));
  const line = (cells: string[]) => cells.map((c, i) => (i >= 2 && i <= 5 ? c.padStart(widths[i]) : c.padEnd(widths[i]))).join("  ");
  const reasons = rows.filter((r) => !r.met).flatMap((r) => r.reasons.map((x) => `  ${r.study} ${r.receiver}: ${x}`));
  return `\nInterference (long-term threshold degradation; C/I with the carrier at the threshold)\n${line(header)}\n${widths.map((w) => "-".repeat(w)).join("  ")}\n${table.map(line).join("\n")}\n${reasons.length ? `${reasons.join("\n")}\n` : ""}`;
}

/**
 * `ridgeline check [study-id…] [--json]`: compute without rendering and compare every link
 * with its targets, and every receiver with its interference limits (C/I and threshold
 * degradation) when the study asks for interference. Exit 0 when all are met, 1 when any is
 * missed, 2 on bad input.
 */
export async function checkCommand(argv: string[]): Promise<number> {
  const args = parseArgs(argv, { values: ["studies-dir"], flags: ["json"] });
  const progress = progressReporter("links");
  const studies = await loadAllStudies(args.values.get("studies-dir")?.[0] ?? "content/studies", { ids: args.positional, coverageOutputs: loadCoverageOutputStage, onProgress: (_s, d, t) => progress.update(d, t) });
  progress.stop();
  const rows = checkRows(studies);
  const counted = rows.filter((r) => !r.design_status);
  const missed = counted.filter((r) => !r.target_met).length;
  const ifx = interferenceCheckRows(studies);
  const ifxMissed = ifx.filter((r) => !r.met).length;
  if (args.flags.has("json")) {
    const chains = studies.flatMap((s) => s.result.chains.map((c) => ({ study: s.result.id, ...c })));
    const interference = ifx.length ? { interference: { receivers: ifx, missed: ifxMissed, total: ifx.length } } : {};
    process.stdout.write(`${JSON.stringify({ links: rows, chains, missed, total: counted.length, set_aside: rows.length - counted.length, ...interference }, null, 2)}\n`);
  } else {
    const header = ["study", "link", "clearance", "fade margin dB", "performance % (worst month)", "target %", "availability % (year)", "target %", "result"];
    const table = rows.map((r) => [
      r.study,
      r.link,
      `${r.clearance_met ? "meets" : "SHORT"}${r.clearance_reliable ? "" : " (unreliable)"}`,
      formatNumber(r.fade_margin_db, 1),
      `${formatNumber(r.objectives?.performance.achieved_pct ?? null, 5)}${r.objectives && !r.objectives.performance.met ? " ✗" : ""}`,
      formatNumber(r.objectives?.performance.target_pct ?? null, 3),
      `${formatNumber(r.availability_pct, 5)}${r.objectives && !r.objectives.availability.met ? " ✗" : ""}`,
      formatNumber(r.target_availability_pct, 3),
      (r.target_met ? "met" : "MISSED") + (r.design_status ? ` (${r.design_status}, not counted)` : ""),
    ]);
    const widths = header.map((h, i) => Math.max(h.length, ...table.map((row) => row[i].length)));
    const line = (cells: string[]) => cells.map((c, i) => (i >= 3 && i <= 7 ? c.padStart(widths[i]) : c.padEnd(widths[i]))).join("  ");
    process.stdout.write(`${line(header)}\n${widths.map((w) => "-".repeat(w)).join("  ")}\n${table.map(line).join("\n")}\n`);
    const unreliable = rows.filter((r) => !r.clearance_reliable);
    if (unreliable.length) {
      process.stdout.write(`\nClearance verdict unreliable (terrain coarser than a tenth of the path; see the link's warnings): ${unreliable.map((r) => `${r.study}/${r.link}`).join(", ")}\n`);
    }
    const aside = rows.length - counted.length;
    const note = aside ? ` (${aside} alternative or rejected design${aside === 1 ? "" : "s"} not counted)` : "";
    process.stdout.write(missed ? `\n${missed} of ${counted.length} ${counted.length === 1 ? "link" : "links"} ${missed === 1 ? "misses" : "miss"} a target${note}.\n` : `\n${counted.length === 1 ? "The link meets its" : `All ${counted.length} links meet their`} targets${note}.\n`);
    if (ifx.length) {
      process.stdout.write(interferenceTable(ifx));
      process.stdout.write(ifxMissed ? `${ifxMissed} of ${ifx.length} receivers miss their interference limits.\n` : `All ${ifx.length} receivers meet their interference limits.\n`);
    }
  }
  return missed || ifxMissed ? 1 : 0;
}
