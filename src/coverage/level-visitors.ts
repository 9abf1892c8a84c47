import { deltaBullingtonIncremental, nuExceeds, type DeltaBullingtonConstants } from "./delta-bullington-incremental.ts";
import { patternAttenuationDb } from "./antenna-pattern.ts";
import type { CoverageJob } from "./coverage-job.ts";
import type { CoverageTally } from "./coverage-tally.ts";
import { RadialProfile } from "./radial-profile.ts";
import type { RayVisitor } from "./radial-sweep.ts";

const DEG = 180 / Math.PI;

/**
 * Radio line of sight with Earth curvature at k (pure geometry): a cell is visible when the
 * receiver, in the flat-Earth frame z = h − d²/(2ae), lies above the steepest slope from the
 * antenna to every sample before it — the running horizon of the radial. (Equivalent to
 * Stim < Str of P.526-15 §4.5.1.) Writes 1/0 into a Uint8 raster.
 */
export class HorizonVisitor implements RayVisitor {
  private maxSlope = -Infinity;
  private readonly hts: number;
  private readonly k2: number;
  private readonly hr: number;
  private readonly out: Uint8Array;
  private readonly area: Float64Array;

  constructor(job: CoverageJob, private readonly tally: CoverageTally) {
    this.hts = job.site_ground_m + job.antenna_m;
    this.k2 = job.ae_m === Infinity ? 0 : 1 / (2 * job.ae_m);
    this.hr = job.receiver_m;
    this.out = new Uint8Array(job.out);
    this.area = job.cell_area_m2;
  }

  startRay(): void {
    this.maxSlope = -Infinity;
  }

  // Slopes are compared multiplied out (z > slope·d rather than z/d > slope, d > 0), which
  // divides only when the horizon rises; horizon-sweep.ts compares alike, to the bit.
  sample(d_m: number, h_m: number): void {
    const z = h_m - d_m * d_m * this.k2 - this.hts;
    if (z > this.maxSlope * d_m) this.maxSlope = z / d_m;
  }

  cell(index: number, row: number, d_m: number, h_m: number): void {
    if (h_m !== h_m) return this.tally.fail();
    const v = h_m + this.hr - d_m * d_m * this.k2 - this.hts > this.maxSlope * d_m ? 1 : 0;
    this.out[index] = v;
    this.tally.add(v, this.area[row]);
  }
}

/**
 * Line of sight with a required clearance of f·F1 over every sample: visible when the
 * geometric line of sight holds and max ν ≤ −√2·f, ν the Fresnel–Kirchhoff parameter of each
 * sample against the Tx–Rx line (P.526-15 eq. (22) with the Earth bulge of §4.5.1, since
 * ν = √2·h/F1). Writes 1/0 into a Uint8 raster.
 */
export class ClearanceVisitor implements RayVisitor {
  private readonly p: RadialProfile;
  private readonly hts: number;
  private readonly nuLimit: number;
  private readonly out: Uint8Array;

  constructor(private readonly job: CoverageJob, capacity: number, private readonly tally: CoverageTally) {
    this.p = new RadialProfile(capacity);
    this.hts = job.site_ground_m + job.antenna_m;
    this.nuLimit = -Math.SQRT2 * job.clearance_f1;
    this.out = new Uint8Array(job.out);
  }

  startRay(): void {
    this.p.reset(this.job.site_ground_m, this.hts, this.job.ae_m);
  }

  sample(d_m: number, h_m: number): void {
    if (this.p.n <= this.p.capacity) this.p.push(d_m, h_m);
  }

  cell(index: number, row: number, d_m: number, h_m: number): void {
    if (h_m !== h_m) return this.tally.fail();
    const p = this.p;
    const hrs = h_m + this.job.receiver_m;
    const sR = (hrs - d_m * d_m * p.invTwoAe - this.hts) / d_m;
    const v = p.n > 1 && !(p.maxSlopeZ < sR) ? 0 : nuExceeds(p, d_m, hrs, this.job.lambda_m, this.nuLimit) ? 0 : 1;
    this.out[index] = v;
    this.tally.add(v, this.job.cell_area_m2[row]);
  }
}

/**
 * Received level (dBm) by free space (P.525-4) + delta-Bullington diffraction (P.526-15 §4.5,
 * evaluated incrementally) + gases (P.676 specific attenuation × distance), with the antenna
 * pattern: level = EIRP − A_pattern − Lbf − Ld − γ·d + receiver gain.
 */
export class DeltaBullingtonVisitor implements RayVisitor {
  private readonly p: RadialProfile;
  private readonly hts: number;
  private readonly out: Float32Array;
  private readonly c: DeltaBullingtonConstants;
  private readonly fslConst: number;
  private readonly base: number;
  private readonly usePattern: boolean;

  constructor(private readonly job: CoverageJob, capacity: number, private readonly tally: CoverageTally) {
    this.p = new RadialProfile(capacity);
    this.hts = job.site_ground_m + job.antenna_m;
    this.out = new Float32Array(job.out);
    this.c = { lambda_m: job.lambda_m, ae_m: job.ae_m, ground: job.ground };
    this.fslConst = 20 * Math.log10((4 * Math.PI) / job.lambda_m); // P.525-4 eq. (4): 20·log10(4π/λ) + 20·log10(d)
    this.base = job.eirp_dbm + job.rx_net_gain_db;
    this.usePattern = job.pattern.horizontal !== null || job.pattern.vertical !== null;
  }

  startRay(): void {
    this.p.reset(this.job.site_ground_m, this.hts, this.job.ae_m);
  }

  sample(d_m: number, h_m: number): void {
    if (this.p.n <= this.p.capacity) this.p.push(d_m, h_m);
  }

  cell(index: number, row: number, d_m: number, h_m: number, east_m: number, north_m: number): void {
    if (h_m !== h_m) return this.tally.fail();
    const hrs = h_m + this.job.receiver_m;
    const Ld = deltaBullingtonIncremental(this.p, d_m, h_m, hrs, this.c);
    const Lbf = this.fslConst + 20 * Math.log10(d_m); // P.525-4 eq. (4)
    let level = this.base - Lbf - Ld - (this.job.gamma_db_km * d_m) / 1000;
    if (this.usePattern) level -= patternLoss(this.job, d_m, hrs - this.hts, this.p.invTwoAe, east_m, north_m);
    if (level !== level) return this.tally.fail();
    this.out[index] = level;
    this.tally.add(level, this.job.cell_area_m2[row]);
  }
}

/** Pattern attenuation (dB) toward a receiver dh_m above the antenna at d_m, offset east/north. */
export function patternLoss(job: CoverageJob, d_m: number, dh_m: number, invTwoAe: number, east_m: number, north_m: number): number {
  const az = Math.atan2(east_m, north_m) * DEG + job.azimuth_offset_deg;
  const el = Math.atan2(dh_m - d_m * d_m * invTwoAe, d_m) * DEG;
  return patternAttenuationDb(job.pattern, az, el);
}
