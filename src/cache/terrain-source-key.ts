import { createHash } from "node:crypto";
import { readdirSync, statSync } from "node:fs";
import { isAbsolute, join, resolve } from "node:path";
import type { TerrainInput } from "../study/study.ts";
import { canonicalJson } from "./canonical-json.ts";
import { fileDigest } from "./file-digest.ts";
import type { ResultCache } from "./result-cache.ts";

/**
 * sha256 (hex) naming a study's terrain by its content, computed WITHOUT opening it: the
 * terrain section as written (canonical JSON: seed and box of synthetic terrain, height of
 * constant terrain, path of a file) and, for a file, the bytes it holds — a .hgt or GeoTIFF
 * file, or every file directly inside a folder of tiles (name and bytes, sorted by name).
 * Cheaper than `Terrain.fingerprint()` after opening, which for synthetic terrain means
 * generating the whole grid and for a GeoTIFF decoding it; the terrain generator's own code
 * is covered by the code fingerprint in every cache key.
 * With a cache, file digests are remembered by file identity (file-digest.ts).
 * Returns null when a named file cannot be read (opening the terrain then reports why).
 */
export function terrainSourceKey(terrain: TerrainInput, studyDir: string, cache: ResultCache | null = null): string | null {
  const h = createHash("sha256").update("ridgeline-terrain-source-v1\0").update(canonicalJson(terrain));
  if (!("file" in terrain)) return h.digest("hex");
  const path = isAbsolute(terrain.file) ? terrain.file : resolve(studyDir, terrain.file);
  try {
    if (statSync(path).isDirectory()) {
      for (const name of readdirSync(path).sort()) {
        const f = join(path, name);
        if (!statSync(f).isFile()) continue;
        h.update(`\0${name}\0${fileDigest(f, cache)}`);
      }
    } else {
      h.update(`\0${fileDigest(path, cache)}`);
    }
  } catch {
    return null;
  }
  return h.digest("hex");
}
