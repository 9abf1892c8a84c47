import { availableParallelism } from "node:os";
import { makeTempDir, removeTempDir } from "../temp-dirs.ts";
import { loadCoverageOutputStage } from "../render/coverage-output-loader.ts";
import { ResultCache } from "../cache/result-cache.ts";
import { analyzeStudy, openStudyTerrain, type CachedLink } from "../analysis/analyze-study.ts";
import { coverageRequestOf, p1812RequestOf } from "../coverage/analyze-coverage.ts";
import { coverageKeyer } from "../coverage/coverage-cache-keys.ts";
import { prepareCoverage } from "../coverage/compute-coverage.ts";
import type { CoverageJob } from "../coverage/coverage-job.ts";
import { CoveragePool } from "../coverage/coverage-pool.ts";
import { keepElevationWindows } from "../coverage/elevation-window.ts";
import { computeCoverageTile, coverageTileCount, coverageTileKey, encodeCoverageTile } from "../coverage/coverage-tiles.ts";
import { linkKeyer } from "../cache/cache-keys.ts";
import { canonicalJson } from "../cache/canonical-json.ts";
import { encodeEntry } from "../cache/entry-codec.ts";
import { studyTerrainKey } from "../cache/terrain-source-key.ts";
import type { Study } from "../study/study.ts";
import type { Terrain } from "../terrain/terrain.ts";
import type { TaskData } from "./task.ts";

const terrainKeys = new Map<string, string | null>();
/** Terrains kept open between tasks (tiles already read stay in their LRU), by folder and content key; the last few. */
const terrains = new Map<string, Promise<Terrain>>();
const KEEP_TERRAINS = 4;

function openTerrainOnce(study: Study, terrainKey: string): Promise<Terrain> {
  const id = `${study.dir}\0${terrainKey}`;
  let t = terrains.get(id);
  if (!t) {
    t = openStudyTerrain(study).then((terrain) => {
      keepElevationWindows(terrain); // a map's tiles and its assembly read its elevations once
      return terrain;
    });
    t.catch(() => terrains.delete(id));
    terrains.set(id, t);
    if (terrains.size > KEEP_TERRAINS) terrains.delete(terrains.keys().next().value!);
  }
  return t;
}

/**
 * The terrain source key of a study on this machine, remembered for the worker's life (a
 * folder of tiles is hashed once, not once per task): terrain files must not change under a
 * running worker.
 */
function workerTerrainKey(study: Study): string | null {
  const id = `${study.dir}\0${canonicalJson([study.terrain, study.sites, study.coverage ?? []])}`;
  if (!terrainKeys.has(id)) terrainKeys.set(id, studyTerrainKey(study, null));
  return terrainKeys.get(id)!;
}

/**
 * Compute a task's cache entries on this machine, exactly as a local build computes them:
 * the study cut down to the task's links and analysed by the ordinary analyzeStudy, or one
 * tile of a coverage map computed by the tiling code a local build uses (coverage-tiles.ts),
 * on the terrain kept open for the worker. Returns each entry's bytes by
 * "kind:key". Throws (the task then fails and is retried) when this machine's terrain or a
 * recomputed key differs from the coordinator's, naming the difference.
 */
export async function runTask(t: TaskData, study: Study, o: { fetchTiles?: (keys: string[]) => Promise<Map<string, Buffer>> } = {}): Promise<Map<string, Buffer>> {
  const terrainKey = workerTerrainKey(study);
  if (terrainKey !== t.terrainKey) {
    const where = "file" in study.terrain ? `${study.terrain.file} in ${study.dir}` : "the study's terrain section";
    throw new Error(
      terrainKey === null
        ? `cannot read the terrain (${where}); give the worker --terrain-root so that it finds the study's terrain files`
        : `the terrain (${where}) differs from the coordinator's (content key ${terrainKey.slice(0, 12)} here, ${t.terrainKey.slice(0, 12)} there)`,
    );
  }
  const terrain = await openTerrainOnce(study, terrainKey);
  if (t.kind === "coverage-tile") return runTileTask(t, study, terrainKey, terrain);
  if (t.kind === "coverage") return runMapTask(t, study, terrainKey, terrain, o.fetchTiles);
  const keyOf = linkKeyer(study, terrainKey);
  const links = t.ids.map((id, i) => {
    const link = study.links.find((l) => l.id === id);
    if (!link || link.profile_csv) throw new Error(`link ${id} is not a terrain link of study ${study.id}`);
    if (keyOf(link, null) !== t.keys[i]) throw new Error(`link ${id}: the cache key computed here differs from the coordinator's`);
    return link;
  });
  const sub: Study = { ...study, links, chains: [], coverage: undefined, interference: undefined }; // interference is the coordinator's, over all links
  // Without a cache: a cache would only remember this task's terrain queries and geodesics
  // (many small files, which made a batch 3–8 times slower), and the entries are the same
  // encodeEntry bytes of the same values a local build stores ("link": { result }, "link-figure").
  const analysed = await analyzeStudy(sub, { cache: null, terrain, terrainKey });
  const out = new Map<string, Buffer>();
  for (const [i, link] of analysed.result.links.entries()) {
    const figure = analysed.figures.get(link.id);
    if (link.id !== t.ids[i] || !figure) throw new Error(`link ${t.ids[i]} was not computed`);
    out.set(`link-figure:${t.keys[i]}`, encodeEntry(figure));
    out.set(`link:${t.keys[i]}`, encodeEntry({ result: link } satisfies CachedLink));
  }
  return out;
}

/**
 * Coverage maps laid out for this worker's tiles, by map key (the last few): the grid, the
 * elevations read once for all the map's tiles this worker takes, and result rasters the
 * tiles are computed in (coverage-tiles.ts takes a tile's box out of them).
 */
const maps = new Map<string, Promise<CoverageJob>>();
const KEEP_MAPS = 2;
/** The worker's coverage threads, started at its first tile and kept (closeTaskResources stops them). */
let pool: CoveragePool | null = null;
/** Tiles computed one after the other (the threads take one job at a time), however many tasks the worker runs at once. */
let computing: Promise<unknown> = Promise.resolve();

async function layOutMap(study: Study, index: number, terrain: Terrain): Promise<CoverageJob> {
  const entry = study.coverage![index];
  const request = coverageRequestOf(study, entry);
  const p1812 = await p1812RequestOf(study, entry, index);
  if (p1812) request.p1812 = p1812;
  const { job, grid } = prepareCoverage(terrain, request);
  const cells = grid.width * grid.height;
  return { ...job, out: new SharedArrayBuffer(job.method === "visibility" ? cells : cells * 4) };
}

/** A tile of a coverage map, computed exactly as a local build computes it: its cache entry's bytes. */
async function runTileTask(t: TaskData, study: Study, terrainKey: string, terrain: Terrain): Promise<Map<string, Buffer>> {
  const index = study.coverage?.findIndex((c) => c.id === t.ids[0]) ?? -1;
  if (index < 0 || !t.tile) throw new Error(`coverage ${t.ids[0]} is not in study ${study.id}`);
  const entry = study.coverage![index];
  const mapKey = coverageKeyer(study, terrainKey).entry(entry);
  const { index: k, count } = t.tile;
  if (mapKey !== t.tile.mapKey || coverageTileKey(mapKey, k, count) !== t.keys[0] || count !== coverageTileCount(entry.radius_km * 1000, entry.resolution_m)) {
    throw new Error(`coverage ${entry.id}: the cache key computed here differs from the coordinator's`);
  }
  let job = maps.get(mapKey);
  if (!job) {
    job = layOutMap(study, index, terrain);
    job.catch(() => maps.delete(mapKey));
    maps.set(mapKey, job);
    if (maps.size > KEEP_MAPS) maps.delete(maps.keys().next().value!);
  }
  const j = await job;
  pool ??= CoveragePool.start(availableParallelism());
  const run = computing.then(() => computeCoverageTile(j, k, count, { pool, extract: true }));
  computing = run.catch(() => {});
  const tile = await run;
  return new Map([[`coverage-tile:${t.keys[0]}`, encodeCoverageTile(tile)]]);
}

/**
 * A map assembled from its tiles, exactly as a local build assembles it: the tiles go into a
 * private, temporary cache (a tile missing from Redis is computed here), the ordinary
 * analyzeStudy of the study cut down to this coverage entry lays the map out from them, and
 * its "coverage" entry (files, figures, rasters) is read back.
 */
async function runMapTask(t: TaskData, study: Study, terrainKey: string, terrain: Terrain, fetchTiles?: (keys: string[]) => Promise<Map<string, Buffer>>): Promise<Map<string, Buffer>> {
  const entry = study.coverage?.find((c) => c.id === t.ids[0]);
  if (!entry) throw new Error(`coverage ${t.ids[0]} is not in study ${study.id}`);
  const mapKey = coverageKeyer(study, terrainKey).entry(entry);
  if (mapKey !== t.keys[0]) throw new Error(`coverage ${entry.id}: the cache key computed here differs from the coordinator's`);
  const sub: Study = { ...study, chains: [], coverage: [entry], interference: undefined }; // links kept: the map draws them and its key covers them
  const dir = makeTempDir("ridgeline-task-");
  try {
    const cache = new ResultCache(dir);
    const tiles = (await fetchTiles?.(t.tileKeys ?? [])) ?? new Map<string, Buffer>();
    for (const [key, bytes] of tiles) cache.putBytes("coverage-tile", key, bytes);
    // no threads of its own: every tile is normally at hand (a missing one is computed in this thread)
    const analysed = await analyzeStudy(sub, { cache, terrain, terrainKey, coverageOutputs: loadCoverageOutputStage, skipLinks: true, coverageWorkers: 0 });
    if (analysed.coverage) removeTempDir(analysed.coverage.dir);
    const bytes = cache.getBytes("coverage", mapKey);
    if (!bytes) throw new Error(`the coverage entry ${mapKey.slice(0, 12)} was not written (cache write errors: ${cache.writeErrors})`);
    return new Map([[`coverage:${mapKey}`, bytes]]);
  } finally {
    removeTempDir(dir);
  }
}

/** Start the coverage threads before the first task (they load their code while the worker waits for one). */
export function warmTaskResources(): void {
  pool ??= CoveragePool.start(availableParallelism());
}

/** Stop what the worker keeps between tasks (its coverage threads). */
export async function closeTaskResources(): Promise<void> {
  const p = pool;
  pool = null;
  maps.clear();
  await p?.close();
}
