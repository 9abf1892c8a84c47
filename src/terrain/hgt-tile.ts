import { readFileSync, statSync } from "node:fs";
import { endianness } from "node:os";
import { basename } from "node:path";
import { fillHgtVoids, HGT_VOID } from "./hgt-void-fill.ts";
import { parseHgtTileName } from "./hgt-tile-name.ts";
import { TerrainError } from "./terrain-error.ts";

/** One SRTM tile in memory. */
export interface HgtTile {
  /** south-west corner (whole degrees) */
  lat_deg: number;
  lon_deg: number;
  /** samples per side: 3601 (1″) or 1201 (3″) */
  n: number;
  /** row-major, first row = north edge (lat + 1); Int16 when void-free, else Float32 with voids filled (NaN if unfillable) */
  data: Int16Array | Float32Array;
  /** 1 where the file had a void (−32768); null when there were none */
  voidMask: Uint8Array | null;
  voids: number;
  unfilled: number;
}

/** Samples per side for a .hgt file of `bytes` bytes, or null when the size fits no SRTM grid. */
export function hgtSamplesPerSide(bytes: number): 3601 | 1201 | null {
  if (bytes === 3601 * 3601 * 2) return 3601;
  if (bytes === 1201 * 1201 * 2) return 1201;
  return null;
}

/** Size check shared by the opener and the reader; `label` names the file in messages. */
export function checkHgtSize(path: string, label: string): 3601 | 1201 {
  let size: number;
  try {
    size = statSync(path).size;
  } catch (e) {
    throw new TerrainError(
      `SRTM tile ${label} could not be read (${(e as NodeJS.ErrnoException).code ?? (e as Error).message}); check the terrain path`,
      { path, hint: "check the terrain path" },
      { cause: e },
    );
  }
  const n = hgtSamplesPerSide(size);
  if (n === null) {
    throw new TerrainError(
      `SRTM tile ${label} has ${size} bytes; expected ${3601 * 3601 * 2} (1″, 3601×3601) or ${1201 * 1201 * 2} (3″, 1201×1201) ` +
        "big-endian 16-bit samples; replace it with an unmodified .hgt file",
      { path, hint: "replace the tile with an unmodified SRTM .hgt file" },
    );
  }
  return n;
}

/** Heights an SRTM tile may hold (m), besides the void marker: the Dead Sea shore to above Everest. */
export const HGT_MIN_M = -500;
export const HGT_MAX_M = 9000;

/**
 * Read one SRTM .hgt tile: big-endian int16, n×n, row-major from the north edge,
 * samples on whole arc-seconds (SRTM format as distributed by NASA/USGS). The SW corner
 * comes from the file name. Voids are filled by fillHgtVoids (see there for the method).
 */
export function readHgtTile(path: string, label = basename(path)): HgtTile {
  const corner = parseHgtTileName(basename(path));
  if (corner === null) {
    throw new TerrainError(
      `SRTM tile ${label}: the name does not say where the tile is; name it after its south-west corner, like N46E007.hgt or S34W071.hgt`,
      { path, hint: "rename the tile like N46E007.hgt" },
    );
  }
  const n = checkHgtSize(path, label);
  let buf = readFileSync(path);
  if (buf.byteOffset % 2 !== 0) buf = Buffer.from(new Uint8Array(buf)); // Int16Array needs 2-byte alignment
  if (endianness() === "LE") buf.swap16(); // file is big-endian; swap in place (our own buffer)
  const raw = new Int16Array(buf.buffer, buf.byteOffset, n * n);
  // Heights outside what the Earth holds mean the file is not an SRTM tile (or is damaged):
  // refused rather than used as ground tens of kilometres high or deep.
  for (let i = 0; i < raw.length; i++) {
    const v = raw[i];
    if ((v < HGT_MIN_M || v > HGT_MAX_M) && v !== HGT_VOID) {
      throw new TerrainError(
        `SRTM tile ${label} holds a height of ${v} m at row ${Math.floor(i / n)}, column ${i % n}, outside ${HGT_MIN_M}…${HGT_MAX_M} m: it is not a big-endian SRTM height tile, or it is damaged`,
        { path, hint: "download the tile again, or convert the DEM with gdal_translate -of SRTMHGT" },
      );
    }
  }
  const filled = fillHgtVoids(raw, n);
  return {
    lat_deg: corner.lat_deg,
    lon_deg: corner.lon_deg,
    n,
    data: filled ? filled.data : raw,
    voidMask: filled ? filled.voidMask : null,
    voids: filled ? filled.voids : 0,
    unfilled: filled ? filled.unfilled : 0,
  };
}
