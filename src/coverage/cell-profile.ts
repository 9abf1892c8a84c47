import type { CoverageJob } from "./coverage-job.ts";
import type { Elevations } from "./elevation-window.ts";
import { rayCount, sweepRays, type RayVisitor } from "./radial-sweep.ts";

/** The profile a coverage sweep gives one cell: samples of its radial before it, and the cell. */
export interface CellProfile {
  /** sample distances from the site (m), heights (m amsl), nearest grid cell of each sample */
  d_m: number[];
  h_m: number[];
  nearest: number[];
  /** the cell as the receiver */
  cell: { index: number; d_m: number; h_m: number; east_m: number; north_m: number };
}

class Recorder implements RayVisitor {
  d: number[] = [];
  h: number[] = [];
  near: number[] = [];
  found: CellProfile | null = null;
  constructor(private readonly target: number) {}
  startRay(): void {
    this.d = [];
    this.h = [];
    this.near = [];
  }
  sample(d_m: number, h_m: number, nearest_index: number): void {
    this.d.push(d_m);
    this.h.push(h_m);
    this.near.push(nearest_index);
  }
  cell(index: number, _row: number, d_m: number, h_m: number, east_m: number, north_m: number): void {
    if (index === this.target && this.found === null) this.found = { d_m: [...this.d], h_m: [...this.h], nearest: [...this.near], cell: { index, d_m, h_m, east_m, north_m } };
  }
}

/**
 * The radial profile the sweep (radial-sweep.ts) uses for the cell at (col, row): found by
 * sweeping the radials that can own it (the one its direction points at and its neighbours;
 * all radials if none does). For checks and per-site tables, which evaluate the full-profile
 * method on exactly the geometry of the raster.
 * @returns null when the cell is outside the radius or never visited
 */
export function cellProfile(job: CoverageJob, dem: Elevations, col: number, row: number): CellProfile | null {
  const rec = new Recorder(row * job.width + col);
  const [lo, hi] = candidateRays(job, col, row);
  sweepRays(job, dem, job.rc, lo, hi, rec);
  if (rec.found === null) sweepRays(job, dem, job.rc, 0, rayCount(job.rc), rec);
  return rec.found;
}

/** The sweep's radials that can own the cell at (col, row): the one its direction points at and its neighbours, as [first, end). */
function candidateRays(job: CoverageJob, col: number, row: number): [number, number] {
  const rc = job.rc;
  const per = 2 * rc + 1;
  const dx = col - job.site_col;
  const dy = row - job.site_row;
  const xMajor = Math.abs(dy) <= Math.abs(dx);
  const face = xMajor ? (dx > 0 ? 0 : 1) : dy > 0 ? 2 : 3;
  const da = Math.abs(xMajor ? dx : dy);
  const t = da > 0 ? Math.round(((xMajor ? dy : dx) * rc) / da) : 0;
  const q = face * per + t + rc;
  const lo = Math.max(face * per, q - 1);
  const hi = Math.min(face * per + per, q + 2);
  return [lo === face * per && face === 0 ? 0 : lo, hi];
}

/** A whole radial of the sweep: its terrain samples and every cell it owns, in order of distance. */
export interface RayProfile {
  /** sample distances from the site (m), heights (m amsl), nearest grid cell of each sample */
  d_m: number[];
  h_m: number[];
  nearest: number[];
  /** the cells the radial owns: each with the number of samples before it (its inner profile is the first `inner` samples) */
  cells: { index: number; d_m: number; h_m: number; east_m: number; north_m: number; inner: number }[];
}

class RayRecorder implements RayVisitor {
  d: number[] = [];
  h: number[] = [];
  near: number[] = [];
  cells: RayProfile["cells"] = [];
  found: RayProfile | null = null;
  /** the radial that owns the target has ended: ignore the rest of the sweep */
  done = false;
  constructor(private readonly target: number) {}
  startRay(): void {
    if (this.found !== null) this.done = true;
    else (this.d = []), (this.h = []), (this.near = []), (this.cells = []);
  }
  sample(d_m: number, h_m: number, nearest_index: number): void {
    if (this.done) return;
    this.d.push(d_m);
    this.h.push(h_m);
    this.near.push(nearest_index);
  }
  cell(index: number, _row: number, d_m: number, h_m: number, east_m: number, north_m: number): void {
    if (this.done) return;
    this.cells.push({ index, d_m, h_m, east_m, north_m, inner: this.d.length });
    if (index === this.target) this.found = { d_m: this.d, h_m: this.h, nearest: this.near, cells: this.cells };
  }
}

/**
 * The whole radial of the sweep (radial-sweep.ts) that owns the cell at (col, row), with every
 * cell it owns: the profiles the coverage method used along one line from the site, for checks
 * that follow a radial (coverage-wave-check.ts).
 * @param options.searchAll sweep every radial when none of the cell's candidates owns it (default true;
 *   false returns null at once, for a caller that will try a nearer cell: a cell beyond nodata or the grid's edge is never visited)
 * @returns null when the cell is outside the radius or never visited
 */
export function rayProfile(job: CoverageJob, dem: Elevations, col: number, row: number, options: { searchAll?: boolean } = {}): RayProfile | null {
  const rec = new RayRecorder(row * job.width + col);
  const [lo, hi] = candidateRays(job, col, row);
  sweepRays(job, dem, job.rc, lo, hi, rec);
  if (rec.found === null && options.searchAll !== false) sweepRays(job, dem, job.rc, 0, rayCount(job.rc), rec);
  return rec.found;
}
