import { INT16_NODATA } from "../terrain/tiff-band-reader.ts";
import { CoverageTally } from "./coverage-tally.ts";
import { faceAxes, radialSample, siteMetric, uniformMetric, type SweepGeometry } from "./radial-sweep.ts";

/** What the geometric line-of-sight sweep needs beyond the grid. */
export interface HorizonParams {
  /** antenna height (m amsl) */
  hts_m: number;
  /** receiver height above ground (m) */
  receiver_m: number;
  /** 1/(2·ae) (1/m), 0 for k = ∞ */
  k2: number;
}

/**
 * Whether a coverage is pure geometric line of sight (visibility with no Fresnel clearance
 * asked for): what horizonSweep computes, on grids where horizonSweepApplies.
 */
export function lineOfSightOnly(method: string, clearance_f1: number): boolean {
  return method === "visibility" && !(clearance_f1 > 0);
}

/**
 * Whether horizonSweep computes this grid (every row with the same metric: projected grids);
 * otherwise sweepRays with a HorizonVisitor does.
 */
export function horizonSweepApplies(g: SweepGeometry): boolean {
  return uniformMetric(g);
}

/**
 * Radio line of sight over radials q0…q1−1: the radials, samples, cell ownership and
 * arithmetic of sweepRays (radial-sweep.ts) with HorizonVisitor (level-visitors.ts), so every
 * cell gets the same value, computed in another order: all the radials of a face advance
 * together one column at a time (a wavefront), keeping each radial's running horizon in an
 * array. Each column first visits its cells — the cell's owning radial found from the cell
 * (t = round(Δminor·rc/Δmajor), then the exact ownership test of sweepRays) with that radial's
 * horizon over the columns before — then adds each radial's sample to its horizon. The
 * general sweep instead tests, at every sample of every radial, whether the radial owns a cell
 * there: about 2.5 samples per cell on a 100 km grid, and a branch that cannot be predicted.
 * Radials end where sweepRays ends them (leaving the grid or the radius, nodata), and their
 * cells beyond are left unvisited as there. The tally adds the same cells in column order,
 * so its area sums can differ from the general sweep's in the last bits. The tally's
 * thresholds must be [1] (visible).
 * Only for grids where horizonSweepApplies.
 *
 * Samples that cannot raise a horizon are skipped, which leaves every value the same: the
 * columns are taken in blocks of HORIZON_TILE, and at each block a radial first bounds what
 * its samples there could add — the highest cell of the tiles its path crosses (`tiles`),
 * at the block's nearest and farthest distance, less the Earth's bulge at the nearest — and
 * takes its samples only when that bound comes within 1e-9 of its horizon. A sample is an
 * interpolation between two cells, so it is never above the higher one; a tile holding
 * nodata bounds nothing (+∞), so a sample that would end its radial is always taken. Over
 * rough ground seen from a low mast most blocks are skipped (nine in ten on the benchmark's
 * 100 km grid). Cells are bounded by tile in the same way (faceWavefront: "dark" tiles and
 * each tile's `low`), which writes 0 without the per-cell comparison only where that
 * comparison is sure to give 0: every cell gets the value it had.
 * @param out visibility raster (1 visible, 0 not), written for the cells these radials own
 * @param area ground area of a cell per row (m²)
 * @param tiles the grid's horizonTileTable, filled by the first sweep given it (the threads
 *   sharing one table fill it together); default a new one
 * @param zeroed `out` was filled by fillLineOfSightRaster (0 inside the radius, 255 outside)
 *   rather than with 255: the sweep then writes only visible cells and, inside the radius,
 *   the cells it computes no value for (255), with the same raster as a result
 */
export function horizonSweep(g: SweepGeometry, dem: Float32Array | Int16Array, rc: number, q0: number, q1: number, p: HorizonParams, out: Uint8Array, area: Float64Array, tally: CoverageTally, tiles: Float32Array = horizonTileTable(g.width, g.height), zeroed = false): void {
  const xs = g.site_col;
  const ys = g.site_row;
  const W = g.width;
  const H = g.height;
  const perFace = 2 * rc + 1;
  const metric = siteMetric(g);
  const dMin = metric.dMin;
  if (q0 === 0 && Number.isInteger(xs) && Number.isInteger(ys) && xs >= 0 && xs < W && ys >= 0 && ys < H) {
    // the cell holding the site, with no samples before it (as sweepRays)
    const hc = dem[ys * W + xs];
    if (hc === INT16_NODATA || hc !== hc) {
      tally.fail();
      if (zeroed) out[ys * W + xs] = 255;
    } else {
      const v = hc + p.receiver_m - dMin * dMin * p.k2 - p.hts_m > -Infinity * dMin ? 1 : 0;
      out[ys * W + xs] = v;
      tally.add(v, area[ys]);
    }
  }
  // one area for every cell (a projected grid): the tally counts cells and multiplies at the end
  const uniformArea = sameValues(area, H);
  const iv2 = new Int32Array(4);
  iv2[3] = zeroed ? 1 : 0;
  fillTileTable(tiles, dem, g);
  for (let face = Math.floor(q0 / perFace); face * perFace < q1; face++) {
    const from = Math.max(q0, face * perFace) - face * perFace - rc;
    const to = Math.min(q1, (face + 1) * perFace) - face * perFace - rc;
    if (to <= from) continue;
    // Every number the loops use goes in through typed arrays: the optimising compiler then
    // holds them as raw doubles and integers, instead of checking a boxed number at each use,
    // and the loops never read an object whose shape could differ from the warm-up's (a job
    // from another thread, say), which would send them back to the interpreter.
    const axes = faceAxes(g, face);
    const xMajor = axes.xMajor;
    const fv = Float64Array.of(g.radius_m, metric.margin, metric.dMin, p.hts_m, p.receiver_m, p.k2, axes.as, axes.bs, xMajor ? metric.ex : metric.ny, xMajor ? metric.ny : metric.ex, rc);
    const iv = Int32Array.of(xMajor ? 1 : 0, axes.sgn, axes.bmax, axes.aStride, axes.bStride, axes.bNext, axes.aStart, axes.mMax, from, to);
    // per radial i (ray from + i), three numbers: its slope (minor per major step), its ground
    // length per column (m) and its horizon — the steepest (z − hts)/d of its samples so far,
    // z = h − d²·k2 — or NaN once it has ended (left the grid or the radius, or met nodata)
    const st = new Float64Array(3 * (to - from));
    // and the last column at which it samples
    const last = new Int32Array(to - from);
    radialSetup(fv, iv, st, last, metric.ex, metric.ny);
    const tilesAcross = Math.ceil(W / HORIZON_TILE);
    iv2[0] = xMajor ? 1 : tilesAcross; // tile index step along the major axis, the minor axis
    iv2[1] = xMajor ? tilesAcross : 1;
    iv2[2] = uniformArea ? 1 : 0;
    const sums = new Float64Array(5);
    faceWavefront(fv, iv, iv2, st, last, dem, tiles, out, area, sums);
    const [cells, area_m2, visible, nVisible, failed] = sums;
    const some = cells > 0; // (each comparison below is made on every call, the warm-up's too)
    tally.addSums({ cells, area_m2, at_least_m2: [visible], failed, min: some ? (nVisible < cells ? 0 : 1) : Infinity, max: some ? (nVisible > 0 ? 1 : 0) : -Infinity, reliability_m2: [0] });
  }
}

/**
 * Prepare a fresh, zero-filled visibility raster for horizonSweep's `zeroed` mode: `value`
 * (nodata) at every cell outside the radius — a cell whose distance from the site, computed
 * as the sweep computes it (√(Δeast² + Δnorth²) with the site row's metric), exceeds the
 * radius — leaving 0 inside, which the sweep keeps for every cell it finds not visible. Only
 * the rows' outer parts are written: the rest of a fresh buffer is never touched unless a cell
 * there is visible (pages never written cost nothing). The sweep never writes a cell outside
 * the radius, so the same fill made after it, strip by strip as the raster is written
 * (`row0`, `row1`), gives the same raster without writing the outer parts in memory at all.
 * @param out rows row0 … row1 − 1 of the raster (out[0] is row0's first cell)
 * @param row0 first row `out` holds (default 0), @param row1 row past the last (default all)
 */
export function fillLineOfSightRaster(out: Uint8Array, g: SweepGeometry, value: number, row0 = 0, row1 = g.height): void {
  const { ex, ny } = siteMetric(g);
  const W = g.width;
  const R = g.radius_m;
  const xs = g.site_col;
  const inside = (c: number, dy2: number) => {
    const dx = (c - xs) * ex;
    return Math.sqrt(dx * dx + dy2) <= R;
  };
  for (let r = row0; r < row1; r++) {
    const dy = (r - g.site_row) * ny;
    const dy2 = dy * dy;
    const half = Math.sqrt(Math.max(0, R * R - dy2)) / Math.abs(ex);
    const at = (r - row0) * W;
    // the row's cells inside form one interval about the site: find its ends exactly
    let a = Math.max(0, Math.floor(xs - half) - 2);
    const stop = Math.min(W - 1, Math.ceil(xs + half) + 2);
    while (a <= stop && !inside(a, dy2)) a++;
    if (a > stop) {
      out.fill(value, at, at + W);
      continue;
    }
    while (a > 0 && inside(a - 1, dy2)) a--;
    let b = Math.min(W - 1, Math.ceil(xs + half) + 2);
    while (b > a && !inside(b, dy2)) b--;
    while (b < W - 1 && inside(b + 1, dy2)) b++;
    out.fill(value, at, at + a);
    out.fill(value, at + b + 1, at + W);
  }
}

/** Whether a[0…n−1] are all equal (a loop of its own: see radialSetup). */
function sameValues(a: Float64Array, n: number): boolean {
  for (let r = 1; r < n; r++) if (a[r] !== a[0]) return false;
  return true;
}

/**
 * Each radial's slope, step length and horizon (−∞) into `st`, and its last column into
 * `last`: past it the radial has left the grid or the radius plus the margin (both grow with
 * the column, so the first such column is found by halving, with the test sweepRays makes).
 * A function of its own, so that horizonSweep, which runs once per chunk, never becomes hot
 * enough to be compiled with the wavefront inlined (compiling costs each thread tens of ms).
 * @param ex metres per column, @param ny metres per row (at the site)
 */
function radialSetup(fv: Float64Array, iv: Int32Array, st: Float64Array, last: Int32Array, ex: number, ny: number): void {
  const R = fv[0], margin = fv[1], as = fv[6], bs = fv[7], rcf = fv[10];
  const xMajor = iv[0] === 1, sgn = iv[1], bmax = iv[2], aStart = iv[6], mMax = iv[7], T0 = iv[8], T1 = iv[9];
  for (let i = 0; i < T1 - T0; i++) {
    const s = (T0 + i) / rcf;
    const step = xMajor ? Math.hypot(ex, s * ny) : Math.hypot(s * ex, ny);
    st[3 * i] = s;
    st[3 * i + 1] = step;
    st[3 * i + 2] = -Infinity;
    let lo = 0;
    let hi = mMax + 1; // past the grid's edge
    while (hi - lo > 1) {
      const mid = (lo + hi) >> 1;
      const da = (aStart + sgn * mid - as) * sgn;
      const b = bs + da * s;
      if (b < -0.5 || b > bmax + 0.5 || da * step - margin > R) hi = mid;
      else lo = mid;
    }
    last[i] = lo;
  }
}

/**
 * The radials of one face (0 east, 1 west, 2 south, 3 north in grid terms) from horizonSweep,
 * as one wavefront, block by block of columns.
 * @param fv radius, sampling margin, least distance (m), antenna height (m amsl), receiver
 *   height (m), 1/(2·ae) (1/m), site on the major and minor axes (cells), metres per major and
 *   per minor step, rc
 * @param iv 1 when x is the major axis, direction along it (±1), last minor index, index steps
 *   along the major and minor axes, step to the next cell across, first column, columns to the
 *   grid's edge, first ray t0, ray past the last t1
 * @param iv2 tile index steps along the major and the minor axis, 1 when every cell has the
 *   same area
 * @param st per radial: slope, step length, horizon (updated)
 * @param last per radial: its last column
 * @param tiles highest elevation per tile (horizonTileTable, filled)
 * @param sums receives cells, their area, the visible area, visible cells, failed cells
 */
function faceWavefront(fv: Float64Array, iv: Int32Array, iv2: Int32Array, st: Float64Array, last: Int32Array, dem: Float32Array | Int16Array, tiles: Float32Array, out: Uint8Array, area: Float64Array, sums: Float64Array): void {
  const R = fv[0], dMin = fv[2], hts = fv[3], hr = fv[4], k2 = fv[5], as = fv[6], bs = fv[7], eMajor = fv[8], eMinor = fv[9], rcf = fv[10];
  const xMajor = iv[0] === 1, sgn = iv[1], bmax = iv[2], aStride = iv[3], bStride = iv[4], bNext = iv[5], aStart = iv[6], mMax = iv[7], T0 = iv[8], T1 = iv[9];
  const tA = iv2[0], tB = iv2[1], uniformArea = iv2[2] === 1, zeroed = iv2[3] === 1;
  const n = T1 - T0;
  const active = new Int32Array(n); // the radials that take their samples in the current block
  const kRange = new Int32Array(2 * TILE); // per column of the block: the cells it visits, from, to
  const dark = new Uint8Array(((bmax / TILE) | 0) + 1); // per tile across: 1 when its cells in the block are all not visible
  const low = new Float64Array(dark.length); // per tile across: cells below this are not visible (−∞: test each cell)
  const eMaj = Math.abs(eMajor); // (no branch the warm-up might not take: see below)
  const eMin = Math.abs(eMinor);
  let alive = n;
  // radials below iLo and from iHi on have ended (the outermost end first, as they leave the grid or the radius first)
  let iLo = 0;
  let iHi = n;
  let sum = 0; // tallied locally, added to the tally in the same order at the end
  let visible = 0;
  let cells = 0;
  let nVisible = 0;
  let failed = 0;

  let nodataEnds = 0; // radials ended by nodata: their cells inside the radius are set to 255 when `zeroed`
  for (let m0 = 1; m0 <= mMax && (alive > 0 || (zeroed && nodataEnds > 0)); ) {
    // --- a block: the columns m0…mB of one tile column ---
    const a0 = aStart + sgn * m0;
    const ta = (a0 / TILE) | 0;
    let mB = sgn > 0 ? m0 + (ta * TILE + TILE - 1 - a0) : m0 + (a0 - ta * TILE);
    if (mB > mMax) mB = mMax;
    const da0 = (a0 - as) * sgn;
    // the cells each column of the block visits, k from kFrom to kTo (see below)
    let kMin = bmax;
    let fullBlock = 1;
    let kMax = 0;
    for (let m = m0; m <= mB; m++) {
      const da = (aStart + sgn * m - as) * sgn;
      let kFrom = Math.floor(bs + ((T0 - 0.5) * da) / rcf) - 1;
      let kTo = Math.ceil(bs + ((T1 - 0.5) * da) / rcf) + 1;
      if (kFrom < 0) kFrom = 0;
      if (kTo > bmax) kTo = bmax;
      // only the face's cells: |k − bs| ≤ da on the x faces, < da on the y faces (an interval of k)
      while (kFrom <= kTo && (xMajor ? bs - kFrom > da : bs - kFrom >= da)) kFrom++;
      while (kTo >= kFrom && (xMajor ? kTo - bs > da : kTo - bs >= da)) kTo--;
      // and only the cells this chunk's radials own (the owner, as the cells below find it,
      // grows with k): the tiles at the chunk's edges are then dark for their part in it
      const invDa = 1 / da;
      for (; kFrom <= kTo; kFrom++) {
        const x = (kFrom - bs) * rcf;
        let t = Math.round(x * invDa);
        t += (x >= (t + 0.5) * da ? 1 : 0) - (x < (t - 0.5) * da ? 1 : 0);
        if (t >= T0) break;
      }
      for (; kTo >= kFrom; kTo--) {
        const x = (kTo - bs) * rcf;
        let t = Math.round(x * invDa);
        t += (x >= (t + 0.5) * da ? 1 : 0) - (x < (t - 0.5) * da ? 1 : 0);
        if (t < T1) break;
      }
      if (kFrom > kTo) fullBlock = 0;
      kRange[2 * (m - m0)] = kFrom;
      kRange[2 * (m - m0) + 1] = kTo;
      if (kFrom < kMin) kMin = kFrom;
      if (kTo > kMax) kMax = kTo;
    }
    // the highest tile the block's samples can read (they lie within a cell of the cells
    // their radials own, so within kMin − 3 … kMax + 3): a radial whose bound from it cannot
    // raise its horizon is passed over before its own tiles are looked up (the same decision,
    // as the bound only grows with the height)
    let blockTop = Infinity;
    if (fullBlock === 1 && kMin <= kMax) {
      blockTop = -Infinity;
      for (let tb = ((kMin - 3 < 0 ? 0 : kMin - 3) / TILE) | 0, tbEnd = ((kMax + 3 > bmax ? bmax : kMax + 3) / TILE) | 0; tb <= tbEnd; tb++) blockTop = Math.max(blockTop, tiles[ta * tA + tb * tB]);
    }
    // which radials may raise their horizon in this block: the others keep it as it is
    let nActive = 0;
    let mayEnd = 0;
    for (let i = iLo; i < iHi; i++) {
      const j = 3 * i;
      const horizon = st[j + 2];
      if (horizon !== horizon) continue;
      const end = last[i];
      if (m0 > end) {
        // past its last column (left the grid or the radius); the cells it would own from
        // here on are outside the radius (within half a cell of its samples)
        st[j + 2] = NaN;
        alive--;
        continue;
      }
      const mL = mB < end ? mB : end;
      const daL = da0 + (mL - m0);
      if (blockTop < Infinity) {
        const d0b = da0 * st[j + 1];
        const up0b = (blockTop - hts) / d0b;
        const upLb = (blockTop - hts) / (daL * st[j + 1]);
        const boundB = (up0b > upLb ? up0b : upLb) - d0b * k2;
        if (boundB < horizon - 1e-9 * (1 + (horizon < 0 ? -horizon : horizon))) continue;
      }
      const s = st[j];
      const b0 = bs + da0 * s;
      const bL = bs + daL * s;
      // the cells its samples interpolate between, clamped to the grid (as radialSample)
      let kLo = Math.floor(b0 < bL ? b0 : bL);
      let kHi = Math.floor(b0 < bL ? bL : b0) + 1;
      if (kLo < 0) kLo = 0;
      if (kLo > bmax) kLo = bmax;
      if (kHi > bmax) kHi = bmax;
      if (kHi < 0) kHi = 0;
      const tHi = (kHi / TILE) | 0;
      let top = -Infinity;
      for (let tb = (kLo / TILE) | 0; tb <= tHi; tb++) {
        const v = tiles[ta * tA + tb * tB];
        if (v > top) top = v;
      }
      // z/d of a sample at distance d is at most (top − hts)/d − d·k2: bound it over the block
      const d0 = da0 * st[j + 1];
      const up0 = (top - hts) / d0;
      const upL = (top - hts) / (daL * st[j + 1]);
      const bound = (up0 > upL ? up0 : upL) - d0 * k2;
      if (top === Infinity) mayEnd = 1; // a tile holding nodata: its sample may end the radial in this block
      if (bound < horizon - 1e-9 * (1 + (horizon < 0 ? -horizon : horizon))) continue;
      active[nActive++] = i;
    }

    // --- the cells each column of the block visits (k from kFrom to kTo), and the tiles
    // whose cells all come out not visible (`dark`): every cell of the tile in the block is
    // inside the radius and owned by a radial of this chunk that has not ended, the
    // highest cell of the tile is below every such radial's horizon at the block's start
    // (a horizon only rises, and with no nodata tile on the block's samples none ends in
    // the block), so the comparison of each cell gives 0; they are written without it.
    // Where the same holds but for the highest cell, a cell below the tile's `low` is not
    // visible either, which a single comparison tells ---
    if (kMin <= kMax) {
      const daB = da0 + (mB - m0);
      const nearMajor = da0 * eMaj;
      const farMajor = daB * eMaj;
      for (let tb = (kMin / TILE) | 0, tbEnd = (kMax / TILE) | 0; tb <= tbEnd; tb++) {
        dark[tb] = 0;
        low[tb] = -Infinity;
        const top = tiles[ta * tA + tb * tB];
        if (mayEnd === 1 || !uniformArea || !(top < Infinity)) continue;
        const x0 = tb * TILE - bs; // the tile's cells, across (cells from the site)
        const x1 = (tb * TILE + TILE - 1 > bmax ? bmax : tb * TILE + TILE - 1) - bs;
        // the radials that can own them: t within ½ of x·rc/da at the tile's corners
        const c00 = (x0 * rcf) / da0;
        const c01 = (x0 * rcf) / daB;
        const c10 = (x1 * rcf) / da0;
        const c11 = (x1 * rcf) / daB;
        const tLo = Math.floor(Math.min(c00, c01, c10, c11)) - 1;
        const tHi = Math.ceil(Math.max(c00, c01, c10, c11)) + 1;
        // (the cells visited are those of radials T0…T1−1: see kRange)
        let h0 = Infinity;
        for (let t = tLo < T0 ? T0 : tLo, tEnd = tHi >= T1 ? T1 - 1 : tHi; t <= tEnd; t++) {
          const h = st[3 * (t - T0) + 2];
          if (h < h0) h0 = h;
          else if (h !== h) h0 = NaN; // ended: its cells stay unvisited
        }
        if (h0 !== h0) continue;
        // nearest and farthest cell (m), as a cell's d is at least dMin
        const xNear = Math.max(0, x0, -x1);
        const xFar = Math.max(-x0, x1);
        let dNear = Math.sqrt(nearMajor * nearMajor + xNear * eMin * (xNear * eMin));
        let dFar = Math.sqrt(farMajor * farMajor + xFar * eMin * (xFar * eMin));
        if (dNear < dMin) dNear = dMin;
        if (dFar < dMin) dFar = dMin;
        if (dFar * (1 + 1e-12) >= R) continue; // a cell may lie outside the radius
        // (h + hr − d²·k2 − hts)/d is at most (top + hr − hts)/d − dNear·k2 over the tile
        const c = top + hr - hts;
        const upNear = c / dNear;
        const upFar = c / dFar;
        const bound = Math.max(upNear, upFar) - dNear * k2;
        if (bound < h0 - 1e-9 * (1 + Math.abs(h0))) {
          dark[tb] = 1;
          continue;
        }
        // otherwise a cell is not visible when hc < h0·d + d²·k2 + hts − hr for every d of the
        // tile (its horizon is at least h0): the least of that parabola in d over [dNear, dFar],
        // less a margin far above the rounding of the comparison, is the tile's `low`
        const dStar = k2 > 0 ? -h0 / (2 * k2) : dNear;
        const dIn = Math.min(Math.max(dStar, dNear), dFar); // (Math.min/max: no branch the warm-up might miss)
        const gNear = (h0 + dNear * k2) * dNear;
        const gFar = (h0 + dFar * k2) * dFar;
        const gIn = (h0 + dIn * k2) * dIn;
        const gMin = Math.min(gNear, gFar, gIn) + hts - hr;
        low[tb] = gMin - 1e-6 * (1 + Math.abs(gMin));
      }
    }

    for (let m = m0; m <= mB; m++) {
      const a = aStart + sgn * m;
      const da = (a - as) * sgn;
      const aOffset = a * aStride;
      const major = (a - as) * eMajor; // ground offset of this column from the site (m)
      const major2 = major * major;
      // --- the cells of this column the radials own: k with t − ½ ≤ (k − bs)·rc/da < t + ½,
      // visited when the owning radial reaches this column (as sweepRays: it has not ended
      // before), against its horizon over the columns before ---
      const invDa = 1 / da;
      const kFrom = kRange[2 * (m - m0)];
      const kTo = kRange[2 * (m - m0) + 1];
      for (let k0 = kFrom; k0 <= kTo; ) {
        const tb = (k0 / TILE) | 0;
        const kEnd = tb * TILE + TILE - 1 < kTo ? tb * TILE + TILE - 1 : kTo;
        if (dark[tb] === 1) {
          // a dark tile's cells (see above): not visible (0 already when `zeroed`)
          if (!zeroed) for (let k = k0; k <= kEnd; k++) out[aOffset + k * bStride] = 0;
          cells += kEnd - k0 + 1;
          k0 = kEnd + 1;
          continue;
        }
        const lowHere = low[tb];
        for (let k = k0; k <= kEnd; k++) {
          const idx = aOffset + k * bStride;
          const hc = dem[idx];
          if (hc < lowHere) {
            // below what any radial of the tile could see (see above; never nodata: a tile
            // holding nodata has low = −∞)
            if (!zeroed) out[idx] = 0;
            cells++;
            continue;
          }
          const db = k - bs;
          const x = db * rcf;
          // a guess, moved by one when the exact test says so (written without a branch that the
          // warm-up might never take: its first use would send the loop back to the interpreter)
          let t = Math.round(x * invDa);
          t += (x >= (t + 0.5) * da ? 1 : 0) - (x < (t - 0.5) * da ? 1 : 0); // (x·invDa is within 1e-8 of x/da: one step is all it can be off)
          if (t < T0 || t >= T1) continue;
          // (the radial's sample here is inside the grid, as the cell it owns is within half a
          // cell of it, and inside the radius plus margin when the cell is inside the radius)
          const horizon = st[3 * (t - T0) + 2];
          const minor = db * eMinor;
          if (horizon !== horizon) {
            // the radial ended before this column: no value (inside the radius only after
            // nodata, as past a radial's last column its cells are outside the radius)
            if (zeroed && Math.sqrt(major2 + minor * minor) <= R) out[idx] = 255;
            continue;
          }
          const dc0 = Math.sqrt(major2 + minor * minor); // east² + north², summed in either order: the same bits as sweepRays
          if (dc0 > R) continue;
          const d = dc0 < dMin ? dMin : dc0;
          if (hc === -32768 || hc !== hc) {
            // nodata (INT16_NODATA, or NaN in Float32 elevations)
            failed++;
            if (zeroed) out[idx] = 255;
            continue;
          }
          const v = hc + hr - d * d * k2 - hts > horizon * d ? 1 : 0; // as HorizonVisitor.cell
          // (when `zeroed` the cell is 0 already: a 0 written would only touch its page)
          if (v === 1 || !zeroed) out[idx] = v;
          cells++;
          nVisible += v;
          if (!uniformArea) {
            const cellArea = area[xMajor ? k : a];
            sum += cellArea;
            visible += v * cellArea;
          }
        }
        k0 = kEnd + 1;
      }
      // --- the active radials' samples in this column (as sweepRays) join their horizons; a
      // nodata sample ends the radial ---
      for (let q = 0; q < nActive; q++) {
        const i = active[q];
        const j = 3 * i;
        const horizon = st[j + 2];
        if (horizon !== horizon || m > last[i]) continue;
        const b = bs + da * st[j];
        const ds = da * st[j + 1];
        // radialSample, with its common case — between two cells inside the grid, neither of
        // them nodata — written out here: the same arithmetic, so the same bits
        let hs: number;
        if (b >= 0 && b < bmax) {
          const bf = b | 0; // = Math.floor(b) for b ≥ 0
          const i0 = aOffset + bf * bStride;
          const v0 = dem[i0];
          const v1 = dem[i0 + bStride];
          hs = v0 + (v1 - v0) * (b - bf);
          if (v0 === -32768 || v1 === -32768 || hs !== hs) hs = radialSample(dem, aOffset, b, bmax, bStride, bNext);
        } else hs = radialSample(dem, aOffset, b, bmax, bStride, bNext);
        if (hs !== hs) {
          st[j + 2] = NaN;
          alive--;
          nodataEnds++;
          continue;
        }
        const z = hs - ds * ds * k2 - hts;
        if (z > horizon * ds) st[j + 2] = z / ds; // as HorizonVisitor.sample
      }
    }
    while (iLo < iHi && st[3 * iLo + 2] !== st[3 * iLo + 2]) iLo++;
    while (iHi > iLo && st[3 * iHi - 1] !== st[3 * iHi - 1]) iHi--;
    m0 = mB + 1;
  }
  if (uniformArea) {
    sum = cells * area[0];
    visible = nVisible * area[0];
  }
  sums[0] = cells;
  sums[1] = sum;
  sums[2] = visible;
  sums[3] = nVisible;
  sums[4] = failed;
}

/** Side of the square tiles whose highest cell bounds the samples a radial takes across them (cells). */
export const HORIZON_TILE = 16;
const TILE = HORIZON_TILE;

/** Bytes before the maxima in a horizon tile table's buffer: its four Int32 counters. */
const TABLE_HEADER = 16;

/**
 * The table of the highest elevation in each HORIZON_TILE × HORIZON_TILE tile of a grid
 * (row-major tiles), for horizonSweep, on a SharedArrayBuffer so that the threads of one job
 * share it: four Int32 counters (tile rows taken, tile rows filled, 1 while the elevations
 * are still being read, grid rows read so far), then the Float32 maxima (+∞ for a tile
 * holding nodata). The first sweep fills it (fillTileTable), or threads fill it while the
 * elevations are read (fillHorizonTileTable, horizonTileTableRows).
 */
export function horizonTileTable(width: number, height: number): Float32Array {
  return new Float32Array(new SharedArrayBuffer(TABLE_HEADER + 4 * Math.ceil(width / TILE) * Math.ceil(height / TILE)), TABLE_HEADER);
}

/** The tile table held by a buffer from horizonTileTable (`.buffer`), e.g. one sent to another thread. */
export function horizonTileTableOf(buffer: SharedArrayBuffer): Float32Array {
  return new Float32Array(buffer, TABLE_HEADER);
}

/**
 * Tell the threads filling a tile table (fillHorizonTileTable) how many grid rows of the
 * elevations are read: `reading` true with the first count, before they start (they then wait
 * for the rows each tile row needs), false with the last (every row there is, whether the read
 * ended or failed: they no longer wait).
 */
export function horizonTileTableRows(tiles: Float32Array, rows: number, reading: boolean): void {
  const ctrl = new Int32Array(tiles.buffer, 0, 4);
  Atomics.store(ctrl, 3, rows);
  Atomics.store(ctrl, 2, reading ? 1 : 0);
  // waking a waiting thread costs this one a system call and, on a busy machine, its core:
  // the threads are woken every 128 rows (8 tile rows) and at the end
  if (!reading || (rows & 127) === 0) Atomics.notify(ctrl, 3);
}

/**
 * Fill a grid's horizon tile table on this thread, with any others doing the same (see
 * fillTileTable), as its elevations are read: a tile row is taken up once the grid rows it
 * covers are read (horizonTileTableRows). The sweeps given the table then find it filled.
 */
export function fillHorizonTileTable(tiles: Float32Array, dem: Float32Array | Int16Array, g: SweepGeometry): void {
  fillTileTable(tiles, dem, g);
}

/** Wait until grid rows 0 … rows − 1 are read, or the elevations are no longer being read (see horizonTileTableRows). */
function awaitRows(ctrl: Int32Array, rows: number): void {
  while (Atomics.load(ctrl, 2) === 1) {
    const got = Atomics.load(ctrl, 3);
    if (got >= rows) return;
    Atomics.wait(ctrl, 3, got, 50);
  }
}

/**
 * Fill a horizon tile table unless it is filled: every thread that calls this takes tile rows
 * from the shared counter and fills them (each once its grid rows are read, when the table is
 * filled while they are: see horizonTileTableRows), then waits for the rows others are filling. Only the
 * tiles within the radius plus three cells are read (the samples end 1.5 cells past it and
 * interpolate with the next cell); the others are +∞, which bounds nothing, so the table never
 * decides more than the cells it has read. Elevations (Int16 or Float32) are exact in Float32.
 */
function fillTileTable(tiles: Float32Array, dem: Float32Array | Int16Array, g: SweepGeometry): void {
  const ctrl = new Int32Array(tiles.buffer, 0, 4);
  const W = g.width;
  const H = g.height;
  const across = Math.ceil(W / TILE);
  const rows = Math.ceil(H / TILE);
  if (Atomics.load(ctrl, 1) >= rows) return;
  const ex = Math.abs(g.east_per_col_m[0]);
  const ny = Math.abs(g.north_per_row_m[0]);
  const reach = g.radius_m + 3 * Math.max(ex, ny);
  const row = new Float64Array(across);
  for (;;) {
    const tr = Atomics.add(ctrl, 0, 1);
    if (tr >= rows) break;
    row.fill(Infinity);
    const r0 = tr * TILE;
    const r1 = Math.min(H, r0 + TILE);
    awaitRows(ctrl, r1); // (returns at once unless the elevations are still being read)
    // the tile columns the disc reaches in these rows
    const dy = (g.site_row < r0 ? r0 - g.site_row : g.site_row > r1 - 1 ? g.site_row - (r1 - 1) : 0) * ny;
    if (dy <= reach) {
      const half = Math.sqrt(reach * reach - dy * dy) / ex;
      const tcLo = Math.max(0, Math.floor((Math.floor(g.site_col - half) - 1) / TILE));
      const tcHi = Math.min(across - 1, Math.floor((Math.ceil(g.site_col + half) + 1) / TILE));
      if (tcLo <= tcHi) {
        row.fill(-Infinity, tcLo, tcHi + 1);
        tileRowsMax(dem, r0, r1, W, row, tcLo, tcHi);
      }
    }
    tiles.set(row, tr * across); // (no loop here: this function is not worth compiling)
    Atomics.add(ctrl, 1, 1);
    Atomics.notify(ctrl, 1);
  }
  for (;;) {
    const done = Atomics.load(ctrl, 1);
    if (done >= rows) return;
    Atomics.wait(ctrl, 1, done, 100);
  }
}

/** Raise row[tc] to the highest of the cells of tile columns tcLo…tcHi in grid rows r0…r1−1 (+∞ at nodata). */
function tileRowsMax(dem: Float32Array | Int16Array, r0: number, r1: number, W: number, row: Float64Array, tcLo: number, tcHi: number): void {
  for (let r = r0; r < r1; r++) {
    const offset = r * W;
    for (let tc = tcLo, c0 = tcLo * TILE; tc <= tcHi && c0 < W; tc++, c0 += TILE) {
      let top = row[tc];
      let nodata = 0;
      const c1 = c0 + TILE < W ? c0 + TILE : W;
      for (let c = c0; c < c1; c++) {
        // no branch per cell: the highest (NaN, nodata in Float32, carries through) and whether −32768 (nodata in Int16) occurs
        const v = dem[offset + c];
        top = Math.max(top, v);
        nodata |= v === -32768 ? 1 : 0;
      }
      row[tc] = nodata === 1 || top !== top ? Infinity : top;
    }
  }
}

/**
 * Run the sweep on a small made-up grid until the engine has optimised it for every face, so
 * that a thread about to sweep a large grid does not spend its first chunks in unoptimised
 * code and deoptimise at each new face (about 0.1 s per thread on a 100 km grid). For a pool
 * thread that would otherwise wait while the terrain is read. `elements`: the type of the
 * elevations the real grid will have (Int16 as read from an Int16 GeoTIFF, else Float32), so
 * that the loads are optimised for it. Returns the visible share, so the work cannot be
 * optimised away.
 */
export function warmUpHorizonSweep(passes = 1, elements: "int16" | "float32" = "int16"): number {
  const n = 161; // wide enough for dark tiles (see faceWavefront) beyond the wall below
  const c = (n - 1) / 2;
  const dem = warmUpRelief(n, elements);
  const cell = 30;
  // the site on a cell centre and between centres (a real grid's site seldom is on one)
  const sites = [[c + 0.37, c - 0.29], [c, c]].map(([col, row]): SweepGeometry => ({ width: n, height: n, site_col: col, site_row: row, radius_m: c * cell - 30, east_per_col_m: new Float64Array(n).fill(cell), north_per_row_m: new Float64Array(n).fill(-cell) }));
  const rc = c + 1;
  const out = new Uint8Array(n * n);
  const area = new Float64Array(n).fill(cell * cell);
  const tally = new CoverageTally(Float64Array.of(1));
  const rays = 4 * (2 * rc + 1);
  const p: HorizonParams = { hts_m: 160, receiver_m: 2, k2: 1 / (2 * 8_494_666) };
  // first a few short calls on every face in turn (a small radius), so that the engine's
  // first optimised code already knows all four: each face it learns later costs a compile
  const near = { ...sites[0], radius_m: 12 * cell };
  const perFace = 2 * rc + 1;
  for (let j = 0; j < 4; j++) for (const face of [0, 2, 1, 3]) horizonSweep(near, dem, rc, face * perFace + j * 37, face * perFace + j * 37 + 37, p, out, area, tally, horizonTileTable(n, n), true);
  for (let k = 0; k < passes; k++) {
    // chunks of a few radials, as the pool hands them out, some straddling faces
    // (as `ridgeline coverage` computes, into a raster holding 0 inside the radius — the
    // feedback the first compile gets — then the second site as other callers do)
    sites.forEach((g, i) => {
      const tiles = horizonTileTable(n, n);
      for (let q = 0; q < rays; q += 37) horizonSweep(g, dem, rc, q, Math.min(rays, q + 37), p, out, area, tally, tiles, i === 0);
    });
  }
  const t = tally.data();
  return t.area_m2 > 0 ? t.at_least_m2[0] / t.area_m2 : 0;
}

/**
 * The warm-up's made-up elevations (a function of its own, so that its loops do not get the
 * warm-up itself compiled): rough relief, a wall around half of the centre, so that tiles
 * behind it are dark (every branch of the loop is taken in the warm-up: a branch first taken
 * on the real grid would send it back to the interpreter in the middle of a chunk), and holes
 * inside the radius, so that the nodata branches (a cell that fails, a sample that ends its
 * radial) are known too.
 */
function warmUpRelief(n: number, elements: "int16" | "float32"): Int16Array | Float32Array {
  const c = (n - 1) / 2;
  const dem = elements === "int16" ? new Int16Array(n * n) : new Float32Array(n * n);
  for (let i = 0; i < dem.length; i++) dem[i] = 100 + ((i * 7919) % 61) + (elements === "int16" ? 0 : 0.25);
  for (let r = 0; r < n; r++) {
    for (let col = 0; col < n; col++) {
      const ring = Math.max(Math.abs(col - c), Math.abs(r - c));
      if (ring >= 5 && ring <= 6 && (col > c || r < c)) dem[r * n + col] = 400;
    }
  }
  const nodata = elements === "int16" ? INT16_NODATA : NaN;
  // (one of them south-west of the centre, outside the wall, where radials reach it and end)
  for (const [c0, r0] of [[52, 47], [30, 25], [50, 100]]) for (let r = r0; r < r0 + 2; r++) for (let col = c0; col < c0 + 3; col++) dem[r * n + col] = nodata;
  dem[(c + 3) * n + c + 8] = nodata; // one cell: the radials pass it (a sample takes the nearer cell), the cell fails
  return dem;
}
