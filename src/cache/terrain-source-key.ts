import { createHash } from "node:crypto";
import { readdirSync, statSync } from "node:fs";
import { isAbsolute, join, resolve } from "node:path";
import type { Study, TerrainInput } from "../study/study.ts";
import { parseHgtTileName } from "../terrain/hgt-tile-name.ts";
import { canonicalJson } from "./canonical-json.ts";
import { fileDigest } from "./file-digest.ts";
import type { ResultCache } from "./result-cache.ts";
import { terrainExtent, tilesInExtent, type LatLonBox } from "./terrain-extent.ts";

/**
 * sha256 (hex) naming a study's terrain by its content, computed WITHOUT opening it: the
 * terrain section as written (canonical JSON: seed and box of synthetic terrain, height of
 * constant terrain, path of a file) and, for a file, the bytes it holds — a .hgt or GeoTIFF
 * file, or the files directly inside a folder of tiles (sorted by name).
 * In a folder, every file counts by name and size (the size says a tile's resolution, which
 * sets how finely profiles are sampled, and the tile count is in the terrain's description),
 * but only the tiles that meet `extent` (terrain-extent.ts: where the study can read) count
 * by their bytes: a study between 2 tiles of a folder of 100 reads 2, and changing a tile it
 * cannot reach does not change its key. Without `extent`, every file counts by its bytes.
 * Cheaper than `Terrain.fingerprint()` after opening, which for synthetic terrain means
 * generating the whole grid and for a GeoTIFF decoding it; the terrain generator's own code
 * is covered by the code fingerprint in every cache key.
 * With a cache, file digests are remembered by file identity (file-digest.ts).
 * Returns null when a named file cannot be read (opening the terrain then reports why).
 */
export function terrainSourceKey(terrain: TerrainInput, studyDir: string, cache: ResultCache | null = null, extent: readonly LatLonBox[] | null = null): string | null {
  const h = createHash("sha256").update("ridgeline-terrain-source-v1\0").update(canonicalJson(terrain));
  if (!("file" in terrain)) return h.digest("hex");
  const path = isAbsolute(terrain.file) ? terrain.file : resolve(studyDir, terrain.file);
  try {
    if (statSync(path).isDirectory()) {
      const touched = extent ? tilesInExtent(extent) : null;
      for (const name of readdirSync(path).sort()) {
        const f = join(path, name);
        const st = statSync(f);
        if (!st.isFile()) continue;
        const c = touched ? parseHgtTileName(name) : null;
        if (touched && !(c && touched.has(`${c.lat_deg},${c.lon_deg}`))) h.update(`\0${name}\0size ${st.size}`);
        else h.update(`\0${name}\0${fileDigest(f, cache)}`);
      }
    } else {
      h.update(`\0${fileDigest(path, cache)}`);
    }
  } catch {
    return null;
  }
  return h.digest("hex");
}

/** Where a study can read terrain (terrain-extent.ts): its sites, and each coverage's site and radius. */
export function studyTerrainExtent(study: Pick<Study, "sites" | "coverage">): LatLonBox[] {
  const byId = new Map(study.sites.map((s) => [s.id, s]));
  const coverages = (study.coverage ?? []).flatMap((c) => {
    const s = byId.get(c.site);
    return s ? [{ lat_deg: s.lat_deg, lon_deg: s.lon_deg, radius_km: c.radius_km }] : [];
  });
  return terrainExtent(study.sites, coverages);
}

/** The study's terrain key over the tiles the study can reach (terrainSourceKey with studyTerrainExtent). */
export function studyTerrainKey(study: Pick<Study, "terrain" | "dir" | "sites" | "coverage">, cache: ResultCache | null = null): string | null {
  return terrainSourceKey(study.terrain, study.dir, cache, studyTerrainExtent(study));
}

/**
 * The HGT tiles of a terrain folder that the study's key covers by their bytes (the tiles its
 * extent meets that the folder holds), by name; null when the terrain is not a folder.
 */
export function studyTerrainTiles(study: Pick<Study, "terrain" | "dir" | "sites" | "coverage">): string[] | null {
  if (!("file" in study.terrain)) return null;
  const path = isAbsolute(study.terrain.file) ? study.terrain.file : resolve(study.dir, study.terrain.file);
  try {
    if (!statSync(path).isDirectory()) return null;
    const touched = tilesInExtent(studyTerrainExtent(study));
    return readdirSync(path)
      .sort()
      .filter((name) => {
        const c = parseHgtTileName(name);
        return c !== null && touched.has(`${c.lat_deg},${c.lon_deg}`);
      });
  } catch {
    return null;
  }
}
