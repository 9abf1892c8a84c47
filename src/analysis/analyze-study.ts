import { createHash } from "node:crypto";
import { readFileSync } from "node:fs";
import { resolve } from "node:path";
import { InputError, type InputProblem } from "../study/input-error.ts";
import type { Study } from "../study/study.ts";
import { openTerrain, type TerrainSpec } from "../terrain/open-terrain.ts";
import type { Terrain } from "../terrain/terrain.ts";
import { TerrainError } from "../terrain/terrain-error.ts";
import { ProfileCsvError } from "../terrain/profile-csv-error.ts";
import { analyzeLink, siteGroundM, type LinkFigureData } from "./analyze-link.ts";
import { chainResults } from "./chains.ts";
import { gitState, TOOL_VERSION } from "./provenance.ts";
import type { LinkResult, StudyResult } from "./results.ts";
import { sanitizeNumbers } from "./sanitize.ts";

export interface AnalyzedStudy {
  study: Study;
  result: StudyResult;
  figures: Map<string, LinkFigureData>;
  terrain: Terrain;
}

export interface AnalyzeOptions {
  /** Called after each link with (done, total). */
  onProgress?: (done: number, total: number) => void;
}

/** The terrain spec a study names. */
export function terrainSpecOf(study: Study): TerrainSpec {
  const t = study.terrain;
  if ("file" in t) return { kind: "file", path: t.file };
  if ("constant_m" in t) return { kind: "constant", height_m: t.constant_m };
  return { kind: "synthetic", ...t.synthetic };
}

/** Open a study's terrain, turning terrain failures into input errors at the terrain field. */
export async function openStudyTerrain(study: Study): Promise<Terrain> {
  try {
    return await openTerrain(terrainSpecOf(study), study.dir);
  } catch (e) {
    if (e instanceof TerrainError) {
      throw new InputError([{ file: study.file, ...study.locate(["terrain"]), field: "terrain", received: e.detail.path ?? "the terrain named here", expected: `${e.message}${e.detail.hint ? ` ${e.detail.hint}` : ""}` }], { cause: e });
    }
    throw e;
  }
}

/** Check that every site lies on the terrain; every site outside is one problem. */
export function checkSitesOnTerrain(study: Study, terrain: Terrain): void {
  const problems: InputProblem[] = [];
  const usedByTerrainLinks = new Set(study.links.filter((l) => !l.profile_csv).flatMap((l) => [l.from.site, l.to.site]));
  study.sites.forEach((s, i) => {
    if (!usedByTerrainLinks.has(s.id) && s.ground_m !== undefined) return;
    const why = terrain.whyOutside(s.lat_deg, s.lon_deg);
    if (why) problems.push({ file: study.file, ...study.locate(["sites", i, "lat_deg"]), field: `sites[${i}] (${s.id})`, received: `${s.lat_deg}, ${s.lon_deg}`, expected: `a position on the study's terrain: ${why}` });
  });
  if (problems.length) throw new InputError(problems);
}

/** Analyse every link of a study and assemble its JSON result. */
export async function analyzeStudy(study: Study, options: AnalyzeOptions = {}): Promise<AnalyzedStudy> {
  const terrain = await openStudyTerrain(study);
  checkSitesOnTerrain(study, terrain);
  const figures = new Map<string, LinkFigureData>();
  const links: LinkResult[] = [];
  const hash = createHash("sha256").update(study.file_sha256).update(terrain.fingerprint()).update(TOOL_VERSION);
  const problems: InputProblem[] = [];
  study.links.forEach((link, i) => {
    try {
      if (link.profile_csv) hash.update(readFileSync(resolve(study.dir, link.profile_csv)));
      const { result, figure } = analyzeLink(study, link, terrain);
      const warnings = [...result.warnings];
      links.push({ ...sanitizeNumbers(result, warnings, `link ${link.id}`), warnings });
      figures.set(link.id, figure);
    } catch (e) {
      if (e instanceof ProfileCsvError) {
        problems.push({ file: e.detail.path, line: e.detail.line, col: e.detail.column, field: `${e.detail.field} (profile of link ${link.id})`, received: JSON.stringify(e.detail.value), expected: e.detail.expected });
      } else throw e;
    }
    options.onProgress?.(i + 1, study.links.length);
  });
  if (problems.length) throw new InputError(problems);
  const warnings: string[] = [];
  if (terrain.synthetic) warnings.push(`Terrain is synthetic (${terrain.description}): figures show invented ground, not a real place.`);
  const result: StudyResult = {
    id: study.id,
    title: study.meta.title,
    client: study.meta.client,
    prepared_by: study.meta.prepared_by,
    revision: study.meta.revision,
    date: study.meta.date,
    ...(study.meta.summary ? { summary: study.meta.summary } : {}),
    terrain: { description: terrain.description, synthetic: terrain.synthetic },
    assumptions: {
      k_factors: study.design.k_factors.map((k) => k.label),
      clearance_criteria: study.design.clearance_criteria.map((c) => ({ k: c.k.label, min_f1: c.min_f1 })),
      availability_pct: study.design.availability_pct,
      diffraction_method: study.design.diffraction_method,
      field_margin_db: study.design.field_margin_db,
      climate: study.climate,
    },
    sites: study.sites.map((s) => ({ id: s.id, name: s.name, lat_deg: s.lat_deg, lon_deg: s.lon_deg, ground_m: siteGroundM(s, terrain), ...(s.notes ? { notes: s.notes } : {}) })),
    links,
    chains: chainResults(study, links),
    coverage: [],
    warnings,
    provenance: { tool_version: TOOL_VERSION, inputs_sha256: hash.digest("hex"), ...gitState(study.dir) },
  };
  return { study, result: sanitizeNumbers(result, warnings, `study ${study.id}`), figures, terrain };
}
