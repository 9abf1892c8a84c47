import { INT16_NODATA } from "../../terrain/tiff-band-reader.ts";
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
 * @param out visibility raster (1 visible, 0 not), written for the cells these radials own
 * @param area ground area of a cell per row (m²)
 */
export function horizonSweep(g: SweepGeometry, dem: Float32Array | Int16Array, rc: number, q0: number, q1: number, p: HorizonParams, out: Uint8Array, area: Float64Array, tally: CoverageTally): void {
  const xs = g.site_col;
  const ys = g.site_row;
  const W = g.width;
  const H = g.height;
  const perFace = 2 * rc + 1;
  const { dMin } = siteMetric(g);
  if (q0 === 0 && Number.isInteger(xs) && Number.isInteger(ys) && xs >= 0 && xs < W && ys >= 0 && ys < H) {
    // the cell holding the site, with no samples before it (as sweepRays)
    const hc = dem[ys * W + xs];
    if (hc === INT16_NODATA || hc !== hc) tally.fail();
    else {
      const v = (hc + p.receiver_m - dMin * dMin * p.k2 - p.hts_m) / dMin > -Infinity ? 1 : 0;
      out[ys * W + xs] = v;
      tally.add(v, area[ys]);
    }
  }
  for (let face = Math.floor(q0 / perFace); face * perFace < q1; face++) {
    const from = Math.max(q0, face * perFace) - face * perFace - rc;
    const to = Math.min(q1, (face + 1) * perFace) - face * perFace - rc;
    if (to > from) faceWavefront(g, dem, rc, face, from, to, p, out, area, tally);
  }
}

/** The radials t = t0…t1−1 of one face (0 east, 1 west, 2 south, 3 north in grid terms), as one wavefront. */
function faceWavefront(g: SweepGeometry, dem: Float32Array | Int16Array, rc: number, face: number, t0: number, t1: number, p: HorizonParams, out: Uint8Array, area: Float64Array, tally: CoverageTally): void {
  const W = g.width;
  const xs = g.site_col;
  const ys = g.site_row;
  const R = g.radius_m;
  const { ex: EXr, ny: NYr, margin, dMin } = siteMetric(g);
  const { hts_m: hts, receiver_m: hr, k2 } = p;
  const { xMajor, sgn, as, bs, bmax, aStride, bStride, bNext, aStart, mMax } = faceAxes(g, face);

  const n = t1 - t0;
  const slope = new Float64Array(n);
  const stepLen = new Float64Array(n);
  const horizon = new Float64Array(n).fill(-Infinity);
  // 1: the radial has not ended; 0: ended (left the grid or the radius, or met nodata)
  const live = new Uint8Array(n).fill(1);
  let alive = n;
  // radials below iLo and from iHi on have ended (the outermost end first, as they leave the grid or the radius first)
  let iLo = 0;
  let iHi = n;
  for (let i = 0; i < n; i++) {
    const s = (t0 + i) / rc;
    slope[i] = s;
    stepLen[i] = xMajor ? Math.hypot(EXr, s * NYr) : Math.hypot(s * EXr, NYr);
  }
  let sum = 0; // tallied locally, added to the tally in the same order at the end
  let visible = 0;
  let cells = 0;
  let nVisible = 0;
  let failed = 0;

  for (let m = 1; m <= mMax && alive > 0; m++) {
    const a = aStart + sgn * m;
    const da = (a - as) * sgn;
    const aOffset = a * aStride;
    // --- the cells of this column the radials own: k with t − ½ ≤ (k − bs)·rc/da < t + ½,
    // visited when the owning radial reaches this column (as sweepRays: it has not ended
    // before), against its horizon over the columns before ---
    const invDa = 1 / da;
    let kFrom = Math.floor(bs + ((t0 - 0.5) * da) / rc) - 1;
    let kTo = Math.ceil(bs + ((t1 - 0.5) * da) / rc) + 1;
    if (kFrom < 0) kFrom = 0;
    if (kTo > bmax) kTo = bmax;
    for (let k = kFrom; k <= kTo; k++) {
      const db = k - bs;
      const adb = db < 0 ? -db : db;
      if (xMajor ? adb > da : adb >= da) continue;
      const x = db * rc;
      let t = Math.round(x * invDa); // a guess, corrected by the exact test below
      if (!(x >= (t - 0.5) * da)) t--;
      else if (!(x < (t + 0.5) * da)) t++;
      if (t < t0 || t >= t1 || !(x >= (t - 0.5) * da && x < (t + 0.5) * da)) continue;
      const i = t - t0;
      // (the radial's sample here is inside the grid, as the cell it owns is within half a
      // cell of it, and inside the radius plus margin when the cell is inside the radius)
      if (live[i] === 0) continue;
      const cc = xMajor ? a : k;
      const cr = xMajor ? k : a;
      const ce = (cc - xs) * EXr;
      const cn = (cr - ys) * NYr;
      const dc0 = Math.sqrt(ce * ce + cn * cn);
      if (dc0 > R) continue;
      const d = dc0 < dMin ? dMin : dc0;
      const idx = cr * W + cc;
      const hc = dem[idx];
      if (hc === INT16_NODATA || hc !== hc) {
        failed++;
        continue;
      }
      const v = (hc + hr - d * d * k2 - hts) / d > horizon[i] ? 1 : 0; // as HorizonVisitor.cell
      out[idx] = v;
      cells++;
      sum += area[cr];
      if (v === 1) {
        visible += area[cr];
        nVisible++;
      }
    }
    // --- each radial's sample in this column (as sweepRays) joins its horizon; leaving the
    // grid or the radius, or a nodata sample, ends the radial ---
    for (let i = iLo; i < iHi; i++) {
      if (live[i] === 0) continue;
      const b = bs + da * slope[i];
      const ds = da * stepLen[i];
      if (b < -0.5 || b > bmax + 0.5 || ds - margin > R) {
        live[i] = 0;
        alive--;
        continue;
      }
      const hs = radialSample(dem, aOffset, b, bmax, bStride, bNext);
      if (hs !== hs) {
        live[i] = 0;
        alive--;
        continue;
      }
      const sp = (hs - ds * ds * k2 - hts) / ds; // as HorizonVisitor.sample
      if (sp > horizon[i]) horizon[i] = sp;
    }
    while (iLo < iHi && live[iLo] === 0) iLo++;
    while (iHi > iLo && live[iHi - 1] === 0) iHi--;
  }
  tally.addSums({ cells, area_m2: sum, at_least_m2: [visible], failed, min: nVisible < cells ? 0 : cells > 0 ? 1 : Infinity, max: nVisible > 0 ? 1 : cells > 0 ? 0 : -Infinity });
}

/**
 * Run the sweep on a small made-up grid until the engine has optimised it for every face, so
 * that a thread about to sweep a large grid does not spend its first chunks in unoptimised
 * code and deoptimise at each new face (about 0.1 s per thread on a 100 km grid). For a pool
 * thread that would otherwise wait while the terrain is read. Int16 elevations, as read from
 * an Int16 GeoTIFF. Returns the visible share, so the work cannot be optimised away.
 */
export function warmUpHorizonSweep(passes = 10): number {
  const n = 81;
  const c = (n - 1) / 2;
  const dem = new Int16Array(n * n);
  for (let i = 0; i < dem.length; i++) dem[i] = 100 + ((i * 7919) % 61); // rough made-up relief
  dem[5 * n + 7] = INT16_NODATA; // and one hole, so that branch is known too
  const cell = 30;
  const g: SweepGeometry = { width: n, height: n, site_col: c, site_row: c, radius_m: c * cell, east_per_col_m: new Float64Array(n).fill(cell), north_per_row_m: new Float64Array(n).fill(-cell) };
  const rc = c + 1;
  const out = new Uint8Array(n * n);
  const area = new Float64Array(n).fill(cell * cell);
  const tally = new CoverageTally(Float64Array.of(1));
  const rays = 4 * (2 * rc + 1);
  const p: HorizonParams = { hts_m: 160, receiver_m: 2, k2: 1 / (2 * 8_494_666) };
  for (let k = 0; k < passes; k++) {
    // chunks of a few radials, as the pool hands them out, some straddling faces
    for (let q = 0; q < rays; q += 37) horizonSweep(g, dem, rc, q, Math.min(rays, q + 37), p, out, area, tally);
  }
  const t = tally.data();
  return t.area_m2 > 0 ? t.at_least_m2[0] / t.area_m2 : 0;
}
