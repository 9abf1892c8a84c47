import { loadAllStudies } from "../cli/load-all.ts";
import { profilePlotSvg } from "../render/svg/profile-plot.ts";
import { formatNumber } from "./format.ts";
import { relativeUrl } from "./relative-url.ts";
import { analyzedStudy, getAnalyzedStudies, setAnalyzedStudies, siteData } from "./site-data.ts";

// Eleventy's config object is untyped here; only the calls below are used.
interface EleventyConfig {
  addGlobalData(name: string, value: unknown): void;
  addFilter(name: string, fn: (...args: any[]) => unknown): void;
  addShortcode(name: string, fn: (...args: any[]) => unknown): void;
  addPassthroughCopy(spec: Record<string, string> | string): void;
  ignores: { add(glob: string): void };
  setQuietMode(q: boolean): void;
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
      studies = await loadAllStudies("content/studies");
      setAnalyzedStudies(studies);
    }
    return siteData(studies);
  });
  eleventyConfig.addFilter("rel", function (this: { page?: { url?: string } }, target: string) {
    return relativeUrl(this.page?.url ?? "/", target);
  });
  eleventyConfig.addFilter("num", (v: unknown, digits = 1) => formatNumber(v, digits));
  eleventyConfig.addFilter("json", (v: unknown) => JSON.stringify(v, null, 2));
  eleventyConfig.addShortcode("profilePlot", (studyId: string, linkId: string) => {
    const s = analyzedStudy(studyId);
    const link = s.result.links.find((l) => l.id === linkId)!;
    const fig = s.figures.get(linkId)!;
    return profilePlotSvg({
      id: `profile-${linkId}`,
      title: `Path profile ${link.ends.from.name} – ${link.ends.to.name}`,
      d_m: fig.profile.d_m,
      terrain_m: fig.profile.terrain_m,
      obstruction_m: fig.profile.obstruction_m,
      from: { name: link.ends.from.name, ground_m: link.ends.from.ground_m, antenna_m: link.ends.from.antenna_m },
      to: { name: link.ends.to.name, ground_m: link.ends.to.ground_m, antenna_m: link.ends.to.antenna_m },
      lambda_m: fig.lambda_m,
      ks: fig.ks,
    });
  });
  eleventyConfig.addPassthroughCopy({ "content/assets": "assets" });
  eleventyConfig.ignores.add("content/studies/**");
  eleventyConfig.setQuietMode(true);
}
