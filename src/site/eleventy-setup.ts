import { capacityCurveSvg, diversityCurveSvg } from "./performance-figures.ts";
import { createRequire } from "node:module";
import { dirname, relative } from "node:path";
import { liveMapData, scriptJson } from "./live-map-data.ts";
import type { AnalyzedStudy } from "../analysis/analyze-study.ts";
import type { StudyResult } from "../analysis/results.ts";
import type { CoverageResult } from "../coverage/coverage-result.ts";
import { loadAllStudies } from "../analysis/load-all.ts";
import { cssString } from "./css-string.ts";
import { formatDuration, formatFrequency, formatK, formatNumber, formatPercent, formatRatio, formatSigned, formatSmall } from "../format/quantity.ts";
import { linksCsv, networkGeoJson, networkKml, sitesCsv } from "./exchange-files.ts";
import { profileSourceText } from "./profile-source.ts";
import { reviewWarnings } from "./review-warnings.ts";
import { linkFresnelSvg, linkHeightGainSvg, linkProfileSvg } from "./link-figures.ts";
import { relativeUrl } from "./relative-url.ts";
import { analyzedStudy, getAnalyzedStudies, setAnalyzedStudies, siteData } from "./site-data.ts";
import { studyMapSvg } from "./study-map.ts";
import { linkWaveFieldSvg, linkWaveHeightGainSvg } from "./wave-figures.ts";
import { coverageWaveCheckSvg } from "./wave-check-figures.ts";
import { loadCoverageOutputStage } from "../render/coverage-output-loader.ts";

// Eleventy's config object is untyped here; only the calls below are used.
interface EleventyConfig {
  addGlobalData(name: string, value: unknown): void;
  addFilter(name: string, fn: (...args: any[]) => unknown): void;
  addShortcode(name: string, fn: (...args: any[]) => unknown): void;
  addPassthroughCopy(spec: Record<string, string> | string): void;
  ignores: { add(glob: string): void };
  setQuietMode(q: boolean): void;
}

/** Overview maps drawn for this build (they need sharp, which is asynchronous), by study id. */
const maps = new Map<string, string>();
/** Interactive map data (JSON for a script block) by study id. */
const liveMaps = new Map<string, string>();
/** Wave-solution field figures drawn for this build (sharp again), by "study/link". */
const waveFields = new Map<string, string>();
/**
 * A link's figures drawn once per analysis: the link page and the study's print page show the
 * same SVG (same ids, same input), and drawing the path profile is most of a link page's cost.
 * Keyed by the analysed study object, so a new analysis (serve's rebuild) draws afresh.
 */
const drawn = new WeakMap<object, Map<string, string>>();
function linkFigure(draw: (s: AnalyzedStudy, linkId: string) => string, name: string) {
  return (studyId: string, linkId: string): string => {
    const s = analyzedStudy(studyId);
    let figs = drawn.get(s);
    if (!figs) drawn.set(s, (figs = new Map()));
    const key = `${name}\u0000${linkId}`;
    let svg = figs.get(key);
    if (svg === undefined) figs.set(key, (svg = draw(s, linkId)));
    return svg;
  };
}

/**
 * The Eleventy side of Ridgeline: global data `ridgeline` (the analysed studies), filters for
 * numbers and relative links, and shortcodes that draw the figures. Templates only lay out.
 */
export default function ridgelineSite(eleventyConfig: EleventyConfig): void {
  eleventyConfig.addGlobalData("ridgeline", async () => {
    let studies = getAnalyzedStudies();
    if (!studies) {
      // Eleventy run on its own (npx @11ty/eleventy): analyse the studies here.
      studies = await loadAllStudies("content/studies", { coverageOutputs: loadCoverageOutputStage });
      setAnalyzedStudies(studies);
    }
    maps.clear();
    liveMaps.clear();
    const svgs = await Promise.all(studies.map((s) => studyMapSvg(s)));
    studies.forEach((s, i) => maps.set(s.study.id, svgs[i]));
    const live = await Promise.all(studies.map((s) => liveMapData(s)));
    studies.forEach((s, i) => liveMaps.set(s.study.id, scriptJson(live[i])));
    waveFields.clear();
    for (const s of studies) {
      const figs = await Promise.all(s.result.links.map((l) => linkWaveFieldSvg(s, l.id)));
      s.result.links.forEach((l, i) => waveFields.set(`${s.study.id}/${l.id}`, figs[i]));
    }
    return siteData(studies);
  });
  eleventyConfig.addFilter("rel", function (this: { page?: { url?: string } }, target: string) {
    return relativeUrl(this.page?.url ?? "/", target);
  });
  eleventyConfig.addFilter("num", (v: unknown, digits = 1) => formatNumber(v, digits));
  eleventyConfig.addFilter("small", (v: unknown, sig = 3) => formatSmall(v, sig));
  eleventyConfig.addFilter("duration", (v: unknown) => formatDuration(v));
  eleventyConfig.addFilter("freq", (ghz: unknown) => formatFrequency(ghz));
  eleventyConfig.addFilter("kval", (k: unknown) => formatK(k));
  eleventyConfig.addFilter("pct", (v: unknown, digits = 5) => formatPercent(v, digits));
  eleventyConfig.addFilter("ratio", (v: unknown) => formatRatio(v));
  // a budget item: its sign ("+", "−" or "") applied to its magnitude, written with the sign
  eleventyConfig.addFilter("signed", (v: unknown, sign: string, digits = 2) => (typeof v === "number" && sign ? formatSigned(sign === "−" ? -v : v, digits) : formatNumber(v, digits)));
  eleventyConfig.addFilter("profileSource", (s: unknown) => profileSourceText(String(s ?? "")));
  eleventyConfig.addFilter("reviewWarnings", (w: unknown, ctx: { frequency_ghz?: number; gases_db?: number | null } = {}) => reviewWarnings(Array.isArray(w) ? w : [], ctx ?? {}));
  eleventyConfig.addFilter("cssString", (v: unknown) => cssString(v));
  eleventyConfig.addFilter("sitesCsv", (r: StudyResult) => sitesCsv(r));
  eleventyConfig.addFilter("linksCsv", (r: StudyResult) => linksCsv(r));
  eleventyConfig.addFilter("networkGeojson", (r: StudyResult) => networkGeoJson(r));
  eleventyConfig.addFilter("networkKml", (r: StudyResult) => networkKml(r));
  eleventyConfig.addFilter("json", (v: unknown) => JSON.stringify(v, null, 2));
  eleventyConfig.addShortcode("profilePlot", linkFigure(linkProfileSvg, "profilePlot"));
  eleventyConfig.addShortcode("fresnelSection", linkFigure(linkFresnelSvg, "fresnelSection"));
  eleventyConfig.addShortcode("heightGain", linkFigure(linkHeightGainSvg, "heightGain"));
  eleventyConfig.addShortcode("diversityCurve", linkFigure(diversityCurveSvg, "diversityCurve"));
  eleventyConfig.addShortcode("capacityCurve", linkFigure(capacityCurveSvg, "capacityCurve"));
  eleventyConfig.addShortcode("liveMapData", (studyId: string) => {
    const data = liveMaps.get(studyId);
    if (data === undefined) throw new Error(`No interactive map data was made for study ${studyId}.`);
    return data;
  });
  eleventyConfig.addShortcode("waveField", (studyId: string, linkId: string) => waveFields.get(`${studyId}/${linkId}`) ?? "");
  eleventyConfig.addShortcode("waveHeightGain", linkFigure(linkWaveHeightGainSvg, "waveHeightGain"));
  eleventyConfig.addShortcode("overviewMap", (studyId: string) => {
    const svg = maps.get(studyId);
    if (svg === undefined) throw new Error(`No overview map was drawn for study ${studyId}.`);
    return svg;
  });
  eleventyConfig.addShortcode("waveCheckFigure", (c: CoverageResult) => coverageWaveCheckSvg(c));
  eleventyConfig.addShortcode("coverageMap", (studyId: string, coverageId: string) => {
    const map = analyzedStudy(studyId).coverage?.maps.find((m) => m.id === coverageId);
    if (!map) throw new Error(`No coverage map ${coverageId} was drawn for study ${studyId}.`);
    return map.svg;
  });
  eleventyConfig.addPassthroughCopy({ "content/assets": "assets" });
  // Leaflet travels with the site (no CDN): its script, stylesheet and control images.
  const leaflet = relative(process.cwd(), dirname(createRequire(import.meta.url).resolve("leaflet/dist/leaflet.js")));
  eleventyConfig.addPassthroughCopy({ [`${leaflet}/leaflet.js`]: "assets/leaflet/leaflet.js", [`${leaflet}/leaflet.css`]: "assets/leaflet/leaflet.css", [`${leaflet}/images`]: "assets/leaflet/images" });
  eleventyConfig.ignores.add("content/studies/**");
  eleventyConfig.setQuietMode(true);
}
