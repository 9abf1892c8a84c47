import { createHash } from "node:crypto";
import { relative, isAbsolute } from "node:path";
import { coverageKeyer } from "../coverage/coverage-cache-keys.ts";
import { coverageTileCount, coverageTileKey } from "../coverage/coverage-tiles.ts";
import { linkKeyer } from "../cache/cache-keys.ts";
import type { ResultCache } from "../cache/result-cache.ts";
import { studyTerrainKey } from "../cache/terrain-source-key.ts";
import type { Study } from "../study/study.ts";
import type { QueueIdentity } from "./identity.ts";
import { encodeStudy, type TaskData } from "./task.ts";

/**
 * Links per task: at about 4 ms a link (all methods, README performance table) a batch is
 * about 0.1 s of work, enough that the queue's own cost per task (a few ms) stays small, and
 * short enough that the worker's event loop renews its task lock in time.
 */
export const LINKS_PER_TASK = 25;

/** A study's tasks, with the bytes the workers load it from. */
export interface StudyPlan {
  study: Study;
  bytes: Buffer;
  sha: string;
  /** tasks to queue at once: link batches and coverage tiles */
  tasks: TaskData[];
  /** per coverage map the cache lacks: its assembly task (queued when its tiles are done) and its tiles */
  maps: { task: TaskData; tiles: TaskData[] }[];
}

/**
 * The tasks of a study: the cache entries it needs that `cache` lacks — terrain links in
 * batches of LINKS_PER_TASK, in study order, and each tile of the coverage maps the cache
 * lacks (coverage-tiles.ts; the tiles it already holds are not computed again), then each such
 * map's assembly from its tiles (its files, figures and rasters), a task queued once its tiles
 * are done. Links with a surveyed profile (no terrain, microseconds each) and the multi-site
 * composite (made from its members' rasters once they are in the cache) are left to the
 * coordinator's own build, as is a study whose terrain cannot be read (the build then reports
 * why).
 */
export function planStudy(study: Study, cache: ResultCache, identity: QueueIdentity, cwd = process.cwd(), linksPerTask = LINKS_PER_TASK): StudyPlan {
  const bytes = encodeStudy(study);
  const sha = createHash("sha256").update(bytes).digest("hex");
  const plan: StudyPlan = { study, bytes, sha, tasks: [], maps: [] };
  const terrainKey = studyTerrainKey(study, cache);
  if (terrainKey === null) return plan;
  const rel = relative(cwd, study.dir);
  const base = { studySha: sha, studyDir: study.dir, studyDirRel: rel.startsWith("..") || isAbsolute(rel) ? null : rel, terrainKey, identity };
  const keyOf = linkKeyer(study, terrainKey);
  const missing = study.links.filter((l) => !l.profile_csv).map((l) => ({ id: l.id, key: keyOf(l, null) })).filter((l) => !(cache.has("link", l.key) && cache.has("link-figure", l.key)));
  for (let i = 0; i < missing.length; i += linksPerTask) {
    const batch = missing.slice(i, i + linksPerTask);
    const span = batch.length === 1 ? batch[0].id : `${batch[0].id}–${batch[batch.length - 1].id}`;
    plan.tasks.push({ ...base, kind: "links", label: `links ${span} of study ${study.id}`, keys: batch.map((l) => l.key), ids: batch.map((l) => l.id) });
  }
  const keyer = coverageKeyer(study, terrainKey);
  for (const entry of study.coverage ?? []) {
    const mapKey = keyer.entry(entry);
    if (cache.has("coverage", mapKey)) continue;
    const count = coverageTileCount(entry.radius_km * 1000, entry.resolution_m);
    const tileKeys = Array.from({ length: count }, (_, index) => coverageTileKey(mapKey, index, count));
    const tiles: TaskData[] = [];
    for (const [index, key] of tileKeys.entries()) {
      if (cache.has("coverage-tile", key)) continue;
      tiles.push({ ...base, kind: "coverage-tile", label: `coverage ${entry.id} tile ${index + 1}/${count} of study ${study.id}`, keys: [key], ids: [entry.id], tile: { index, count, mapKey } });
    }
    plan.maps.push({ task: { ...base, kind: "coverage", label: `coverage ${entry.id} of study ${study.id} (assembly of ${count} tiles)`, keys: [mapKey], ids: [entry.id], tileKeys }, tiles });
  }
  // Tiles of two maps at a time, alternately (a1, b1, a2, b2, …): two workers taking tiles in
  // turn then tend to stay on one map each, laying out its grid and elevations once.
  for (let i = 0; i < plan.maps.length; i += 2) {
    const a = plan.maps[i].tiles;
    const b = plan.maps[i + 1]?.tiles ?? [];
    for (let k = 0; k < Math.max(a.length, b.length); k++) plan.tasks.push(...a.slice(k, k + 1), ...b.slice(k, k + 1));
  }
  return plan;
}
