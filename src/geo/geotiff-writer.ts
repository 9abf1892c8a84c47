import { closeSync, openSync, renameSync, rmSync, unlinkSync, writeSync } from "node:fs";
import { deflateSync } from "node:zlib";

/** What to write: one band, north-up, in EPSG:4326 or a projected EPSG CRS (UTM). */
export interface GeoTiffRaster {
  width: number;
  height: number;
  /** samples, row-major from the north-west corner */
  data: Float32Array | Uint8Array | Int16Array;
  /** GDAL-style [x0, dx, 0, y0, 0, dy] with dy < 0, pixel-corner origin */
  geoTransform: readonly [number, number, number, number, number, number];
  epsg: number;
  /** value marking "no data" (written as the GDAL_NODATA tag) */
  nodata: number;
  /** band description and unit (GDAL metadata), e.g. "received level", "dBm" */
  description?: string;
  unit?: string;
  /** "deflate" (zlib, Adobe Deflate) or "none" (default) */
  compression?: "none" | "deflate";
  /**
   * Completes each strip before it is written, in a copy (`data` is left as it is): `strip`
   * holds rows row0 … row1 − 1 (strip[0] is row0's first sample)
   */
  fillStrip?: (strip: Uint8Array, row0: number, row1: number) => void;
}

// TIFF 6.0 field types
const SHORT = 3;
const LONG = 4;
const ASCII = 2;
const DOUBLE = 12;

/**
 * Write a single-band GeoTIFF, little-endian classic TIFF (TIFF 6.0; GeoTIFF 1.1 / OGC
 * 19-008r4 keys), strip-organised, uncompressed or Deflate, streamed from the array (no copy of
 * an uncompressed raster is made). Georeferencing: ModelPixelScale + ModelTiepoint, PixelIsArea,
 * the EPSG code as GeographicTypeGeoKey (4326) or ProjectedCSTypeGeoKey; GDAL_NODATA and
 * GDAL_METADATA (description, unit) as GDAL writes them. Checked by reading the files back
 * with gdalinfo and gdallocationinfo (test/coverage/geotiff-writer.test.ts).
 * The file is written beside the target and renamed into place when complete, so a failure
 * never leaves a half-written raster under the final name, and a file already there stays
 * until the new one is complete.
 * @param path output file
 */
export function writeGeoTiff(path: string, r: GeoTiffRaster): void {
  const { width: W, height: H, data } = r;
  if (data.length !== W * H) throw new RangeError(`raster data has ${data.length} samples for ${W}×${H}`);
  const bps = data instanceof Float32Array ? 32 : data instanceof Int16Array ? 16 : 8;
  const sampleFormat = data instanceof Float32Array ? 3 : data instanceof Int16Array ? 2 : 1;
  const rowBytes = W * (bps / 8);
  const rowsPerStrip = Math.max(1, Math.min(H, Math.floor((1 << 20) / rowBytes)));
  const nStrips = Math.ceil(H / rowsPerStrip);
  const bytes = new Uint8Array(data.buffer, data.byteOffset, data.byteLength);
  const deflate = r.compression === "deflate";
  if (r.fillStrip && bps !== 8) throw new RangeError("fillStrip is for rasters of bytes");
  const scratch = r.fillStrip ? new Uint8Array(rowsPerStrip * rowBytes) : null; // one strip, reused
  const tmp = `${path}.partial-${process.pid}`;
  const fd = openSync(tmp, "w");
  try {
    let pos = 8;
    const offsets: number[] = [];
    const counts: number[] = [];
    writeSync(fd, new Uint8Array(8), 0, 8, 0); // header placeholder
    for (let s = 0; s < nStrips; s++) {
      const a = s * rowsPerStrip * rowBytes;
      const b = Math.min(H, (s + 1) * rowsPerStrip) * rowBytes;
      let strip = bytes.subarray(a, b);
      if (scratch) {
        strip = scratch.subarray(0, b - a);
        strip.set(bytes.subarray(a, b));
        r.fillStrip!(strip, s * rowsPerStrip, Math.min(H, (s + 1) * rowsPerStrip));
      }
      const chunk = deflate ? deflateSync(strip, { level: 6 }) : strip;
      offsets.push(pos);
      counts.push(chunk.byteLength);
      writeAll(fd, chunk, pos);
      pos += chunk.byteLength;
    }
    if (pos % 2) pos += 1; // IFD on a word boundary
    const { ifd, ifdOffset } = buildIfd(r, { bps, sampleFormat, rowsPerStrip, offsets, counts, compression: deflate ? 8 : 1 }, pos);
    writeAll(fd, ifd, pos);
    const header = new DataView(new ArrayBuffer(8));
    header.setUint8(0, 0x49); // "II" little-endian
    header.setUint8(1, 0x49);
    header.setUint16(2, 42, true);
    header.setUint32(4, ifdOffset, true);
    writeAll(fd, new Uint8Array(header.buffer), 0);
  } catch (e) {
    closeSync(fd);
    rmSync(tmp, { force: true });
    throw e;
  }
  closeSync(fd);
  // An existing file is removed first and the complete one renamed in. Renamed over it
  // instead, ext4 starts writing the new file to disk at once (its auto_da_alloc, against
  // empty files after a crash), and the next replacement of that file waits for that write:
  // 24–38 ms for a 44 MB raster on this project's machine, against 3 ms this way. The old
  // file stays until the new one is complete; for an instant no file is at `path`.
  try {
    unlinkSync(path);
  } catch (e) {
    if ((e as NodeJS.ErrnoException).code !== "ENOENT") {
      rmSync(tmp, { force: true });
      throw e;
    }
  }
  renameSync(tmp, path);
}

function writeAll(fd: number, buf: Uint8Array, position: number): void {
  let done = 0;
  while (done < buf.byteLength) done += writeSync(fd, buf, done, Math.min(buf.byteLength - done, 1 << 26), position + done);
}

interface Layout {
  bps: number;
  sampleFormat: number;
  rowsPerStrip: number;
  offsets: number[];
  counts: number[];
  compression: number;
}

/** The IFD and its out-of-line values, placed at file offset `at`. */
function buildIfd(r: GeoTiffRaster, L: Layout, at: number): { ifd: Uint8Array; ifdOffset: number } {
  const geographic = r.epsg === 4326;
  const geoKeys = geographic
    ? [
        [1024, 0, 1, 2], // GTModelTypeGeoKey = ModelTypeGeographic
        [1025, 0, 1, 1], // GTRasterTypeGeoKey = RasterPixelIsArea
        [2048, 0, 1, 4326], // GeographicTypeGeoKey
        [2054, 0, 1, 9102], // GeogAngularUnitsGeoKey = degree
      ]
    : [
        [1024, 0, 1, 1], // ModelTypeProjected
        [1025, 0, 1, 1],
        [3072, 0, 1, r.epsg], // ProjectedCSTypeGeoKey
        [3076, 0, 1, 9001], // ProjLinearUnitsGeoKey = metre
      ];
  const keyDir = [1, 1, 0, geoKeys.length, ...geoKeys.flat()];
  const [x0, dx, , y0, , dy] = r.geoTransform;
  const meta =
    r.description || r.unit
      ? `<GDALMetadata>${r.description ? `<Item name="DESCRIPTION" sample="0" role="description">${xml(r.description)}</Item>` : ""}${r.unit ? `<Item name="UNITTYPE" sample="0" role="unittype">${xml(r.unit)}</Item>` : ""}</GDALMetadata>`
      : null;
  type Entry = { tag: number; type: number; values: number[] | string };
  const entries: Entry[] = [
    { tag: 256, type: LONG, values: [r.width] },
    { tag: 257, type: LONG, values: [r.height] },
    { tag: 258, type: SHORT, values: [L.bps] },
    { tag: 259, type: SHORT, values: [L.compression] },
    { tag: 262, type: SHORT, values: [1] }, // BlackIsZero
    { tag: 273, type: LONG, values: L.offsets },
    { tag: 277, type: SHORT, values: [1] },
    { tag: 278, type: LONG, values: [L.rowsPerStrip] },
    { tag: 279, type: LONG, values: L.counts },
    { tag: 284, type: SHORT, values: [1] }, // chunky
    { tag: 339, type: SHORT, values: [L.sampleFormat] },
    { tag: 33550, type: DOUBLE, values: [dx, -dy, 0] }, // ModelPixelScaleTag
    { tag: 33922, type: DOUBLE, values: [0, 0, 0, x0, y0, 0] }, // ModelTiepointTag
    { tag: 34735, type: SHORT, values: keyDir }, // GeoKeyDirectoryTag
    ...(meta ? [{ tag: 42112, type: ASCII, values: meta }] : []), // GDAL_METADATA
    { tag: 42113, type: ASCII, values: fmtNodata(r.nodata) }, // GDAL_NODATA
  ];
  const size = (e: Entry) => (typeof e.values === "string" ? e.values.length + 1 : e.values.length * (e.type === DOUBLE ? 8 : e.type === LONG ? 4 : 2));
  const ifdSize = 2 + entries.length * 12 + 4;
  let extra = 0;
  for (const e of entries) if (size(e) > 4) extra += size(e) + (size(e) % 2);
  const buf = new DataView(new ArrayBuffer(ifdSize + extra));
  buf.setUint16(0, entries.length, true);
  let ext = ifdSize; // relative position of the next out-of-line value
  entries.forEach((e, i) => {
    const p = 2 + i * 12;
    const n = size(e);
    buf.setUint16(p, e.tag, true);
    buf.setUint16(p + 2, e.type, true);
    buf.setUint32(p + 4, typeof e.values === "string" ? e.values.length + 1 : e.values.length, true);
    const target = n > 4 ? ext : p + 8;
    if (n > 4) {
      buf.setUint32(p + 8, at + ext, true);
      ext += n + (n % 2);
    }
    if (typeof e.values === "string") {
      for (let k = 0; k < e.values.length; k++) buf.setUint8(target + k, e.values.charCodeAt(k) & 0x7f);
      buf.setUint8(target + e.values.length, 0);
    } else {
      e.values.forEach((v, k) => {
        if (e.type === DOUBLE) buf.setFloat64(target + 8 * k, v, true);
        else if (e.type === LONG) buf.setUint32(target + 4 * k, v, true);
        else buf.setUint16(target + 2 * k, v, true);
      });
    }
  });
  buf.setUint32(2 + entries.length * 12, 0, true); // no next IFD
  return { ifd: new Uint8Array(buf.buffer), ifdOffset: at };
}

function fmtNodata(v: number): string {
  return Number.isNaN(v) ? "nan" : String(v);
}

function xml(s: string): string {
  return s.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;");
}
