import { cpSync, existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join, resolve } from "node:path";
import { pathToFileURL } from "node:url";
import type { BrowserContext, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { buildSite } from "../../src/cli/build-site.ts";
import { loadAllStudies } from "../../src/analysis/load-all.ts";
import { launchChromium } from "../../src/render/pdf/chromium.ts";
import { serveStatic } from "./static-server.ts";
import { loadCoverageOutputStage } from "../../src/render/coverage-output-loader.ts";

// The study page's interactive map (issue 18 §7) in Debian's chromium: Leaflet bundled with
// the site, no request leaves it (no CDN, no tiles), it works from file:// and under a path
// prefix, layers toggle, and a link's popup leads to its page.

const DEMO = "kestrel-vale";
const PREFIX = "/reports/ridgeline/";
const SCREENSHOTS = resolve("test-output/screenshots");
let work: string;
let site: string;
let browser: { context: BrowserContext; close: () => Promise<void> };
let server: { url: string; close: () => Promise<void> };

beforeAll(async () => {
  work = mkdtempSync(join(tmpdir(), "ridgeline-map-"));
  const studies = join(work, "studies");
  mkdirSync(studies);
  cpSync(resolve("content/studies", DEMO), join(studies, DEMO), { recursive: true });
  site = join(work, "site");
  await buildSite(await loadAllStudies(studies, { coverageOutputs: loadCoverageOutputStage }), { outDir: site });
  browser = await launchChromium({ viewport: { width: 1280, height: 900 } });
  server = await serveStatic(site, PREFIX);
}, 240_000);
afterAll(async () => {
  await browser?.close();
  await server?.close();
  rmSync(work, { recursive: true, force: true });
});

/** Open a page, wait for the map, and return the problems seen and every URL requested. */
async function openMap(page: Page, url: string): Promise<{ problems: string[]; requests: string[] }> {
  const problems: string[] = [];
  const requests: string[] = [];
  page.on("console", (m) => m.type() === "error" && problems.push(m.text()));
  page.on("pageerror", (e) => problems.push(e.message));
  page.on("request", (r) => requests.push(r.url()));
  page.on("requestfailed", (r) => problems.push(`failed: ${r.url()}`));
  await page.goto(url, { waitUntil: "load" });
  await page.waitForSelector(".live-map[data-ready=true]", { timeout: 10_000 });
  return { problems, requests };
}

describe("the interactive map", () => {
  it("works from file:// with Leaflet bundled: no request leaves the site folder", async () => {
    const page = await browser.context.newPage();
    const { problems, requests } = await openMap(page, pathToFileURL(join(site, "studies", DEMO, "index.html")).href);
    expect(problems).toEqual([]);
    expect(requests.filter((u) => !u.startsWith("file:") && !u.startsWith("data:"))).toEqual([]);
    expect(requests.some((u) => u.endsWith("/assets/leaflet/leaflet.js"))).toBe(true);
    expect(await page.locator(".live-map path.map-link-met").count()).toBe(11);
    expect(await page.locator(".live-map path.map-link-rejected").count()).toBe(1);
    expect(await page.locator(".live-map path.map-site").count()).toBe(10);
    // the static figure stays in the page for print, hidden on screen while the map runs
    expect(await page.locator("figure.map-static svg.overview-map").count()).toBe(1);
    expect(await page.locator("figure.map-static").isVisible()).toBe(false);
    await page.close();
  });

  it("layers toggle: a coverage overlay appears and goes, the hillshade can be hidden", async () => {
    const page = await browser.context.newPage();
    await openMap(page, pathToFileURL(join(site, "studies", DEMO, "index.html")).href);
    const toggle = (name: RegExp) => page.locator(".leaflet-control-layers label", { hasText: name }).locator("input");
    expect(await page.locator("img.map-hillshade").count()).toBe(1);
    expect(await page.locator("img.map-coverage-harr-uhf").count()).toBe(0);
    await toggle(/Coverage harr-uhf/).check();
    const img = page.locator("img.map-coverage-harr-uhf");
    await img.waitFor();
    await expect.poll(() => img.evaluate((e) => (e as HTMLImageElement).naturalWidth)).toBeGreaterThan(0);
    await toggle(/Coverage harr-uhf/).uncheck();
    expect(await page.locator("img.map-coverage-harr-uhf").count()).toBe(0);
    await toggle(/Shaded relief/).uncheck();
    expect(await page.locator("img.map-hillshade").count()).toBe(0);
    await page.close();
  });

  it("a link's popup opens with its verdict and leads to the link page", async () => {
    const page = await browser.context.newPage();
    await openMap(page, pathToFileURL(join(site, "studies", DEMO, "index.html")).href);
    await page.locator("path.map-link-rejected").click({ force: true });
    const popup = page.locator(".leaflet-popup-content");
    await popup.waitFor();
    expect(await popup.innerText()).toMatch(/mill-aldr[\s\S]*Millbrook Depot → Aldermoor Tank[\s\S]*rejected design/);
    await popup.getByRole("link", { name: "Link page" }).click();
    await page.waitForLoadState("load");
    expect(page.url()).toBe(pathToFileURL(join(site, "studies", DEMO, "links", "mill-aldr", "index.html")).href);
    await page.close();
  });

  it("works under a path prefix, and screenshots of the study and a link page are saved", async () => {
    const page = await browser.context.newPage();
    const { problems, requests } = await openMap(page, `${server.url}studies/${DEMO}/`);
    expect(problems).toEqual([]);
    expect(requests.filter((u) => !u.startsWith(server.url) && !u.startsWith("data:"))).toEqual([]);
    mkdirSync(SCREENSHOTS, { recursive: true });
    await page.locator(".leaflet-control-layers label", { hasText: /Coverage composite/ }).locator("input").check();
    await page.locator(".live-map path.map-link-met").first().click({ force: true });
    await page.locator(".leaflet-popup-content").waitFor();
    await page.waitForTimeout(400); // the popup fades in
    // the relief shows through the map's vector layer (a page rule once painted that layer white)
    expect(await page.locator(".live-map svg").first().evaluate((e) => getComputedStyle(e).backgroundColor)).toBe("rgba(0, 0, 0, 0)");
    await page.locator(".live-map").screenshot({ path: join(SCREENSHOTS, "study-map.png") });
    await page.screenshot({ path: join(SCREENSHOTS, "study-page.png"), fullPage: true });
    await page.goto(`${server.url}studies/${DEMO}/links/mill-aldr/`, { waitUntil: "load" });
    await page.screenshot({ path: join(SCREENSHOTS, "link-page-mill-aldr.png"), fullPage: true });
    for (const f of ["study-map.png", "study-page.png", "link-page-mill-aldr.png"]) expect(existsSync(join(SCREENSHOTS, f))).toBe(true);
    expect(readFileSync(join(site, "studies", DEMO, "index.html"), "utf8")).not.toMatch(/https?:\/\/(?!www\.w3\.org|www\.opengis)/);
    await page.close();
  });
});
