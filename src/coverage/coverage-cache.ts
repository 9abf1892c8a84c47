import { mkdirSync, statSync, writeFileSync } from "node:fs";
import { availableParallelism } from "node:os";
import { join } from "node:path";
import { decodeEntry, FileBytes } from "../cache/entry-codec.ts";
import type { ResultCache } from "../cache/result-cache.ts";
import type { CoverageInput, Study } from "../study/study.ts";
import type { Terrain } from "../terrain/terrain.ts";
import { analyzeCoverage, compositeMemberOf, type CoverageOptions } from "./analyze-coverage.ts";
import { coverageKeyer } from "./coverage-cache-keys.ts";
import { requireOutputStage, type CoverageFigure, type CoverageOutputStage } from "./coverage-output-stage.ts";
import { CoveragePool } from "./coverage-pool.ts";
import { coverageTileKey, type CoverageTileStore } from "./coverage-tiles.ts";
import type { CoverageResult } from "./coverage-result.ts";
import { studyComposite, type CompositeMember, type CompositeOutputs } from "./study-composite.ts";

export interface CachedCoverageOptions {
  /** folder for the coverage files (GeoTIFF, PNGs, GeoJSON, KML); created */
  outDir: string;
  /** writes the files and page figures (src/render/coverage-outputs.ts) */
  outputs?: CoverageOutputStage;
  /** look maps up here and store what is computed; null computes everything */
  cache: ResultCache | null;
  /** the study's terrain source key (terrainSourceKey) */
  terrainKey: string;
  /** opens the study's terrain; called only when a map must be computed */
  openTerrain: () => Promise<Terrain>;
  /** worker threads for computed maps (default: available parallelism; 0 computes in this thread) */
  workers?: number;
  onProgress?: CoverageOptions["onProgress"];
}

/** One coverage map of a study: its JSON (without compute time), files (absolute paths), page figure and SVG. */
export interface StudyCoverageMap {
  result: CoverageResult;
  files: Record<string, string>;
  figure: CoverageFigure;
  svg: string;
  /** further maps of the coverage: page id suffix and SVG */
  extra: { suffix: string; svg: string }[];
}

/** A study's coverage maps, and how many came from the cache. */
export interface CachedStudyCoverage {
  /** every entry's JSON in study order, then the composite's; no compute time (reproducible) */
  results: CoverageResult[];
  items: StudyCoverageMap[];
  composite: CompositeOutputs | null;
  warnings: string[];
  /** maps (the entries, and the composite when there is one) read from the cache, and computed */
  cache: { hits: number; misses: number };
}

/** An output file kept in an entry: its name in the output folder and its bytes. */
interface StoredFile {
  name: string;
  bytes: Uint8Array;
}

/** An output file as an entry is written: its bytes are copied from the file (FileBytes). */
interface FileToStore {
  name: string;
  bytes: FileBytes;
}

/** A coverage entry's cache entry (the SVG is rebuilt from the figure: coverageMapSvg is pure). */
interface CoverageEntry<F = StoredFile> {
  result: CoverageResult;
  figure: CoverageFigure;
  extra?: { suffix: string; figure: CoverageFigure }[];
  files: F[];
  /** what the composite needs of a level coverage; null for visibility */
  member: Omit<CompositeMember, "result"> | null;
}

/** The composite's cache entry: its map, or why there is none. */
type CompositeEntry<F = StoredFile> = { warning: string } | { result: CoverageResult; figure: CoverageFigure; files: F[] };

/**
 * Every coverage map of a study, each read from the cache or computed, then the multi-site
 * composite of the level maps (read, or computed from its members' rasters, which level
 * entries keep). Keys cover everything a map depends on (coverage-cache-keys.ts). A hit writes
 * the stored files back into outDir under their names; the terrain is opened, and the worker
 * threads started, only for the first map that must be computed. The output files, results
 * and SVGs are byte-identical with and without the cache.
 * @throws InputError for an entry that cannot be computed (as analyzeCoverage)
 */
export async function cachedStudyCoverage(study: Study, o: CachedCoverageOptions): Promise<CachedStudyCoverage> {
  const entries = study.coverage ?? [];
  const run: CachedStudyCoverage = { results: [], items: [], composite: null, warnings: [], cache: { hits: 0, misses: 0 } };
  if (entries.length === 0) return run;
  mkdirSync(o.outDir, { recursive: true });
  const cache = o.cache;
  const keyer = cache ? coverageKeyer(study, o.terrainKey) : null;
  const keys = entries.map((e) => keyer?.entry(e) ?? null);
  const lookups = keys.map((k) => (k ? cache!.getBytesAsync("coverage", k) : undefined)); // read together
  const members: CompositeMember[] = [];
  const memberKeys: (string | null)[] = [];
  let pool: CoveragePool | null | undefined; // undefined until a map is computed
  try {
    for (const [i, entry] of entries.entries()) {
      const bytes = await lookups[i];
      const hit = bytes ? coverageHit(decodeEntry(bytes, { views: true }), entry) : null;
      let member: CompositeMember | null;
      if (hit) {
        const map = restore(hit, o.outDir, requireOutputStage(o.outputs));
        run.items.push(map);
        member = hit.member && { result: map.result, ...hit.member };
        run.cache.hits++;
      } else {
        const workers = o.workers ?? availableParallelism();
        if (pool === undefined) pool = workers > 0 ? CoveragePool.start(workers) : null; // threads load while the terrain opens
        const tiles = keys[i] ? coverageTileStore(cache!, keys[i]) : null;
        const a = await analyzeCoverage(study, entry, await o.openTerrain(), { outDir: o.outDir, outputs: o.outputs, pool, index: i, onProgress: o.onProgress, tiles });
        const { compute_s: _clock, ...result } = a.result; // no clock in results
        run.items.push({ result, files: a.files, figure: a.figure, svg: a.svg, extra: a.extra.map((x) => ({ suffix: x.suffix, svg: x.svg })) });
        const m = compositeMemberOf(a);
        member = m && { ...m, result };
        if (keys[i]) {
          const stored: CoverageEntry<FileToStore> = { result, figure: a.figure, extra: a.extra.map((x) => ({ suffix: x.suffix, figure: x.figure })), files: readFiles(o.outDir, result.files), member: m && { thresholds_dbm: m.thresholds_dbm, grid: m.grid, values: m.values, dem: m.dem } };
          cache!.putLarge("coverage", keys[i], stored); // written piece by piece: its rasters are not copied again
        }
        run.cache.misses++;
      }
      if (member) {
        members.push(member);
        memberKeys.push(keys[i]);
      }
    }
  } finally {
    await pool?.close();
  }
  bestServers(run.items.map((it) => it.result));
  run.results.push(...run.items.map((it) => it.result));
  if (members.length >= 2) await addComposite(run, study, members, memberKeys.every((k) => k) ? keyer!.composite(memberKeys as string[]) : null, o);
  return run;
}

/** The tiles of the coverage map with this key, in the cache (entry kind "coverage-tile"; the job queue's tasks send them). */
export function coverageTileStore(cache: ResultCache, mapKey: string): CoverageTileStore {
  return {
    get: (index, count) => cache.getBytesAsync("coverage-tile", coverageTileKey(mapKey, index, count)),
    put: (index, count, bytes) => cache.putBytes("coverage-tile", coverageTileKey(mapKey, index, count), bytes),
  };
}

/** Read the composite from the cache or compute it from its members; add it to the run. */
async function addComposite(run: CachedStudyCoverage, study: Study, members: CompositeMember[], key: string | null, o: CachedCoverageOptions): Promise<void> {
  const bytes = key ? await o.cache!.getBytesAsync("coverage", key) : undefined;
  const hit = bytes ? compositeHit(decodeEntry(bytes, { views: true })) : null;
  if (hit && "warning" in hit) {
    run.warnings.push(hit.warning);
    return;
  }
  if (hit) {
    const map = restore(hit, o.outDir, requireOutputStage(o.outputs));
    run.results.push(map.result);
    run.composite = { files: map.files, figure: map.figure, svg: map.svg };
    run.cache.hits++;
    return;
  }
  const comp = await studyComposite(study, members, o.outDir, requireOutputStage(o.outputs));
  if ("warning" in comp) {
    run.warnings.push(comp.warning);
    if (key) o.cache!.put("coverage", key, comp satisfies CompositeEntry);
    return;
  }
  const { compute_s: _clock, ...result } = comp.result;
  run.results.push(result);
  run.composite = comp.outputs;
  if (key) o.cache!.putLarge("coverage", key, { result, figure: comp.outputs.figure, files: readFiles(o.outDir, result.files) } satisfies CompositeEntry<FileToStore>);
  run.cache.misses++;
}

/** Write a cached map's files into dir; its JSON, absolute file paths, figure and SVG. */
function restore(e: { result: CoverageResult; figure: CoverageFigure; files: StoredFile[]; extra?: { suffix: string; figure: CoverageFigure }[] }, dir: string, outputs: CoverageOutputStage): StudyCoverageMap {
  for (const f of e.files) writeFileSync(join(dir, f.name), f.bytes);
  const files = Object.fromEntries(Object.entries(e.result.files).map(([k, f]) => [k, join(dir, f)]));
  return { result: structuredClone(e.result), files, figure: e.figure, svg: outputs.svg(e.figure), extra: (e.extra ?? []).map((x) => ({ suffix: x.suffix, svg: outputs.svg(x.figure) })) };
}

/**
 * Fill the served-sites tables' best server: for each site, the P.1812 coverage of the study
 * with the strongest median level there (results in place; ties to the first in study order).
 */
function bestServers(results: CoverageResult[]): void {
  const best = new Map<string, { id: string; level: number }>();
  for (const r of results) for (const s of r.p1812?.served_sites ?? []) {
    const b = best.get(s.site);
    if (!b || s.median_dbm > b.level) best.set(s.site, { id: r.id, level: s.median_dbm });
  }
  for (const r of results) for (const s of r.p1812?.served_sites ?? []) s.best_server = best.get(s.site)!.id;
}

/**
 * The files a map wrote (names relative to dir), for its entry: copied from the files as the
 * entry is written (FileBytes), not read into memory (a 150 km map's level GeoTIFF is 260 MB).
 */
function readFiles(dir: string, files: Record<string, string>): FileToStore[] {
  return Object.values(files).map((name) => ({ name, bytes: new FileBytes(join(dir, name), statSync(join(dir, name)).size) }));
}

const FILE_NAME = /^[A-Za-z0-9][A-Za-z0-9._-]*$/;

/** The map part of a decoded entry when it is well formed (files named plainly and all present). */
function mapOk(v: unknown): v is { result: CoverageResult; figure: CoverageFigure; files: StoredFile[] } {
  const e = v as Partial<CoverageEntry> | null;
  if (!e || typeof e !== "object" || typeof e.result?.id !== "string" || typeof e.figure?.image_href !== "string" || !Array.isArray(e.files)) return false;
  if (!e.files.every((f) => typeof f?.name === "string" && FILE_NAME.test(f.name) && f.bytes instanceof Uint8Array)) return false;
  const names = new Set(e.files.map((f) => f.name));
  return !!e.result.files && Object.values(e.result.files).every((n) => names.has(n));
}

/** A decoded coverage entry for this study entry, or null (a miss) when it is not one. */
function coverageHit(v: unknown, entry: CoverageInput): CoverageEntry | null {
  if (!mapOk(v) || v.result.id !== entry.id) return null;
  const m = (v as Partial<CoverageEntry>).member;
  if (entry.method === "visibility") return m === null ? (v as CoverageEntry) : null;
  const cells = m?.grid ? m.grid.width * m.grid.height : -1;
  const ok = m && Array.isArray(m.thresholds_dbm) && m.values instanceof Float32Array && (m.dem instanceof Float32Array || m.dem instanceof Int16Array) && m.values.length === cells && m.dem.length === cells;
  return ok ? (v as CoverageEntry) : null;
}

/** A decoded composite entry, or null when it is not one. */
function compositeHit(v: unknown): CompositeEntry | null {
  if (v && typeof v === "object" && typeof (v as { warning?: unknown }).warning === "string") return v as CompositeEntry;
  return mapOk(v) && v.result.id === "composite" ? v : null;
}
