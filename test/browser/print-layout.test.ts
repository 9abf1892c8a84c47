import { execFileSync } from "node:child_process";
import { cpSync, existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join, resolve } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { buildSite } from "../../src/cli/build-site.ts";
import { pdfCommand } from "../../src/cli/commands/pdf.ts";
import { loadAllStudies } from "../../src/analysis/load-all.ts";
import { headingPages } from "../../src/render/pdf/contents-pages.ts";
import { printRuleFaults } from "../helpers/print-rules.ts";
import { loadCoverageOutputStage } from "../../src/render/coverage-output-loader.ts";

// The printed report (issue 18 §1, §2): the PDF's first page carries document control and a
// contents list with page numbers; pagination rules hold on every page, read per page with
// poppler's pdftotext; the study's paper option (A4 or Letter) sets the page size.

const DEMO = "kestrel-vale";
const SCREENSHOTS = resolve("test-output/screenshots");
let work: string;
let site: string;
let pages: string[];
let pdf: string;

const headingsOf = (html: string) => [...html.matchAll(/<h[1-3][^>]*>([^<]+)<\/h[1-3]>/g)].map((m) => m[1].replace(/&amp;/g, "&"));
/** Running head and foot lines (not the page body). */
const isMargin = (l: string) => /· rev\. B|Ridgeline radio link study|^Page \d+ of \d+$|Engineering estimates by published methods|licensed engineer\.$|^or review by/.test(l) && !/^Table/.test(l);

const pageTexts = (file: string) => {
  const t = execFileSync("pdftotext", ["-layout", "-enc", "UTF-8", file, "-"], { encoding: "utf8" }).split("\f");
  if (t.length && !t[t.length - 1].trim()) t.pop();
  return t;
};

beforeAll(async () => {
  work = mkdtempSync(join(tmpdir(), "ridgeline-print-"));
  const studies = join(work, "studies");
  mkdirSync(studies);
  cpSync(resolve("content/studies", DEMO), join(studies, DEMO), { recursive: true });
  site = join(work, "site");
  await buildSite(await loadAllStudies(studies, { coverageOutputs: loadCoverageOutputStage }), { outDir: site });
  expect(await pdfCommand([DEMO, "--out", site])).toBe(0);
  pdf = join(site, "studies", DEMO, `${DEMO}.pdf`);
  pages = pageTexts(pdf);
}, 240_000);
afterAll(() => rmSync(work, { recursive: true, force: true }));

describe("the PDF's first page", () => {
  it("carries the document number, revision history, approval block and contents", () => {
    const first = pages[0];
    expect(first).toMatch(/KVWB-RL-0042/);
    expect(first).toMatch(/Revision history/);
    expect(first).toMatch(/Prepared\s+R\. Okafor\s+Radio planning engineer\s+2026-11-20/);
    expect(first).toMatch(/Approved\s*\n/); // empty boxes: no name given
    expect(first).toMatch(/Contents/);
  });

  it("lists each section with the page it starts on", () => {
    const entries = [...pages[0].matchAll(/^\s*(Link \S+: .+?|Overview|Links|Coverage|Sites|Cautions)\s{3,}(\d+)\s*$/gm)].map((m) => [m[1], Number(m[2])] as const);
    expect(entries.length).toBeGreaterThanOrEqual(13);
    for (const [title, page] of entries) {
      const text = pages[page - 1].replace(/\s+/g, "");
      const want = title.startsWith("Link ") ? `LINK${title.split(/[ :]/)[1].toUpperCase()}` : title.replace(/\s+/g, "");
      expect(text, `${title} on page ${page}`).toContain(want);
    }
  });

  it("headingPages finds headings in reading order, from page 2 on", () => {
    expect(headingPages(["Links", "x\nLinks", "Sites\nLinks"], ["Links", "Sites", "Links"])).toEqual([2, 3, 3]);
    expect(headingPages(["a", "b"], ["zzz"])).toEqual([null]);
  });
});

describe("pagination rules", () => {
  it("no lone heading at a page foot, no caption split from its table, totals with their rows, no near-empty page", () => {
    const headings = headingsOf(readFileSync(join(site, "studies", DEMO, "print", "index.html"), "utf8"));
    const faults = printRuleFaults(pages, { headings, isMargin });
    expect(faults).toEqual([]);
  });

  it("regression: the page holding only 'Scope of this study' and the page holding only the Terminals table are gone", () => {
    for (const [i, t] of pages.entries()) {
      const body = t.split("\n").filter((l) => l.trim()).length;
      if (/Scope of this study/.test(t)) expect(body, `page ${i + 1}`).toBeGreaterThan(10);
      // the Terminals table now opens each link, beside its summary (it was left alone on a link's last page)
      if (/Antennas at the two ends/.test(t)) expect(body, `page ${i + 1}`).toBeGreaterThan(10);
    }
  });

  it("saves the PDF's first pages as images for review", () => {
    mkdirSync(SCREENSHOTS, { recursive: true });
    execFileSync("pdftoppm", ["-png", "-r", "60", "-f", "1", "-l", "3", pdf, join(SCREENSHOTS, "pdf-page")]);
    expect(existsSync(join(SCREENSHOTS, "pdf-page-1.png")) || existsSync(join(SCREENSHOTS, "pdf-page-01.png"))).toBe(true);
  });
  it("A4 from the study's paper option; Letter on request", async () => {
    expect(execFileSync("pdfinfo", [pdf], { encoding: "utf8" })).toMatch(/Page size:\s+59\d\.\d+ x 84\d\.\d+ pts \(A4\)/);
    expect(await pdfCommand([DEMO, "--out", site, "--paper", "letter"])).toBe(0);
    expect(execFileSync("pdfinfo", [pdf], { encoding: "utf8" })).toMatch(/Page size:\s+612 x 792 pts \(letter\)/);
    const letter = pageTexts(pdf);
    expect(letter[0]).toMatch(/Contents/);
    expect(printRuleFaults(letter, { headings: headingsOf(readFileSync(join(site, "studies", DEMO, "print", "index.html"), "utf8")), isMargin })).toEqual([]);
  }, 120_000);

});
