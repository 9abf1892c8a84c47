import { readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";

/** Every .html file under a folder, recursively. */
export function htmlFiles(dir: string): string[] {
  return readdirSync(dir, { withFileTypes: true, recursive: true })
    .filter((e) => e.isFile() && e.name.endsWith(".html"))
    .map((e) => join(e.parentPath ?? (e as unknown as { path: string }).path, e.name))
    .sort();
}

const ENTITIES: Record<string, string> = { amp: "&", lt: "<", gt: ">", quot: '"', "#39": "'", nbsp: " " };

/**
 * The running text of a page, one line per block (paragraph, cell, caption, list item, heading):
 * figures (SVG), styles and scripts dropped, tags removed, entities decoded, spaces collapsed.
 */
export function runningText(html: string): string[] {
  const body = html
    .replace(/<(svg|style|script|code|title)\b[\s\S]*?<\/\1>/g, " ")
    .replace(/<\/?(p|li|td|th|caption|figcaption|dt|dd|h[1-6]|div|section|tr|header|footer|nav|ul|ol|dl|table|figure|article|br)\b[^>]*>/g, "\n")
    .replace(/<[^>]+>/g, "")
    .replace(/&(#?\w+);/g, (m, e: string) => ENTITIES[e] ?? (e.startsWith("#x") ? String.fromCodePoint(parseInt(e.slice(2), 16)) : e.startsWith("#") ? String.fromCodePoint(Number(e.slice(1))) : m));
  return body
    .split("\n")
    .map((l) => l.replace(/\s+/g, " ").trim())
    .filter(Boolean);
}

/** Faults a reviewer marks in red, each with the rule that found it. */
export const TEXT_FAULTS: { rule: string; re: RegExp }[] = [
  { rule: "exponent notation", re: /\d(?:\.\d+)?e[+-]?\d/i },
  { rule: "NaN", re: /\bNaN\b/ },
  { rule: "ASCII hyphen as a minus sign", re: /(?:^|[\s(=:,;/[])-\d/ },
  { rule: "doubled word", re: /\b([A-Za-z]{2,})\W{1,3}\1\b/i },
];

/** Every fault in a page's running text, as "rule: …text…". */
export function textFaults(html: string): string[] {
  const out: string[] = [];
  for (const line of runningText(html))
    for (const { rule, re } of TEXT_FAULTS) {
      const m = re.exec(line);
      if (m) out.push(`${rule}: …${line.slice(Math.max(0, m.index - 50), m.index + m[0].length + 30)}…`);
    }
  return out;
}
