import { createHash } from "node:crypto";
import { closeSync, fstatSync, openSync, readFileSync } from "node:fs";
import { readFile } from "node:fs/promises";
import { makeRasterGrid, RasterTerrain, type RasterTerrainOptions } from "./raster-terrain.ts";
import { bilinearGrid } from "./bilinear-grid.ts";
import { BandBlocks, readStripSegments } from "./band-blocks.ts";
import { crsFromEpsg, type Crs } from "../geo/crs-from-epsg.ts";
import { bandLayout, decodeBands, readBandFloat32, readBandFloat32AsInt16, readBandInt16, rowPiecesReadable, waitForBands, type BandLayout, type PixelWindow, type RowProgress, type TiffBandSource } from "./tiff-band-reader.ts";
import { readTiffDirectory } from "./tiff-directory.ts";
import type { RasterGrid } from "./terrain.ts";
import { TerrainError } from "./terrain-error.ts";
import { sharedFloat32, sharedInt16 } from "./shared-grid.ts";

/** GeoTIFF GTRasterTypeGeoKey values (GeoTIFF 1.1, §7.4.2 / OGC 19-008r4). */
const RASTER_PIXEL_IS_POINT = 2;

/**
 * Open a GeoTIFF DEM (first band, elevations in metres) in EPSG:4326 or a WGS84 UTM zone
 * (EPSG:326zz / 327zz).
 *
 * Reading: the common layouts of a single-band DEM (strips or tiles, uncompressed or
 * Deflate, UInt16/Int16/Int32/Float32, see tiff-band-reader.ts) are decoded strip by strip
 * straight into a Float32Array on a SharedArrayBuffer; anything else (BigTIFF, other
 * compressions, multi-band…) goes through geotiff.js (`fromArrayBuffer`, one `readRasters` of
 * band 1). Both give the same raster.
 *
 * Georeferencing follows GDAL's reading of the same tags, so `raster.geoTransform` equals
 * what `gdalinfo` reports:
 * - ModelPixelScale + ModelTiepoint (any tiepoint pixel I, J), or a non-rotated
 *   ModelTransformation;
 * - PixelIsArea: the tiepoint is the corner of pixel (0, 0);
 *   PixelIsPoint: it is that pixel's centre, so the corner origin is shifted back by half a
 *   pixel (GDAL's default, GTIFF_POINT_GEO_IGNORE=FALSE).
 * - The GDAL_NODATA tag: samples equal to it become NaN (compared in the band's own type).
 * Scale/offset metadata and vertical datums are not applied.
 *
 * The fingerprint (sha256 of the file bytes) is computed when first asked for, by reading
 * the file again; a file changed on disk after opening is reported by its new bytes.
 *
 * @param path file path (absolute or relative to the working directory)
 * @param options.label how messages name the file (default: the path)
 * @param options.deferPixels decode the band only when `raster.data` is first read (the fast
 *   path only); single elevations and `readWindow` read just the pixels they need meanwhile
 * @param options.blocks for a band of at least `minPixels` pixels (fast path only): decode
 *   nothing when opening. Elevations and profiles read the band in blocks (BandBlocks, at most
 *   `maxBytes` kept) — but over Deflate strips, which blocks inflate again for every profile
 *   crossing them, once the profiles have read as many pixels as the band holds, it is decoded
 *   whole for the next ones (a few links stay cheap, many cost at most twice a decode). Reading a
 *   coverage grid's window (`readWindow`) lets the blocks or the decoded band go and reads the
 *   window from the file (Int16 when it can): a study's DEM far larger than its links need is
 *   not held beside its coverage grid. Same values.
 * @throws TerrainError when the file is missing, unreadable, not georeferenced or in another CRS
 */
export async function openGeoTiff(path: string, options: { label?: string; deferPixels?: boolean; blocks?: { minPixels: number; maxBytes: number } } = {}): Promise<RasterTerrain> {
  const label = options.label ?? path;
  const unreadable = (e: unknown) =>
    new TerrainError(
      `GeoTIFF ${label} could not be read (${(e as NodeJS.ErrnoException).code ?? (e as Error).message}); ` +
        "check the path in the study's terrain setting",
      { path, hint: "check the terrain path" },
      { cause: e },
    );
  let raster: RasterGrid | null = null;
  let pixels: DeferredPixels | null = null;
  let blocks: BandBlocks | null = null;
  try {
    const head = readGeoTiffHeader(path, label);
    if (head !== null) {
      pixels = new DeferredPixels(path, label, head.layout, head.nodata);
      raster = makeRasterGrid(head.width, head.height, head.gt, head.epsg, EMPTY, path);
      const px = pixels;
      Object.defineProperty(raster, "data", { enumerable: true, get: () => px.all() });
      if (options.blocks && head.width * head.height >= options.blocks.minPixels) blocks = px.blocks(options.blocks!.maxBytes);
      else if (!options.deferPixels) px.all();
    }
  } catch (e) {
    if (e instanceof TerrainError) throw e;
    throw unreadable(e);
  }
  if (raster === null) {
    let bytes: Buffer;
    try {
      bytes = await readFile(path);
    } catch (e) {
      throw unreadable(e);
    }
    raster = await parseGeoTiff(bytes, path, label);
  }
  const res = `${fmtRes(raster)}`;
  return new GeoTiffTerrain(path, raster, pixels, { blocks, decodeForProfiles: !!pixels && !pixels.tiled && pixels.compressed }, {
    kind: "geotiff",
    description: `GeoTIFF ${label} (EPSG:${raster.epsg}, ${raster.width}×${raster.height}, ${res})`,
    synthetic: false,
    label,
    fingerprint: "",
  });
}

const EMPTY = new Float32Array(0);

/**
 * Hands a window decode to other threads: each is to call decodeBands(fd, src, window, out,
 * ctrl) with the same arguments (see tiff-band-reader.ts) and may start late or never.
 */
export type ShareDecode = (src: TiffBandSource, window: PixelWindow, out: Float32Array | Int16Array, ctrl: Int32Array) => void;

/**
 * Band 1 of a GeoTIFF the fast reader handles, decoded on first use: all of it (`all`) or a
 * window (`window`, read from the file unless the whole band is already in memory).
 */
class DeferredPixels {
  private data: Float32Array | null = null;
  constructor(
    private readonly path: string,
    private readonly label: string,
    private readonly layout: BandLayout,
    private readonly nodata: number | null,
  ) {}

  get decoded(): boolean {
    return this.data !== null;
  }

  /** The band as plain data, for threads that decode shares of a window. */
  get source(): TiffBandSource {
    return { path: this.path, layout: this.layout, nodata: this.nodata };
  }

  /** Whether the band's blocks are compressed (Deflate). */
  get compressed(): boolean {
    return this.layout.deflate;
  }

  /** Whether the band is stored in tiles (not strips). */
  get tiled(): boolean {
    return this.layout.tiled;
  }

  /** Whether the band holds Int16 samples (a window can then be read as Int16: half the memory). */
  get int16(): boolean {
    return this.layout.kind === "i16";
  }

  /**
   * A window decoded by this thread together with others (see decodeBands), as Int16 when
   * asked and the band is Int16; null when a band failed.
   */
  windowShared(w: PixelWindow, share: ShareDecode, int16 = false): Float32Array | Int16Array | null {
    const out = int16 && this.int16 ? sharedInt16(w.width * w.height) : sharedFloat32(w.width * w.height);
    const ctrl = new Int32Array(new SharedArrayBuffer(12));
    const src = this.source;
    share(src, w, out, ctrl);
    const fd = openSync(this.path, "r");
    try {
      decodeBands(fd, src, w, out, ctrl);
    } finally {
      closeSync(fd);
    }
    return waitForBands(src, w, ctrl) ? out : null;
  }

  /** The band read in blocks on demand (BandBlocks), at most maxBytes of them kept decoded. */
  blocks(maxBytes: number): BandBlocks {
    const segments = rowPiecesReadable(this.layout);
    return new BandBlocks(this.layout, (w) => this.decode((fd) => (segments ? readStripSegments(fd, this.layout, this.nodata, w) : readBandFloat32(fd, this.layout, this.nodata, w, new Float32Array(w.width * w.height)))), maxBytes);
  }

  /** Let the decoded band go (decoded again when asked for). */
  release(): void {
    this.data = null;
  }

  all(): Float32Array {
    this.data ??= this.read();
    return this.data;
  }

  window(w: PixelWindow): Float32Array;
  window(w: PixelWindow, int16: boolean, progress?: RowProgress): Float32Array | Int16Array;
  window(w: PixelWindow, int16 = false, progress?: RowProgress): Float32Array | Int16Array {
    if (this.data === null) {
      if (int16 && this.int16) return this.read(w, true, progress);
      // a Float32 band of whole metres reads as Int16 too: the same values in half the memory
      if (int16 && this.layout.kind === "f32") return this.decode((fd) => readBandFloat32AsInt16(fd, this.layout, this.nodata, w)) ?? this.read(w, false, progress);
      return this.read(w, false, progress);
    }
    const out = sharedFloat32(w.width * w.height);
    const W = this.layout.width;
    for (let r = 0; r < w.height; r++) {
      const from = (w.row0 + r) * W + w.col0;
      out.set(this.data.subarray(from, from + w.width), r * w.width);
    }
    return out;
  }

  private read(w?: PixelWindow): Float32Array;
  private read(w: PixelWindow, int16: boolean, progress?: RowProgress): Float32Array | Int16Array;
  private read(w?: PixelWindow, int16 = false, progress?: RowProgress): Float32Array | Int16Array {
    return this.decode((fd) => (int16 ? readBandInt16(fd, this.layout, this.nodata, w, undefined, progress) : readBandFloat32(fd, this.layout, this.nodata, w, undefined, progress)));
  }

  /** Run a decoder on the open file; a failure becomes a TerrainError naming the file. */
  private decode<T>(decoder: (fd: number) => T): T {
    let fd: number | null = null;
    try {
      fd = openSync(this.path, "r");
      return decoder(fd);
    } catch (e) {
      throw new TerrainError(
        `GeoTIFF ${this.label}: its pixels could not be decoded (${(e as NodeJS.ErrnoException).code ?? (e as Error).message}); rewrite it with gdal_translate -co COMPRESS=DEFLATE in.tif out.tif`,
        { path: this.path, hint: "rewrite it with gdal_translate -co COMPRESS=DEFLATE in.tif out.tif" },
        { cause: e },
      );
    } finally {
      if (fd !== null) closeSync(fd);
    }
  }
}

/**
 * A GeoTIFF terrain: the fingerprint is hashed from the file on first request; with deferred
 * pixels, single elevations and windows are read from the file without decoding the band.
 */
class GeoTiffTerrain extends RasterTerrain {
  private hashed: string | null = null;
  private geoCrs: Crs | null = null;
  constructor(
    private readonly path: string,
    raster: RasterGrid,
    private readonly pixels: DeferredPixels | null,
    /** openGeoTiff's `blocks`: the band's blocks when it is read so, and whether many profiles decode it whole instead (Deflate strips) */
    private readonly mode: { blocks: BandBlocks | null; decodeForProfiles: boolean },
    options: RasterTerrainOptions,
  ) {
    super(raster, options);
  }

  private get blocks(): BandBlocks | null {
    return this.mode.blocks;
  }

  override fingerprint(): string {
    this.hashed ??= createHash("sha256").update(readFileSync(this.path)).digest("hex");
    return this.hashed;
  }

  /** Whether the band is in memory (decoded, or read by the general reader); false while windows are read from the file. */
  get pixelsInMemory(): boolean {
    return this.pixels === null || this.pixels.decoded;
  }

  /** Whether readWindow(…, int16 = true) gives Int16 for this band's type (Float32 bands of whole metres aside, which only reading tells). */
  get windowsInt16(): boolean {
    return this.pixels !== null && this.pixels.int16;
  }

  /**
   * Bilinear elevation as RasterTerrain computes it; before the band is decoded, from the 4×4
   * pixels around the point (clamped to the raster), which hold every pixel the interpolation
   * reads, at the same fractional position (an integer shift of the coordinates is exact).
   */
  override elevation(lat_deg: number, lon_deg: number): number {
    if (this.pixels === null || this.pixels.decoded) return super.elevation(lat_deg, lon_deg);
    if (this.blocks) return this.blocks.bilinear(...this.pixelPosition(lat_deg, lon_deg));
    const r = this.raster;
    const crs = crsFromEpsg(r.epsg)!;
    const [x, y] = crs.geographic ? [lon_deg, lat_deg] : crs.toCrs(lat_deg, lon_deg);
    const [x0, dx, , y0, , dy] = r.geoTransform;
    const col = (x - x0) / dx - 0.5;
    const row = (y - y0) / dy - 0.5;
    if (!(col >= -0.5 && col <= r.width - 0.5 && row >= -0.5 && row <= r.height - 0.5)) return NaN;
    const c0 = Math.max(0, Math.floor(col) - 1);
    const r0 = Math.max(0, Math.floor(row) - 1);
    const w = { col0: c0, row0: r0, width: Math.min(r.width, Math.floor(col) + 3) - c0, height: Math.min(r.height, Math.floor(row) + 3) - r0 };
    const c1 = c0 + w.width === r.width;
    const r1 = r0 + w.height === r.height;
    // the window keeps the raster's own edges where it reaches them, and stays ≥ 1 pixel clear of its own otherwise
    if (!(c0 === 0 || col - c0 >= 1) || !(r0 === 0 || row - r0 >= 1) || !(c1 || c0 + w.width - 1 - col >= 1) || !(r1 || r0 + w.height - 1 - row >= 1)) {
      return super.elevation(lat_deg, lon_deg);
    }
    return bilinearGrid(this.pixels.window(w), w.width, w.height, col - c0, row - r0);
  }

  /** Profiles as RasterTerrain samples them; before the band is decoded, through its blocks when it has them. */
  override sample(lat_deg: ArrayLike<number>, lon_deg: ArrayLike<number>): { h_m: Float64Array; voidFilled: number; outside: number } {
    const blocks = this.blocks;
    if (blocks === null || this.pixels === null || this.pixels.decoded) return super.sample(lat_deg, lon_deg);
    // Deflate strips: decoded whole once blocks have read the band's worth (openGeoTiff's `blocks`)
    if (this.mode.decodeForProfiles && blocks.loadedPixels >= this.raster.width * this.raster.height) return super.sample(lat_deg, lon_deg);
    const n = Math.min(lat_deg.length, lon_deg.length);
    const h_m = new Float64Array(n);
    let outside = 0;
    for (let i = 0; i < n; i++) {
      const h = blocks.bilinear(...this.pixelPosition(lat_deg[i], lon_deg[i]));
      h_m[i] = h;
      if (h !== h) outside++;
    }
    return { h_m, voidFilled: 0, outside };
  }

  /** Pixel-centre coordinates (col, row) of a point, computed as RasterTerrain does. */
  private pixelPosition(lat_deg: number, lon_deg: number): [number, number] {
    const r = this.raster;
    const crs = (this.geoCrs ??= crsFromEpsg(r.epsg)!);
    const [x, y] = crs.geographic ? [lon_deg, lat_deg] : crs.toCrs(lat_deg, lon_deg);
    const [x0, dx, , y0, , dy] = r.geoTransform;
    return [(x - x0) / dx - 0.5, (y - y0) / dy - 0.5];
  }

  /**
   * Elevations of a window of the raster's own pixels (Float32 on a SharedArrayBuffer, NaN
   * nodata), read straight from the file when the band is not decoded yet — with `share`,
   * by this thread and the threads `share` hands the same work to (see decodeBands). With
   * `int16` and an Int16 band read that way — or an uncompressed or single-thread Float32 band
   * whose window holds only whole metres (readBandFloat32AsInt16) — an Int16Array instead
   * (nodata INT16_NODATA): the same values in half the memory, which a 100 km coverage grid
   * (≈ 45 M cells) feels. `progress` is told of the rows as they are read when the window is
   * read row by row straight from the file (uncompressed strips; see RowProgress), and not
   * called otherwise.
   */
  readWindow(window: PixelWindow, share?: ShareDecode, int16 = false, progress?: RowProgress): Float32Array | Int16Array {
    // a coverage grid holds its own elevations from now: what was kept for profiles can go
    if (this.blocks) {
      this.blocks.clear();
      this.pixels?.release();
    }
    // Shared only when blocks are compressed: inflating is work that threads divide, while
    // copying uncompressed blocks is bound by first writes to fresh memory, which measured
    // slower from three threads at once (0.44 s) than from one (0.33 s) for 89 MB here.
    if (this.pixels !== null && share && !this.pixels.decoded && this.pixels.compressed) {
      // shared by other threads; on a failed band, read it again here to report the error
      return this.pixels.windowShared(window, share, int16) ?? this.pixels.window(window);
    }
    if (this.pixels !== null) return this.pixels.window(window, int16, progress);
    const { width: W, data } = this.raster;
    const out = sharedFloat32(window.width * window.height);
    for (let r = 0; r < window.height; r++) {
      const from = (window.row0 + r) * W + window.col0;
      out.set(data.subarray(from, from + window.width), r * window.width);
    }
    return out;
  }
}

/** What georeferencing needs of a GeoTIFF's tags, whichever reader found them. */
interface GeoTiffMeta {
  scale?: number[];
  tie?: number[];
  mt?: number[];
  keys: Record<string, number | undefined>;
}

/**
 * The fast path: parse the directory and georeference without geotiff.js. Null when the
 * file's layout needs the general reader.
 */
function readGeoTiffHeader(
  path: string,
  label: string,
): { width: number; height: number; gt: RasterGrid["geoTransform"]; epsg: number; layout: BandLayout; nodata: number | null } | null {
  const fd = openSync(path, "r");
  try {
    const dir = readTiffDirectory(fd, fstatSync(fd).size);
    if (dir === null) return null;
    const layout = bandLayout(dir);
    if (layout === null) return null;
    const t = dir.tags;
    const num = (tag: number) => (Array.isArray(t.get(tag)) ? (t.get(tag) as number[]) : undefined);
    const meta: GeoTiffMeta = { scale: num(33550), tie: num(33922), mt: num(34264), keys: geoKeys(num(34735), num(34736)) };
    const { gt, epsg } = georeference(meta, path, label);
    const nd = t.get(42113);
    const nodata = typeof nd === "string" && nd !== "" ? Number(nd) : null;
    return { width: layout.width, height: layout.height, gt, epsg, layout, nodata };
  } finally {
    closeSync(fd);
  }
}

/** The GeoKeyDirectory (GeoTIFF 1.1 §7.1.3) as key name → value, for the keys used here. */
function geoKeys(dirValues: number[] | undefined, doubles: number[] | undefined): Record<string, number | undefined> {
  const names: Record<number, string> = { 1024: "GTModelTypeGeoKey", 1025: "GTRasterTypeGeoKey", 2048: "GeographicTypeGeoKey", 3072: "ProjectedCSTypeGeoKey" };
  const keys: Record<string, number | undefined> = {};
  if (!dirValues || dirValues.length < 4) return keys;
  const n = dirValues[3];
  for (let i = 0; i < n && 4 + 4 * i + 3 < dirValues.length; i++) {
    const [id, loc, , value] = dirValues.slice(4 + 4 * i, 8 + 4 * i);
    if (!(id in names)) continue;
    if (loc === 0) keys[names[id]] = value;
    else if (loc === 34736 && doubles) keys[names[id]] = doubles[value];
  }
  return keys;
}

/** Geotransform (pixel-corner origin, as GDAL) and EPSG code from the tags. */
function georeference(meta: GeoTiffMeta, path: string, label: string): { gt: RasterGrid["geoTransform"]; epsg: number } {
  const fail = (what: string, hint: string): TerrainError => new TerrainError(`GeoTIFF ${label}: ${what}; ${hint}`, { path, hint });
  const { scale, tie, mt, keys } = meta;
  let gt: RasterGrid["geoTransform"];
  if (scale && tie && tie.length >= 6) {
    const [I, J, , X, Y] = tie;
    gt = [X - I * scale[0], scale[0], 0, Y + J * scale[1], 0, -scale[1]];
  } else if (mt && mt.length >= 8) {
    gt = [mt[3], mt[0], mt[1], mt[7], mt[4], mt[5]];
  } else {
    throw fail("no georeferencing (ModelPixelScale/ModelTiepoint or ModelTransformation tags)", "assign it, e.g. gdal_translate -a_srs EPSG:4326 -a_ullr ulx uly lrx lry in.tif out.tif");
  }
  if (keys.GTRasterTypeGeoKey === RASTER_PIXEL_IS_POINT) {
    gt[0] -= 0.5 * gt[1] + 0.5 * gt[2];
    gt[3] -= 0.5 * gt[4] + 0.5 * gt[5];
  }
  const model = keys.GTModelTypeGeoKey;
  const epsg = model === 1 ? keys.ProjectedCSTypeGeoKey : model === 2 ? keys.GeographicTypeGeoKey : undefined;
  if (epsg === undefined || epsg === 32767) {
    throw fail(
      `its coordinate reference system is ${model === undefined ? "missing" : "not given as an EPSG code"}`,
      "assign or reproject to EPSG:4326 or a WGS84 UTM zone, e.g. gdalwarp -t_srs EPSG:4326 in.tif out.tif",
    );
  }
  return { gt, epsg };
}

/** The general reader: geotiff.js, loaded only when a file needs it. */
async function parseGeoTiff(bytes: Buffer, path: string, label: string): Promise<RasterGrid> {
  const fail = (what: string, hint: string, cause?: unknown): TerrainError =>
    new TerrainError(`GeoTIFF ${label}: ${what}; ${hint}`, { path, hint }, { cause });
  const ab =
    bytes.byteOffset === 0 && bytes.byteLength === bytes.buffer.byteLength
      ? (bytes.buffer as ArrayBuffer)
      : (bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength) as ArrayBuffer);
  let image;
  try {
    const { fromArrayBuffer } = await import("geotiff");
    const tiff = await fromArrayBuffer(ab);
    image = await tiff.getImage(0);
  } catch (e) {
    throw fail(`not a readable TIFF (${(e as Error).message})`, "export the DEM as a GeoTIFF, e.g. gdal_translate -of GTiff in out.tif", e);
  }
  const width = image.getWidth();
  const height = image.getHeight();
  const dir = image.fileDirectory;
  const meta: GeoTiffMeta = {
    scale: (await dir.loadValue("ModelPixelScale")) as number[] | undefined,
    tie: (await dir.loadValue("ModelTiepoint")) as number[] | undefined,
    mt: (await dir.loadValue("ModelTransformation")) as number[] | undefined,
    keys: (image.getGeoKeys() ?? {}) as Record<string, number | undefined>,
  };
  const { gt, epsg } = georeference(meta, path, label);

  // --- Band 1 → Float32Array with NaN for nodata ---
  let band: ArrayLike<number>;
  try {
    const rasters = await image.readRasters({ samples: [0], interleave: false });
    band = (rasters as unknown as ArrayLike<number>[])[0];
  } catch (e) {
    throw fail(`its pixels could not be decoded (${(e as Error).message})`, "rewrite it with gdal_translate -co COMPRESS=DEFLATE in.tif out.tif", e);
  }
  const data = sharedFloat32(band.length);
  data.set(band);
  const nodata = image.getGDALNoData();
  if (nodata !== null && !Number.isNaN(nodata)) {
    // Compare in the band's own type, as GDAL does (a float32 band stores fround(nodata)).
    const nd = band instanceof Float64Array ? nodata : Math.fround(nodata);
    for (let i = 0; i < data.length; i++) if (band[i] === nd) data[i] = NaN;
  }
  return makeRasterGrid(width, height, gt, epsg, data, path);
}

function fmtRes(r: RasterGrid): string {
  const dx = Math.abs(r.geoTransform[1]);
  return r.epsg === 4326 ? `${Number((dx * 3600).toPrecision(4))}″` : `${Number(dx.toPrecision(4))} m`;
}
