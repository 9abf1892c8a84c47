/** Area statistics of computed cells, plain data (sent back from worker threads). */
export interface TallyData {
  /** ground area (m²) of cells whose value is ≥ each threshold, in threshold order */
  at_least_m2: number[];
  /** ground area (m²) of every cell computed inside the radius */
  area_m2: number;
  cells: number;
  /** cells inside the radius that could not be computed (nodata on the profile or the cell) */
  failed: number;
  min: number;
  max: number;
  /** Σ location probability × area (m²) per threshold (P.1812 coverages; zeros otherwise): area reliability × area */
  reliability_m2: number[];
}

/**
 * Accumulates, cell by cell, the area at or above each threshold (ascending), the area
 * computed, and the range of values. One per worker; merged at the end.
 */
export class CoverageTally {
  readonly atLeast: Float64Array;
  readonly reliability: Float64Array;
  area = 0;
  cells = 0;
  failed = 0;
  min = Infinity;
  max = -Infinity;

  constructor(readonly thresholds: Float64Array) {
    this.atLeast = new Float64Array(thresholds.length);
    this.reliability = new Float64Array(thresholds.length);
  }

  /** Start counting afresh (a new chunk of work). */
  reset(): void {
    this.atLeast.fill(0);
    this.reliability.fill(0);
    this.area = 0;
    this.cells = 0;
    this.failed = 0;
    this.min = Infinity;
    this.max = -Infinity;
  }

  add(value: number, area_m2: number): void {
    if (value !== value) {
      this.failed++;
      return;
    }
    this.cells++;
    this.area += area_m2;
    if (value < this.min) this.min = value;
    if (value > this.max) this.max = value;
    const t = this.thresholds;
    for (let j = 0; j < t.length; j++) {
      if (value >= t[j]) this.atLeast[j] += area_m2;
      else break;
    }
  }

  /** Add the sums of cells tallied elsewhere (same thresholds). */
  addSums(s: TallyData): void {
    this.cells += s.cells;
    this.area += s.area_m2;
    this.failed += s.failed;
    for (let j = 0; j < this.atLeast.length; j++) this.atLeast[j] += s.at_least_m2[j];
    for (let j = 0; j < this.reliability.length; j++) this.reliability[j] += s.reliability_m2?.[j] ?? 0;
    if (s.min < this.min) this.min = s.min;
    if (s.max > this.max) this.max = s.max;
  }

  fail(): void {
    this.failed++;
  }

  data(): TallyData {
    return { at_least_m2: Array.from(this.atLeast), area_m2: this.area, cells: this.cells, failed: this.failed, min: this.min, max: this.max, reliability_m2: Array.from(this.reliability) };
  }
}

/** Sum of tallies over the same thresholds. */
export function mergeTallies(parts: TallyData[], nThresholds: number): TallyData {
  const out: TallyData = { at_least_m2: new Array<number>(nThresholds).fill(0), area_m2: 0, cells: 0, failed: 0, min: Infinity, max: -Infinity, reliability_m2: new Array<number>(nThresholds).fill(0) };
  for (const p of parts) {
    for (let j = 0; j < nThresholds; j++) out.at_least_m2[j] += p.at_least_m2[j];
    for (let j = 0; j < nThresholds; j++) out.reliability_m2[j] += p.reliability_m2?.[j] ?? 0;
    out.area_m2 += p.area_m2;
    out.cells += p.cells;
    out.failed += p.failed;
    out.min = Math.min(out.min, p.min);
    out.max = Math.max(out.max, p.max);
  }
  return out;
}
