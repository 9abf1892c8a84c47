import { normalCdf } from "../physics/normal-distribution.ts";
import { terrestrialClutterLoss } from "../physics/terrestrial-clutter-loss.ts";
import type { CoverageJob, P1812Job } from "./coverage-job.ts";
import type { CoverageTally } from "./coverage-tally.ts";
import { patternLoss } from "./level-visitors.ts";
import { newCellLoss, P1812Radial, type P1812CellLoss } from "./p1812-incremental.ts";
import type { RayVisitor } from "./radial-sweep.ts";

/** Percentage of locations one standard deviation above the median: Φ(1) (%). */
const ONE_SIGMA_PCT = 84.134474606854;

/**
 * The extra median loss (dB) and the location standard deviation σ (dB) of a receiver of land
 * class `cls` at `d_m` from the site: the coverage's building entry loss (or none) and the class's
 * σ, plus, where asked, the terrestrial clutter loss of P.2108-1 §3.2 (its median, at least at
 * the method's shortest distance of 0.25 km, and its spread L(Φ(1)) − L(50 %) combined with σ);
 * σ = 0 at sea (P.1812-6 eq. (69)). Written into `out` (no allocation per cell).
 */
export function receiverLocationStats(q: P1812Job, f_ghz: number, cls: number, d_m: number, out: { extra_db: number; sigma_db: number }): void {
  const rxSea = q.sea[cls] === 1;
  let extra = q.extra_median_db;
  let sigma = q.sigma_db[cls];
  if (q.p2108 && !rxSea) {
    const dkm = d_m / 1000 < 0.25 ? 0.25 : d_m / 1000;
    const med = terrestrialClutterLoss(f_ghz, dkm, 50); // P.2108-1 eq. (4), median
    const s = terrestrialClutterLoss(f_ghz, dkm, ONE_SIGMA_PCT) - med; // P.2108-1 σ_cb (one standard deviation)
    extra += med;
    sigma = Math.sqrt(sigma * sigma + s * s);
  }
  out.extra_db = extra;
  out.sigma_db = rxSea ? 0 : sigma; // P.1812-6 eq. (69): no location variability at sea
}

/**
 * Received level (dBm) by ITU-R P.1812-6, evaluated incrementally along each radial
 * (P1812Radial), with clutter from the land cover (or one class), the location term of eq. (69)
 * with σ per receiver class, any building entry loss, and the antenna pattern:
 *   level = EIRP − A_pattern − [max(Lb0p, Lbc + Lloc) + L_extra] + receiver gain,
 *   Lloc = −I(pL/100)·σ (0 for a receiver at sea), L_extra the median building entry loss
 *   (P.2109-1) or terrestrial clutter loss (P.2108-1 §3.2).
 * Also the location probability of each threshold T at the cell: the level at a location is
 * normal about its median (EIRP − … − Lbc − L_extra) with σ, and never above the line-of-sight
 * ceiling (Lb0p), so P(level ≥ T) = Φ((median − T)/σ) where T is below the ceiling, else 0.
 * Writes the level raster, the first threshold's probability raster and the tally (area per
 * threshold, Σ probability × area per threshold).
 */
export class P1812Visitor implements RayVisitor {
  private readonly rad: P1812Radial;
  private readonly q: P1812Job;
  private readonly out: Float32Array;
  private readonly prob: Float32Array;
  private readonly classes: Uint8Array | null;
  private readonly o: P1812CellLoss = newCellLoss();
  private readonly stats = { extra_db: 0, sigma_db: 0 };
  private readonly hts: number;
  private readonly base: number;
  private readonly usePattern: boolean;
  private readonly thresholds: Float64Array;
  private readonly halfDegPerM: number;

  constructor(private readonly job: CoverageJob, capacity: number, private readonly tally: CoverageTally) {
    this.q = job.p1812!;
    this.rad = new P1812Radial(capacity, { f_ghz: job.frequency_ghz, p_pct: this.q.time_pct, polarization: this.q.polarization, ae_m: this.q.ae_m, n0: this.q.n0, clutterFree: this.q.clutter_m.every((h) => h === 0) });
    this.out = new Float32Array(job.out);
    this.prob = new Float32Array(this.q.probability);
    this.classes = this.q.classes ? new Uint8Array(this.q.classes) : null;
    this.hts = job.site_ground_m + job.antenna_m;
    this.base = job.eirp_dbm + job.rx_net_gain_db;
    this.usePattern = job.pattern.horizontal !== null || job.pattern.vertical !== null;
    this.thresholds = job.thresholds_dbm;
    this.halfDegPerM = 0.5 / this.q.m_per_deg_lat;
  }

  startRay(): void {
    this.rad.reset(this.job.site_ground_m, this.hts, this.q.sea[this.q.site_class] === 1);
  }

  sample(d_m: number, h_m: number, nearest_index: number): void {
    const p = this.rad.pH;
    if (p.n > p.capacity) return;
    const cls = this.classes === null ? this.q.default_class : this.classes[nearest_index];
    this.rad.push(d_m, h_m, this.q.clutter_m[cls], this.q.sea[cls] === 1);
  }

  cell(index: number, row: number, d_m: number, h_m: number, east_m: number, north_m: number): void {
    if (h_m !== h_m) return this.tally.fail();
    const q = this.q;
    const cls = this.classes === null ? q.default_class : this.classes[index];
    const rxSea = q.sea[cls] === 1;
    const o = this.o;
    this.rad.evaluate(d_m, h_m, this.job.receiver_m, rxSea, q.site_lat_deg + north_m * this.halfDegPerM, o);
    const stats = this.stats;
    receiverLocationStats(q, this.job.frequency_ghz, cls, d_m, stats);
    const extra = stats.extra_db;
    const sigma = stats.sigma_db;
    let top = this.base - extra;
    if (this.usePattern) top -= patternLoss(this.job, d_m, h_m + this.job.receiver_m - this.hts, 1 / (2 * q.ae_m), east_m, north_m);
    const Lloc = q.loc_factor * sigma; // P.1812-6 eq. (69) (location term)
    const Lb = o.Lbc + Lloc > o.Lb0p ? o.Lbc + Lloc : o.Lb0p; // P.1812-6 eq. (69)
    const level = top - Lb;
    if (level !== level) return this.tally.fail();
    this.out[index] = level;
    const area = this.job.cell_area_m2[row];
    this.tally.add(level, area);
    // location probability per threshold (the level's normal spread about its median, capped at the line-of-sight level)
    const median = top - o.Lbc;
    const ceiling = top - o.Lb0p;
    const t = this.thresholds;
    const rel = this.tally.reliability;
    for (let j = 0; j < t.length; j++) {
      const T = t[j];
      const P = T > ceiling ? 0 : sigma > 0 ? normalCdf((median - T) / sigma) : median >= T ? 1 : 0;
      rel[j] += P * area;
      if (j === 0) this.prob[index] = P;
    }
  }
}
