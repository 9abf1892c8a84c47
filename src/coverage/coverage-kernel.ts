import type { CoverageJob } from "./coverage-job.ts";
import { elevationAt, type Elevations } from "./elevation-window.ts";
import { horizonSweep, horizonSweepApplies, horizonTileTable, horizonTileTableOf, lineOfSightOnly } from "./horizon-sweep.ts";
import { CoverageTally, type TallyData } from "./coverage-tally.ts";
import { ClearanceVisitor, DeltaBullingtonVisitor, HorizonVisitor, patternLoss } from "./level-visitors.ts";
import { P1812Visitor } from "./p1812-visitor.ts";
import { maxSamplesPerRay, rayCount, sweepRays, type RayVisitor } from "./radial-sweep.ts";

/** Units of work of a job: radials for the swept methods, rows for Hata. */
export function coverageUnits(job: CoverageJob): number {
  return job.method === "hata" ? job.height : rayCount(job.rc);
}

/**
 * The computation of one job in one thread: `run(from, to)` computes units from…to−1 into
 * the shared result and returns the tally of the cells it wrote. Used by the worker threads
 * and, for small jobs, in the calling thread.
 */
export function createChunkRunner(job: CoverageJob): { run(from: number, to: number): TallyData } {
  const dem: Elevations = job.dem_int16 ? new Int16Array(job.dem, 0, job.width * job.height) : new Float32Array(job.dem, 0, job.width * job.height);
  if (job.method === "hata") {
    return {
      run(from, to) {
        const tally = new CoverageTally(job.thresholds_dbm);
        hataRows(job, dem, from, to, tally);
        return tally.data();
      },
    };
  }
  const tally = new CoverageTally(job.thresholds_dbm);
  if (lineOfSightOnly(job.method, job.clearance_f1) && horizonSweepApplies(job)) {
    // geometric line of sight on a projected grid: the same sweep in one loop (horizon-sweep.ts)
    const params = { hts_m: job.site_ground_m + job.antenna_m, receiver_m: job.receiver_m, k2: job.ae_m === Infinity ? 0 : 1 / (2 * job.ae_m) };
    const out = new Uint8Array(job.out);
    const tiles = job.dem_tile_max ? horizonTileTableOf(job.dem_tile_max) : horizonTileTable(job.width, job.height);
    return {
      run(from, to) {
        tally.reset();
        horizonSweep(job, dem, job.rc, from, to, params, out, job.cell_area_m2, tally, tiles, job.out_zeroed === true);
        return tally.data();
      },
    };
  }
  const capacity = maxSamplesPerRay(job);
  const visitor: RayVisitor =
    job.method === "p1812"
      ? new P1812Visitor(job, capacity, tally)
      : job.method === "delta-bullington"
      ? new DeltaBullingtonVisitor(job, capacity, tally)
      : job.clearance_f1 > 0
        ? new ClearanceVisitor(job, capacity, tally)
        : new HorizonVisitor(job, tally);
  return {
    run(from, to) {
      tally.reset();
      sweepRays(job, dem, job.rc, from, to, visitor);
      return tally.data();
    },
  };
}

/**
 * Okumura–Hata / COST-231 Hata levels of rows from…to−1: loss = A + B·log10(d_km), A and B
 * taken from `hataLoss` at 1 and 10 km (the formulas are affine in log d), so each cell costs
 * one logarithm. Distances below half a cell are taken as half a cell. Terrain enters only
 * through the elevation angle of the antenna pattern (flat where the DEM has no data).
 */
function hataRows(job: CoverageJob, dem: Elevations, from: number, to: number, tally: CoverageTally): void {
  const out = new Float32Array(job.out);
  const W = job.width;
  const R = job.radius_m;
  const hts = job.site_ground_m + job.antenna_m;
  const k2 = job.ae_m === Infinity ? 0 : 1 / (2 * job.ae_m);
  const usePattern = job.pattern.horizontal !== null || job.pattern.vertical !== null;
  const base = job.eirp_dbm + job.rx_net_gain_db;
  for (let r = from; r < to; r++) {
    const ny = (r - job.site_row) * job.north_per_row_m[r];
    const ex = job.east_per_col_m[r];
    const dmin = 0.5 * Math.min(Math.abs(ex), Math.abs(job.north_per_row_m[r]));
    const area = job.cell_area_m2[r];
    for (let c = 0; c < W; c++) {
      const e = (c - job.site_col) * ex;
      const d0 = Math.sqrt(e * e + ny * ny);
      if (d0 > R) continue;
      const d = d0 < dmin ? dmin : d0;
      let level = base - job.hata_A_db - job.hata_B_db * Math.log10(d / 1000); // Hata (1980) / COST 231 §4.4.1, affine in log d
      if (usePattern) {
        const hc = elevationAt(dem, r * W + c);
        const dh = hc === hc ? hc + job.receiver_m - hts : job.receiver_m - job.antenna_m;
        level -= patternLoss(job, d, dh, k2, e, ny);
      }
      out[r * W + c] = level;
      tally.add(level, area);
    }
  }
}
