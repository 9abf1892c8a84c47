import { INT16_NODATA } from "../terrain/tiff-band-reader.ts";

/** What the sweep needs of the grid (plain numbers, sent to worker threads). */
export interface SweepGeometry {
  width: number;
  height: number;
  site_col: number;
  site_row: number;
  radius_m: number;
  /** ground metres east per column step and north per row step, per row (signed) */
  east_per_col_m: Float64Array;
  north_per_row_m: Float64Array;
}

/** Receives the radials of a sweep (one implementation per method, so calls stay monomorphic). */
export interface RayVisitor {
  /** A new radial starts at the site. */
  startRay(): void;
  /**
   * A cell owned by the current radial, visited after every sample closer to the site than
   * its column and before that column's sample is added.
   * @param index row-major cell index
   * @param row cell row
   * @param d_m ground distance of the cell centre from the site (m)
   * @param h_m the cell's elevation (m amsl; NaN for nodata)
   * @param east_m ground offset east of the site (m)
   * @param north_m ground offset north of the site (m)
   */
  cell(index: number, row: number, d_m: number, h_m: number, east_m: number, north_m: number): void;
  /**
   * A terrain sample along the radial at distance d_m (increasing), height h_m (finite);
   * nearest_index is the row-major index of the grid cell nearest to the sample (for rasters
   * on the same grid, e.g. land cover).
   */
  sample(d_m: number, h_m: number, nearest_index: number): void;
}

/**
 * Radials per half face: rays toward every cell of the edge of a square of ±rc cells around
 * the site, so neighbouring rays are at most one cell apart inside the radius.
 */
export function raysPerHalfFace(g: SweepGeometry): number {
  const r = Math.min(g.height - 1, Math.max(0, Math.round(g.site_row)));
  const ex = Math.abs(g.east_per_col_m[r]);
  const ny = Math.abs(g.north_per_row_m[r]);
  return Math.ceil(Math.max(g.radius_m / ex, g.radius_m / ny)) + 1;
}

/** Number of radials of a sweep: four faces of 2·rc + 1 rays. */
export function rayCount(rc: number): number {
  return 4 * (2 * rc + 1);
}

/** Longest radial in samples (for preallocating per-radial state). */
export function maxSamplesPerRay(g: SweepGeometry): number {
  let minStep = Infinity;
  for (let r = 0; r < g.height; r++) minStep = Math.min(minStep, Math.abs(g.east_per_col_m[r]), Math.abs(g.north_per_row_m[r]));
  return Math.min(Math.max(g.width, g.height) + 2, Math.ceil((1.1 * g.radius_m) / minStep) + 8);
}

/** Whether every row of the grid has the same metric (a projected grid): distances along a radial are then its column count times one step. */
export function uniformMetric(g: Pick<SweepGeometry, "height" | "east_per_col_m" | "north_per_row_m">): boolean {
  return g.east_per_col_m[0] === g.east_per_col_m[g.height - 1] && g.north_per_row_m[0] === g.north_per_row_m[g.height - 1];
}

/**
 * How the radials of `face` (0 east, 1 west: x major; 2, 3: y major) run over the grid: the
 * major axis (a, one sample per column), the minor axis (b), the site on each, the index steps
 * along each, the first column and the number of columns to the grid's edge. Shared by both
 * sweeps so they walk the grid alike.
 */
export function faceAxes(g: Pick<SweepGeometry, "width" | "height" | "site_col" | "site_row">, face: number) {
  const W = g.width;
  const H = g.height;
  const xMajor = face < 2;
  const sgn = face === 0 || face === 2 ? 1 : -1;
  const as = xMajor ? g.site_col : g.site_row; // site along the major axis
  const bs = xMajor ? g.site_row : g.site_col;
  const amax = xMajor ? W - 1 : H - 1;
  const bmax = xMajor ? H - 1 : W - 1;
  const aStride = xMajor ? 1 : W; // index step along the major axis
  const bStride = xMajor ? W : 1; // index step along the minor axis
  const aStart = sgn > 0 ? Math.floor(as) : Math.ceil(as);
  return { xMajor, sgn, as, bs, bmax, aStride, bStride, bNext: bmax > 0 ? bStride : 0, aStart, mMax: sgn > 0 ? amax - aStart : aStart };
}

/**
 * The grid's metric in the site's row, as both sweeps use it: metres per column and per row
 * (signed, as the grid gives them), how far past the radius a radial still samples (1.5 cells)
 * and the least distance a cell is taken at (half a cell: the site's own cell and its
 * neighbours). One function, so that the two sweeps cannot drift apart.
 */
export function siteMetric(g: Pick<SweepGeometry, "height" | "site_row" | "east_per_col_m" | "north_per_row_m">): { ex: number; ny: number; margin: number; dMin: number } {
  const rs = Math.min(g.height - 1, Math.max(0, Math.round(g.site_row)));
  const ex = g.east_per_col_m[rs];
  const ny = g.north_per_row_m[rs];
  return { ex, ny, margin: 1.5 * Math.max(Math.abs(ex), Math.abs(ny)), dMin: 0.5 * Math.min(Math.abs(ex), Math.abs(ny)) };
}

/**
 * The elevation a radial samples at major index offset `aOffset` (a · stride along the major
 * axis) and minor coordinate b (−0.5 ≤ b ≤ bmax + 0.5): linear between the two cells of that
 * column it passes between (clamped at the grid's edge), the nearer one where the other is
 * nodata, NaN where both are — bilinear interpolation on a grid line (as bilinear-grid.ts).
 * Shared by both sweeps so that they sample alike.
 */
export function radialSample(dem: Float32Array | Int16Array, aOffset: number, b: number, bmax: number, bStride: number, bNext: number): number {
  let bf = Math.floor(b);
  let fr = b - bf;
  if (bf < 0 || bf >= bmax) {
    if (bf < 0) (bf = 0), (fr = 0);
    else (bf = bmax > 0 ? bmax - 1 : 0), (fr = bmax > 0 ? 1 : 0);
  }
  const i0 = aOffset + bf * bStride;
  let v0 = dem[i0];
  let v1 = dem[i0 + bNext];
  if (v0 === INT16_NODATA) v0 = NaN;
  if (v1 === INT16_NODATA) v1 = NaN;
  const hs = v0 + (v1 - v0) * fr;
  if (hs === hs) return hs;
  const nearest = fr < 0.5 ? v0 : v1;
  return nearest !== nearest ? NaN : v0 === v0 ? v0 : v1;
}

/**
 * Walk radials q0…q1−1 of the sweep over `dem` (row-major elevations, NaN or −32768 nodata:
 * see Elevations in elevation-window.ts).
 *
 * Geometry (in pixel-centre coordinates of the grid). Cells split into four faces around the
 * site: east/west hold the cells with |Δrow| ≤ |Δcol|, north/south those with |Δcol| < |Δrow|.
 * Face f has rays t = −rc…rc; ray t of the east face is the line row = site_row +
 * (col − site_col)·t/rc, and likewise for the others with the roles of row and column swapped.
 * A ray takes one sample per column of its major axis (the first column past the site, then
 * every column), at the exact point on the line: the elevation there is the linear
 * interpolation between the two cells of that column it passes between — bilinear
 * interpolation on a grid line (nodata as in bilinear-grid.ts).
 *
 * Ownership: a cell at Δ = (Δmajor, Δminor) belongs to the ray t with
 * t − ½ ≤ Δminor·rc/|Δmajor| < t + ½ (evaluated multiplied out, so the rays' intervals tile
 * exactly), which passes within half a cell of its centre; each cell is visited once, by its owner, with
 * the samples before its column as the inner profile and its own centre as the receiver —
 * so the profile of a cell is the radial toward it up to the previous column, ending exactly
 * at the cell. A sample that is nodata ends its radial. Cells farther than the radius are
 * not visited. Cells closer than half a cell are taken at half a cell; the cell holding the site
 * exactly (site on a cell centre) belongs to no face and is visited by ray 0 with no inner
 * samples.
 */
export function sweepRays(g: SweepGeometry, dem: Float32Array | Int16Array, rc: number, q0: number, q1: number, v: RayVisitor): void {
  const W = g.width;
  const H = g.height;
  const xs = g.site_col;
  const ys = g.site_row;
  const R = g.radius_m;
  const EX = g.east_per_col_m;
  const NY = g.north_per_row_m;
  const { ex: EXr, ny: NYr, margin, dMin } = siteMetric(g);
  const perFace = 2 * rc + 1;
  const uniform = uniformMetric(g);

  if (q0 === 0 && Number.isInteger(xs) && Number.isInteger(ys) && xs >= 0 && xs < W && ys >= 0 && ys < H) {
    const idx = ys * W + xs;
    v.startRay();
    v.cell(idx, ys, dMin, dem[idx] === INT16_NODATA ? NaN : dem[idx], 0, 0);
  }

  let axesFace = -1;
  let axes = faceAxes(g, 0);
  for (let q = q0; q < q1; q++) {
    const face = (q / perFace) | 0;
    const t = (q % perFace) - rc;
    if (face !== axesFace) (axes = faceAxes(g, face)), (axesFace = face);
    const { xMajor, sgn, as, bs, bmax, aStride, bStride, bNext, aStart, mMax } = axes;
    const slope = t / rc;
    // ownership of cell k: t − ½ ≤ (k − bs)·rc/da < t + ½, multiplied out by da > 0
    const tLo = t - 0.5;
    const tHi = t + 0.5;
    // on a grid with the same metric in every row a sample's distance is da times the step
    const stepLen = xMajor ? Math.hypot(EXr, slope * NYr) : Math.hypot(slope * EXr, NYr);
    v.startRay();
    for (let m = 1; m <= mMax; m++) {
      const a = aStart + sgn * m;
      const da = (a - as) * sgn;
      const b = bs + da * slope;
      if (b < -0.5 || b > bmax + 0.5) break;
      const hs = radialSample(dem, a * aStride, b, bmax, bStride, bNext);
      let ds: number;
      if (uniform) {
        ds = da * stepLen;
      } else {
        const row = xMajor ? b : a;
        const ri = row < 0 ? 0 : row > H - 1 ? H - 1 : (row + 0.5) | 0;
        const se = ((xMajor ? a : b) - xs) * EX[ri];
        const sn = (row - ys) * NY[ri];
        ds = Math.sqrt(se * se + sn * sn);
      }
      if (ds - margin > R) break;
      // --- the cell of this column the ray owns, if any: round(b), or its neighbour at a tie ---
      let k = Math.round(b);
      const other = b - k > 0.4999999 ? k + 1 : k - b > 0.4999999 ? k - 1 : k;
      for (;;) {
        if (k >= 0 && k <= bmax) {
          const db = k - bs;
          const adb = db < 0 ? -db : db;
          const x = db * rc;
          if ((xMajor ? adb <= da : adb < da) && x >= tLo * da && x < tHi * da) {
            const cc = xMajor ? a : k;
            const cr = xMajor ? k : a;
            const ce = (cc - xs) * EX[cr];
            const cn = (cr - ys) * NY[cr];
            const dc = Math.sqrt(ce * ce + cn * cn);
            if (dc <= R) {
              const idx = cr * W + cc;
              const hc = dem[idx];
              v.cell(idx, cr, dc < dMin ? dMin : dc, hc === INT16_NODATA ? NaN : hc, ce, cn);
            }
          }
        }
        if (k === other) break;
        k = other;
      }
      if (hs !== hs) break;
      const kn = b < 0 ? 0 : b > bmax ? bmax : Math.round(b);
      v.sample(ds, hs, a * aStride + kn * bStride);
    }
  }
}
