import { loadAllStudies } from "../analysis/load-all.ts";
import { cssString } from "./css-string.ts";
import { formatDuration, formatNumber, formatSmall } from "./format.ts";
import { linkFresnelSvg, linkHeightGainSvg, linkProfileSvg } from "./link-figures.ts";
import { relativeUrl } from "./relative-url.ts";
import { analyzedStudy, getAnalyzedStudies, setAnalyzedStudies, siteData } from "./site-data.ts";
import { studyMapSvg } from "./study-map.ts";
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
    const svgs = await Promise.all(studies.map((s) => studyMapSvg(s)));
    studies.forEach((s, i) => maps.set(s.study.id, svgs[i]));
    return siteData(studies);
  });
  eleventyConfig.addFilter("rel", function (this: { page?: { url?: string } }, target: string) {
    return relativeUrl(this.page?.url ?? "/", target);
  });
  eleventyConfig.addFilter("num", (v: unknown, digits = 1) => formatNumber(v, digits));
  eleventyConfig.addFilter("small", (v: unknown, sig = 3) => formatSmall(v, sig));
  eleventyConfig.addFilter("duration", (v: unknown) => formatDuration(v));
  eleventyConfig.addFilter("cssString", (v: unknown) => cssString(v));
  eleventyConfig.addFilter("json", (v: unknown) => JSON.stringify(v, null, 2));
  eleventyConfig.addShortcode("profilePlot", (studyId: string, linkId: string) => linkProfileSvg(analyzedStudy(studyId), linkId));
  eleventyConfig.addShortcode("fresnelSection", (studyId: string, linkId: string) => linkFresnelSvg(analyzedStudy(studyId), linkId));
  eleventyConfig.addShortcode("heightGain", (studyId: string, linkId: string) => linkHeightGainSvg(analyzedStudy(studyId), linkId));
  eleventyConfig.addShortcode("overviewMap", (studyId: string) => {
    const svg = maps.get(studyId);
    if (svg === undefined) throw new Error(`No overview map was drawn for study ${studyId}.`);
    return svg;
  });
  eleventyConfig.addShortcode("coverageMap", (studyId: string, coverageId: string) => {
    const map = analyzedStudy(studyId).coverage?.maps.find((m) => m.id === coverageId);
    if (!map) throw new Error(`No coverage map ${coverageId} was drawn for study ${studyId}.`);
    return map.svg;
  });
  eleventyConfig.addPassthroughCopy({ "content/assets": "assets" });
  eleventyConfig.ignores.add("content/studies/**");
  eleventyConfig.setQuietMode(true);
}
