import { readSync } from "node:fs";
import { inflateSync } from "node:zlib";
import { sharedFloat32, sharedInt16 } from "./shared-grid.ts";
import { readAt, type TiffDirectory } from "./tiff-directory.ts";

/** A window of a raster in pixels (columns col0…col0+width−1, rows row0…row0+height−1). */
export interface PixelWindow {
  col0: number;
  row0: number;
  width: number;
  height: number;
  /**
   * Optional: read only columns spans[2r] … spans[2r+1]−1 (window columns) of window row r;
   * the rest of the row is not written (a zero-filled buffer keeps zeros there). For callers
   * that need only part of each row, e.g. the disc of a coverage radius in its square.
   */
  spans?: Int32Array;
  /**
   * Optional: a Float32 band whose nodata is −32768 (INT16_NODATA) keeps those samples as they
   * are instead of NaN, which saves a pass over every sample; for readers that take −32768 as
   * nodata in either type (the coverage sweeps: elevation-window.ts, Elevations)
   */
  int16NodataKept?: boolean;
}

/**
 * Told how far a window read straight from the file has come (readRowsDirect), so that other
 * threads can work on the rows already read: `started` with the window's buffer before its
 * first row is read, `rows` with the count of window rows complete (nodata marked) — every
 * 16 rows, and once at the end with all of them.
 */
export interface RowProgress {
  started(out: Float32Array | Int16Array): void;
  rows(done: number): void;
}

type SampleKind = "u16" | "i16" | "i32" | "f32";

/** How band 1 of a TIFF is stored, for the layouts readBandFloat32 decodes. */
export interface BandLayout {
  width: number;
  height: number;
  kind: SampleKind;
  littleEndian: boolean;
  deflate: boolean;
  predictor: 1 | 2 | 3;
  tiled: boolean;
  /** block (tile or strip) width and height in pixels */
  bw: number;
  bh: number;
  across: number;
  offsets: number[];
  counts: number[];
}

/**
 * The layout of band 1 when readBandFloat32 can decode it: strips or tiles; no compression
 * or Deflate (TIFF compression 8 / 32946, a zlib stream, RFC 1950); predictor 1 (none),
 * 2 (horizontal differencing, TIFF 6.0 §14) for integers or 3 (floating point, Adobe TIFF
 * Technical Note 3) for little-endian Float32; one sample per pixel of UInt16, Int16, Int32 or Float32.
 * Null for anything else (the caller then uses the general reader).
 */
export function bandLayout(dir: TiffDirectory): BandLayout | null {
  const t = dir.tags;
  const one = (tag: number, dflt?: number) => {
    const v = t.get(tag);
    return Array.isArray(v) && v.length > 0 ? v[0] : dflt;
  };
  const W = one(256);
  const H = one(257);
  const bits = (t.get(258) as number[] | undefined) ?? [1];
  const format = one(339, 1)!;
  const compression = one(259, 1)!;
  const predictor = one(317, 1)!;
  const spp = one(277, 1)!;
  if (W === undefined || H === undefined || !(W > 0 && H > 0) || spp !== 1 || bits.length !== 1) return null;
  const kind: SampleKind | null =
    bits[0] === 16 && format === 1 ? "u16" : bits[0] === 16 && format === 2 ? "i16" : bits[0] === 32 && format === 2 ? "i32" : bits[0] === 32 && format === 3 ? "f32" : null;
  if (kind === null) return null;
  const deflate = compression === 8 || compression === 32946;
  if (compression !== 1 && !deflate) return null;
  if (!(predictor === 1 || (predictor === 2 && kind !== "f32") || (predictor === 3 && kind === "f32"))) return null;
  if (predictor !== 1 && !deflate) return null;
  // Big-endian files with the floating-point predictor are read differently by GDAL 3.6 and
  // geotiff.js (which recovers the values written): left to geotiff.js, as before this reader.
  if (predictor === 3 && !dir.littleEndian) return null;
  // strips are tiles as wide as the image
  const tiled = t.has(322);
  const bw = tiled ? one(322)! : W;
  const bh = tiled ? one(323)! : Math.min(one(278, H)!, H);
  const offsets = t.get(tiled ? 324 : 273) as number[] | undefined;
  const counts = t.get(tiled ? 325 : 279) as number[] | undefined;
  if (!offsets || !counts || !(bw > 0) || !(bh > 0)) return null;
  const across = Math.ceil(W / bw);
  const down = Math.ceil(H / bh);
  if (offsets.length < across * down || counts.length < across * down) return null;
  return { width: W, height: H, kind, littleEndian: dir.littleEndian, deflate, predictor: predictor as 1 | 2 | 3, tiled, bw, bh, across, offsets, counts };
}

/** Int16 elevations mark nodata with this value (GDAL's usual Int16 nodata; SRTM voids). */
export const INT16_NODATA = -32768;

/**
 * Decode band 1 straight into a Float32Array backed by a SharedArrayBuffer (so worker
 * threads can share it without a copy), samples equal to `nodata` (compared in the band's
 * own type, as GDAL does) as NaN. Reads only the strips or tiles that intersect `window`
 * (default: the whole raster), one at a time.
 * @param fd open file descriptor
 * @param layout from bandLayout
 * @param nodata the GDAL_NODATA value, or null
 * @param window pixels to read (inside the raster)
 * @param into where to write the window (row-major, window.width × window.height; default a new array)
 * @throws Error when a block is truncated or its compressed stream is corrupt
 */
export function readBandFloat32(fd: number, layout: BandLayout, nodata: number | null, window?: PixelWindow, into?: Float32Array, progress?: RowProgress): Float32Array {
  const win = window ?? { col0: 0, row0: 0, width: layout.width, height: layout.height };
  const out = into ?? sharedFloat32(win.width * win.height);
  const kind = layout.kind;
  // Nodata in the band's own type: integers only match an integer, Float32 its rounding.
  const nd = nodata === null || Number.isNaN(nodata) || (win.int16NodataKept && kind === "f32" && nodata === INT16_NODATA) ? null : kind === "f32" ? Math.fround(nodata) : Number.isInteger(nodata) ? nodata : null;
  if (kind === "f32" && readRowsDirect(fd, layout, win, out, nd === null ? undefined : (from, to) => markNodata(out, from, to, nd), progress)) return out;
  decodeWindow(fd, layout, win, (samples, src, dst, n) => {
    if (kind === "i32") {
      // Int32 → Float32 rounds: compare with nodata before converting
      for (let c = 0; c < n; c++) {
        const v = samples[src + c];
        out[dst + c] = v === nd ? NaN : v;
      }
      return;
    }
    // 16-bit integers and Float32 convert exactly: copy the row in one native call (a loop over
    // the sample array, whose type differs by file, runs several times slower), then mark nodata.
    out.set((samples as Int16Array | Uint16Array | Float32Array).subarray(src, src + n), dst); // view() gives a typed array for every kind
    if (nd !== null) markNodata(out, dst, dst + n, nd);
  });
  return out;
}

/**
 * Decode an Int16 band 1 (layout.kind "i16") into an Int16Array backed by a SharedArrayBuffer:
 * half the memory of Float32 for the same exact values. Samples equal to `nodata` become
 * INT16_NODATA (−32768), which therefore always means nodata. As readBandFloat32 otherwise.
 * @throws Error for a band that is not Int16, a truncated block or a corrupt stream
 */
export function readBandInt16(fd: number, layout: BandLayout, nodata: number | null, window?: PixelWindow, into?: Int16Array, progress?: RowProgress): Int16Array {
  if (layout.kind !== "i16") throw new Error(`readBandInt16: the band holds ${layout.kind} samples`);
  const win = window ?? { col0: 0, row0: 0, width: layout.width, height: layout.height };
  const out = into ?? sharedInt16(win.width * win.height);
  const nd = nodata !== null && Number.isInteger(nodata) && nodata !== INT16_NODATA ? nodata : null;
  if (readRowsDirect(fd, layout, win, out, nd === null ? undefined : (from, to) => markInt16Nodata(out, from, to, nd), progress)) return out;
  decodeWindow(fd, layout, win, (samples, src, dst, n) => {
    out.set((samples as Int16Array).subarray(src, src + n), dst);
    if (nd !== null) for (let i = dst; i < dst + n; i++) if (out[i] === nd) out[i] = INT16_NODATA;
  });
  return out;
}

/**
 * Decode a Float32 band 1 (layout.kind "f32") into Int16 when every sample of the window is
 * a whole number from −32767 to 32767 or nodata (NaN, or equal to `nodata` in Float32): the
 * values readBandFloat32 gives, exactly, with nodata as INT16_NODATA, in half the memory (a
 * Float32 DEM of whole metres, as GDAL converts an Int16 one). Null as soon as a sample is
 * not; the caller then reads the band as Float32.
 * @throws Error for a band that is not Float32, a truncated block or a corrupt stream
 */
export function readBandFloat32AsInt16(fd: number, layout: BandLayout, nodata: number | null, window?: PixelWindow): Int16Array | null {
  if (layout.kind !== "f32") throw new Error(`readBandFloat32AsInt16: the band holds ${layout.kind} samples`);
  const win = window ?? { col0: 0, row0: 0, width: layout.width, height: layout.height };
  const nd = nodata === null || Number.isNaN(nodata) ? NaN : Math.fround(nodata);
  const notWhole = new Error("not whole metres");
  // allocated once the first piece has been found whole: a band of fractional metres usually
  // tells at its first samples, and then no window of Int16 is made (and no page of it written)
  let out: Int16Array | null = null;
  try {
    decodeWindow(fd, layout, win, (samples, src, dst, n) => {
      if (out === null) {
        if (!wholeToInt16(samples as Float32Array, src, new Int16Array(n), 0, n, nd)) throw notWhole;
        out = sharedInt16(win.width * win.height);
      }
      if (!wholeToInt16(samples as Float32Array, src, out, dst, n, nd)) throw notWhole;
    });
  } catch (e) {
    if (e === notWhole) return null;
    throw e;
  }
  return out ?? sharedInt16(win.width * win.height);
}

/** Copy n Float32 samples to Int16 (NaN and `nd` as INT16_NODATA); false at the first sample that is not a whole number from −32767 to 32767. */
function wholeToInt16(samples: Float32Array, src: number, out: Int16Array, dst: number, n: number, nd: number): boolean {
  for (let c = 0; c < n; c++) {
    const v = samples[src + c];
    const i = v | 0; // NaN → 0, which differs from it
    // one test for the common sample: whole, from −32767 to 32767, not nodata
    if (i === v && (i + 32767) >>> 0 <= 65534 && v !== nd) out[dst + c] = i;
    else if (v !== v || v === nd) out[dst + c] = INT16_NODATA;
    else return false;
  }
  return true;
}

/**
 * Whether a band's rows can be read in pieces straight from the file, each piece one read of
 * its bytes as they are stored: uncompressed strips, no predictor, this machine's byte order.
 */
export function rowPiecesReadable(layout: BandLayout): boolean {
  return !layout.tiled && !layout.deflate && layout.predictor === 1 && layout.littleEndian === LITTLE_ENDIAN_HOST;
}

/**
 * Read samples col0 … col0 + into.length / (sample bytes) of one row of a rowPiecesReadable
 * band into `into` (its bytes as stored).
 * @throws Error when the file ends before the piece does (a truncated file)
 */
export function readRowPiece(fd: number, layout: BandLayout, row: number, col0: number, into: Uint8Array, bps: number): void {
  const strip = Math.floor(row / layout.bh);
  const at = layout.offsets[strip] + ((row - strip * layout.bh) * layout.width + col0) * bps;
  const got = readInto(fd, into, at);
  if (got < into.length) throw new Error(`row ${row} is cut short (${got} of ${into.length} bytes)`);
}

/**
 * Read a window of a rowPiecesReadable band whose samples are stored as `out` holds them
 * (Int16 into an Int16Array, Float32 into a Float32Array) with one read per window row straight
 * from the file into `out`: no block buffer and no copy of it (on a SharedArrayBuffer that copy
 * is a slow element-wise move). False, reading nothing, for any other layout (decodeWindow then
 * reads it).
 * @param onRow called with the samples just read, out[from…to) (while they are in the cache)
 * @param progress told of the rows read (see RowProgress)
 * @throws Error when a strip is shorter than its rows
 */
function readRowsDirect(fd: number, layout: BandLayout, win: PixelWindow, out: Int16Array | Float32Array, onRow?: (from: number, to: number) => void, progress?: RowProgress): boolean {
  const bps = out.BYTES_PER_ELEMENT;
  const kind = out instanceof Int16Array ? "i16" : "f32";
  if (layout.kind !== kind || !rowPiecesReadable(layout)) return false;
  progress?.started(out);
  const bytes = new Uint8Array(out.buffer, out.byteOffset, out.byteLength);
  const { width: W, bh, counts } = layout;
  for (let r = 0; r < win.height; r++) {
    const row = win.row0 + r;
    const a = win.spans ? win.spans[2 * r] : 0;
    const b = win.spans ? win.spans[2 * r + 1] : win.width;
    if (b <= a) continue;
    const strip = Math.floor(row / bh);
    const at = ((row - strip * bh) * W + win.col0 + a) * bps; // within the strip
    if (at + (b - a) * bps > counts[strip]) throw new Error(`block ${strip} holds ${counts[strip]} bytes, expected at least ${at + (b - a) * bps}`);
    readRowPiece(fd, layout, row, win.col0 + a, bytes.subarray((r * win.width + a) * bps, (r * win.width + b) * bps), bps);
    onRow?.(r * win.width + a, r * win.width + b);
    if ((r & 15) === 15) progress?.rows(r + 1);
  }
  progress?.rows(win.height);
  return true;
}

/** Replace every value equal to `nd` in out[from…to) by INT16_NODATA. */
function markInt16Nodata(out: Int16Array, from: number, to: number, nd: number): void {
  for (let i = from; i < to; i++) if (out[i] === nd) out[i] = INT16_NODATA;
}

const LITTLE_ENDIAN_HOST = new Uint8Array(Uint16Array.of(1).buffer)[0] === 1;

/** Copies n samples of one row of a decoded block, from samples[src…] to the window at dst. */
type CopyRow = (samples: ArrayLike<number>, src: number, dst: number, n: number) => void;

/** Read and decode every block that intersects `win`, handing each row's part of the window to `copyRow`. */
function decodeWindow(fd: number, layout: BandLayout, win: PixelWindow, copyRow: CopyRow): void {
  const { width: W, height: H, kind, deflate, predictor, tiled, bw, bh, across, offsets, counts } = layout;
  const bps = kind === "u16" || kind === "i16" ? 2 : 4;
  const scratch = new ArrayBuffer(bw * bh * bps);
  const by0 = Math.floor(win.row0 / bh);
  const by1 = Math.floor((win.row0 + win.height - 1) / bh);
  const bx0 = Math.floor(win.col0 / bw);
  const bx1 = Math.floor((win.col0 + win.width - 1) / bw);
  for (let by = by0; by <= by1; by++) {
    // strips: the last one holds only the rows left
    const rowsInBlock = tiled ? bh : Math.min(bh, H - by * bh);
    for (let bx = bx0; bx <= bx1; bx++) {
      const b = by * across + bx;
      const need = bw * rowsInBlock * bps;
      const bytes = new Uint8Array(scratch, 0, need);
      if (deflate) {
        const inflated = inflateSync(readAt(fd, offsets[b], counts[b]));
        if (inflated.length < need) throw new Error(`block ${b} decompresses to ${inflated.length} bytes, expected ${need}`);
        bytes.set(inflated.subarray(0, need));
      } else {
        const got = readInto(fd, bytes, offsets[b]);
        if (got < need) throw new Error(`block ${b} holds ${got} bytes, expected ${need}`);
      }
      if (predictor === 3) floatPredictor(bytes, bw, rowsInBlock);
      else if (!layout.littleEndian) swapBytes(bytes, bps);
      const samples = view(kind, scratch, bw * rowsInBlock, predictor === 3);
      if (predictor === 2) horizontalPredictor(samples as Int16Array | Uint16Array | Int32Array, bw, rowsInBlock);
      // --- the block's part of the window ---
      const r0 = Math.max(win.row0, by * bh);
      const r1 = Math.min(win.row0 + win.height, by * bh + rowsInBlock, H);
      const c0 = Math.max(win.col0, bx * bw);
      const c1 = Math.min(win.col0 + win.width, bx * bw + bw, W);
      for (let r = r0; r < r1; r++) {
        let a = c0;
        let b = c1;
        if (win.spans) {
          a = Math.max(a, win.col0 + win.spans[2 * (r - win.row0)]);
          b = Math.min(b, win.col0 + win.spans[2 * (r - win.row0) + 1]);
          if (b <= a) continue;
        }
        copyRow(samples, (r - by * bh) * bw - bx * bw + a, (r - win.row0) * win.width - win.col0 + a, b - a);
      }
    }
  }
}

/** Replace every value equal to `nd` in out[from…to) by NaN. */
function markNodata(out: Float32Array, from: number, to: number, nd: number): void {
  for (let i = from; i < to; i++) if (out[i] === nd) out[i] = NaN;
}

/** Fill `into` from the file at `offset`; returns the bytes read (fewer at the end of the file). */
function readInto(fd: number, into: Uint8Array, offset: number): number {
  let got = 0;
  while (got < into.length) {
    const r = readSync(fd, into, got, into.length - got, offset + got);
    if (r === 0) break;
    got += r;
  }
  return got;
}

function view(kind: SampleKind, buf: ArrayBuffer, n: number, bigEndianFloat: boolean): ArrayLike<number> {
  if (kind === "f32" && bigEndianFloat) {
    // the floating-point predictor leaves big-endian words: read them through a DataView
    const dv = new DataView(buf);
    const f = new Float32Array(n);
    for (let i = 0; i < n; i++) f[i] = dv.getFloat32(4 * i, false);
    return f;
  }
  switch (kind) {
    case "u16":
      return new Uint16Array(buf, 0, n);
    case "i16":
      return new Int16Array(buf, 0, n);
    case "i32":
      return new Int32Array(buf, 0, n);
    default:
      return new Float32Array(buf, 0, n);
  }
}

/** File (big-endian) byte order → this machine's (little-endian) for words of `size` bytes. */
function swapBytes(b: Uint8Array, size: number): void {
  if (size === 2) Buffer.from(b.buffer, b.byteOffset, b.byteLength).swap16();
  else if (size === 4) Buffer.from(b.buffer, b.byteOffset, b.byteLength).swap32();
}

/** Undo horizontal differencing (TIFF 6.0 §14, predictor 2): each sample adds its left neighbour, per row, in the sample's type. */
function horizontalPredictor(s: Int16Array | Uint16Array | Int32Array, w: number, h: number): void {
  for (let r = 0; r < h; r++) {
    const o = r * w;
    for (let c = 1; c < w; c++) s[o + c] += s[o + c - 1];
  }
}

/**
 * Undo the floating-point predictor (Adobe TIFF Technical Note 3, predictor 3): per row, bytes
 * were split into planes (most significant first) and differenced; accumulate the bytes, then
 * gather each word's bytes back from the planes, leaving big-endian words in place.
 */
function floatPredictor(b: Uint8Array, w: number, h: number): void {
  const rowBytes = 4 * w;
  const tmp = new Uint8Array(rowBytes);
  for (let r = 0; r < h; r++) {
    const o = r * rowBytes;
    for (let i = 1; i < rowBytes; i++) b[o + i] = (b[o + i] + b[o + i - 1]) & 0xff;
    tmp.set(b.subarray(o, o + rowBytes));
    for (let c = 0; c < w; c++) {
      b[o + 4 * c] = tmp[c];
      b[o + 4 * c + 1] = tmp[w + c];
      b[o + 4 * c + 2] = tmp[2 * w + c];
      b[o + 4 * c + 3] = tmp[3 * w + c];
    }
  }
}

/** A band the fast reader decodes, as plain data (it is sent to worker threads). */
export interface TiffBandSource {
  path: string;
  layout: BandLayout;
  nodata: number | null;
}

/**
 * One share of a window decoded by several threads at once: the window is cut into bands of
 * whole block rows (strips or tile rows), and each thread takes the next band from a shared
 * counter (`ctrl[0]`), decodes it into `out` and counts it done (`ctrl[1]`, notified). Every
 * thread that calls this returns when no band is left to take; `waitForBands` then waits for
 * the bands others are still decoding.
 * @param out the window's elevations (Float32, or Int16 for an Int16 band, on a SharedArrayBuffer, window.width × window.height)
 * @param ctrl Int32Array(3) on a SharedArrayBuffer, zeroed before the first call: next band,
 *   bands done, 1 when a band failed
 */
export function decodeBands(fd: number, src: TiffBandSource, window: PixelWindow, out: Float32Array | Int16Array, ctrl: Int32Array): void {
  const n = bandCount(src.layout, window);
  const bh = src.layout.bh;
  for (;;) {
    const k = Atomics.add(ctrl, 0, 1);
    if (k >= n) return;
    const first = Math.floor(window.row0 / bh);
    const r0 = Math.max(window.row0, (first + k) * bh);
    const r1 = Math.min(window.row0 + window.height, (first + k + 1) * bh);
    const w = { col0: window.col0, row0: r0, width: window.width, height: r1 - r0, ...(window.spans ? { spans: window.spans.subarray(2 * (r0 - window.row0), 2 * (r1 - window.row0)) } : {}) };
    const at = (r0 - window.row0) * window.width;
    try {
      if (out instanceof Int16Array) readBandInt16(fd, src.layout, src.nodata, w, out.subarray(at, at + w.width * w.height));
      else readBandFloat32(fd, src.layout, src.nodata, w, out.subarray(at, at + w.width * w.height));
    } catch {
      out.fill(out instanceof Int16Array ? INT16_NODATA : NaN, at, at + w.width * w.height);
      Atomics.store(ctrl, 2, 1); // failed: the caller reports it
    }
    Atomics.add(ctrl, 1, 1);
    Atomics.notify(ctrl, 1);
  }
}

/** Block-row bands of a window (see decodeBands). */
export function bandCount(layout: BandLayout, window: PixelWindow): number {
  return Math.floor((window.row0 + window.height - 1) / layout.bh) - Math.floor(window.row0 / layout.bh) + 1;
}

/** Block until every band of the window is decoded; false when one failed. */
export function waitForBands(src: TiffBandSource, window: PixelWindow, ctrl: Int32Array): boolean {
  const n = bandCount(src.layout, window);
  for (;;) {
    const done = Atomics.load(ctrl, 1);
    if (done >= n) break;
    Atomics.wait(ctrl, 1, done, 1000);
  }
  return Atomics.load(ctrl, 2) === 0;
}
