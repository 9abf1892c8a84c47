import { execFileSync } from "node:child_process";
import { cpSync, existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join, relative, resolve } from "node:path";
import { pathToFileURL } from "node:url";
import type { BrowserContext, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { buildSite } from "../../src/cli/build-site.ts";
import { pdfCommand } from "../../src/cli/commands/pdf.ts";
import { loadAllStudies } from "../../src/analysis/load-all.ts";
import { launchChromium } from "../../src/render/pdf/chromium.ts";
import { printPdf } from "../../src/render/pdf/print-pdf.ts";
import { IMG_TEXT, SCRIPT_TEXT, writeHostileStudy } from "./hostile-study.ts";
import { serveStatic } from "./static-server.ts";
import { loadCoverageOutputStage } from "../../src/render/coverage-output-loader.ts";

// The whole report site in a real browser (Debian's chromium through playwright-core): the
// demo study and a study whose names carry markup, built into a temporary folder and served
// under a sub-path, so every relative link and figure is exercised as a reader would meet it.

const DEMO = "kestrel-vale";
const PREFIX = "/reports/ridgeline/";
const SCREENSHOTS = resolve("test-output/screenshots");

let work: string;
let site: string;
let hostileId: string;
let server: { url: string; close: () => Promise<void> };
let browser: { context: BrowserContext; close: () => Promise<void> };
let demoLinks: string[];
let hostileLinks: string[];

/** Every .html file of the built site, as paths relative to its root. */
function htmlPages(root: string): string[] {
  const out: string[] = [];
  const walk = (dir: string) => {
    for (const e of readdirSync(dir, { withFileTypes: true })) {
      const p = join(dir, e.name);
      if (e.isDirectory()) walk(p);
      else if (e.name.endsWith(".html")) out.push(relative(root, p).split("\\").join("/"));
    }
  };
  walk(root);
  return out.sort();
}

/** Open a page and collect what went wrong: console errors, script errors, failed or 4xx/5xx requests, dialogs. */
async function visit(page: Page, url: string): Promise<{ problems: string[]; dialogs: string[] }> {
  const problems: string[] = [];
  const dialogs: string[] = [];
  const onConsole = (m: { type(): string; text(): string }) => {
    if (m.type() === "error") problems.push(`console: ${m.text()}`);
  };
  const onPageError = (e: Error) => problems.push(`script error: ${e.message}`);
  const onFailed = (r: { url(): string; failure(): { errorText: string } | null }) => problems.push(`request failed: ${r.url()} ${r.failure()?.errorText}`);
  const onResponse = (r: { url(): string; status(): number }) => {
    if (r.status() >= 400) problems.push(`HTTP ${r.status()}: ${r.url()}`);
  };
  const onDialog = (d: { message(): string; dismiss(): Promise<void> }) => {
    dialogs.push(d.message());
    void d.dismiss();
  };
  page.on("console", onConsole);
  page.on("pageerror", onPageError);
  page.on("requestfailed", onFailed);
  page.on("response", onResponse);
  page.on("dialog", onDialog);
  try {
    const res = await page.goto(url, { waitUntil: "load" });
    if (res && !res.ok() && !url.startsWith("file:")) problems.push(`HTTP ${res.status()} for the page ${url}`);
  } finally {
    page.off("console", onConsole);
    page.off("pageerror", onPageError);
    page.off("requestfailed", onFailed);
    page.off("response", onResponse);
    page.off("dialog", onDialog);
  }
  return { problems, dialogs };
}

beforeAll(async () => {
  work = mkdtempSync(join(tmpdir(), "ridgeline-browser-"));
  const studies = join(work, "studies");
  mkdirSync(studies);
  cpSync(resolve("content/studies", DEMO), join(studies, DEMO), { recursive: true });
  hostileId = writeHostileStudy(studies);
  site = join(work, "site");
  const analysed = await loadAllStudies(studies, { coverageOutputs: loadCoverageOutputStage });
  await buildSite(analysed, { outDir: site });
  demoLinks = analysed.find((s) => s.study.id === DEMO)!.result.links.map((l) => l.id);
  hostileLinks = analysed.find((s) => s.study.id === hostileId)!.result.links.map((l) => l.id);
  server = await serveStatic(site, PREFIX);
  browser = await launchChromium({ viewport: { width: 1280, height: 900 } });
});

afterAll(async () => {
  await browser?.close();
  await server?.close();
  if (work) rmSync(work, { recursive: true, force: true });
});

/** What one visit of a page found. */
interface PageFacts {
  problems: string[];
  dialogs: string[];
  text: string;
  title: string;
  /** Absolute URLs of every a[href]. */
  hrefs: string[];
  ids: string[];
  /** Elements that failed the size or text-alternative checks. */
  bad: string[];
  /** Rendered size of each figure kind on the page. */
  figures: Record<string, { width: number; height: number }[]>;
  captions: number;
  rootRelative: boolean;
}

let inspection: Promise<Map<string, PageFacts>> | null = null;

/** Visit every generated page once (served under the prefix) and record what the tests check. */
function inspectAll(): Promise<Map<string, PageFacts>> {
  inspection ??= (async () => {
    const out = new Map<string, PageFacts>();
    const page = await browser.context.newPage();
    for (const p of htmlPages(site)) {
      const { problems, dialogs } = await visit(page, server.url + p);
      const facts = await page.evaluate(() => {
        const bad: string[] = [];
        for (const img of Array.from(document.querySelectorAll("img"))) {
          const r = img.getBoundingClientRect();
          if (!(r.width > 0 && r.height > 0 && img.naturalWidth > 0)) bad.push(`img ${img.getAttribute("src")?.slice(0, 40)}`);
        }
        const figures: Record<string, { width: number; height: number }[]> = {};
        for (const svg of Array.from(document.querySelectorAll("svg"))) {
          if (svg.closest(".live-map")) continue; // Leaflet's own drawing layer, checked in live-map.test.ts
          const r = svg.getBoundingClientRect();
          const cls = svg.getAttribute("class") ?? "";
          (figures[cls] ??= []).push({ width: r.width, height: r.height });
          // the static overview figure is for print while the interactive map runs on screen
          const printOnly = !!svg.closest(".has-live-map figure.map-static");
          if (!(r.width > 0 && r.height > 0) && !printOnly) bad.push(`svg.${cls} ${r.width}×${r.height}`);
          if (svg.getAttribute("role") !== "img" || !svg.querySelector(":scope > title")?.textContent?.trim() || !svg.querySelector(":scope > desc")?.textContent?.trim()) bad.push(`svg.${cls} without role=img, title and desc`);
          for (const im of printOnly ? [] : Array.from(svg.querySelectorAll("image"))) {
            const b = (im as SVGGraphicsElement).getBBox();
            if (!(b.width > 0 && b.height > 0)) bad.push(`svg.${cls} image of zero size`);
          }
        }
        for (const th of Array.from(document.querySelectorAll("thead th"))) if (!th.getAttribute("scope")) bad.push(`th without scope: ${th.textContent}`);
        return {
          text: document.body.innerText,
          title: document.title,
          hrefs: Array.from(document.querySelectorAll("a[href]")).map((a) => (a as HTMLAnchorElement).href),
          ids: Array.from(document.querySelectorAll("[id]")).map((e) => e.id),
          bad,
          figures,
          captions: document.querySelectorAll("table.data caption").length,
          rootRelative: /(href|src)="\//.test(document.documentElement.outerHTML),
        };
      });
      out.set(p, { problems, dialogs, ...facts });
    }
    await page.close();
    return out;
  })();
  return inspection;
}

describe("report site in Chromium", () => {
  it("every generated page loads with no console error, failed request or script dialog, and shows no NaN", async () => {
    const pages = await inspectAll();
    // catalogue + 2 × (study page, print page) + one page per link
    expect(pages.size).toBe(1 + 2 * 2 + demoLinks.length + hostileLinks.length);
    for (const [p, f] of pages) {
      expect(f.problems, p).toEqual([]);
      expect(f.dialogs, p).toEqual([]);
      expect(f.text, p).not.toMatch(/\bNaN\b|\bundefined\b|\[object Object\]|Infinity/);
    }
  });

  it("every image and SVG figure has a non-zero size and a text alternative; every table header has a scope", async () => {
    for (const [p, f] of await inspectAll()) expect(f.bad, p).toEqual([]);
  });

  it("every internal link resolves, fragments included, and every page is reachable from the catalogue", async () => {
    const pages = await inspectAll();
    const urlOf = (p: string) => server.url + p;
    const byUrl = new Map([...pages].map(([p, f]) => [urlOf(p), f]));
    const other = new Set<string>();
    for (const [p, f] of pages) {
      expect(f.rootRelative, `${p} has a root-relative URL`).toBe(false);
      for (const h of f.hrefs) {
        expect(h.startsWith(server.url), `${p} links outside the site: ${h}`).toBe(true);
        const [target, frag] = h.split("#");
        if (target.endsWith(".html")) {
          expect(byUrl.has(target), `${p} → ${h}`).toBe(true);
          if (frag) expect(byUrl.get(target)!.ids, `${p} → ${h}`).toContain(frag);
        } else other.add(target);
      }
    }
    const request = (await browser.context.newPage()).request;
    for (const u of other) {
      const res = await request.get(u);
      expect(res.ok(), u).toBe(true);
      if (u.endsWith(".json")) expect(JSON.parse((await res.body()).toString()).id, u).toBeTruthy();
    }
    // Reachability from the catalogue over the recorded links.
    const seen = new Set([urlOf("index.html")]);
    const queue = [...seen];
    while (queue.length) {
      for (const h of byUrl.get(queue.shift()!)?.hrefs ?? []) {
        const t = h.split("#")[0];
        if (byUrl.has(t) && !seen.has(t)) {
          seen.add(t);
          queue.push(t);
        }
      }
    }
    expect([...seen].sort()).toEqual([...byUrl.keys()].sort());
  });

  it("each link page carries the path profile, the Fresnel-zone cross-section and the numbered tables", async () => {
    const pages = await inspectAll();
    for (const [study, links] of [
      [DEMO, demoLinks],
      [hostileId, hostileLinks],
    ] as const) {
      for (const id of links) {
        const f = pages.get(`studies/${study}/links/${id}/index.html`)!;
        for (const cls of ["profile-plot", "fresnel-section"]) {
          const figs = f.figures[cls] ?? [];
          expect(figs.length, `${id} ${cls}`).toBe(1);
          expect(figs[0].width > 300 && figs[0].height > 120, `${id} ${cls} ${JSON.stringify(figs[0])}`).toBe(true);
        }
        expect(f.captions, id).toBeGreaterThanOrEqual(6);
        // Pass/fail is written out, not shown by colour alone.
        expect(f.text, id).toMatch(/[✓✗] (Meets|Misses)/);
      }
      // The print page holds every link section.
      const print = pages.get(`studies/${study}/print/index.html`)!;
      expect(print.figures["profile-plot"]?.length, study).toBe(links.length);
      expect(print.figures["fresnel-section"]?.length, study).toBe(links.length);
    }
    // The study page: overview map with its shaded relief, assumptions and cautions.
    const f = pages.get(`studies/${DEMO}/index.html`)!;
    expect(f.figures["overview-map"]?.length).toBe(1);
    for (const re of [/ICNIRP 2020/, /estimate/, /does not replace licensed frequency coordination/, /P\.525-4/, /P\.526-15 §4\.5/, /P\.676-12 Annex 1/, /P\.838-3/, /P\.530-16 §2\.4\.1/, /P\.530-16 §2\.3/, /Common-practice defaults/]) {
      expect(f.text).toMatch(re);
    }
  });

  it("each demo link page and the print page carry the wave solution's field figure (with its raster and text alternative), the comparison table and the height-gain comparison", async () => {
    const pages = await inspectAll();
    for (const id of demoLinks) {
      const f = pages.get(`studies/${DEMO}/links/${id}/index.html`)!;
      for (const cls of ["wave-field", "height-gain wave-height-gain"]) {
        const figs = f.figures[cls] ?? [];
        expect(figs.length, `${id} ${cls}`).toBe(1);
        expect(figs[0].width > 300 && figs[0].height > 120, `${id} ${cls} ${JSON.stringify(figs[0])}`).toBe(true);
      }
      expect(f.bad.filter((b) => b.includes("wave")), id).toEqual([]);
      expect(f.text, id).toMatch(/Method − wave solution \(dB\)/);
    }
    const print = pages.get(`studies/${DEMO}/print/index.html`)!;
    expect(print.figures["wave-field"]?.length).toBe(demoLinks.length);
  });

  it("the demo's P.1812 coverages show a location-probability map at true scale with sites, links and service area, and the area-reliability and served-sites tables", async () => {
    const page = await browser.context.newPage();
    await visit(page, `${server.url}studies/${DEMO}/index.html`);
    const facts = await page.evaluate(() =>
      Array.from(document.querySelectorAll("section.coverage")).map((sec) => ({
        id: sec.id,
        probability: Array.from(sec.querySelectorAll("figure.probability-map svg")).map((svg) => ({
          title: svg.querySelector("title")?.textContent ?? "",
          w: Number(svg.getAttribute("width")),
          h: Number(svg.getAttribute("height")),
          areas: svg.querySelectorAll("g.service-area path").length,
          links: svg.querySelectorAll("g.links path").length,
          others: svg.querySelectorAll("g.other-site").length,
        })),
        reliabilityRows: sec.querySelectorAll("table.area-reliability tbody tr").length,
        servedRows: Array.from(sec.querySelectorAll("table.served-sites tbody tr")).map((tr) => Array.from(tr.children).map((td) => td.textContent ?? "")),
        waveCheck: Array.from(sec.querySelectorAll("figure.wave-check-figure svg")).map((svg) => {
          const r = svg.getBoundingClientRect();
          return { w: r.width, h: r.height, role: svg.getAttribute("role"), desc: svg.querySelector(":scope > desc")?.textContent ?? "", panels: svg.querySelectorAll("g.wc-panel").length };
        }),
        waveCheckRows: Array.from(sec.querySelectorAll("table.wave-check-table tbody tr")).map((tr) => Array.from(tr.children).map((td) => td.textContent ?? "")),
        text: (sec as HTMLElement).innerText,
      })),
    );
    await page.close();
    const results = JSON.parse(readFileSync(join(site, "studies", DEMO, "results.json"), "utf8")) as { coverage: { id: string; method: string; grid: { width: number; height: number; cell_m: [number, number] }; p1812?: { served_sites: unknown[] } }[] };
    const p1812 = results.coverage.filter((c) => c.method === "p1812");
    expect(p1812.length).toBeGreaterThanOrEqual(1);
    for (const c of p1812) {
      const f = facts.find((x) => x.id === `coverage-${c.id}`)!;
      expect(f.probability.length, c.id).toBe(1);
      const m = f.probability[0];
      expect(m.title).toMatch(/location probability/);
      // true scale: the map's aspect is the ground's (cells are not square on the demo's geographic grid)
      const ground = (c.grid.width * c.grid.cell_m[0]) / (c.grid.height * c.grid.cell_m[1]);
      expect(Math.abs(m.w / m.h / ground - 1), `${c.id} aspect ${m.w}×${m.h} vs ground ${ground}`).toBeLessThan(0.01);
      expect(m.areas, c.id).toBeGreaterThanOrEqual(1);
      expect(m.links, c.id).toBeGreaterThanOrEqual(1);
      expect(m.others, c.id).toBeGreaterThanOrEqual(1);
      expect(f.reliabilityRows, c.id).toBeGreaterThanOrEqual(1);
      expect(f.servedRows.length, c.id).toBe(c.p1812!.served_sites.length);
      expect(f.servedRows.length, c.id).toBeGreaterThanOrEqual(3);
      for (const row of f.servedRows) expect(row.join(" "), c.id).toMatch(/−?\d+\.\d/);
      expect(f.text).toMatch(/ITU-R P\.1812-6/);
      expect(f.text).toMatch(/Talk-back/);
      // the check along radials: the figure (a panel per radial, a size, a text alternative) and
      // the table (a row per radial, clear-path and diffraction rows, the total), its numbers through the formatter
      expect(f.waveCheck.length, c.id).toBe(1);
      const w = f.waveCheck[0];
      expect(w.w > 300 && w.h > 150 && w.role === "img", `${c.id} ${JSON.stringify(w)}`).toBe(true);
      expect(w.desc, c.id).toMatch(/radials .* wave solution .* method's loss minus the wave solution's/);
      expect(w.panels, c.id).toBe(8);
      expect(f.waveCheckRows.length, c.id).toBe(11);
      for (const row of f.waveCheckRows) expect(row.join(" "), c.id).toMatch(/\d+\.\d/);
      expect(f.text).toMatch(/Method − wave solution along each radial/);
    }
    // a line-of-sight coverage says why it has no check
    const visibility = results.coverage.filter((c) => c.method === "visibility");
    for (const c of visibility) expect(facts.find((x) => x.id === `coverage-${c.id}`)!.text, c.id).toMatch(/no level to compare/);
  });

  it("a study whose names contain markup shows that text and runs nothing", async () => {
    const page = await browser.context.newPage();
    const urls = [
      "index.html",
      `studies/${hostileId}/index.html`,
      `studies/${hostileId}/print/index.html`,
      ...hostileLinks.map((l) => `studies/${hostileId}/links/${l}/index.html`),
    ];
    for (const u of urls) {
      const { problems, dialogs } = await visit(page, server.url + u);
      expect(dialogs, u).toEqual([]);
      expect(problems, u).toEqual([]);
      // only the site's own scripts (the bundled map) and its JSON data block
      expect(await page.locator("script:not([type='application/json']):not([src$='assets/leaflet/leaflet.js']):not([src$='assets/live-map.js'])").count(), u).toBe(0);
      for (const j of await page.locator("script[type='application/json']").allTextContents()) expect(() => JSON.parse(j), u).not.toThrow();
      expect(await page.locator('img[src="x"], [onerror]').count(), u).toBe(0);
      const text = await page.evaluate(() => document.body.innerText);
      expect(text, u).toContain(SCRIPT_TEXT);
      expect(await page.getByText(SCRIPT_TEXT, { exact: false }).first().isVisible(), u).toBe(true);
      if (u !== "index.html") expect(await page.title(), u).toContain(SCRIPT_TEXT);
    }
    // Site names inside the SVG map are text, not markup.
    await visit(page, `${server.url}studies/${hostileId}/index.html`);
    const mapText = await page.locator("svg.overview-map").evaluate((el) => el.textContent ?? "");
    expect(mapText).toContain(SCRIPT_TEXT);
    expect(mapText).toContain(IMG_TEXT);
    await page.close();
  });

  it("the catalogue opened from disk (file://) reaches a study page by clicking", async () => {
    const page = await browser.context.newPage();
    const { problems } = await visit(page, pathToFileURL(join(site, "index.html")).href);
    expect(problems).toEqual([]);
    await page.getByRole("link", { name: "Kestrel Vale telemetry and backhaul network" }).click();
    await page.waitForLoadState("load");
    expect(page.url()).toBe(pathToFileURL(join(site, "studies", DEMO, "index.html")).href);
    await expect(page.locator("h1").innerText()).resolves.toBe("Kestrel Vale telemetry and backhaul network");
    // on screen the interactive map stands in for the static figure (kept for print)
    await page.waitForSelector(".live-map[data-ready=true]");
    const box = await page.locator(".live-map").boundingBox();
    expect(box && box.width > 300).toBe(true);
    await page.getByRole("link", { name: "mill-harr", exact: true }).first().click();
    await page.waitForLoadState("load");
    expect(page.url()).toBe(pathToFileURL(join(site, "studies", DEMO, "links", "mill-harr", "index.html")).href);
    await page.close();
  });

  it("ridgeline pdf writes the report with a page per link, running header and page numbers", async () => {
    const code = await pdfCommand([DEMO, "--out", site]);
    expect(code).toBe(0);
    const pdf = join(site, "studies", DEMO, `${DEMO}.pdf`);
    expect(existsSync(pdf)).toBe(true);
    const pages = Number(/Pages:\s+(\d+)/.exec(execFileSync("pdfinfo", [pdf], { encoding: "utf8" }))![1]);
    expect(pages).toBeGreaterThanOrEqual(demoLinks.length + 1);
    const text = execFileSync("pdftotext", ["-layout", pdf, "-"], { encoding: "utf8" }).split("\f");
    // Each link section starts a page of its own (its heading is set in capitals with letter
    // spacing, which pdftotext may split with spaces; compare without white space).
    const starts = demoLinks.map((id) => text.findIndex((t) => t.replace(/\s+/g, "").includes(`LINK${id.toUpperCase()}`)));
    expect(starts.every((i) => i > 0), `link sections at pages ${starts.join(", ")}`).toBe(true);
    expect(new Set(starts).size).toBe(demoLinks.length);
    for (let i = 1; i < pages; i++) {
      expect(text[i], `page ${i + 1}`).toContain("Kestrel Vale telemetry and backhaul network · rev. C");
      expect(text[i], `page ${i + 1}`).toContain(`Page ${i + 1} of ${pages}`);
    }
    // (compared with white space collapsed: a sentence may wrap across lines)
    const all = text.join("").replace(/\s+/g, " ");
    expect(all).toContain("does not replace licensed frequency coordination");
    // The P.1812 coverage sections are in the PDF: location-probability map, tables.
    for (const re of [/Location probability of/, /Area reliability/, /Served sites/, /Talk-back/, /Method − wave solution along each radial/]) expect(all).toMatch(re);
    // The running header of the hostile study is text too.
    const hostilePdf = join(work, "hostile.pdf");
    await printPdf({ html_path: join(site, "studies", hostileId, "print", "index.html"), pdf_path: hostilePdf, context: browser.context });
    expect(execFileSync("pdftotext", ["-layout", hostilePdf, "-"], { encoding: "utf8" })).toContain(`Hostile ${SCRIPT_TEXT} study`);
  });

  it("saves screenshots of the catalogue, a study page and a link page for review", async () => {
    mkdirSync(SCREENSHOTS, { recursive: true });
    const page = await browser.context.newPage();
    for (const [name, url] of [
      ["catalogue", "index.html"],
      ["study", `studies/${DEMO}/index.html`],
      ["link", `studies/${DEMO}/links/mill-harr/index.html`],
    ]) {
      await visit(page, server.url + url);
      const file = join(SCREENSHOTS, `${name}.png`);
      await page.screenshot({ path: file, fullPage: true });
      expect(existsSync(file)).toBe(true);
    }
    await page.close();
  });
});
