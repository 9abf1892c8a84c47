import { createHash } from "node:crypto";
import { resolve } from "node:path";
import { linkKeyer, terrainFactsKey, toolIdentity } from "../cache/cache-keys.ts";
import { canonicalJson } from "../cache/canonical-json.ts";
import { decodeEntry } from "../cache/entry-codec.ts";
import { fileDigest } from "../cache/file-digest.ts";
import { modulesFingerprint } from "../cache/code-fingerprint.ts";
import { memoGeodesicPath } from "../cache/memo-geodesic.ts";
import { MemoTerrain, TerrainQueryMiss } from "../cache/memo-terrain.ts";
import type { CoverageOutputStage } from "../coverage/coverage-output-stage.ts";
import type { ResultCache } from "../cache/result-cache.ts";
import { studyTerrainExtent, studyTerrainKey, studyTerrainTiles, terrainSourceKey } from "../cache/terrain-source-key.ts";
import type { LatLonBox } from "../cache/terrain-extent.ts";
import { InternalError, RidgelineError } from "../errors.ts";
import { InputError, type InputProblem } from "../study/input-error.ts";
import type { Study } from "../study/study.ts";
import { openTerrain, type TerrainSpec } from "../terrain/open-terrain.ts";
import type { Terrain } from "../terrain/terrain.ts";
import { TerrainError } from "../terrain/terrain-error.ts";
import { ProfileCsvError } from "../terrain/profile-csv-error.ts";
import { analyzeLink, GROUND_MAX_M, GROUND_MIN_M, siteGroundM, type LinkFigureData } from "./analyze-link.ts";
import { shownPath } from "../study/input-file.ts";
import { chainResults } from "./chains.ts";
import { LinkFigureMap } from "./link-figure-map.ts";
import { gitStateAsync, TOOL_VERSION } from "./provenance.ts";
import type { LinkResult, StudyResult } from "./results.ts";
import { sanitizeNumbers } from "./sanitize.ts";
import { applyLinkWave, type LinkWaveOutcome } from "./link-wave-job.ts";
import { WavePool, waveThreads } from "./wave-pool.ts";
import { makeTempDir, removeTempDir } from "../temp-dirs.ts";

export interface AnalyzedStudy {
  study: Study;
  result: StudyResult;
  /** Each link's figure data, by link id in study order; a cached link's is decoded when first read. */
  figures: LinkFigureMap;
  /** The study's terrain if it was opened; null when every result came from the cache. */
  readonly terrain: Terrain | null;
  /** Open the study's terrain (once) for work beyond the cached results. */
  openTerrain(): Promise<Terrain>;
  /**
   * Links whose result and figure data came from the cache, and links computed; `coverage`:
   * the same for coverage maps (each entry, and the composite when there is one).
   */
  cache: { hits: number; misses: number; coverage: { hits: number; misses: number } };
  /** The study's coverage maps: page figures and the folder holding their files; null without coverage. */
  coverage: StudyCoverage | null;
  /**
   * A value computed from the study's terrain and `inputs` (e.g. a shaded-relief grid for a
   * map), kept in the build's cache when there is one, so that a hit does not open the
   * terrain. `modules` are the modules whose code computes it (pass `import.meta.url`; their
   * project imports are followed), so changing that code computes it again. The value must be
   * plain data (objects, arrays, strings, numbers, typed arrays). Without a cache: computed.
   * `extent`: where the computation reads terrain, when that reaches beyond the study's own
   * extent (a map's frame): the key then covers the tiles there (terrain-source-key.ts).
   */
  remember<T>(name: string, inputs: unknown, modules: string[], compute: (terrain: Terrain) => T | Promise<T>, extent?: LatLonBox[]): Promise<T>;
}

export interface AnalyzeOptions {
  /** Called after each link with (done, total). */
  onProgress?: (done: number, total: number) => void;
  /** Look results up here and store what is computed; null or absent: compute everything. */
  cache?: ResultCache | null;
  /** The study's terrain, already open (a queue worker keeps it open from one task to the next). */
  terrain?: Terrain;
  /**
   * Loads the stage that writes coverage files and figures (`loadCoverageOutputStage`,
   * src/render/coverage-output-loader.ts); needed for a study with coverage. Analysis never
   * imports render: the caller above both hands it in.
   */
  coverageOutputs?: () => Promise<CoverageOutputStage>;
  /**
   * Compute no link (a queue worker's coverage task: the links are tasks of their own). The
   * study keeps its links, which the coverage maps draw and their cache keys cover.
   */
  skipLinks?: boolean;
  /**
   * The whole study's terrain key (studyTerrainKey), for a part of it cut down to a task's
   * links or one coverage: the key covers the tiles the whole study can reach.
   */
  terrainKey?: string;
  /** Threads for coverage tiles that must be computed (default: available parallelism; 0: this thread). */
  coverageWorkers?: number;
  /**
   * Threads for the links' wave solutions (wave-pool.ts): default one per core when at least
   * WAVE_THREADS_MIN_LINKS links must be solved (waveThreads); 0: this thread solves them.
   */
  waveWorkers?: number;
}

/** Coverage maps of a study: the folder their files were written to, and each map's SVG. */
export interface StudyCoverage {
  /** Folder holding every coverage file (GeoTIFF, PNG, GeoJSON, KML), named as in results. */
  dir: string;
  /** Page map (SVG) of each coverage entry, in study order, then the composite when there is one. */
  maps: { id: string; svg: string }[];
}

/**
 * A link's cache entry ("link"): its result. Its figure data is an entry of its own
 * ("link-figure", same key), read only when a figure is drawn (LinkFigureMap).
 */
export interface CachedLink {
  result: LinkResult;
}

/** What a study needs of its terrain beyond the links: cached so a full hit never opens it. */
interface TerrainFacts {
  kind: Terrain["kind"];
  description: string;
  synthetic: boolean;
  /** Ground (m amsl) under each site, in study order (NaN when unknown). */
  ground_m: number[];
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
      throw new InputError([{ file: study.file, ...study.locate(["terrain"]), field: "terrain", received: e.detail.path ? shownPath(study.dir, e.detail.path) : "the terrain named here", expected: terrainFix(e) }], { cause: e });
    }
    throw e;
  }
}

/** Whether a link's failure is reported as a problem of the input (the build goes on to the other links). */
function isInputProblem(e: unknown): boolean {
  return e instanceof TerrainError || e instanceof ProfileCsvError || e instanceof InputError;
}

/** A terrain failure as "expected …" text: its message, and its hint unless the message already says it. */
function terrainFix(e: TerrainError): string {
  const hint = e.detail.hint;
  return hint && !e.message.toLowerCase().includes(hint.toLowerCase()) ? `${e.message}; ${hint}` : e.message;
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

/** `{ tiles_used }` for a terrain folder of HGT tiles (the tiles the study's key covers), else nothing. */
function tilesUsed(study: Study): { tiles_used?: string[] } {
  const tiles = studyTerrainTiles(study);
  return tiles ? { tiles_used: tiles } : {};
}

const sha256 = (b: Buffer | string): string => createHash("sha256").update(b).digest("hex");

/**
 * Analyse every link of a study and assemble its JSON result. With a cache, each link's
 * result and figure data are looked up by a key over everything they depend on
 * (cache-keys.ts) and only the misses are computed; the terrain is opened only when
 * something must be computed from it. Results are identical with and without the cache.
 */
export async function analyzeStudy(study: Study, options: AnalyzeOptions = {}): Promise<AnalyzedStudy> {
  const cache = options.cache ?? null;
  const git = gitStateAsync(study.dir); // runs while the links are read or computed
  let terrain: Terrain | null = options.terrain ?? null;
  const open = async (): Promise<Terrain> => (terrain ??= await openStudyTerrain(study));
  // The terrain's content key, without opening it, over the tiles the study can reach; an
  // unreadable file is reported by opening.
  const terrainKey = options.terrainKey ?? studyTerrainKey(study, cache) ?? (await open()).fingerprint();
  const csvSha = new Map<string, string | null>();
  for (const l of study.links) {
    if (!l.profile_csv) continue;
    try {
      csvSha.set(l.id, fileDigest(resolve(study.dir, l.profile_csv), cache)); // remembered by file identity with a cache
    } catch {
      csvSha.set(l.id, null);
    }
  }

  // --- Terrain facts: description and ground under each site ---
  const factsKey = cache ? terrainFactsKey(study, terrainKey) : null;
  let facts = factsKey ? cache!.get<TerrainFacts>("terrain-facts", factsKey) : undefined;
  if (typeof facts?.kind !== "string" || facts.ground_m?.length !== study.sites.length) {
    const t = await open();
    checkSitesOnTerrain(study, t);
    facts = { kind: t.kind, description: t.description, synthetic: t.synthetic, ground_m: study.sites.map((s) => siteGroundM(s, t)) };
    const wrong = facts.ground_m.findIndex((h) => !Number.isNaN(h) && !(h >= GROUND_MIN_M && h <= GROUND_MAX_M));
    if (wrong >= 0) {
      const s = study.sites[wrong];
      throw new InputError([{ file: study.file, ...study.locate(["terrain"]), field: `terrain (under site ${s.id})`, received: `a ground height of ${facts.ground_m[wrong]} m`, expected: `terrain heights from ${GROUND_MIN_M} to ${GROUND_MAX_M} m: the DEM holds values that are not heights (declare its nodata value)` }]);
    }
    if (factsKey) cache!.put("terrain-facts", factsKey, facts);
  }

  // --- Links: from the cache, or computed (through remembered terrain queries when possible) ---
  const keyOf = cache ? linkKeyer(study, terrainKey) : null;
  const identity = facts;
  const pathOf = cache ? memoGeodesicPath(cache) : undefined;
  const computeLink = async (link: Study["links"][number], deferWave: boolean) => {
    if (!cache) return analyzeLink(study, link, await open(), { deferWave });
    if (!terrain) {
      try {
        return analyzeLink(study, link, new MemoTerrain(cache, terrainKey, identity, null), { pathOf, deferWave });
      } catch (e) {
        if (!(e instanceof TerrainQueryMiss)) throw e;
      }
    }
    return analyzeLink(study, link, new MemoTerrain(cache, terrainKey, identity, await open()), { pathOf, deferWave });
  };
  const links: LinkResult[] = [];
  const problems: InputProblem[] = [];
  let hits = 0;
  const keys = study.links.map((link) => (keyOf ? keyOf(link, csvSha.get(link.id) ?? null) : null));
  // The study's two packs hold the last build's entries, results in one file and figure data
  // in another: the results are read at once (a link the pack lacks is looked up on its own,
  // those reads starting now and proceeding while entries are decoded), the figure data only
  // when a figure is drawn — of its pack, only the index is read now, to know what it holds.
  const packName = (part: string) => (cache ? sha256(`study-pack-v2\0${part}\0${resolve(study.file)}`) : "");
  const resultsPack = packName("results");
  const figuresPack = packName("figures");
  const pack = cache ? cache.readPack(resultsPack) : new Map<string, Buffer>();
  const figureKeys = cache ? cache.readPackKeys(figuresPack) : new Set<string>();
  let figurePack: Map<string, Buffer> | null = null;
  const storedFigure = (key: string): Buffer | undefined => {
    figurePack ??= cache!.readPack(figuresPack);
    return figurePack.get(key) ?? cache!.getBytes("link-figure", key);
  };
  const figures = new LinkFigureMap(storedFigure);
  // The few links a pack lacks after small edits are read at once (a turn of the event loop
  // for an async read costs more than the read); many (a cold or much-changed study) in the
  // background while the others are decoded.
  const outside = keys.filter((key) => key && !pack.has(key)).length;
  const lookups = keys.map((key) => (!key ? undefined : (pack.get(key) ?? (outside <= 8 ? cache!.getBytes("link", key) : cache!.getBytesAsync("link", key)))));
  const packed: [string, Buffer][] = []; // this build's result entries, in study order, for the next build's pack
  const computedFigures = new Map<string, Buffer>(); // figure entries stored by this build, by key
  // Each link as it was read or computed; taken into the results in study order (`take`). With
  // wave threads (wave-pool.ts) a computed link's wave solution is still being solved on a
  // thread while this thread goes on with the next links, and those links wait in `waiting`.
  type Slot =
    | { link: Study["links"][number]; key: string | null; hit: CachedLink; bytes: Buffer }
    | { link: Study["links"][number]; key: string | null; computed: { result: LinkResult; figure: LinkFigureData }; wave: Promise<LinkWaveOutcome> | null }
    | { link: Study["links"][number]; key: string | null; error: unknown };
  const take = async (slot: Slot, i: number): Promise<void> => {
    const { link, key } = slot;
    if ("hit" in slot) {
      links.push(slot.hit.result);
      figures.setStored(link.id, key!);
      packed.push([key!, slot.bytes]);
      hits++;
    } else {
      try {
        if ("error" in slot) throw slot.error;
        const { result, figure } = slot.computed;
        if (slot.wave) applyLinkWave(result, figure, await slot.wave);
        const warnings = [...result.warnings];
        const clean = { ...sanitizeNumbers(result, warnings, `link ${link.id}`), warnings };
        links.push(clean);
        figures.set(link.id, figure);
        // the figure entry first: a stored result always has its figure data beside it
        const storedFig = key ? cache!.put("link-figure", key, figure) : null;
        const stored = storedFig ? cache!.put("link", key!, { result: clean } satisfies CachedLink) : null;
        if (stored) {
          packed.push([key!, stored]);
          computedFigures.set(key!, storedFig!);
        }
      } catch (e) {
        if (e instanceof TerrainError) {
          problems.push({ file: study.file, ...study.locate(["terrain"]), field: `terrain (link ${link.id})`, received: e.detail.path ? shownPath(study.dir, e.detail.path) : "the terrain named here", expected: terrainFix(e) });
        } else if (e instanceof ProfileCsvError) {
          problems.push({ file: e.detail.path, line: e.detail.line, col: e.detail.column, field: `${e.detail.field} (profile of link ${link.id})`, received: JSON.stringify(e.detail.value), expected: e.detail.expected });
        } else if (e instanceof InputError) {
          problems.push(...e.problems); // every link's problem is reported together
        } else throw e;
      }
    }
    options.onProgress?.(i + 1, study.links.length);
  };
  const waiting: [Slot, number][] = [];
  let pool: WavePool | null = null;
  let threadsDecided = false;
  try {
    for (const [i, link] of (options.skipLinks ? [] : study.links).entries()) {
      const key = keys[i];
      const lookup = lookups[i];
      const bytes = lookup instanceof Promise ? await lookup : lookup; // a pack hit is at hand: no turn of the event loop
      const hit = bytes ? (decodeEntry(bytes) as CachedLink | null) : null;
      let slot: Slot;
      if (hit && hit.result?.id === link.id && (figureKeys.has(key!) || cache!.has("link-figure", key!))) {
        slot = { link, key, hit, bytes: bytes! };
      } else {
        if (!threadsDecided) {
          // at the first link to compute: threads when enough wave solutions lie ahead (this
          // link and each later one whose result is not at hand in the pack)
          threadsDecided = true;
          const jobs = study.design.wave_solution === false ? 0 : lookups.slice(i).filter((l) => !Buffer.isBuffer(l)).length;
          const threads = waveThreads(jobs, options.waveWorkers);
          if (threads > 0) pool = WavePool.start(study, threads);
        }
        try {
          const { result, figure, wave } = await computeLink(link, pool !== null);
          const solving = wave ? pool!.solve(wave) : null;
          solving?.catch(() => {}); // its failure is reported when the link is taken, in order
          slot = { link, key, computed: { result, figure }, wave: solving };
        } catch (e) {
          slot = { link, key, error: e };
        }
      }
      if (!pool && !waiting.length) await take(slot, i);
      else {
        waiting.push([slot, i]);
        if ("error" in slot && !isInputProblem(slot.error)) break; // the build stops at this link
        await new Promise((r) => setImmediate(r)); // the threads' messages are handled: each takes its next job
      }
    }
  } catch (e) {
    await pool?.close();
    throw e;
  }
  // The links left waiting for their wave solutions are taken in order as the threads solve
  // them. When every link's own analysis succeeded, that goes on while the coverage maps are
  // computed: the threads use the cores the coverage leaves idle. A link's failure is still
  // reported first, as in a build without threads.
  const linksTaken = (async () => {
    try {
      for (const [slot, i] of waiting) await take(slot, i);
    } finally {
      await pool?.close();
    }
    // Rewrite the packs (≈ 3.5 kB and 23 kB a link) when more than one link in 20 was not in
    // them; until then those few are read on their own. So a one-link change does not rewrite
    // the whole study's packs, and they are rewritten once for every few changed links, as they
    // accumulate. The figure pack is written first, from the figure data this build computed
    // and the old pack's (read whole now, and kept for the figures drawn later).
    const unpacked = packed.filter(([k, b]) => pack.get(k) !== b).length;
    if (cache && !problems.length && unpacked * 20 > packed.length) {
      const figurePacked = packed.map(([k]) => [k, computedFigures.get(k) ?? storedFigure(k)] as const);
      if (figurePacked.every(([, b]) => b !== undefined)) {
        cache.writePack(figuresPack, figurePacked as [string, Buffer][]);
        cache.writePack(resultsPack, packed);
      }
    }
    if (problems.length) throw new InputError(problems);
  })();
  if (problems.length || waiting.some(([slot]) => "error" in slot)) await linksTaken;

  // --- Coverage maps: from the cache or computed (coverage-cache.ts; the terrain is opened only
  // for a map that must be computed), into a temporary folder that the site build copies next
  // to the study page ---
  const covering = (async () => {
    if (!study.coverage?.length) return null;
    // removed when the process ends at the latest (temp-dirs.ts); at once when the maps fail
    const dir = makeTempDir(`ridgeline-coverage-${study.id}-`);
    try {
      // loaded only for a study with coverage: it brings the raster encoders (sharp), which the
      // link analysis, `ridgeline path` and `check` of a links-only study do not need
      const { cachedStudyCoverage } = await import("../coverage/coverage-cache.ts");
      return { dir, cov: await cachedStudyCoverage(study, { outDir: dir, outputs: await options.coverageOutputs?.(), cache, terrainKey, openTerrain: open, workers: options.coverageWorkers }) };
    } catch (e) {
      removeTempDir(dir);
      throw e;
    }
  })();
  covering.catch(() => {}); // awaited below, after the links
  try {
    await linksTaken;
  } catch (e) {
    const done = await covering.catch(() => null);
    if (done) removeTempDir(done.dir);
    throw e;
  }
  let coverage: StudyCoverage | null = null;
  const warnings: string[] = [];
  let coverageResults: StudyResult["coverage"] = [];
  let coverageCache = { hits: 0, misses: 0 };
  const done = await covering;
  if (done) {
    const { dir, cov } = done;
    coverageResults = cov.results; // without compute time: no clock in results
    coverageCache = cov.cache;
    warnings.push(...cov.warnings);
    coverage = { dir, maps: [...cov.items.flatMap((it) => [{ id: it.result.id, svg: it.svg }, ...it.extra.map((x) => ({ id: `${it.result.id}-${x.suffix}`, svg: x.svg }))]), ...(cov.composite ? [{ id: "composite", svg: cov.composite.svg }] : [])] };
  }

  // --- The study's result ---
  const inputs = createHash("sha256").update(study.file_sha256).update(terrainKey).update(TOOL_VERSION);
  for (const l of study.links) if (csvSha.has(l.id)) inputs.update(csvSha.get(l.id) ?? "unreadable");
  if (facts.synthetic) warnings.unshift(`The figures show invented ground, not a real place: the terrain is ${facts.description}.`);
  // Alternative and rejected designs: computed like any link, marked so that verdicts leave them out.
  for (const l of study.links) {
    const i = l.design_status ? links.findIndex((r) => r.id === l.id) : -1;
    if (i >= 0) links[i] = { ...links[i], design_status: l.design_status, design_reason: l.design_reason };
  }
  const ground_m = facts.ground_m;
  const siteResults = study.sites.map((s, i) => ({ id: s.id, name: s.name, lat_deg: s.lat_deg, lon_deg: s.lon_deg, ground_m: ground_m[i], ...(s.notes ? { notes: s.notes } : {}) }));
  // --- Interference between the links, when the study asks for it (interference.ts) ---
  let interference: StudyResult["interference"];
  if (study.interference) {
    const { analyzeInterference, interferenceInputFiles } = await import("./interference.ts");
    for (const f of interferenceInputFiles(study)) inputs.update(fileDigest(f, cache));
    interference = await analyzeInterference(study, links, { sites: siteResults, openTerrain: open, cache, terrainKey });
    warnings.push(...interference.warnings);
  }
  const result: StudyResult = {
    id: study.id,
    title: study.meta.title,
    client: study.meta.client,
    prepared_by: study.meta.prepared_by,
    revision: study.meta.revision,
    date: study.meta.date,
    ...(study.meta.summary ? { summary: study.meta.summary } : {}),
    ...(study.document ? { document: study.document } : {}),
    terrain: { description: facts.description, synthetic: facts.synthetic, ...tilesUsed(study) },
    assumptions: {
      k_factors: study.design.k_factors.map((k) => k.label),
      clearance_criteria: study.design.clearance_criteria.map((c) => ({ k: c.k.label, min_f1: c.min_f1 })),
      availability_pct: study.design.availability_pct,
      diffraction_method: study.design.diffraction_method,
      design_allowance_db: study.design.design_allowance_db,
      structure_notice_height_m: study.design.structure_notice_height_m,
      climate: study.climate,
    },
    sites: siteResults,
    links,
    chains: chainResults(study, links),
    coverage: coverageResults,
    ...(interference ? { interference } : {}),
    warnings,
    provenance: { tool_version: TOOL_VERSION, inputs_sha256: inputs.digest("hex"), ...(await git) },
  };
  // Link results were sanitised one by one above; the rest of the study is checked here.
  const clean = { ...sanitizeNumbers({ ...result, links: [] }, warnings, `study ${study.id}`), links };
  return {
    study,
    result: clean,
    figures,
    get terrain() {
      return terrain;
    },
    openTerrain: open,
    cache: { hits, misses: study.links.length - hits, coverage: coverageCache },
    coverage,
    async remember<T>(name: string, inputs: unknown, modules: string[], compute: (terrain: Terrain) => T | Promise<T>, extent?: LatLonBox[]): Promise<T> {
      if (!cache) return compute(await open());
      const valueTerrainKey = extent ? (terrainSourceKey(study.terrain, study.dir, cache, [...studyTerrainExtent(study), ...extent]) ?? terrainKey) : terrainKey;
      const key = sha256(canonicalJson(["study-value", toolIdentity(), modulesFingerprint(modules), valueTerrainKey, name, inputs]));
      const hit = cache.get<{ v: T }>("study-value", key);
      if (hit !== undefined && "v" in hit) return hit.v;
      const v = await compute(await open());
      cache.put("study-value", key, { v });
      return v;
    },
  };
}

/**
 * Analyse several studies, reporting the input problems of all of them together.
 * @param onProgress called after each link with the study id, links done and links in that study
 */
export async function analyzeStudies(
  studies: Study[],
  options: Omit<AnalyzeOptions, "onProgress"> & { onProgress?: (study: string, done: number, total: number) => void } = {},
): Promise<AnalyzedStudy[]> {
  const out: AnalyzedStudy[] = [];
  const problems: InputProblem[] = [];
  for (const s of studies) {
    try {
      out.push(await analyzeStudy(s, { cache: options.cache, coverageOutputs: options.coverageOutputs, coverageWorkers: options.coverageWorkers, waveWorkers: options.waveWorkers, onProgress: (d, t) => options.onProgress?.(s.id, d, t) }));
    } catch (e) {
      if (e instanceof InputError) problems.push(...e.problems);
      else if (e instanceof RidgelineError || e instanceof InternalError) throw e;
      else throw new InternalError(s.id, e);
    }
  }
  if (problems.length) throw new InputError(problems);
  return out;
}
