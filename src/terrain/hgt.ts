import { createHash } from "node:crypto";
import { readdirSync, readFileSync, statSync } from "node:fs";
import { basename, join } from "node:path";
import { checkHgtSize, readHgtTile, type HgtTile } from "./hgt-tile.ts";
import { hgtTileName, parseHgtTileName } from "./hgt-tile-name.ts";
import { LruCache } from "./lru-cache.ts";
import { metresPerDegree } from "./metres-per-degree.ts";
import type { RasterGrid, Terrain } from "./terrain.ts";
import { TerrainError } from "./terrain-error.ts";

export interface HgtOptions {
  /** how messages name the file or folder (default: the path) */
  label?: string;
  /** tiles kept in memory at once (LRU), default 16 */
  cacheTiles?: number;
}

interface TileEntry {
  path: string;
  name: string;
  n: number;
}

const tileKey = (lat: number, lon: number): number => (lat + 90) * 360 + (lon + 180);

/**
 * Elevation from SRTM .hgt tiles: one file, or a folder of tiles found by name
 * (N46E007.hgt …) and read lazily on first use, at most `cacheTiles` in memory (LRU).
 *
 * Sampling: bilinear between the four surrounding samples, which sit on whole multiples of
 * 1″ (or 3″) with the tile's first row on its north edge (lat + 1) and its last row and
 * column shared with the neighbouring tiles. A point on a tile edge whose own tile is
 * missing is taken from the neighbour that holds that edge. Voids are filled when a tile is
 * read (hgt-void-fill.ts: inverse-distance mean of the nearest valid samples along the row
 * and the column) and a sample whose bilinear cell uses a filled void is counted in
 * `voidFilled`.
 */
export class HgtTerrain implements Terrain {
  readonly kind = "hgt" as const;
  readonly synthetic = false;
  readonly description: string;
  private readonly tiles: Map<number, TileEntry>;
  private readonly cache: LruCache<number, HgtTile>;
  private readonly label: string;
  private readonly single: boolean;
  private readonly finestArcsec: number;
  private hash: string | null = null;
  private rasterGrid: RasterGrid | undefined;
  // Scratch state of the last lookup (no per-point allocation).
  private lastKey = -1;
  private lastTile: HgtTile | null = null;
  private touchedVoid = false;

  constructor(tiles: TileEntry[], options: { label: string; single: boolean; cacheTiles: number }) {
    this.tiles = new Map();
    for (const t of tiles) {
      const c = parseHgtTileName(t.name)!;
      this.tiles.set(tileKey(c.lat_deg, c.lon_deg), t);
    }
    this.cache = new LruCache(options.cacheTiles);
    this.label = options.label;
    this.single = options.single;
    const arcsecs = [...new Set(tiles.map((t) => (t.n === 3601 ? 1 : 3)))].sort();
    this.finestArcsec = arcsecs[0];
    const res = arcsecs.map((a) => `${a}″`).join("/");
    this.description = options.single
      ? `SRTM ${res} tile ${options.label}`
      : `SRTM ${res} tiles in ${options.label} (${tiles.length} tile${tiles.length === 1 ? "" : "s"})`;
  }

  resolutionM(lat_deg: number): number {
    const [ns, ew] = metresPerDegree(lat_deg);
    return (Math.max(ns, ew) * this.finestArcsec) / 3600;
  }

  elevation(lat_deg: number, lon_deg: number): number {
    return this.at(lat_deg, lon_deg);
  }

  sample(lat_deg: ArrayLike<number>, lon_deg: ArrayLike<number>): { h_m: Float64Array; voidFilled: number; outside: number } {
    const n = Math.min(lat_deg.length, lon_deg.length);
    const h_m = new Float64Array(n);
    let voidFilled = 0;
    let outside = 0;
    for (let i = 0; i < n; i++) {
      const h = this.at(lat_deg[i], lon_deg[i]);
      h_m[i] = h;
      if (h !== h) outside++;
      if (this.touchedVoid) voidFilled++;
    }
    return { h_m, voidFilled, outside };
  }

  whyOutside(lat_deg: number, lon_deg: number): string | null {
    const where = `${lat_deg.toFixed(5)}, ${lon_deg.toFixed(5)}`;
    if (!Number.isFinite(lat_deg) || !Number.isFinite(lon_deg) || Math.abs(lat_deg) > 90) {
      return `point (${lat_deg}, ${lon_deg}) is not a valid WGS84 latitude/longitude`;
    }
    if (!Number.isNaN(this.at(lat_deg, lon_deg))) return null;
    const tlat = Math.floor(lat_deg);
    const tlon = Math.floor(wrapLon(lon_deg));
    const name = hgtTileName(tlat, tlon);
    if (this.tiles.has(tileKey(tlat, tlon))) {
      return `point ${where} falls on a void in ${name} with no valid samples along its row or column; use a void-filled DEM or choose another terrain source`;
    }
    if (this.single) {
      return `point ${where} is outside the single tile ${this.label}; put ${name} beside it and use the folder as terrain, or choose another terrain source`;
    }
    return `tile ${name} not found in ${this.label} (needed for ${where}); add it or choose another terrain source`;
  }

  fingerprint(): string {
    if (this.hash === null) {
      const h = createHash("sha256");
      const entries = [...this.tiles.values()].sort((a, b) => (a.name < b.name ? -1 : 1));
      for (const t of entries) h.update(`${t.name}\0`).update(readFileSync(t.path));
      this.hash = h.digest("hex");
    }
    return this.hash;
  }

  /** For a single-file terrain: the tile as an EPSG:4326 raster (voids filled); undefined for a folder. */
  get raster(): RasterGrid | undefined {
    if (!this.single) return undefined;
    if (this.rasterGrid === undefined) {
      const t = this.loadTile([...this.tiles.keys()][0])!;
      const s = 1 / (t.n - 1);
      this.rasterGrid = {
        width: t.n,
        height: t.n,
        geoTransform: [t.lon_deg - s / 2, s, 0, t.lat_deg + 1 + s / 2, 0, -s],
        epsg: 4326,
        data: t.data instanceof Float32Array ? t.data : Float32Array.from(t.data),
        toCrs: (lat, lon) => [lon, lat],
        fromCrs: (x, y) => [y, x],
      };
    }
    return this.rasterGrid;
  }

  // --- Lookup ---

  private loadTile(key: number): HgtTile | null {
    if (key === this.lastKey) return this.lastTile;
    let tile = this.cache.get(key) ?? null;
    if (tile === null) {
      const entry = this.tiles.get(key);
      if (entry !== undefined) {
        tile = readHgtTile(entry.path, this.single ? this.label : join(this.label, entry.name));
        this.cache.set(key, tile);
      }
    }
    this.lastKey = key;
    this.lastTile = tile;
    return tile;
  }

  /** Bilinear elevation; sets touchedVoid. */
  private at(lat: number, lonIn: number): number {
    this.touchedVoid = false;
    if (!(lat >= -90 && lat <= 90 && Math.abs(lonIn) <= 540)) return NaN;
    const lon = wrapLon(lonIn);
    let tlat = Math.floor(lat);
    let tlon = Math.floor(lon);
    let tile = this.loadTile(tileKey(tlat, tlon));
    // On a tile edge, the neighbour to the south / west holds the same samples.
    if (tile === null && lat === tlat) tile = this.loadTile(tileKey(--tlat, tlon));
    if (tile === null && lon === tlon) {
      tlat = Math.floor(lat);
      tlon = tlon === -180 ? 179 : tlon - 1;
      tile = this.loadTile(tileKey(tlat, tlon));
      if (tile === null && lat === tlat) tile = this.loadTile(tileKey(--tlat, tlon));
    }
    if (tile === null) return NaN;
    const m = tile.n - 1;
    const row = (tile.lat_deg + 1 - lat) * m;
    let col = (lon - tile.lon_deg) * m;
    if (col < 0) col += 360 * m; // lon 180 taken from the tile E179
    let r0 = Math.floor(row);
    let c0 = Math.floor(col);
    if (r0 >= m) r0 = m - 1;
    if (c0 >= m) c0 = m - 1;
    const fr = row - r0;
    const fc = col - c0;
    const n = tile.n;
    const i00 = r0 * n + c0;
    const d = tile.data;
    const w00 = (1 - fc) * (1 - fr);
    const w01 = fc * (1 - fr);
    const w10 = (1 - fc) * fr;
    const w11 = fc * fr;
    const mask = tile.voidMask;
    if (mask !== null) {
      this.touchedVoid =
        (w00 > 0 && mask[i00] === 1) || (w01 > 0 && mask[i00 + 1] === 1) || (w10 > 0 && mask[i00 + n] === 1) || (w11 > 0 && mask[i00 + n + 1] === 1);
      if (tile.unfilled > 0) return renormalised(d, i00, n, fc, fr, w00, w01, w10, w11);
    }
    return d[i00] * w00 + d[i00 + 1] * w01 + d[i00 + n] * w10 + d[i00 + n + 1] * w11;
  }
}

function wrapLon(lon: number): number {
  return lon >= 180 || lon < -180 ? ((((lon + 180) % 360) + 360) % 360) - 180 : lon;
}

/**
 * Bilinear in a tile with unfillable voids (NaN): NaN when the nearest sample is NaN, else
 * over the valid corners only — the same rule as bilinear-grid.ts.
 */
function renormalised(d: ArrayLike<number>, i00: number, n: number, fc: number, fr: number, w00: number, w01: number, w10: number, w11: number): number {
  const v00 = d[i00];
  const v01 = d[i00 + 1];
  const v10 = d[i00 + n];
  const v11 = d[i00 + n + 1];
  const nearest = fr < 0.5 ? (fc < 0.5 ? v00 : v01) : fc < 0.5 ? v10 : v11;
  if (nearest !== nearest) return NaN;
  let s = 0;
  let w = 0;
  if (v00 === v00) (s += v00 * w00), (w += w00);
  if (v01 === v01) (s += v01 * w01), (w += w01);
  if (v10 === v10) (s += v10 * w10), (w += w10);
  if (v11 === v11) (s += v11 * w11), (w += w11);
  return w < 1e-6 ? NaN : s / w;
}

/**
 * Open SRTM terrain from a single .hgt file or a folder of them (tiles named by their
 * south-west corner). File sizes are checked here; tile contents are read on first use.
 * @throws TerrainError when the path is missing, a file has the wrong size or name, or a folder holds no tiles
 */
export function openHgt(path: string, options: HgtOptions = {}): HgtTerrain {
  const label = options.label ?? path;
  const cacheTiles = options.cacheTiles ?? 16;
  if (!(Number.isInteger(cacheTiles) && cacheTiles >= 1)) {
    throw new TerrainError(`tile cache size must be a whole number ≥ 1, received ${cacheTiles}`, { hint: "set cacheTiles to e.g. 16" });
  }
  let isDir: boolean;
  try {
    isDir = statSync(path).isDirectory();
  } catch (e) {
    throw new TerrainError(
      `terrain ${label} not found (${(e as NodeJS.ErrnoException).code ?? (e as Error).message}); check the path, which is relative to the study file`,
      { path, hint: "check the terrain path" },
      { cause: e },
    );
  }
  const entries: TileEntry[] = [];
  if (isDir) {
    for (const name of readdirSync(path).sort()) {
      if (parseHgtTileName(name) === null) continue;
      const p = join(path, name);
      entries.push({ path: p, name, n: checkHgtSize(p, join(label, name)) });
    }
    if (entries.length === 0) {
      throw new TerrainError(
        `folder ${label} holds no SRTM tiles named like N46E007.hgt; add the tiles the study area needs or choose another terrain source`,
        { path, hint: "add .hgt tiles named by their south-west corner" },
      );
    }
  } else {
    const name = basename(path);
    if (parseHgtTileName(name) === null) {
      throw new TerrainError(
        `SRTM tile ${label}: the name does not say where the tile is; name it after its south-west corner, like N46E007.hgt or S34W071.hgt`,
        { path, hint: "rename the tile like N46E007.hgt" },
      );
    }
    entries.push({ path, name, n: checkHgtSize(path, label) });
  }
  return new HgtTerrain(entries, { label, single: !isDir, cacheTiles });
}
