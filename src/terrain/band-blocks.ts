import { bilinearGrid } from "./bilinear-grid.ts";
import { LruCache } from "./lru-cache.ts";
import { readRowPiece, rowPiecesReadable, type BandLayout, type PixelWindow } from "./tiff-band-reader.ts";

/** Rows (about) of a block of a compressed striped band: blocks are whole strips as wide as the image. */
const STRIP_BLOCK_ROWS = 16;
/** Side of a block of an uncompressed striped band, whose rows are read in pieces (readStripSegments). */
const SEGMENT_BLOCK = 128;

/**
 * Band 1 of a GeoTIFF read on demand in blocks, for single elevations and profiles over a DEM
 * too large to decode whole beside a coverage grid: each block is decoded (Float32, NaN
 * nodata, as readBandFloat32) when a pixel in it is first read, and the most recently used
 * blocks are kept within a byte budget. Blocks follow the file's own: a tile, or a band of
 * whole strips of about STRIP_BLOCK_ROWS rows (a strip is read whole whatever part of it is
 * needed) — or, for uncompressed strips in this machine's byte order, squares of
 * SEGMENT_BLOCK pixels whose rows are read on their own (a profile across a 10 000-pixel-wide
 * DEM then reads a few hundred kB, not every strip it crosses whole). Interpolation gives
 * bilinearGrid's value over the whole band, bit for bit.
 */
export class BandBlocks {
  private readonly blockW: number;
  private readonly blockH: number;
  private readonly across: number;
  private readonly capacity: number;
  private blocks: LruCache<number, Float32Array>;
  /** the last block read (most points of a profile or a relief row fall in the same one) */
  private lastIndex = -1;
  /** pixels read so far, blocks read again included */
  loadedPixels = 0;
  private last: Float32Array | null = null;
  private readonly quad = new Float64Array(4);

  /**
   * @param layout the band's layout (bandLayout)
   * @param read decodes a window of the band (Float32, NaN nodata: readBandFloat32's values)
   * @param maxBytes decoded blocks kept at most (at least one block is kept)
   */
  constructor(
    private readonly layout: BandLayout,
    private readonly read: (window: PixelWindow) => Float32Array,
    maxBytes: number,
  ) {
    const squares = rowPiecesReadable(layout);
    this.blockW = layout.tiled ? layout.bw : squares ? SEGMENT_BLOCK : layout.width;
    this.blockH = layout.tiled ? layout.bh : squares ? SEGMENT_BLOCK : layout.bh * Math.max(1, Math.ceil(STRIP_BLOCK_ROWS / layout.bh));
    this.across = Math.ceil(layout.width / this.blockW);
    this.capacity = Math.max(1, Math.floor(maxBytes / (4 * this.blockW * this.blockH)));
    this.blocks = new LruCache(this.capacity);
  }

  /** Let every kept block go (read again when needed). */
  clear(): void {
    this.blocks = new LruCache(this.capacity);
    this.lastIndex = -1;
    this.last = null;
  }

  /** The sample at (col, row) of the band (inside it), NaN for nodata. */
  pixel(col: number, row: number): number {
    const bx = Math.floor(col / this.blockW);
    const by = Math.floor(row / this.blockH);
    const i = by * this.across + bx;
    const block = i === this.lastIndex ? this.last! : this.block(i, bx, by);
    const w = Math.min(this.blockW, this.layout.width - bx * this.blockW);
    return block[(row - by * this.blockH) * w + (col - bx * this.blockW)];
  }

  /**
   * Bilinear elevation at pixel-centre coordinates (col, row), as bilinearGrid over the whole
   * band gives it: the same four samples and weights, read through the blocks.
   */
  bilinear(col: number, row: number): number {
    const { width: W, height: H } = this.layout;
    if (!(col >= -0.5 && col <= W - 0.5 && row >= -0.5 && row <= H - 0.5)) return NaN;
    if (W < 2 || H < 2) return NaN; // not a DEM; callers read such a band whole
    // bilinearGrid's clamping and choice of the four samples
    const c = col < 0 ? 0 : col > W - 1 ? W - 1 : col;
    const r = row < 0 ? 0 : row > H - 1 ? H - 1 : row;
    let c0 = Math.floor(c);
    let r0 = Math.floor(r);
    if (c0 > W - 2) c0 = W - 2;
    if (r0 > H - 2) r0 = H - 2;
    const q = this.quad;
    q[0] = this.pixel(c0, r0);
    q[1] = this.pixel(c0 + 1, r0);
    q[2] = this.pixel(c0, r0 + 1);
    q[3] = this.pixel(c0 + 1, r0 + 1);
    // on a 2 × 2 grid, (c − c0, r − r0) selects the same samples with the same weights
    return bilinearGrid(q, 2, 2, c - c0, r - r0);
  }

  private block(i: number, bx: number, by: number): Float32Array {
    let b = this.blocks.get(i);
    if (!b) {
      const { width: W, height: H } = this.layout;
      const col0 = bx * this.blockW;
      const row0 = by * this.blockH;
      const window = { col0, row0, width: Math.min(this.blockW, W - col0), height: Math.min(this.blockH, H - row0) };
      b = this.read(window);
      this.loadedPixels += b.length;
      this.blocks.set(i, b);
    }
    this.lastIndex = i;
    this.last = b;
    return b;
  }
}

/**
 * A window of an uncompressed striped band (rowPiecesReadable) read row by row, each row's
 * part of the window on its own (one read of width × sample bytes): the values
 * readBandFloat32 gives (Float32, samples equal to `nodata` in the band's own type as NaN).
 * @throws Error when a row is cut short (a truncated file)
 */
export function readStripSegments(fd: number, layout: BandLayout, nodata: number | null, w: PixelWindow): Float32Array {
  const { kind } = layout;
  const bps = kind === "u16" || kind === "i16" ? 2 : 4;
  const out = new Float32Array(w.width * w.height);
  const raw = new ArrayBuffer(w.width * bps);
  const bytes = new Uint8Array(raw);
  const samples = kind === "u16" ? new Uint16Array(raw) : kind === "i16" ? new Int16Array(raw) : kind === "i32" ? new Int32Array(raw) : new Float32Array(raw);
  // nodata in the band's own type, as readBandFloat32 compares it
  const nd = nodata === null || Number.isNaN(nodata) ? null : kind === "f32" ? Math.fround(nodata) : Number.isInteger(nodata) ? nodata : null;
  for (let r = 0; r < w.height; r++) {
    readRowPiece(fd, layout, w.row0 + r, w.col0, bytes, bps);
    const o = r * w.width;
    for (let c = 0; c < w.width; c++) {
      const v = samples[c];
      out[o + c] = v === nd ? NaN : v;
    }
  }
  return out;
}
