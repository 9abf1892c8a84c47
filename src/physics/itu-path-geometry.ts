/**
 * Path geometry shared by the ITU-R point-to-point methods P.1812-6 and P.452-18: effective
 * Earth radius, path-centre latitude, radio-climatic sections (dtm, dlm, ω), β0, horizon
 * angles and distances, the smooth-Earth surface and the effective antenna heights.
 *
 * API (pure, no I/O, no throwing; NaN for bad numbers):
 *   `effectiveEarthRadiusKm(ΔN)`, `EARTH_RADIUS_BETA_KM` — ae (k50 = 157/(157 − ΔN)) and aβ (k = 3), km;
 *   `pathCentreLatitudeDeg(...)` — great-circle point half-way along the path (P.2001 Annex H);
 *   `longestZoneSectionKm(d_km, zone, mask)`, `seaFraction(d_km, zone)` — dtm, dlm and ω;
 *   `beta0Pct(φ, dtm, dlm)` — time percentage β0 (%);
 *   `pathGeometry(d_km, h_m, htg_m, hrg_m, ae_km, f_ghz, out)` — fills a reusable
 *     `PathGeometry` (horizons, θ, hst/hsr, hstd/hsrd, hte/hre, hm) without allocating, so a
 *     coverage sweep can keep one object per worker and call it per cell;
 *   `inverseComplementaryNormal(x)` — I(x) of P.1812-6 Attachment 2 (also P.452-18).
 * Profiles: distances d_km from the transmitter (km, first 0, non-decreasing, spacing free),
 * heights h_m above mean sea level (m, terrain only: representative clutter is not part of
 * the horizon and smooth-surface analysis in either method), zones as `ZONE_*` codes
 * (the P.1812 codes; P.452 files number them differently — map them before calling).
 * Units follow the Recommendations: km for distances, m for heights, mrad for angles.
 */
import { newSmoothEarthHeights, smoothSurface, type SmoothEarthHeights } from "./smooth-earth-heights.ts";

/** Radio-climatic zone codes (ITU-R P.1812-6 §3.6 / Table codes): sea, coastal land, inland. */
export const ZONE_SEA = 1;
export const ZONE_COASTAL = 3;
export const ZONE_INLAND = 4;

/** Mean Earth radius used by P.1812-6 and P.452-18 (km). */
export const EARTH_RADIUS_KM = 6371;

/** Effective Earth radius exceeded for β0 % of time, aβ = 3·6371 km (P.1812-6 eq. (7b), P.452-18 eq. (6b)). */
export const EARTH_RADIUS_BETA_KM = 3 * EARTH_RADIUS_KM; // P.1812-6 eq. (7b)

/**
 * Median effective Earth radius ae (km) from the average refractivity lapse rate ΔN.
 * Method: P.1812-6 eq. (6), (7a); P.452-18 eq. (5), (6a): k50 = 157/(157 − ΔN), ae = 6371·k50.
 * Validity: ΔN < 157 N-units/km (NaN otherwise).
 * @param dn_n_km ΔN (N-units/km), positive
 * @returns ae (km)
 */
export function effectiveEarthRadiusKm(dn_n_km: number): number {
  if (!(dn_n_km < 157) || !Number.isFinite(dn_n_km)) return NaN;
  const k50 = 157 / (157 - dn_n_km); // P.1812-6 eq. (6)
  return EARTH_RADIUS_KM * k50; // P.1812-6 eq. (7a)
}

/**
 * Latitude (deg) of the great-circle point at distance dpnt from the transmitter.
 * Method: ITU-R P.2001-4 Annex H §H.2–H.3 (the path-centre latitude that P.1812-6 §3.5 and
 * P.452-18 ask for), sphere of radius 6371 km.
 * @param latT_deg transmitter latitude (deg)
 * @param lonT_deg transmitter longitude, east positive (deg)
 * @param latR_deg receiver latitude (deg)
 * @param lonR_deg receiver longitude (deg)
 * @param dpnt_km distance from the transmitter (km), usually half the profile length
 * @returns latitude (deg)
 */
export function pathCentreLatitudeDeg(latT_deg: number, lonT_deg: number, latR_deg: number, lonR_deg: number, dpnt_km: number): number {
  const r = Math.PI / 180;
  const pt = latT_deg * r;
  const pr = latR_deg * r;
  const dlon = (lonR_deg - lonT_deg) * r; // P.2001-4 eq. (H.2.1)
  const rr = Math.sin(pt) * Math.sin(pr) + Math.cos(pt) * Math.cos(pr) * Math.cos(dlon); // P.2001-4 eq. (H.2.2)
  const x1 = Math.sin(pr) - rr * Math.sin(pt); // P.2001-4 eq. (H.2.5a)
  const y1 = Math.cos(pt) * Math.cos(pr) * Math.sin(dlon); // P.2001-4 eq. (H.2.5b)
  const bearing = Math.abs(x1) < 1e-9 && Math.abs(y1) < 1e-9 ? lonR_deg * r : Math.atan2(y1, x1); // P.2001-4 eq. (H.2.6)
  const phiPnt = dpnt_km / EARTH_RADIUS_KM; // P.2001-4 eq. (H.3.1)
  const s = Math.sin(pt) * Math.cos(phiPnt) + Math.cos(pt) * Math.sin(phiPnt) * Math.cos(bearing); // P.2001-4 eq. (H.3.2)
  return Math.asin(s) / r; // P.2001-4 eq. (H.3.3)
}

/**
 * Longest continuous section (km) of the path whose zone passes `mask`, each run extended by
 * half the spacing to its neighbours outside the run.
 * Method: P.1812-6 §3.6 / P.452-18 §3.2 (dtm: land = coastal + inland; dlm: inland).
 * @param d_km distances (km)
 * @param zone zone code per point
 * @param mask which zone codes count (e.g. (z) => z !== ZONE_SEA)
 * @returns length (km)
 */
export function longestZoneSectionKm(d_km: ArrayLike<number>, zone: ArrayLike<number>, mask: (zone: number) => boolean): number {
  const n = d_km.length;
  let best = 0;
  let i = 0;
  while (i < n) {
    if (!mask(zone[i])) {
      i++;
      continue;
    }
    const start = i;
    while (i + 1 < n && mask(zone[i + 1])) i++;
    const stop = i;
    let len = d_km[stop] - d_km[start];
    if (stop < n - 1) len += (d_km[stop + 1] - d_km[stop]) / 2;
    if (start > 0) len += (d_km[start] - d_km[start - 1]) / 2;
    if (len > best) best = len;
    i++;
  }
  return best;
}

/**
 * Fraction ω of the path over sea (0–1): total length of the sea runs (each extended by half
 * a spacing at its inner ends) over the path length.
 * Method: P.1812-6 Table 5 (ω), P.452-18 Table 3 (ω).
 * @param d_km distances (km)
 * @param zone zone codes (ZONE_SEA counts)
 * @returns ω
 */
export function seaFraction(d_km: ArrayLike<number>, zone: ArrayLike<number>): number {
  const n = d_km.length;
  let total = 0;
  let i = 0;
  while (i < n) {
    if (zone[i] !== ZONE_SEA) {
      i++;
      continue;
    }
    const start = i;
    while (i + 1 < n && zone[i + 1] === ZONE_SEA) i++;
    const stop = i;
    let len = d_km[stop] - d_km[start];
    if (stop < n - 1) len += (d_km[stop + 1] - d_km[stop]) / 2;
    if (start > 0) len += (d_km[start] - d_km[start - 1]) / 2;
    total += len;
    i++;
  }
  return total / (d_km[n - 1] - d_km[0]);
}

/**
 * Time percentage β0 (%) for which refractive-index lapse rates above 100 N-units/km are
 * expected in the first 100 m of the atmosphere.
 * Method: P.1812-6 eq. (2)–(5) (P.452-18 eq. (2)–(4) are the same):
 *   τ = 1 − exp(−4.12e-4·dlm^2.41), μ1 = [10^(−dtm/(16 − 6.6τ)) + 10^(−5(0.496 + 0.354τ))]^0.2 ≤ 1,
 *   |φ| ≤ 70°: μ4 = μ1^(−0.935 + 0.0176|φ|), β0 = 10^(−0.015|φ| + 1.67)·μ1·μ4;
 *   else μ4 = μ1^0.3, β0 = 4.17·μ1·μ4.
 * @param phi_deg path-centre latitude (deg)
 * @param dtm_km longest continuous land section (km)
 * @param dlm_km longest continuous inland section (km)
 * @returns β0 (%)
 */
export function beta0Pct(phi_deg: number, dtm_km: number, dlm_km: number): number {
  return beta0PctWithTau(phi_deg, dtm_km, inlandTau(dlm_km));
}

/**
 * τ = 1 − exp(−4.12e-4·dlm^2.41) of P.1812-6 eq. (3) (P.452-18 eq. (3a)), used by β0 and by
 * the ducting exponent α (eq. (55a)); dlm^2.41 as exp(2.41·ln dlm) (0 for dlm = 0).
 * @param dlm_km longest continuous inland section (km)
 * @returns τ
 */
export function inlandTau(dlm_km: number): number {
  return 1 - Math.exp(-4.12e-4 * Math.exp(2.41 * Math.log(dlm_km))); // P.1812-6 eq. (3)
}

/**
 * `beta0Pct` from τ (P.1812-6 eq. (3)) already known — a coverage shares τ with the ducting
 * loss (eq. (55a)). Evaluated in the log domain (x^y as exp(y·ln x), one exponential at the
 * end): the same equations, equal to rounding, at a quarter of the cost of Math.pow.
 * @param phi_deg path-centre latitude (deg)
 * @param dtm_km longest continuous land section (km)
 * @param tau τ of eq. (3)
 * @returns β0 (%)
 */
export function beta0PctWithTau(phi_deg: number, dtm_km: number, tau: number): number {
  const lnA = (-Math.LN10 * dtm_km) / (16 - 6.6 * tau); // P.1812-6 eq. (2), ln 10^(−dtm/(16 − 6.6τ))
  const lnB = -Math.LN10 * 5 * (0.496 + 0.354 * tau); // P.1812-6 eq. (2), ln 10^(−5(0.496 + 0.354τ))
  const hi = lnA > lnB ? lnA : lnB;
  let lnMu1 = 0.2 * (hi + Math.log1p(Math.exp((lnA > lnB ? lnB : lnA) - hi))); // P.1812-6 eq. (2), 0.2·ln(a + b)
  if (lnMu1 > 0) lnMu1 = 0; // μ1 ≤ 1
  const aphi = Math.abs(phi_deg);
  if (aphi <= 70) return Math.exp(Math.LN10 * (-0.015 * aphi + 1.67) + lnMu1 * (1 + (-0.935 + 0.0176 * aphi))); // P.1812-6 eq. (4), (5): 10^(−0.015|φ| + 1.67)·μ1·μ4
  return 4.17 * Math.exp(1.3 * lnMu1); // P.1812-6 eq. (4), (5): 4.17·μ1·μ1^0.3
}

/**
 * Inverse complementary cumulative normal distribution I(x) (x in 0–1, clipped to
 * 1e-6…1−1e-6): the value exceeded with probability x. I(0.5) = 0, I(0.1) ≈ 1.2816.
 * Method: P.1812-6 Attachment 2 eq. (96)–(97) (Hastings' rational approximation, |error| < 4.5e-4).
 * @param x probability (0–1)
 * @returns I(x)
 */
export function inverseComplementaryNormal(x: number): number {
  if (Number.isNaN(x)) return NaN;
  const xc = x < 1e-6 ? 1e-6 : x > 0.999999 ? 0.999999 : x;
  if (xc <= 0.5) return tMinusC(xc); // P.1812-6 eq. (96a)
  return -tMinusC(1 - xc); // P.1812-6 eq. (96b)
}

function tMinusC(y: number): number {
  const t = Math.sqrt(-2 * Math.log(y)); // P.1812-6 eq. (97a)
  const c = ((0.010328 * t + 0.802853) * t + 2.515516698) / (((0.001308 * t + 0.189269) * t + 1.432788) * t + 1); // P.1812-6 eq. (97b)
  return t - c;
}

/** Results of the path-profile analysis (one object reused per call by a sweep). */
export interface PathGeometry {
  /** path length d (km) */
  d_km: number;
  /** antenna heights amsl hts, hrs (m) */
  hts_m: number;
  hrs_m: number;
  /** true when the path is transhorizon (θmax > θtd) */
  transhorizon: boolean;
  /** horizon elevation angles θt, θr (mrad) and path angular distance θ (mrad) */
  theta_t_mrad: number;
  theta_r_mrad: number;
  theta_mrad: number;
  /** horizon distances dlt, dlr (km); for a line-of-sight path, the distances to the point of highest ν */
  dlt_km: number;
  dlr_km: number;
  /** index of the Tx-side and Rx-side horizon points */
  lt: number;
  lr: number;
  /** least-squares smooth surface at Tx/Rx before any correction, hst, hsr (m amsl) */
  hst_ls_m: number;
  hsr_ls_m: number;
  /** smooth surface for the diffraction model hstd, hsrd (m amsl) */
  hstd_m: number;
  hsrd_m: number;
  /** smooth surface for the ducting model, min(hst, h1), min(hsr, hn) (m amsl) */
  hst_m: number;
  hsr_m: number;
  /** effective heights for the ducting/layer-reflection model hte, hre (m) */
  hte_m: number;
  hre_m: number;
  /** terrain roughness hm (m) */
  hm_m: number;
  /** the smooth-surface fit behind hst/hsr and hstd/hsrd (scratch, reused) */
  surface: SmoothEarthHeights;
}

/** A fresh `PathGeometry` filled with NaN (for reuse by `pathGeometry`). */
export function newPathGeometry(): PathGeometry {
  return {
    d_km: NaN, hts_m: NaN, hrs_m: NaN, transhorizon: false, theta_t_mrad: NaN, theta_r_mrad: NaN, theta_mrad: NaN,
    dlt_km: NaN, dlr_km: NaN, lt: -1, lr: -1, hst_ls_m: NaN, hsr_ls_m: NaN, hstd_m: NaN, hsrd_m: NaN,
    hst_m: NaN, hsr_m: NaN, hte_m: NaN, hre_m: NaN, hm_m: NaN, surface: newSmoothEarthHeights(),
  };
}

/**
 * Path-profile analysis of P.1812-6 Attachment 1 §4–5 (= P.452-18 Attachment 2 §4–5):
 *   θ_i = 1000·atan[(h_i − hts)/(1000·d_i) − d_i/(2ae)], θmax = max over inner points (eq. (76));
 *   θtd = 1000·atan[(hrs − hts)/(1000·d) − d/(2ae)] (eq. (77)); transhorizon when θmax > θtd;
 *   θt = max(θmax, θtd) (eq. (78)); dlt = distance of the θmax point (eq. (78));
 *   transhorizon: θr = max_i 1000·atan[(h_i − hrs)/(1000(d − d_i)) − (d − d_i)/(2ae)] (eq. (79)),
 *     dlr = d − d_i of its last maximum (eq. (81a));
 *   line of sight: θr = θrd (eq. (80)); dlt = d_i of the highest ν_i (last maximum), with
 *     ν_i = [h_i + 500·d_i(d − d_i)/ae − (hts(d − d_i) + hrs·d_i)/d]·sqrt(0.002·d/(λ·d_i(d − d_i))),
 *     λ = 0.2998/f, dlr = d − dlt (eq. (81)); θ = 1e3·d/ae + θt + θr (eq. (82));
 *   smooth surface v1 = Σ(d_i − d_{i−1})(h_i + h_{i−1}), v2 = Σ(d_i − d_{i−1})[h_i(2d_i + d_{i−1}) + h_{i−1}(d_i + 2d_{i−1})],
 *     hst = (2v1·d − v2)/d², hsr = (v2 − v1·d)/d² (eq. (83)–(86));
 *   diffraction surface: H_i = h_i − [hts(d − d_i) + hrs·d_i]/d, hobs = max H_i, αobt = max H_i/d_i,
 *     αobr = max H_i/(d − d_i), hobs ≤ 0: hstp = hst, hsrp = hsr, else hstp = hst − hobs·gt,
 *     hsrp = hsr − hobs·gr (gt = αobt/(αobt + αobr), gr = αobr/(αobt + αobr)),
 *     hstd = min(hstp, h1), hsrd = min(hsrp, hn) (eq. (87)–(89));
 *   ducting surface hst = min(hst, h1), hsr = min(hsr, hn) (eq. (90)), m = (hsr − hst)/d (eq. (91)),
 *     hte = htg + h1 − hst, hre = hrg + hn − hsr (eq. (92)),
 *     hm = max over lt…lr of [h_i − (hst + m·d_i)] (eq. (93)).
 * (Equation numbers as labelled in the published P.1812-6 validation results.)
 * Needs at least 3 points; otherwise fills NaN. Allocation-free.
 * @param d_km distances from Tx (km)
 * @param h_m terrain heights amsl (m)
 * @param htg_m Tx antenna height above ground (m)
 * @param hrg_m Rx antenna height above ground (m)
 * @param ae_km median effective Earth radius (km)
 * @param f_ghz frequency (GHz), for the line-of-sight ν
 * @param out object to fill (see `newPathGeometry`)
 * @returns `out`
 */
export function pathGeometry(
  d_km: ArrayLike<number>,
  h_m: ArrayLike<number>,
  htg_m: number,
  hrg_m: number,
  ae_km: number,
  f_ghz: number,
  out: PathGeometry = newPathGeometry(),
): PathGeometry {
  const n = d_km.length;
  if (n < 3 || h_m.length !== n || !(ae_km > 0) || !(f_ghz > 0)) {
    fillNaN(out);
    return out;
  }
  const d = d_km[n - 1] - d_km[0];
  const hts = h_m[0] + htg_m;
  const hrs = h_m[n - 1] + hrg_m;
  out.d_km = d;
  out.hts_m = hts;
  out.hrs_m = hrs;

  // smooth surfaces: the least-squares fit and the one for diffraction (one home: smooth-earth-heights.ts)
  const sm = smoothSurface(d_km, 1, h_m, hts, hrs, out.surface);
  const hstLs = sm.hst_m; // P.1812-6 eq. (85)
  const hsrLs = sm.hsr_m; // P.1812-6 eq. (86)
  out.hst_ls_m = hstLs;
  out.hsr_ls_m = hsrLs;
  out.hstd_m = sm.hstd_m; // P.1812-6 eq. (89)
  out.hsrd_m = sm.hsrd_m; // P.1812-6 eq. (89)

  // horizons
  let thetaMax = -Infinity;
  let lt = -1;
  for (let i = 1; i < n - 1; i++) {
    const di = d_km[i];
    const th = 1000 * Math.atan((h_m[i] - hts) / (1000 * di) - di / (2 * ae_km)); // P.1812-6 eq. (76)
    if (th > thetaMax) {
      thetaMax = th;
      lt = i;
    }
  }
  const thetaTd = 1000 * Math.atan((hrs - hts) / (1000 * d) - d / (2 * ae_km)); // P.1812-6 eq. (77)
  const thetaRd = 1000 * Math.atan((hts - hrs) / (1000 * d) - d / (2 * ae_km)); // P.1812-6 eq. (80)
  const trans = thetaMax > thetaTd;
  out.transhorizon = trans;
  let thetaR: number;
  let lr: number;
  if (trans) {
    thetaR = -Infinity;
    lr = -1;
    for (let i = 1; i < n - 1; i++) {
      const dr = d - d_km[i];
      const th = 1000 * Math.atan((h_m[i] - hrs) / (1000 * dr) - dr / (2 * ae_km)); // P.1812-6 eq. (79)
      if (th >= thetaR) {
        thetaR = th;
        lr = i;
      }
    }
    out.theta_t_mrad = thetaMax; // P.1812-6 eq. (78)
    out.dlt_km = d_km[lt]; // P.1812-6 eq. (78)
    out.dlr_km = d - d_km[lr]; // P.1812-6 eq. (81a)
  } else {
    thetaR = thetaRd; // P.1812-6 eq. (80)
    const lambda = 0.2998 / f_ghz;
    let numax = -Infinity;
    lt = -1;
    for (let i = 1; i < n - 1; i++) {
      const di = d_km[i];
      const nu =
        (h_m[i] + (500 * di * (d - di)) / ae_km - (hts * (d - di) + hrs * di) / d) *
        Math.sqrt((0.002 * d) / (lambda * di * (d - di))); // P.1812-6 eq. (81)
      if (nu >= numax) {
        numax = nu;
        lt = i;
      }
    }
    lr = lt;
    out.theta_t_mrad = thetaTd; // P.1812-6 eq. (78)
    out.dlt_km = d_km[lt]; // P.1812-6 eq. (81)
    out.dlr_km = d - d_km[lt]; // P.1812-6 eq. (81a)
  }
  out.theta_r_mrad = thetaR;
  out.lt = lt;
  out.lr = lr;
  out.theta_mrad = (1e3 * d) / ae_km + out.theta_t_mrad + thetaR; // P.1812-6 eq. (82)

  const hst = hstLs < h_m[0] ? hstLs : h_m[0]; // P.1812-6 eq. (90a)
  const hsr = hsrLs < h_m[n - 1] ? hsrLs : h_m[n - 1]; // P.1812-6 eq. (90b)
  out.hst_m = hst;
  out.hsr_m = hsr;
  const m = (hsr - hst) / d; // P.1812-6 eq. (91)
  out.hte_m = htg_m + h_m[0] - hst; // P.1812-6 eq. (92a)
  out.hre_m = hrg_m + h_m[n - 1] - hsr; // P.1812-6 eq. (92b)
  let hm = -Infinity;
  // lt ≤ lr on every real path; the span is taken in order so that a profile where the two
  // horizon points cross still gives a roughness
  const i0 = lt < lr ? lt : lr;
  const i1 = lt < lr ? lr : lt;
  for (let i = i0; i <= i1; i++) {
    const r = h_m[i] - (hst + m * d_km[i]); // P.1812-6 eq. (93)
    if (r > hm) hm = r;
  }
  out.hm_m = hm;
  return out;
}

function fillNaN(out: PathGeometry): void {
  out.d_km = out.hts_m = out.hrs_m = NaN;
  out.transhorizon = false;
  out.theta_t_mrad = out.theta_r_mrad = out.theta_mrad = out.dlt_km = out.dlr_km = NaN;
  out.lt = out.lr = -1;
  out.hst_ls_m = out.hsr_ls_m = out.hstd_m = out.hsrd_m = out.hst_m = out.hsr_m = out.hte_m = out.hre_m = out.hm_m = NaN;
}
