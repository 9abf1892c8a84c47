import { existsSync } from "node:fs";
import { join, resolve } from "node:path";
import { launchChromium } from "../../render/pdf/chromium.ts";
import { printPdf } from "../../render/pdf/print-pdf.ts";
import { parseArgs, UsageError } from "../args.ts";
import { buildSite } from "../build-site.ts";
import { findStudies, loadAllStudies } from "../../analysis/load-all.ts";
import { loadCoverageOutputStage } from "../../render/coverage-output-loader.ts";

/**
 * `ridgeline pdf <study-id> [--out DIR] [--studies-dir DIR] [--paper a4|letter]`: print the
 * study's report page (the study and one section per link) to `<out>/studies/<id>/<id>.pdf`
 * with the system Chromium. Builds the site first when the report page is missing.
 */
export async function pdfCommand(argv: string[]): Promise<number> {
  const args = parseArgs(argv, { values: ["out", "studies-dir", "paper"] });
  if (args.positional.length !== 1) throw new UsageError(`pdf needs exactly one study id (received ${args.positional.length}). Usage: ridgeline pdf <study-id> [--out DIR] [--paper a4|letter]`);
  const id = args.positional[0];
  const paperArg = (args.values.get("paper")?.[0] ?? "study").toLowerCase();
  if (paperArg !== "a4" && paperArg !== "letter" && paperArg !== "study") throw new UsageError(`--paper: received "${paperArg}"; expected a4 or letter.`);
  const outDir = resolve(args.values.get("out")?.[0] ?? "_site");
  const studiesDir = args.values.get("studies-dir")?.[0] ?? "content/studies";
  const printPage = join(outDir, "studies", id, "print", "index.html");
  if (!existsSync(printPage)) {
    findStudies(studiesDir, [id]); // an unknown id is an input error (exit 2), before any work
    process.stderr.write(`No built report for ${id} in ${outDir}; building the site first.\n`);
    await buildSite(await loadAllStudies(studiesDir, { coverageOutputs: loadCoverageOutputStage }), { outDir });
  }
  const pdfPath = join(outDir, "studies", id, `${id}.pdf`);
  const browser = await launchChromium();
  try {
    await printPdf({ html_path: printPage, pdf_path: pdfPath, paper: paperArg === "a4" ? "A4" : paperArg === "letter" ? "Letter" : undefined, context: browser.context });
  } finally {
    await browser.close();
  }
  process.stderr.write(`Wrote ${pdfPath}\n`);
  return 0;
}
