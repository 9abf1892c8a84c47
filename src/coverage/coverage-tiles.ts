import { createHash } from "node:crypto";
import { decodeEntry, encodeEntry } from "../cache/entry-codec.ts";
import { LEVEL_NODATA, PROBABILITY_NODATA, VISIBILITY_NODATA, type CoverageJob } from "./coverage-job.ts";
import { coverageUnits } from "./coverage-kernel.ts";
import { chunkSize, runInThisThread, type CoveragePool, type CoverageProgress } from "./coverage-pool.ts";
import { mergeTallies, type TallyData } from "./coverage-tally.ts";
import { faceAxes, siteMetric } from "./radial-sweep.ts";

/**
 * Cells (inside the radius, about) per coverage tile: a few seconds of computation on two
 * cores, so that a tile sent to a queue worker costs little beside its computation, and a
 * 150 km map at 30 m (≈ 80 M cells inside the radius) is cut into about 20.
 */
export const TILE_CELLS = 4_000_000;

/** Fewest tiles of a map (so that two workers share even a small one), and most (a map is computed in 96 chunks). */
export const MIN_TILES = 2;
export const MAX_TILES = 96;

/**
 * A coverage map is computed in tiles: blocks of consecutive radials (rows for Hata), each
 * whole — a radial's incremental sweep never spans two tiles, so a tile's cells are exactly
 * those of the whole map. A tile holds the box of the grid its radials can reach, with its
 * own cells' values and nodata elsewhere, and the tally of its cells; tiles are cached
 * (entry kind "coverage-tile") and are the tasks of the job queue. The map's tally is the sum
 * of its tiles' tallies in tile order, each the sum of its chunks' in chunk order: the same
 * floating-point sums whether tiles are computed here, read from the cache or sent by a worker.
 */
export interface CoverageTile {
  index: number;
  count: number;
  /** units (radials, or rows for Hata) from…to−1 */
  from: number;
  to: number;
  /** box of the grid (columns, rows) holding every cell of the tile */
  col0: number;
  row0: number;
  width: number;
  height: number;
  /**
   * The tile's cells that hold a value, in runs along the box's rows: pairs (row-major index
   * in the grid, length); the values of the runs one after the other. Only the cells a tile
   * computed travel and are stored — about 4 (level) or 1 (visibility) bytes a cell — not its
   * whole box.
   */
  runs: Int32Array;
  values: Float32Array | Uint8Array;
  /** P.1812: the location probabilities of the same runs; null otherwise */
  probability: Float32Array | null;
  tally: TallyData;
}

/** Where a map's computed tiles are kept and found (the result cache, under the map's key). */
export interface CoverageTileStore {
  get(index: number, count: number): Promise<Uint8Array | undefined>;
  put(index: number, count: number, bytes: Uint8Array): void;
}

/** Tiles of a coverage of this radius and resolution (m): from the request alone, so a queue coordinator plans them without the terrain. */
export function coverageTileCount(radius_m: number, resolution_m: number): number {
  const cells = Math.PI * (radius_m / resolution_m) ** 2;
  return Math.min(MAX_TILES, Math.max(MIN_TILES, Math.ceil(cells / TILE_CELLS) || MIN_TILES));
}

/** Cache key of tile `index` of `count` of the coverage map with this key. */
export function coverageTileKey(mapKey: string, index: number, count: number): string {
  return createHash("sha256").update(`coverage-tile\0${mapKey}\0${index}\0${count}`).digest("hex");
}

/** Units from…to−1 of tile `index` of `count`: whole chunks of the map's computation (coverage-pool.ts chunkSize). */
export function tileUnits(job: CoverageJob, index: number, count: number): [number, number] {
  const total = coverageUnits(job);
  const chunk = chunkSize(total);
  const chunks = Math.ceil(total / chunk);
  const c0 = Math.floor((index * chunks) / count);
  const c1 = Math.floor(((index + 1) * chunks) / count);
  return [Math.min(total, c0 * chunk), Math.min(total, c1 * chunk)];
}

/**
 * The box of grid cells that units from…to−1 can own: Hata rows whole; for radials, per face
 * of the sweep (radial-sweep.ts), the wedge between its first and last radial's ownership
 * bounds from the site to the radius plus the sweep's margin, widened by a cell on each side.
 * The bounding box of tileFaceBoxes.
 */
export function tileBox(job: CoverageJob, from: number, to: number): Box {
  return boundingBox(tileFaceBoxes(job, from, to));
}

/**
 * The boxes whose union holds every cell units from…to−1 can own: one per face of the sweep
 * the units reach (each with the site's cell), or Hata's rows. A tile that ends one face and
 * starts the next owns two wedges far apart (a 150 km map's tiles 4 and 14 span the whole grid
 * together, 381 MB of Float32, but about 150 MB apart).
 */
export function tileFaceBoxes(job: CoverageJob, from: number, to: number): Box[] {
  const W = job.width;
  const H = job.height;
  if (to <= from) return [];
  if (job.method === "hata") return [{ col0: 0, row0: from, width: W, height: to - from }];
  const rc = job.rc;
  const perFace = 2 * rc + 1;
  let minStep = Infinity;
  for (let r = 0; r < H; r++) minStep = Math.min(minStep, Math.abs(job.east_per_col_m[r]), Math.abs(job.north_per_row_m[r]));
  const { margin } = siteMetric(job);
  const boxes: Box[] = [];
  let c0 = Infinity;
  let c1 = -Infinity;
  let r0 = Infinity;
  let r1 = -Infinity;
  const add = (col: number, row: number) => {
    c0 = Math.min(c0, col);
    c1 = Math.max(c1, col);
    r0 = Math.min(r0, row);
    r1 = Math.max(r1, row);
  };
  const start = () => {
    c0 = r0 = Infinity;
    c1 = r1 = -Infinity;
    add(Math.floor(job.site_col), Math.floor(job.site_row));
    add(Math.ceil(job.site_col), Math.ceil(job.site_row));
  };
  const close = () => {
    const col0 = Math.max(0, c0);
    const row0 = Math.max(0, r0);
    boxes.push({ col0, row0, width: Math.max(0, Math.min(W - 1, c1) - col0 + 1), height: Math.max(0, Math.min(H - 1, r1) - row0 + 1) });
  };
  for (let face = Math.floor(from / perFace); face * perFace < to; face++) {
    const tA = Math.max(from, face * perFace) - face * perFace - rc;
    const tB = Math.min(to, (face + 1) * perFace) - 1 - face * perFace - rc;
    if (tB < tA) continue;
    const ax = faceAxes(job, face);
    const daMax = Math.min(ax.mMax + 1, Math.ceil((job.radius_m + 2 * margin) / minStep) + 2);
    const sLo = (tA - 0.5) / rc;
    const sHi = (tB + 0.5) / rc;
    const bLo = Math.floor(ax.bs + Math.min(0, daMax * sLo)) - 1;
    const bHi = Math.ceil(ax.bs + Math.max(0, daMax * sHi)) + 1;
    const aLo = Math.floor(ax.sgn > 0 ? ax.as : ax.as - daMax) - 1;
    const aHi = Math.ceil(ax.sgn > 0 ? ax.as + daMax : ax.as) + 1;
    start();
    if (ax.xMajor) (add(aLo, bLo), add(aHi, bHi));
    else (add(bLo, aLo), add(bHi, aHi));
    close();
  }
  if (boxes.length === 0) (start(), close()); // the site's cells alone
  return boxes;
}

type Box = { col0: number; row0: number; width: number; height: number };

/** The smallest box holding every box (empty boxes count too, as in tileBox before). */
function boundingBox(boxes: Box[]): Box {
  if (boxes.length === 0) return { col0: 0, row0: 0, width: 0, height: 0 };
  const col0 = Math.min(...boxes.map((b) => b.col0));
  const row0 = Math.min(...boxes.map((b) => b.row0));
  const col1 = Math.max(...boxes.map((b) => b.col0 + b.width - 1));
  const row1 = Math.max(...boxes.map((b) => b.row0 + b.height - 1));
  return { col0, row0, width: Math.max(0, col1 - col0 + 1), height: Math.max(0, row1 - row0 + 1) };
}

type Raster = Float32Array | Uint8Array;

/**
 * Per row of `box`, the columns its boxes cover there: [start, end) pairs, ascending, touching
 * or overlapping ones merged (so that a run of cells never breaks at a boxes' seam).
 */
function rowSpans(boxes: Box[], box: Box): number[][] {
  const spans: number[][] = [];
  for (let r = box.row0; r < box.row0 + box.height; r++) {
    const cut = boxes
      .filter((b) => b.width > 0 && r >= b.row0 && r < b.row0 + b.height)
      .map((b) => [b.col0, b.col0 + b.width])
      .sort((x, y) => x[0] - y[0]);
    const row: number[] = [];
    for (const [a, b] of cut) {
      if (row.length && a <= row[row.length - 1]) row[row.length - 1] = Math.max(row[row.length - 1], b);
      else row.push(a, b);
    }
    spans.push(row);
  }
  return spans;
}

/** Calls f(first, end) for each row span of the box, as row-major grid indices [first, end). */
function eachSpan(W: number, box: Box, spans: number[][], f: (first: number, end: number) => void): void {
  for (let r = 0; r < spans.length; r++) {
    const at = (box.row0 + r) * W;
    const row = spans[r];
    for (let k = 0; k < row.length; k += 2) f(at + row[k], at + row[k + 1]);
  }
}

/** The cells within the spans whose value differs from `nodata`, as runs (index, length) and values: what a tile sets aside and puts back. */
function keepRuns<T extends Raster>(a: T, W: number, box: Box, spans: number[][], nodata: number): { runs: number[]; values: T } {
  const runs: number[] = [];
  let cells = 0;
  eachSpan(W, box, spans, (first, end) => {
    let start = -1;
    for (let i = first; i <= end; i++) {
      const has = i < end && a[i] !== nodata;
      if (has && start < 0) start = i;
      else if (!has && start >= 0) {
        runs.push(start, i - start);
        cells += i - start;
        start = -1;
      }
    }
  });
  const values = (a instanceof Float32Array ? new Float32Array(cells) : new Uint8Array(cells)) as T;
  let p = 0;
  for (let k = 0; k < runs.length; k += 2) {
    values.set(a.subarray(runs[k], runs[k] + runs[k + 1]), p);
    p += runs[k + 1];
  }
  return { runs, values };
}

/** Put set-aside runs back. */
function putRuns(a: Raster, kept: { runs: number[]; values: Raster }): void {
  let p = 0;
  for (let k = 0; k < kept.runs.length; k += 2) {
    a.set(kept.values.subarray(p, p + kept.runs[k + 1]), kept.runs[k]);
    p += kept.runs[k + 1];
  }
}

/**
 * The runs of cells in the box's spans whose value (or probability) is not nodata, and their
 * values: what a tile keeps of the box it was computed in.
 */
function packRuns(out: Raster, prob: Float32Array | null, W: number, box: Box, spans: number[][], nodata: number): { runs: Int32Array; values: Raster; probability: Float32Array | null } {
  const runs: number[] = [];
  let cells = 0;
  eachSpan(W, box, spans, (first, end) => {
    let start = -1;
    for (let i = first; i <= end; i++) {
      const has = i < end && (out[i] !== nodata || (prob !== null && prob[i] !== PROBABILITY_NODATA));
      if (has && start < 0) start = i;
      else if (!has && start >= 0) {
        runs.push(start, i - start);
        cells += i - start;
        start = -1;
      }
    }
  });
  const values = out instanceof Float32Array ? new Float32Array(cells) : new Uint8Array(cells);
  const probability = prob ? new Float32Array(cells) : null;
  let p = 0;
  for (let i = 0; i < runs.length; i += 2) {
    values.set(out.subarray(runs[i], runs[i] + runs[i + 1]), p);
    probability?.set(prob!.subarray(runs[i], runs[i] + runs[i + 1]), p);
    p += runs[i + 1];
  }
  return { runs: Int32Array.from(runs), values, probability };
}

function rasters(job: CoverageJob): { out: Raster; nodata: number; prob: Float32Array | null } {
  const isLevel = job.method !== "visibility";
  return { out: isLevel ? new Float32Array(job.out) : new Uint8Array(job.out), nodata: isLevel ? LEVEL_NODATA : VISIBILITY_NODATA, prob: job.p1812 ? new Float32Array(job.p1812.probability) : null };
}

const emptyTally = (n: number): TallyData => mergeTallies([], n);

/**
 * Compute tile `index` of `count` into the job's result rasters (on the pool's threads, or in
 * this thread) and return its tally. With `extract`, also return its box: the cells already in
 * the box (other tiles') are set aside and put back, so the box holds this tile's cells and
 * nodata elsewhere — the same bytes whatever else the rasters hold.
 */
export async function computeCoverageTile(job: CoverageJob, index: number, count: number, o: { pool?: CoveragePool | null; onProgress?: CoverageProgress; extract: boolean }): Promise<CoverageTile> {
  const [from, to] = tileUnits(job, index, count);
  const boxes = o.extract ? tileFaceBoxes(job, from, to) : [];
  const box = boundingBox(boxes);
  // Only the cells of the face boxes are set aside (those the tile's radials can reach), and
  // only those holding a value: a tile computed after others keeps theirs, not a copy of its
  // whole box (which once held 381 MB for a tile spanning two faces of a 150 km map).
  const spans = o.extract ? rowSpans(boxes, box) : [];
  const { out, nodata, prob } = rasters(job);
  const W = job.width;
  const kept = o.extract ? keepRuns(out, W, box, spans, nodata) : null;
  const keptProb = o.extract && prob ? keepRuns(prob, W, box, spans, PROBABILITY_NODATA) : null;
  if (o.extract) {
    eachSpan(W, box, spans, (first, end) => {
      out.fill(nodata, first, end);
      prob?.fill(PROBABILITY_NODATA, first, end);
    });
  }
  const n = job.thresholds_dbm.length;
  const tally = from >= to ? emptyTally(n) : o.pool ? await o.pool.run(job, o.onProgress, [from, to]) : await runInThisThread(job, o.onProgress, [from, to]);
  const packed = o.extract ? packRuns(out, prob, W, box, spans, nodata) : { runs: new Int32Array(0), values: new Float32Array(0), probability: null };
  const tile: CoverageTile = { index, count, from, to, ...box, ...packed, tally };
  if (kept) putRuns(out, kept);
  if (keptProb) putRuns(prob!, keptProb);
  return tile;
}

/** Write a tile's cells into the job's result rasters (filled with nodata, or holding other tiles). */
export function placeCoverageTile(job: CoverageJob, tile: CoverageTile): void {
  const { out, prob } = rasters(job);
  const { runs, values, probability } = tile;
  let p = 0;
  for (let i = 0; i < runs.length; i += 2) {
    out.set(values.subarray(p, p + runs[i + 1]), runs[i]);
    if (prob && probability) prob.set(probability.subarray(p, p + runs[i + 1]), runs[i]);
    p += runs[i + 1];
  }
}

/** A tile as cache-entry bytes (the entry codec: the same bytes on every machine for the same tile). */
export function encodeCoverageTile(tile: CoverageTile): Buffer {
  return encodeEntry(tile);
}

/** A tile read from the cache, or null (a miss) when it is not tile `index` of `count` of this job. */
export function decodeCoverageTile(bytes: Uint8Array, job: CoverageJob, index: number, count: number): CoverageTile | null {
  const t = decodeEntry(Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength), { views: true }) as Partial<CoverageTile> | null;
  if (!t || typeof t !== "object" || t.index !== index || t.count !== count) return null;
  const [from, to] = tileUnits(job, index, count);
  const box = tileBox(job, from, to);
  if (t.from !== from || t.to !== to || t.col0 !== box.col0 || t.row0 !== box.row0 || t.width !== box.width || t.height !== box.height) return null;
  // runs within the box's rows, in order, their lengths adding up to the values'
  const runs = t.runs;
  if (!(runs instanceof Int32Array) || runs.length % 2 !== 0) return null;
  let cells = 0;
  let last = -1;
  for (let i = 0; i < runs.length; i += 2) {
    const at = runs[i];
    const n = runs[i + 1];
    const row = Math.floor(at / job.width);
    const col = at - row * job.width;
    if (!(at > last && n > 0 && row >= box.row0 && row < box.row0 + box.height && col >= box.col0 && col + n <= box.col0 + box.width)) return null;
    last = at + n - 1;
    cells += n;
  }
  const isLevel = job.method !== "visibility";
  const v = t.values;
  if (!(isLevel ? v instanceof Float32Array : v instanceof Uint8Array) || v!.length !== cells) return null;
  if (job.p1812 ? !(t.probability instanceof Float32Array && t.probability.length === cells) : t.probability !== null) return null;
  const y = t.tally;
  if (!y || !Array.isArray(y.at_least_m2) || y.at_least_m2.length !== job.thresholds_dbm.length || typeof y.area_m2 !== "number") return null;
  return t as CoverageTile;
}

/**
 * Compute a map tile by tile into the job's rasters (filled with nodata), reading tiles the
 * store holds and storing those computed; resolves with the map's tally (the tiles' in order).
 */
export async function computeCoverageTiles(job: CoverageJob, count: number, o: { pool?: CoveragePool | null; onProgress?: CoverageProgress; store?: CoverageTileStore | null }): Promise<TallyData> {
  const total = coverageUnits(job);
  const tallies: TallyData[] = [];
  let before = 0;
  for (let k = 0; k < count; k++) {
    const [from, to] = tileUnits(job, k, count);
    const bytes = o.store ? await o.store.get(k, count) : undefined;
    let tile = bytes ? decodeCoverageTile(bytes, job, k, count) : null;
    if (tile) placeCoverageTile(job, tile);
    else {
      tile = await computeCoverageTile(job, k, count, { pool: o.pool, onProgress: (d) => o.onProgress?.(before + d, total), extract: !!o.store });
      o.store?.put(k, count, encodeCoverageTile(tile));
    }
    tallies.push(tile.tally);
    before += to - from;
    o.onProgress?.(before, total);
  }
  return mergeTallies(tallies, job.thresholds_dbm.length);
}
