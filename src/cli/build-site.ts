import { cpSync, existsSync, renameSync, rmSync } from "node:fs";
import { join, resolve } from "node:path";
import Eleventy from "@11ty/eleventy";
import type { AnalyzedStudy } from "../analysis/analyze-study.ts";
import { setAnalyzedStudies } from "../site/site-data.ts";

/**
 * Render analysed studies into `outDir` with Eleventy. The site is written to a temporary
 * sibling folder and swapped in only when complete, so a failed build leaves the previous
 * site as it was.
 */
export async function buildSite(studies: AnalyzedStudy[], options: { outDir?: string; inputDir?: string; pathPrefix?: string } = {}): Promise<{ outDir: string; files: number }> {
  const outDir = resolve(options.outDir ?? "_site");
  const tmp = `${outDir}.building-${process.pid}`;
  const old = `${outDir}.previous-${process.pid}`;
  rmSync(tmp, { recursive: true, force: true });
  setAnalyzedStudies(studies, options.pathPrefix ?? "/");
  const elev = new Eleventy(options.inputDir ?? "content", tmp, {
    quietMode: true,
    configPath: resolve(".eleventy.js"),
    pathPrefix: options.pathPrefix ?? "/",
  });
  let files = 0;
  try {
    const written = await elev.write();
    files = countWritten(written);
  } catch (e) {
    rmSync(tmp, { recursive: true, force: true });
    throw e;
  }
  // Coverage files (GeoTIFF, PNG, GeoJSON, KML) next to each study page.
  for (const s of studies) {
    if (s.coverage) cpSync(s.coverage.dir, join(tmp, "studies", s.study.id, "coverage"), { recursive: true });
  }
  // Keep the changes page that `ridgeline diff` wrote into the previous site.
  const changes = join(outDir, "changes");
  if (existsSync(changes) && !existsSync(join(tmp, "changes"))) cpSync(changes, join(tmp, "changes"), { recursive: true });
  if (existsSync(outDir)) renameSync(outDir, old);
  renameSync(tmp, outDir);
  rmSync(old, { recursive: true, force: true });
  return { outDir, files };
}

function countWritten(written: unknown): number {
  // Eleventy returns [passthroughCopies, templates]; count what it reports.
  if (!Array.isArray(written)) return 0;
  return written.flat(2).filter((x) => x && typeof x === "object").length;
}
