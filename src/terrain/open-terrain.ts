import { statSync } from "node:fs";
import { extname, isAbsolute, relative, resolve } from "node:path";
import { ConstantTerrain } from "./constant.ts";
import { openGeoTiff } from "./geotiff.ts";
import { openHgt } from "./hgt.ts";
import { syntheticTerrain, type SyntheticTerrainParams } from "./synthetic.ts";
import type { Terrain } from "./terrain.ts";
import { TerrainError } from "./terrain-error.ts";

/** Where a study's elevations come from. */
export type TerrainSpec =
  | { kind: "file"; path: string }
  | { kind: "constant"; height_m: number }
  | ({ kind: "synthetic" } & SyntheticTerrainParams);

/**
 * A GeoTIFF of at least this many pixels (64 MiB as Float32, e.g. 4 096 × 4 096) is not decoded
 * whole when opened: links and maps read it in blocks (at most 128 MiB kept, let go when a
 * coverage grid is read) and a coverage grid reads its own window from the file, as Int16 when
 * it can (openGeoTiff's `blocks`). A 150 km coverage at 30 m on a 10 000 × 10 000 DEM otherwise
 * held the whole band as Float32 (400 MB) beside the grid. Smaller files are decoded whole,
 * once: the fastest for many links. A 100 km profile on a 10 000² DEM costs about 10–18 ms in
 * blocks of uncompressed strips or of 256² Deflate tiles, 0.3 s of Deflate strips (every strip
 * it crosses is inflated whole: after the band's worth, openGeoTiff decodes it whole), against
 * 3 ms decoded (after 0.8–3 s of decoding).
 */
const LARGE_GEOTIFF = { minPixels: 16 * 1024 * 1024, maxBytes: 128 * 1024 * 1024 };

/**
 * Open the terrain a spec names. A file path is resolved against `baseDir` (the study's
 * folder) and opened by what it is: a folder of .hgt tiles, one .hgt tile, or a .tif/.tiff
 * GeoTIFF. Messages name the path as written relative to `baseDir`.
 * @throws TerrainError for a missing path, an unknown file type or a bad raster
 */
export async function openTerrain(spec: TerrainSpec, baseDir: string): Promise<Terrain> {
  switch (spec.kind) {
    case "constant":
      return new ConstantTerrain(spec.height_m);
    case "synthetic":
      return syntheticTerrain(spec);
    case "file": {
      const path = isAbsolute(spec.path) ? spec.path : resolve(baseDir, spec.path);
      const label = isAbsolute(spec.path) ? spec.path : relative(baseDir, path) || spec.path;
      let isDir: boolean;
      try {
        isDir = statSync(path).isDirectory();
      } catch (e) {
        throw new TerrainError(
          `terrain ${label} not found (looked for ${path}); check the path, which is relative to the study file, or use constant:<m>`,
          { path, hint: "check the terrain path" },
          { cause: e },
        );
      }
      if (isDir) return openHgt(path, { label: label.endsWith("/") ? label : `${label}/` });
      const ext = extname(path).toLowerCase();
      if (ext === ".hgt") return openHgt(path, { label });
      if (ext === ".tif" || ext === ".tiff") return openGeoTiff(path, { label, blocks: LARGE_GEOTIFF });
      throw new TerrainError(
        `terrain ${label}: unknown file type "${ext || "(none)"}"; expected a .hgt tile, a folder of .hgt tiles or a .tif/.tiff GeoTIFF`,
        { path, hint: "convert the DEM to GeoTIFF, e.g. gdal_translate in.asc out.tif" },
      );
    }
  }
}

/**
 * Parse a command-line terrain argument: `constant:<m>` (e.g. constant:120) or a path to a
 * .hgt/.tif/.tiff file or a folder of .hgt tiles (checked when opened, not here).
 * @throws TerrainError for an empty argument or a bad constant
 */
export function parseTerrainArg(s: string): TerrainSpec {
  const arg = s.trim();
  if (arg === "") {
    throw new TerrainError("terrain argument is empty; give constant:<m>, a .hgt/.tif file or a folder of .hgt tiles", {
      hint: "e.g. --terrain dem/ or --terrain constant:0",
    });
  }
  const m = /^constant:(.*)$/i.exec(arg);
  if (m) {
    const text = m[1].trim();
    const height_m = text === "" ? NaN : Number(text);
    if (!Number.isFinite(height_m)) {
      throw new TerrainError(`terrain "${arg}": the height after "constant:" must be a number of metres, received "${m[1]}"`, {
        hint: "e.g. constant:0 for a sea path",
      });
    }
    return { kind: "constant", height_m };
  }
  return { kind: "file", path: arg };
}
