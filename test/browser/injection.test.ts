import { mkdirSync, mkdtempSync, readdirSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join, relative } from "node:path";
import type { BrowserContext } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { stringify } from "yaml";
import { buildSite } from "../../src/cli/build-site.ts";
import { loadAllStudies } from "../../src/analysis/load-all.ts";
import { InputError } from "../../src/study/input-error.ts";
import { launchChromium } from "../../src/render/pdf/chromium.ts";
import { serveStatic } from "./static-server.ts";
import { loadCoverageOutputStage } from "../../src/render/coverage-output-loader.ts";

// Injection through study input, judged by a real browser (Debian's chromium through
// playwright-core), not by a regex over the HTML: a study whose every free-text field holds
// markup that would run script or add attributes if any escape were missing — in HTML text,
// attributes, the SVG figures (titles, labels, ids) and the coverage map — and whose ids use
// every character the id rule allows, at its longest. Every page must run no script, show no
// dialog, carry no event-handler attribute and no element the study wrote; every href must be
// percent-encoded. Folder names that would break out of an attribute cannot be study ids.

const MARKUP = [
  `<script>alert("s")</script>`,
  `"><img src=x onerror=alert("i")>`,
  `' onmouseover='alert("q")' x='`,
  `" onmouseover="alert('d')" x="`,
  `</title><svg onload=alert("v")>`,
  `javascript:alert("j")`,
  `{{ 7*7 }}{% raw %}`,
  `]]><!--`,
];
const hostile = (label: string, i: number) => `${label} ${MARKUP[i % MARKUP.length]} ${MARKUP[(i + 3) % MARKUP.length]}`;

/** The longest ids the rule allows, with every allowed punctuation mark. */
const ID = (stem: string) => `${stem}.-_`.padEnd(64, "x.-_");

let work: string;
let site: string;
let studyId: string;
let server: { url: string; close: () => Promise<void> };
let browser: { context: BrowserContext; close: () => Promise<void> };

beforeAll(async () => {
  work = mkdtempSync(join(tmpdir(), "ridgeline-injection-"));
  const studies = join(work, "studies");
  studyId = ID("Study9");
  const dir = join(studies, studyId);
  mkdirSync(dir, { recursive: true });
  let k = 0;
  const t = (label: string) => hostile(label, k++);
  const A = ID("A");
  const B = ID("B");
  const C = ID("C");
  const study = {
    title: t("Title"),
    client: t("Client"),
    prepared_by: t("Author"),
    revision: t("Rev"),
    date: "2026-01-15",
    summary: `${t("Summary")}\n${t("second line")}`,
    terrain: { synthetic: { seed: 7, south_deg: 10.0, west_deg: 20.0, north_deg: 10.08, east_deg: 20.1, spacing_arcsec: 3 } },
    radios: [{ id: ID("r"), name: t("Radio"), frequency_ghz: 6.175, tx_power_dbm: 27, rx_threshold_dbm: -78, threshold_ber: "1e-6" }],
    sites: [
      { id: A, name: t("Site A"), lat_deg: 10.01, lon_deg: 20.01, notes: t("Notes") },
      { id: B, name: t("Site B"), lat_deg: 10.07, lon_deg: 20.09, notes: t("More notes") },
      { id: C, name: t("Site C"), lat_deg: 10.02, lon_deg: 20.085 },
    ],
    links: [
      { id: ID("L1"), from: { site: A, antenna_m: 40, gain_dbi: 34 }, to: { site: B, antenna_m: 35, gain_dbi: 34 }, radio: ID("r") },
      { id: ID("L2"), from: { site: B, antenna_m: 20, gain_dbi: 34 }, to: { site: C, antenna_m: 20, gain_dbi: 34 }, radio: ID("r") },
    ],
    chains: [{ id: ID("ch"), name: t("Chain"), links: [ID("L1"), ID("L2")] }],
    coverage: [
      { id: ID("cov1"), site: A, method: "hata", frequency_ghz: 0.9, antenna_m: 30, radius_km: 1.5, resolution_m: 90, thresholds: [-90, -80] },
      { id: ID("cov2"), site: B, method: "hata", frequency_ghz: 0.9, antenna_m: 30, radius_km: 1.5, resolution_m: 90, thresholds: [-90, -80] },
    ],
  };
  writeFileSync(join(dir, "study.yaml"), stringify(study));
  site = join(work, "site");
  await buildSite(await loadAllStudies(studies, { cache: null, coverageOutputs: loadCoverageOutputStage }), { outDir: site });
  server = await serveStatic(site, "/p/");
  browser = await launchChromium({ viewport: { width: 1100, height: 800 } });
}, 240_000);

afterAll(async () => {
  await browser?.close();
  await server?.close();
  if (work) rmSync(work, { recursive: true, force: true });
});

function htmlPages(root: string): string[] {
  const out: string[] = [];
  const walk = (d: string) => {
    for (const e of readdirSync(d, { withFileTypes: true })) {
      if (e.isDirectory()) walk(join(d, e.name));
      else if (e.name.endsWith(".html")) out.push(relative(root, join(d, e.name)).split("\\").join("/"));
    }
  };
  walk(root);
  return out.sort();
}

describe("hostile study text in a real browser", () => {
  it("runs no script, adds no attribute or element, and percent-encodes every href, on every page", async () => {
    const pages = htmlPages(site);
    expect(pages.length).toBeGreaterThanOrEqual(5); // catalogue, study, print, two links
    const page = await browser.context.newPage();
    const dialogs: string[] = [];
    page.on("dialog", (d) => {
      dialogs.push(d.message());
      void d.dismiss();
    });
    for (const p of pages) {
      await page.goto(`${server.url}${p}`, { waitUntil: "load" });
      // hover every element, which would fire an injected onmouseover
      const facts = await page.evaluate(() => {
        const all = [...document.querySelectorAll("*")];
        const handlers = all.flatMap((el) => [...el.attributes].filter((a) => /^on/i.test(a.name)).map((a) => `${el.tagName}[${a.name}]`));
        const injected = all.filter((el) => (el.tagName === "IMG" && el.getAttribute("src") === "x") || (el.tagName.toLowerCase() === "svg" && el.hasAttribute("onload")));
        // the markup closes an attribute with x='…' / x="…": an HTML element with an x attribute, or an attribute named with a quote, was injected
        const html = "http://www.w3.org/1999/xhtml";
        const strayAttrs = all.flatMap((el) => [...el.attributes].filter((a) => (a.name === "x" && el.namespaceURI === html) || /['"<>]/.test(a.name)).map((a) => `${el.tagName}[${a.name}]`));
        const hrefs = [...document.querySelectorAll("[href]")].map((el) => el.getAttribute("href") ?? "");
        for (const el of all) el.dispatchEvent(new MouseEvent("mouseover", { bubbles: true }));
        // the only scripts are the site's own: Leaflet and the map script from the site's assets, and the map's data as a JSON block
        const scripts = [...document.querySelectorAll("script")].filter((s) => {
          const attrs = [...s.attributes].map((a) => a.name).sort().join(" ");
          if (attrs === "src") return !/^(\.\.\/)*assets\/(leaflet\/leaflet|live-map)\.js$/.test(s.getAttribute("src") ?? "");
          if (attrs !== "id type" || s.getAttribute("type") !== "application/json" || !s.id.startsWith("live-map-data-")) return true;
          try {
            JSON.parse(s.textContent ?? "");
            return false;
          } catch {
            return true;
          }
        });
        return { handlers, injected: injected.length, strayAttrs, scripts: scripts.map((s) => s.outerHTML.slice(0, 120)), hrefs, text: document.body.innerText };
      });
      expect(facts.handlers, p).toEqual([]);
      expect(facts.strayAttrs, p).toEqual([]);
      expect(facts.injected, p).toBe(0);
      expect(facts.scripts, p).toEqual([]);
      for (const h of facts.hrefs) {
        if (h.startsWith("data:")) continue;
        expect(h, `${p}: href ${h}`).toMatch(/^[A-Za-z0-9._~%\/#:-]*$/);
        expect(h, p).not.toMatch(/^javascript:/i);
      }
      if (p.startsWith("studies/") && !p.includes("/links/")) expect(facts.text, p).toContain(MARKUP[0]);
    }
    expect(dialogs).toEqual([]);
    await page.close();
  }, 120_000);

  it("shows the markup as text in the overview and coverage maps (SVG)", async () => {
    const page = await browser.context.newPage();
    await page.goto(`${server.url}studies/${studyId}/index.html`, { waitUntil: "load" });
    const svgText = await page.locator("svg").evaluateAll((els) => els.map((e) => e.textContent ?? "").join(" "));
    expect(svgText).toContain(MARKUP[0]);
    expect(await page.locator("svg foreignObject, svg script").count()).toBe(0);
    await page.close();
  });

  it("a folder name that would break out of an attribute is not a study id", async () => {
    const studies = join(work, "bad-folder");
    const dir = join(studies, `x" onmouseover="alert(1)`);
    mkdirSync(dir, { recursive: true });
    writeFileSync(join(dir, "study.yaml"), "title: t\n");
    const e = await loadAllStudies(studies, { cache: null, coverageOutputs: loadCoverageOutputStage }).catch((x: unknown) => x);
    expect(e).toBeInstanceOf(InputError);
    expect((e as InputError).message).toMatch(/a folder name usable as a study id/);
  });
});
