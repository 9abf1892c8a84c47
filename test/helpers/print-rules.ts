/**
 * Pagination rules for a printed report, checked on the text of each page (pdftotext -layout):
 * no heading alone at a page foot, no table caption left at a page foot, an availability table's
 * total on the page of its first row, and no page (but the last) holding only a few lines.
 */
export interface PrintRuleOptions {
  /** Headings of the document (h1–h3 texts). */
  headings: string[];
  /** Lines that belong to the running head and foot, not the body. */
  isMargin: (line: string) => boolean;
  /** A page body with fewer lines than this (the last page excepted) is a fault. */
  minLines?: number;
}

export function bodyLines(pageText: string, isMargin: (line: string) => boolean): string[] {
  return pageText
    .split(/\r?\n/)
    .map((l) => l.replace(/\s+/g, " ").trim())
    .filter((l) => l && !isMargin(l));
}

/** Every broken rule, as "page N: rule: line". */
export function printRuleFaults(pages: string[], o: PrintRuleOptions): string[] {
  const headings = new Set(o.headings.map((h) => h.replace(/\s+/g, " ").trim()));
  const faults: string[] = [];
  pages.forEach((text, i) => {
    const n = i + 1;
    const body = bodyLines(text, o.isMargin);
    const last = body[body.length - 1] ?? "";
    if (headings.has(last)) faults.push(`page ${n}: heading alone at the page foot: ${last}`);
    if (/^Table \d+\./.test(last)) faults.push(`page ${n}: table caption at the page foot: ${last}`);
    if (body.some((l) => /^Multipath fading ITU-R P\.530-\d+ §2\.3 [\d—]/.test(l)) && !body.some((l) => /^Total unavailability/.test(l))) faults.push(`page ${n}: availability table split from its total row`);
    if (i < pages.length - 1 && body.length < (o.minLines ?? 10)) faults.push(`page ${n}: only ${body.length} lines: ${body.join(" | ").slice(0, 160)}`);
  });
  return faults;
}
