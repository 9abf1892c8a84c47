import type { AnalyzedStudy } from "../../analysis/analyze-study.ts";
import { formatNumber } from "../../site/format.ts";
import { parseArgs } from "../args.ts";
import { loadAllStudies } from "../../analysis/load-all.ts";
import { progressReporter } from "../progress.ts";
import { loadCoverageOutputStage } from "../../render/coverage-output-loader.ts";

/** One row of the check table. */
export interface CheckRow {
  study: string;
  link: string;
  clearance_met: boolean;
  fade_margin_db: number | null;
  availability_pct: number | null;
  target_availability_pct: number | null;
  target_met: boolean;
}

/** Rows for every link of the analysed studies. */
export function checkRows(studies: AnalyzedStudy[]): CheckRow[] {
  return studies.flatMap((s) =>
    s.result.links.map((l) => ({
      study: s.result.id,
      link: l.id,
      clearance_met: l.clearance_met,
      fade_margin_db: l.fade_margin_db ?? null,
      availability_pct: l.availability_pct ?? null,
      target_availability_pct: l.target_availability_pct ?? null,
      target_met: l.target_met,
    })),
  );
}

/**
 * `ridgeline check [study-id…] [--json]`: compute without rendering and compare every link
 * with its targets. Exit 0 when all are met, 1 when any is missed, 2 on bad input.
 */
export async function checkCommand(argv: string[]): Promise<number> {
  const args = parseArgs(argv, { values: ["studies-dir"], flags: ["json"] });
  const progress = progressReporter("links");
  const studies = await loadAllStudies(args.values.get("studies-dir")?.[0] ?? "content/studies", { ids: args.positional, coverageOutputs: loadCoverageOutputStage, onProgress: (_s, d, t) => progress.update(d, t) });
  progress.stop();
  const rows = checkRows(studies);
  const missed = rows.filter((r) => !r.target_met).length;
  if (args.flags.has("json")) {
    process.stdout.write(`${JSON.stringify({ links: rows, missed, total: rows.length }, null, 2)}\n`);
  } else {
    const header = ["study", "link", "clearance", "fade margin dB", "availability %", "target %", "result"];
    const table = rows.map((r) => [
      r.study,
      r.link,
      r.clearance_met ? "meets" : "SHORT",
      formatNumber(r.fade_margin_db, 1),
      formatNumber(r.availability_pct, 5),
      formatNumber(r.target_availability_pct, 3),
      r.target_met ? "met" : "MISSED",
    ]);
    const widths = header.map((h, i) => Math.max(h.length, ...table.map((row) => row[i].length)));
    const line = (cells: string[]) => cells.map((c, i) => (i >= 3 && i <= 5 ? c.padStart(widths[i]) : c.padEnd(widths[i]))).join("  ");
    process.stdout.write(`${line(header)}\n${widths.map((w) => "-".repeat(w)).join("  ")}\n${table.map(line).join("\n")}\n`);
    process.stdout.write(missed ? `\n${missed} of ${rows.length} links miss a target.\n` : `\nAll ${rows.length} links meet their targets.\n`);
  }
  return missed ? 1 : 0;
}
