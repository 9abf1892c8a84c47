import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { buildSite } from "../../src/cli/build-site.ts";
import { loadAllStudies } from "../../src/analysis/load-all.ts";
import { htmlFiles, runningText, textFaults } from "../helpers/page-text.ts";
import { PROJECT_ROOT } from "../helpers/run-cli.ts";
import { loadCoverageOutputStage } from "../../src/render/coverage-output-loader.ts";

// Every page of the demo read as a client would (issue 18 §3): no exponent notation, no NaN,
// no ASCII hyphen for a minus sign, no doubled words — and each fault quoted in the issue is
// named below so that its return fails a test of its own.

let work: string;
let site: string;
const pages = new Map<string, string>();
const text = (rel: string) => runningText(pages.get(rel)!).join("\n");

beforeAll(async () => {
  work = mkdtempSync(join(tmpdir(), "ridgeline-text-"));
  site = join(work, "_site");
  await buildSite(await loadAllStudies(join(PROJECT_ROOT, "content/studies"), { coverageOutputs: loadCoverageOutputStage }), { outDir: site });
  for (const f of htmlFiles(site)) pages.set(f.slice(site.length + 1), readFileSync(f, "utf8"));
}, 120_000);
afterAll(() => rmSync(work, { recursive: true, force: true }));

describe("every demo page's running text", () => {
  it("has no exponent notation, NaN, ASCII minus or doubled word", () => {
    expect(pages.size).toBeGreaterThan(5);
    const faults = [...pages].flatMap(([rel, html]) => textFaults(html).map((f) => `${rel}: ${f}`));
    expect(faults).toEqual([]);
  });
});

describe("faults quoted in issue 18 stay gone", () => {
  const study = "studies/kestrel-vale/index.html";
  it("study verdict: grammar, and the rejected revision-A path is not a design failure", () => {
    expect(text(study)).not.toMatch(/links miss a design target/);
    expect(text(study)).toMatch(/All 11 links meet their design targets/);
    expect(text(study)).toMatch(/Alternative and rejected designs/);
  });
  it("no doubled 'synthetic (synthetic'", () => expect(text(study)).not.toMatch(/synthetic \(synthetic/));
  it("link ids do not wrap inside the id", () => expect(pages.get(study)).toMatch(/class="link-id"/));
  it("frequencies in one style: MHz below 1 GHz, GHz above, never 1.125e+4 or 0.459", () => {
    const all = [...pages.values()].map((h) => runningText(h).join("\n")).join("\n");
    expect(all).not.toMatch(/1\.125e\+4|11\.2450 GHz|0\.4585? GHz|frequency 0\.459/);
    expect(all).toMatch(/11\.245 GHz/);
    expect(all).toMatch(/458\.5 MHz/);
  });
  it("k as the study wrote it, not 1.333", () => expect([...pages.values()].join("")).not.toMatch(/k = 1\.333/));
  it("small percentages as × 10⁻ⁿ in warnings as in tables", () => {
    const all = [...pages.values()].map((h) => runningText(h).join("\n")).join("\n");
    expect(all).not.toMatch(/\(\d\.\d+e-\d+ %\)/);
  });
  it("budget rows carry the sign on the number: no '− 0.50' or '− 0.00'", () => {
    const link = text("studies/kestrel-vale/links/mill-harr/index.html");
    expect(link).not.toMatch(/[−+] \d/);
    expect(link).not.toMatch(/−0\.00\b/);
    expect(link).toMatch(/−0\.50/);
  });
  it("true minus in coverage notes ('at or above −95 dBm', composite centre)", () => {
    expect(text(study)).not.toMatch(/-95 dBm|-41\.0/);
  });
  it("wording: no 'Profile: terrain:', no '(EPSG:4326 (', no 'at the first k'; threshold with its BER", () => {
    const all = [...pages.values()].map((h) => runningText(h).join("\n")).join("\n");
    expect(all).not.toMatch(/Profile: terrain:|\(EPSG:4326 \(|at the first k/);
    expect(text("studies/kestrel-vale/links/mill-harr/index.html")).toMatch(/Receiver threshold\n−70\.50\ndBm\nat a bit-error ratio of 10⁻⁶/);
  });
  it("no developer notes in the client report", () => {
    expect(text(study)).not.toMatch(/18 m at 30 km|kept incrementally|not an approximation/);
  });
  it("reflection table: σ is conductivity in the caption only; no rows of 0.000", () => {
    const t = text("studies/kestrel-vale/links/mill-harr/index.html");
    expect(t).not.toMatch(/roughness σ/);
    for (const [rel, html] of pages) {
      const table = /<caption>Specular reflection points[\s\S]*?<\/table>/.exec(html)?.[0];
      if (!table) continue;
      // the effective coefficient is the 8th cell of each row; weak points are counted in the caption instead
      for (const row of table.match(/<tr><th scope="row"[\s\S]*?<\/tr>/g) ?? []) expect(row.match(/<td class="num">([^<]*)<\/td>/g)?.[6], rel).not.toMatch(/>0\.000</);
    }
  });
  it("blocked path: no height-gain figure, a sentence says why", () => {
    const h = pages.get("studies/kestrel-vale/links/mill-aldr/index.html")!;
    expect(h).not.toMatch(/id="height-gain-mill-aldr/);
    expect(runningText(h).join("\n")).toMatch(/obstructed.*no height-gain curve is drawn/);
  });
  it("UHF link: gaseous absorption as one note, P.530 warnings grouped under the method", () => {
    const t = text("studies/kestrel-vale/links/grey-lowf/index.html");
    expect(t).toMatch(/Note Gaseous absorption is negligible at 458\.5 MHz/);
    expect(t.match(/^Warning ITU-R P\.530-16 §2\.4\.1/gm)?.length).toBe(1);
    expect(t).not.toMatch(/Warning ITU-R P\.676/);
  });
  it("HTML footer and PDF footer carry the same disclaimer", () => {
    const h = pages.get(study)!;
    const footer = /<p class="disclaimer">([^<]+)<\/p>/.exec(h)?.[1];
    expect(footer).toBeTruthy();
    const css = /@bottom-left \{ content: "((?:[^"\\]|\\.)*)"/.exec(h)?.[1] ?? "";
    expect(css.replace(/\\([0-9a-f]{1,6}) ?/gi, (_m, hex: string) => String.fromCodePoint(parseInt(hex, 16)))).toBe(footer);
  });
  it("document control: number, revision history and three sign-off rows, empty boxes for approval", () => {
    const t = text(study);
    expect(t).toMatch(/KVWB-RL-0042/);
    expect(t).toMatch(/Prepared\nR\. Okafor/);
    expect(t).toMatch(/Checked\nT\. Lindqvist/);
    expect(t).toMatch(/Approved\n(?!\S*Okafor)/);
  });
});
