import { pathToFileURL } from "node:url";
import type { BrowserContext } from "playwright-core";

export interface PrintPdfOptions {
  /** The HTML page to print (a file on disk). */
  html_path: string;
  /** Where to write the PDF. */
  pdf_path: string;
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
    await page.pdf({ path: o.pdf_path, format: o.paper ?? "A4", printBackground: true, margin: { top: "0", right: "0", bottom: "0", left: "0" } });
    if (errors.length) throw new Error(`The print page reported errors: ${errors.join("; ")}`);
  } finally {
    await page.close();
  }
}
