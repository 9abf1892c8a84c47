import { beta0PctWithTau, EARTH_RADIUS_BETA_KM, inlandTau } from "../physics/itu-path-geometry.ts";
import {
  newP1812CellOutput,
  p1812CellConstants,
  p1812CellLoss,
  p1812DuctingLowerBound,
  p1812LineOfSight,
  P1812_DEFAULTS,
  type P1812CellConstants,
  type P1812CellInput,
  type P1812CellOutput,
} from "../physics/p1812.ts";
import { diffractionLossForTime } from "../physics/delta-bullington.ts";
import { sphericalEarthDiffractionLoss, type SphericalEarthResult } from "../physics/spherical-earth-diffraction.ts";
import { bullingtonActualIncremental, nuMaxLineOfSight } from "./delta-bullington-incremental.ts";
import { BLOCK1, BLOCK2, hullHighestAboveSlope, hullTangentFromRight, RadialProfile } from "./radial-profile.ts";
import { smoothBullington } from "./smooth-bullington.ts";

/** Per-coverage constants of the incremental P.1812-6 evaluation. */
export interface P1812Constants {
  f_ghz: number;
  /** time percentage p (%) */
  p_pct: number;
  polarization: "h" | "v";
  /** median effective Earth radius ae (m), from ΔN */
  ae_m: number;
  /** sea-level surface refractivity N0 */
  n0: number;
  /** true when every clutter height is 0: the clutter profile g is then the terrain h, kept once */
  clutterFree?: boolean;
  /**
   * true: always compute the ducting loss Lba and hm. Default false: where a lower bound of Lba
   * is above Lbd = Lb0p + Ldp, Lba cannot change Lbc (p1812DuctingLowerBound in p1812.ts):
   * Lba is then that bound and hm is NaN; Lbc and Lb are the same.
   */
  exact?: boolean;
}

/** What one cell's evaluation gives (dB unless named), filled in place. */
export interface P1812CellLoss {
  /** blended clear-air loss Lbc (eq. (63)), before the location term */
  Lbc: number;
  /** line-of-sight loss with the time enhancement Lb0p (eq. (10)): the floor of Lb (eq. (69)) */
  Lb0p: number;
  Lbfs: number;
  Ld50: number;
  Ldp: number;
  Lbs: number;
  /** ducting loss, or a lower bound of it ≥ Lbd where it cannot change Lbc (see P1812Constants.exact) */
  Lba: number;
  theta_mrad: number;
  dlt_km: number;
  dlr_km: number;
  /** terrain roughness hm (m); NaN where the ducting loss was left out */
  hm_m: number;
  beta0_pct: number;
  omega: number;
  transhorizon: boolean;
}

export function newCellLoss(): P1812CellLoss {
  return { Lbc: NaN, Lb0p: NaN, Lbfs: NaN, Ld50: NaN, Ldp: NaN, Lbs: NaN, Lba: NaN, theta_mrad: NaN, dlt_km: NaN, dlr_km: NaN, hm_m: NaN, beta0_pct: NaN, omega: NaN, transhorizon: false };
}

/**
 * Runs of points in or out of a zone along a radial (P.1812-6 §3.6, Table 5): the longest run
 * and the total length of the runs, each run extended by half the spacing to its neighbours
 * outside it — what `longestZoneSectionKm` and `seaFraction` (src/physics/itu-path-geometry.ts)
 * compute over a whole profile, kept as the radial grows. Distances in m.
 */
class ZoneRuns {
  private doneBest = 0;
  private doneTotal = 0;
  private lastIn = false;
  private lastD = 0;
  private startD = 0;
  private startExt = 0;
  best = 0;
  total = 0;

  reset(inZone: boolean): void {
    this.doneBest = 0;
    this.doneTotal = 0;
    this.lastIn = inZone;
    this.lastD = 0;
    this.startD = 0;
    this.startExt = 0;
  }

  push(d: number, inZone: boolean): void {
    if (this.lastIn && !inZone) {
      const len = this.lastD - this.startD + this.startExt + (d - this.lastD) / 2;
      if (len > this.doneBest) this.doneBest = len;
      this.doneTotal += len;
    } else if (!this.lastIn && inZone) {
      this.startD = d;
      this.startExt = (d - this.lastD) / 2;
    }
    this.lastIn = inZone;
    this.lastD = d;
  }

  /** best and total with a last point at d (the receiver). */
  finish(d: number, inZone: boolean): void {
    let cur = 0;
    if (this.lastIn) cur = inZone ? d - this.startD + this.startExt : this.lastD - this.startD + this.startExt + (d - this.lastD) / 2;
    else if (inZone) cur = (d - this.lastD) / 2;
    this.best = cur > this.doneBest ? cur : this.doneBest;
    this.total = this.doneTotal + cur;
  }
}

/**
 * One radial of a P.1812-6 coverage, grown a sample at a time, from which the basic
 * transmission loss of ITU-R P.1812-6 §4 is evaluated for a receiver beyond the last sample
 * without revisiting the samples:
 * - `pH`, the terrain heights h (frame of ae): horizon angles and distances (Attachment 1
 *   eq. (76)–(82): running maximum and its index for θt/dlt, hull tangent from the receiver for
 *   θr/dlr, bounded νmax search for a line-of-sight path's dlt), the least-squares smooth
 *   surface and hobs/αobt/αobr (eq. (83)–(89)), and the terrain roughness hm over the horizon
 *   interval (eq. (93), block maxima bound the search);
 * - `pG`, terrain plus representative clutter heights g (terminals bare, §3.2), frame of ae:
 *   the Bullington loss of the actual profile for Ld50; `pGb` the same in the frame of aβ for
 *   Ldβ (only when p < 50 %);
 * - zone runs (sea / land) for ω, dtm and dlm (§3.6, Table 5): only sea (from a land cover's
 *   water class) and inland zones are told apart.
 * The scalar parts (Lb0p, Ldp, Lbs, Lba, blending) are `p1812CellLoss` of src/physics/p1812.ts.
 * Preallocated once per worker; `reset` starts a radial. The result equals `p1812Loss` on the
 * same profile to rounding (test/coverage/p1812-coverage.test.ts).
 */
export class P1812Radial {
  readonly pH: RadialProfile;
  readonly pG: RadialProfile;
  readonly pGb: RadialProfile;
  private readonly land = new ZoneRuns();
  private readonly sea = new ZoneRuns();
  private readonly needBeta: boolean;
  private readonly lambda: number;
  private readonly aeB_m = EARTH_RADIUS_BETA_KM * 1000;
  private txSea = false;
  /** the last running maximum slope seen and its angle θt (mrad) */
  private slopeT = NaN;
  private thetaTmax = NaN;
  private readonly cell: P1812CellInput;
  private readonly out: P1812CellOutput = newP1812CellOutput();
  private readonly k: P1812CellConstants;
  private readonly sphOpts: { omega: number; polarization: "h" | "v"; frequency_ghz: number };
  /** maxima of the terrain height h over blocks of BLOCK1 and BLOCK2 samples (bounds for hm) */
  private readonly hMax1: Float64Array;
  private readonly hMax2: Float64Array;

  constructor(capacity: number, private readonly c: P1812Constants) {
    this.hMax1 = new Float64Array(Math.ceil((capacity + 2) / BLOCK1) + 1);
    this.hMax2 = new Float64Array(Math.ceil((capacity + 2) / BLOCK2) + 1);
    this.pH = new RadialProfile(capacity);
    this.pG = c.clutterFree ? this.pH : new RadialProfile(capacity);
    this.pGb = new RadialProfile(capacity);
    this.needBeta = c.p_pct < 50;
    this.lambda = 0.2998 / c.f_ghz; // as P.1812-6 and src/physics/p1812.ts take it
    // the location term is applied by the caller (σ per receiver class): pL = 50 % here
    this.cell = {
      frequency_ghz: c.f_ghz, time_pct: c.p_pct, location_pct: 50, sigma_l_db: 0, d_km: 0, hts_m: 0, hrs_m: 0, theta_t_mrad: 0, theta_r_mrad: 0, theta_mrad: 0,
      dlt_km: 0, dlr_km: 0, hte_m: 0, hre_m: 0, hm_m: 0, omega: 0, beta0_pct: 0, ae_km: c.ae_m / 1000, dlm_km: 0, dct_km: 0, dcr_km: 0, n0: c.n0, rx_at_sea: false, Ld50_db: 0, Ldbeta_db: 0,
    };
    this.sphOpts = { omega: 0, polarization: c.polarization, frequency_ghz: c.f_ghz };
    this.k = p1812CellConstants(c.f_ghz, c.p_pct, c.n0, c.ae_m / 1000);
  }

  /** Start a radial: ground at the site (m amsl), antenna (m amsl), whether the site is at sea. */
  reset(ground_m: number, hts_m: number, txSea: boolean): void {
    this.pH.reset(ground_m, hts_m, this.c.ae_m);
    if (this.pG !== this.pH) this.pG.reset(ground_m, hts_m, this.c.ae_m);
    if (this.needBeta) this.pGb.reset(ground_m, hts_m, this.aeB_m);
    this.land.reset(!txSea);
    this.sea.reset(txSea);
    this.txSea = txSea;
  }

  /** Append a sample: distance (m), ground (m amsl), representative clutter height (m), at sea. */
  push(d_m: number, h_m: number, clutter_m: number, atSea: boolean): void {
    const i = this.pH.n;
    const b1 = (i / BLOCK1) | 0;
    if (i % BLOCK1 === 0 || i === 1 || h_m > this.hMax1[b1]) this.hMax1[b1] = h_m;
    const b2 = (i / BLOCK2) | 0;
    if (i % BLOCK2 === 0 || i === 1 || h_m > this.hMax2[b2]) this.hMax2[b2] = h_m;
    this.pH.push(d_m, h_m);
    const g = h_m + clutter_m; // P.1812-6 §3.2 (g = h + R at inner points)
    if (this.pG !== this.pH) this.pG.push(d_m, g);
    if (this.needBeta) this.pGb.push(d_m, g);
    this.land.push(d_m, !atSea);
    this.sea.push(d_m, atSea);
  }

  /**
   * Lbc and Lb0p (and intermediates) for a receiver at d_m beyond the last sample.
   * @param d_m receiver distance (m)
   * @param hR_m receiver ground (m amsl)
   * @param hrg_m receiver antenna above ground (m)
   * @param rxSea receiver point at sea
   * @param phi_deg path-centre latitude (deg)
   * @param o filled in place
   */
  evaluate(d_m: number, hR_m: number, hrg_m: number, rxSea: boolean, phi_deg: number, o: P1812CellLoss): void {
    const c = this.c;
    const pH = this.pH;
    const n = pH.n;
    const d = d_m;
    const dkm = d / 1000;
    const hts = pH.hts;
    const hrs = hR_m + hrg_m;
    const k = pH.invTwoAe;
    const H = pH.h;
    const D = pH.d;

    // --- horizons (Attachment 1 eq. (76)–(82)); slopes in the frame z = h − d²/(2ae) ---
    const sTd = (hrs - hts) / d - d * k;
    const trans = n > 1 && pH.maxSlopeZ > sTd; // P.1812-6 eq. (76), (77)
    let thetaT: number;
    let thetaR: number;
    let lt = -1;
    let lr = -1;
    let dlt: number;
    let dlr: number;
    if (trans) {
      lt = pH.argMaxSlopeZ;
      // the running maximum changes at few samples: keep its angle
      if (pH.maxSlopeZ !== this.slopeT) (this.slopeT = pH.maxSlopeZ), (this.thetaTmax = 1000 * Math.atan(pH.maxSlopeZ)); // P.1812-6 eq. (76), (78)
      thetaT = this.thetaTmax;
      const zR = hrs - d * d * k;
      lr = hullTangentFromRight(pH.hullZ, pH.nHullZ, D, pH.z, d, zR);
      thetaR = 1000 * Math.atan((pH.z[lr] - zR) / (d - D[lr]) - 2 * k * d); // P.1812-6 eq. (79)
      dlt = D[lt]; // P.1812-6 eq. (78)
      dlr = d - D[lr]; // P.1812-6 eq. (81a)
    } else {
      thetaT = 1000 * Math.atan(sTd); // P.1812-6 eq. (77), (78)
      thetaR = 1000 * Math.atan((hts - hrs) / d - d * k); // P.1812-6 eq. (80)
      if (n > 1) {
        nuMaxLineOfSight(pH, d, hrs, this.lambda, -Infinity); // P.1812-6 eq. (81): point of highest ν
        lt = lr = pH.lastNuIndex;
        dlt = D[lt];
      } else {
        dlt = d / 2; // no inner point (the site's own neighbourhood)
      }
      dlr = d - dlt; // P.1812-6 eq. (81a)
    }
    const theta = (1000 * d) / c.ae_m + thetaT + thetaR; // P.1812-6 eq. (82)

    // --- smooth surface and diffraction heights (eq. (83)–(89)) ---
    const hLast = H[n - 1];
    const dLast = D[n - 1] / 1000;
    const v1 = pH.v1 + (dkm - dLast) * (hR_m + hLast); // P.1812-6 eq. (85)
    const v2 = pH.v2 + (dkm - dLast) * (hR_m * (2 * dkm + dLast) + hLast * (dkm + 2 * dLast)); // P.1812-6 eq. (86)
    const hstLs = (2 * v1 * dkm - v2) / (dkm * dkm); // P.1812-6 eq. (85)
    const hsrLs = (v2 - v1 * dkm) / (dkm * dkm); // P.1812-6 eq. (86)
    let hstp = hstLs;
    let hsrp = hsrLs;
    if (n > 1) {
      const S = (hrs - hts) / d;
      const jo = hullHighestAboveSlope(pH.hullH, pH.nHullH, D, H, S);
      const hobs = H[jo] - (hts * (d - D[jo]) + hrs * D[jo]) / d; // P.1812-6 eq. (87a)
      if (hobs > 0) {
        const aobt = pH.maxSlopeH - S; // P.1812-6 eq. (87b)
        const jr = hullTangentFromRight(pH.hullH, pH.nHullH, D, H, d, hrs);
        const aobr = (H[jr] - hrs) / (d - D[jr]) + S; // P.1812-6 eq. (87c)
        hstp = hstLs - (hobs * aobt) / (aobt + aobr); // P.1812-6 eq. (88c)
        hsrp = hsrLs - (hobs * aobr) / (aobt + aobr); // P.1812-6 eq. (88d)
      }
    }
    const h0 = H[0];
    const hstd = hstp >= h0 ? h0 : hstp; // P.1812-6 eq. (89)
    const hsrd = hsrp > hR_m ? hR_m : hsrp; // P.1812-6 eq. (89)
    const htsP = hts - hstd; // P.1812-6 eq. (37a)
    const hrsP = hrs - hsrd; // P.1812-6 eq. (37b)

    // --- ducting surface, effective heights, roughness (eq. (90)–(93)) ---
    const hst = hstLs < h0 ? hstLs : h0; // P.1812-6 eq. (90a)
    const hsr = hsrLs < hR_m ? hsrLs : hR_m; // P.1812-6 eq. (90b)
    const m = (hsr - hst) / d; // P.1812-6 eq. (91)
    // hm (eq. (93)) enters only the ducting loss: computed below unless Lba is negligible

    // --- zones (§3.6, Table 5) ---
    this.land.finish(d, !rxSea);
    this.sea.finish(d, rxSea);
    const dtm = this.land.best / 1000;
    const dlm = dtm; // only sea and inland zones: every land section is inland
    const omega = this.sea.total / d;
    const tau = inlandTau(dlm); // P.1812-6 eq. (3)
    const b0 = beta0PctWithTau(phi_deg, dtm, tau); // P.1812-6 eq. (2)–(5)

    // --- diffraction (§4.3): Ld50 in ae, Ldβ in aβ ---
    this.sphOpts.omega = omega;
    const lambda = this.lambda;
    const Ld50 = diffraction(this.pG, d, hrs, htsP, hrsP, c.ae_m, lambda, this.sphOpts);
    const Ldb = this.needBeta ? diffraction(this.pGb, d, hrs, htsP, hrsP, this.aeB_m, lambda, this.sphOpts) : Ld50;
    // --- line of sight, time interpolation, troposcatter, ducting, blend (§4.2, §4.4–§4.6) ---
    const ci = this.cell;
    ci.d_km = dkm;
    ci.hts_m = hts;
    ci.hrs_m = hrs;
    ci.theta_t_mrad = thetaT;
    ci.theta_r_mrad = thetaR;
    ci.theta_mrad = theta;
    ci.dlt_km = dlt / 1000;
    ci.dlr_km = dlr / 1000;
    ci.hte_m = hts - hst; // P.1812-6 eq. (92a)
    ci.hre_m = hrs - hsr; // P.1812-6 eq. (92b)
    ci.omega = omega;
    ci.beta0_pct = b0;
    ci.dlm_km = dlm;
    ci.dct_km = this.txSea ? 0 : P1812_DEFAULTS.dct_km;
    ci.dcr_km = rxSea ? 0 : P1812_DEFAULTS.dcr_km;
    ci.rx_at_sea = rxSea;
    ci.Ld50_db = Ld50;
    ci.Ldbeta_db = Ldb;
    // Lba has no effect where a lower bound of it (without hm) is above Lbd = Lb0p + Ldp
    // (eq. (60), (61); see p1812DuctingLowerBound): the roughness search is then skipped, hm left NaN.
    const kc = this.k;
    const Lb0p = p1812LineOfSight(dkm, hts, hrs, c.f_ghz, c.p_pct, b0, ci.dlt_km, ci.dlr_km, this.out.los, kc).Lb0p; // P.1812-6 eq. (8)–(10), kept in out.los
    const Lbd = Lb0p + diffractionLossForTime(c.p_pct, b0, Ld50, Ldb); // P.1812-6 eq. (41), (43)
    const bound = c.exact ? NaN : p1812DuctingLowerBound(ci, this.out, kc, Lbd);
    const skipDucting = bound > Lbd; // as p1812CellLoss decides
    // the span between the horizon points taken in order (as pathGeometry: they can cross)
    const hm = skipDucting ? NaN : lt >= 0 ? roughness(pH, this.hMax1, this.hMax2, lt < lr ? lt : lr, lt < lr ? lr : lt, hst, m) : 0; // P.1812-6 eq. (93)
    ci.hm_m = hm;
    const r = p1812CellLoss(ci, this.out, kc, tau, skipDucting ? bound : NaN, true); // P.1812-6 eq. (8)–(11), (41), (44), (46), (57)–(63)
    const Ldp = r.Ldp;
    const Lbs = r.Lbs;
    const Lba = r.Lba;
    const los = r.los;
    const bl = r.blend;

    o.Lbc = bl.Lbc;
    o.Lb0p = los.Lb0p;
    o.Lbfs = los.Lbfs;
    o.Ld50 = Ld50;
    o.Ldp = Ldp;
    o.Lbs = Lbs;
    o.Lba = Lba;
    o.theta_mrad = theta;
    o.dlt_km = dlt / 1000;
    o.dlr_km = dlr / 1000;
    o.hm_m = hm;
    o.beta0_pct = b0;
    o.omega = omega;
    o.transhorizon = trans;
  }
}

/** Reused result of the spherical-Earth loss (one per thread: this module's code runs in one thread). */
const SPH_OUT: SphericalEarthResult = { Ldsph: NaN, dlos_m: NaN, transhorizon: false, hse_m: NaN, hreq_m: NaN, aem_m: NaN, Ldft: NaN };

/**
 * Delta-Bullington Ld (dB) of P.1812-6 §4.3.4 for the receiver: Bullington on the clutter
 * profile `p` (eq. (21)), the zero-height profile with hts', hrs' (eq. (21)), the spherical-Earth
 * loss (eq. (22)–(36)) in p's frame; Ld = Lbulla + max(Ldsph − Lbulls, 0) (eq. (39)).
 */
function diffraction(p: RadialProfile, d: number, hrs: number, htsP: number, hrsP: number, ae_m: number, lambda: number, sph: { omega: number; polarization: "h" | "v"; frequency_ghz: number }): number {
  const Lbulla = bullingtonActualIncremental(p, d, hrs, lambda); // P.1812-6 eq. (21)
  const Lbulls = smoothBullington(p.d, p.n, d, htsP, hrsP, lambda, p.invTwoAe); // P.1812-6 eq. (21), zero heights
  const Ldsph = sphericalEarthDiffractionLoss(d, htsP, hrsP, ae_m, lambda, sph, SPH_OUT).Ldsph; // P.1812-6 eq. (22)–(27)
  return Ldsph !== Ldsph ? NaN : Lbulla + Math.max(Ldsph - Lbulls, 0); // P.1812-6 eq. (39)
}

/**
 * hm = max over lt…lr of h_i − (hst + m·d_i) (P.1812-6 eq. (93)). Blocks of BLOCK1 and BLOCK2
 * samples are skipped when their bound — the block's highest h less the line at the block's
 * favourable end — cannot beat the best value found. Exact.
 */
function roughness(p: RadialProfile, hMax1: Float64Array, hMax2: Float64Array, lt: number, lr: number, hst: number, m: number): number {
  const H = p.h;
  const D = p.d;
  let best = -Infinity;
  let i = lt;
  while (i <= lr) {
    if (i % BLOCK2 === 0 && i + BLOCK2 - 1 <= lr) {
      const de = D[i + BLOCK2 - 1];
      const bound = hMax2[i / BLOCK2] - hst - m * (m > 0 ? D[i] : de);
      if (bound <= best) {
        i += BLOCK2;
        continue;
      }
    }
    if (i % BLOCK1 === 0 && i + BLOCK1 - 1 <= lr) {
      const de = D[i + BLOCK1 - 1];
      const bound = hMax1[i / BLOCK1] - hst - m * (m > 0 ? D[i] : de);
      if (bound <= best) {
        i += BLOCK1;
        continue;
      }
    }
    const v = H[i] - (hst + m * D[i]); // P.1812-6 eq. (93)
    if (v > best) best = v;
    i++;
  }
  return best;
}
