import { execFileSync } from "node:child_process";

/**
 * The page on which each contents entry starts, from the text of each page of a printed PDF:
 * the first line, at or after the previous entry's page (entries are in reading order), whose
 * text is exactly the entry's heading. Pages before `firstPage` (the front page with the
 * contents itself) are not searched. null when a heading is not found.
 */
export function headingPages(pageTexts: readonly string[], headings: readonly string[], firstPage = 2): (number | null)[] {
  const norm = (s: string) => s.replace(/\s+/g, " ").trim();
  const lines = pageTexts.map((t) => new Set(t.split(/\r?\n/).map(norm)));
  let from = firstPage;
  return headings.map((h) => {
    const want = norm(h);
    for (let p = from; p <= lines.length; p++)
      if (lines[p - 1].has(want)) {
        from = p;
        return p;
      }
    return null;
  });
}

/** The text of each page of a PDF by poppler's pdftotext, or null when pdftotext is not installed. */
export function pdfPageTexts(pdfPath: string): string[] | null {
  try {
    const text = execFileSync("pdftotext", ["-layout", "-enc", "UTF-8", pdfPath, "-"], { encoding: "utf8", maxBuffer: 64 * 1024 * 1024, stdio: ["ignore", "pipe", "ignore"] });
    const pages = text.split("\f");
    if (pages.length && pages[pages.length - 1].trim() === "") pages.pop();
    return pages;
  } catch (e) {
    if ((e as NodeJS.ErrnoException).code === "ENOENT") return null;
    throw e;
  }
}
