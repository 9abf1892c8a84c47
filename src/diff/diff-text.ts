import { showNumber } from "./diff-format.ts";
import type { StudiesDiff } from "./study-diff.ts";

const plural = (n: number, one: string, many = `${one}s`) => `${n} ${n === 1 ? one : many}`;

/** The thresholds as a sentence: "fade margin 0.5 dB, availability and performance 0.001 %, clearance 0.05 F1". */
export function thresholdsText(t: StudiesDiff["thresholds"]): string {
  return `fade margin ${showNumber(t.fade_margin_db)} dB, availability and performance ${showNumber(t.availability_pct)} %, least clearance ${showNumber(t.clearance_f1)} F1`;
}

/** The terminal summary of a diff: per study its input changes, then the links whose results moved. */
export function diffText(d: StudiesDiff): string {
  const lines = [`Studies at ${d.from.label} → ${d.to.label}`, `Result changes shown beyond: ${thresholdsText(d.thresholds)}.`];
  for (const n of d.notes) lines.push(`Note: ${n}`);
  const changed = d.studies.filter((s) => s.status !== "unchanged");
  if (changed.length === 0) {
    lines.push("", d.studies.length ? `No changes in ${plural(d.studies.length, "study", "studies")}.` : "No studies at either revision.");
    return lines.join("\n");
  }
  for (const s of changed) {
    const moved = s.results.length;
    lines.push("", `${s.id} (${s.status}): ${plural(s.inputs.length, "input change")}, ${plural(moved, "link")} with result changes`);
    if (s.inputs.length) {
      lines.push("  inputs");
      for (const c of s.inputs) lines.push(`    ${c.text}${c.links.length && c.kind !== "study" ? `  [feeds ${c.links.length > 6 ? `${c.links.length} links` : c.links.join(", ")}]` : ""}`);
    }
    if (s.results.length) {
      lines.push("  results");
      const w = Math.max(...s.results.map((r) => r.link.length));
      for (const r of s.results) {
        const tag = r.status === "changed" ? "" : ` (${r.status})`;
        lines.push(`    ${r.link.padEnd(w)}${tag}  ${r.changes.map((c) => c.text).join("; ") || "no result changes"}`);
      }
    } else if (s.inputs.length) {
      lines.push("  results: no link moved beyond the thresholds");
    }
    if (s.interference?.length) {
      lines.push("  interference");
      const w = Math.max(...s.interference.map((r) => r.receiver.length));
      for (const r of s.interference) lines.push(`    ${r.receiver.padEnd(w)}${r.status === "changed" ? "" : ` (${r.status})`}  ${r.text}`);
    }
  }
  const unchanged = d.studies.length - changed.length;
  if (unchanged) lines.push("", `${plural(unchanged, "study", "studies")} unchanged.`);
  return lines.join("\n");
}
