import { pathToFileURL } from "node:url";
import type { BrowserContext, Page } from "playwright-core";
import { headingPages, pdfPageTexts } from "./contents-pages.ts";

export interface PrintPdfOptions {
  /** The HTML page to print (a file on disk). */
  html_path: string;
  /** Where to write the PDF. */
  pdf_path: string;
  /** Paper size; without it, the page's own CSS @page size (the study's document.paper). */
  paper?: "A4" | "Letter";
  /** A browser context to reuse (tests); otherwise the caller launches one. */
  context: BrowserContext;
}

/**
 * Print a page of the built site to PDF with Chromium: opened from disk (file://, as a reader
 * would), print media, backgrounds kept; margins, running header and page numbers come from
 * the stylesheet's @page rules. Throws when the page reports a script error.
 */
export async function printPdf(o: PrintPdfOptions): Promise<void> {
  const page = await o.context.newPage();
  const errors: string[] = [];
  page.on("pageerror", (e) => errors.push(e.message));
  try {
    await page.goto(pathToFileURL(o.html_path).href, { waitUntil: "load" });
    await page.emulateMedia({ media: "print" });
    const print = () => page.pdf({ path: o.pdf_path, ...(o.paper ? { format: o.paper } : { preferCSSPageSize: true }), printBackground: true, margin: { top: "0", right: "0", bottom: "0", left: "0" } });
    await print();
    // Contents with page numbers: where each heading fell in this print, written into the
    // contents (its numbers fill reserved space, so the layout does not move), printed again.
    for (let pass = 0; pass < 2 && (await fillContentsPages(page, o.pdf_path)); pass++) await print();
    if (errors.length) throw new Error(`The print page reported errors: ${errors.join("; ")}`);
  } finally {
    await page.close();
  }
}

/** Fill the `.toc-page[data-find]` slots from the PDF just printed; true when a number changed. */
async function fillContentsPages(page: Page, pdfPath: string): Promise<boolean> {
  const finds = await page.$$eval(".toc-page[data-find]", (els) => els.map((e) => e.getAttribute("data-find") ?? ""));
  if (!finds.length) return false;
  const texts = pdfPageTexts(pdfPath);
  if (!texts) return false; // without poppler's pdftotext the contents list has no page numbers
  const pages = headingPages(texts, finds).map((p) => (p === null ? "" : String(p)));
  return page.$$eval(
    ".toc-page[data-find]",
    (els, nums) => {
      let changed = false;
      els.forEach((e, i) => {
        if (e.textContent !== nums[i]) (e.textContent = nums[i]), (changed = true);
      });
      return changed;
    },
    pages,
  );
}
