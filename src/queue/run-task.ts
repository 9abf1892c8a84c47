import { makeTempDir, removeTempDir } from "../temp-dirs.ts";
import { loadCoverageOutputStage } from "../render/coverage-output-loader.ts";
import { analyzeStudy, openStudyTerrain, type CachedLink } from "../analysis/analyze-study.ts";
import { coverageKeyer } from "../coverage/coverage-cache-keys.ts";
import { linkKeyer } from "../cache/cache-keys.ts";
import { canonicalJson } from "../cache/canonical-json.ts";
import { encodeEntry } from "../cache/entry-codec.ts";
import { ResultCache } from "../cache/result-cache.ts";
import { studyTerrainKey } from "../cache/terrain-source-key.ts";
import type { Study } from "../study/study.ts";
import type { Terrain } from "../terrain/terrain.ts";
import { taskEntries, type TaskData } from "./task.ts";

const terrainKeys = new Map<string, string | null>();
/** Terrains kept open between tasks (tiles already read stay in their LRU), by folder and content key; the last few. */
const terrains = new Map<string, Promise<Terrain>>();
const KEEP_TERRAINS = 4;

function openTerrainOnce(study: Study, terrainKey: string): Promise<Terrain> {
  const id = `${study.dir}\0${terrainKey}`;
  let t = terrains.get(id);
  if (!t) {
    t = openStudyTerrain(study);
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
 * the study is cut down to the task's links (or its one coverage entry) and analysed by the
 * ordinary analyzeStudy on the terrain kept open for the worker. Returns each entry's bytes by
 * "kind:key". Throws (the task then fails and is retried) when this machine's terrain or a
 * recomputed key differs from the coordinator's, naming the difference.
 */
export async function runTask(t: TaskData, study: Study): Promise<Map<string, Buffer>> {
  const terrainKey = workerTerrainKey(study);
  if (terrainKey !== t.terrainKey) {
    const where = "file" in study.terrain ? `${study.terrain.file} in ${study.dir}` : "the study's terrain section";
    throw new Error(
      terrainKey === null
        ? `cannot read the terrain (${where}); give the worker --terrain-root so that it finds the study's terrain files`
        : `the terrain (${where}) differs from the coordinator's (content key ${terrainKey.slice(0, 12)} here, ${t.terrainKey.slice(0, 12)} there)`,
    );
  }
  let sub: Study;
  if (t.kind === "links") {
    const keyOf = linkKeyer(study, terrainKey);
    const links = t.ids.map((id, i) => {
      const link = study.links.find((l) => l.id === id);
      if (!link || link.profile_csv) throw new Error(`link ${id} is not a terrain link of study ${study.id}`);
      if (keyOf(link, null) !== t.keys[i]) throw new Error(`link ${id}: the cache key computed here differs from the coordinator's`);
      return link;
    });
    sub = { ...study, links, chains: [], coverage: undefined, interference: undefined }; // interference is the coordinator's, over all links
  } else {
    const entry = study.coverage?.find((c) => c.id === t.ids[0]);
    if (!entry) throw new Error(`coverage ${t.ids[0]} is not in study ${study.id}`);
    if (coverageKeyer(study, terrainKey).entry(entry) !== t.keys[0]) throw new Error(`coverage ${entry.id}: the cache key computed here differs from the coordinator's`);
    sub = { ...study, chains: [], coverage: [entry], interference: undefined }; // links kept: the map draws them and its key covers them
  }
  const terrain = await openTerrainOnce(study, terrainKey);
  if (t.kind === "links") {
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
  // A coverage map: its entry (files, rasters, figure) is laid out by the coverage cache, so
  // the map is computed through a private, temporary cache and its entry read back.
  const dir = makeTempDir("ridgeline-task-");
  try {
    const cache = new ResultCache(dir);
    const analysed = await analyzeStudy(sub, { cache, terrain, terrainKey, coverageOutputs: loadCoverageOutputStage, skipLinks: true });
    if (analysed.coverage) removeTempDir(analysed.coverage.dir);
    const out = new Map<string, Buffer>();
    for (const { kind, key } of taskEntries(t)) {
      const bytes = cache.getBytes(kind, key);
      if (!bytes) throw new Error(`the ${kind} entry ${key.slice(0, 12)} was not written (cache write errors: ${cache.writeErrors})`);
      out.set(`${kind}:${key}`, bytes);
    }
    return out;
  } finally {
    removeTempDir(dir);
  }
}
