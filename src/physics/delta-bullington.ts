import { inverseComplementaryNormal } from "./itu-path-geometry.ts";
import { bullingtonFromArrays, type BullingtonResult } from "./bullington.ts";
import { isComputablePath, pathLambdaM, type DiffractionPath } from "./profile.ts";
import { smoothEarthHeights } from "./smooth-earth-heights.ts";
import { sphericalEarthDiffractionLoss, type SphericalEarthResult } from "./spherical-earth-diffraction.ts";
import type { FirstTermOptions } from "./spherical-earth-first-term.ts";

/** Options of the delta-Bullington method. */
export interface DeltaBullingtonOptions {
  /** fraction of the path over sea, 0–1 (default 0) */
  omega?: number;
  /** polarisation "h" (default) or "v" */
  polarization?: "h" | "v";
  /** relative permittivity of land (default 22) */
  epsilon_r?: number;
  /** conductivity of land (S/m) (default 0.003) */
  sigma_s_m?: number;
  /** wavelength override (m); else the path's */
  lambda_m?: number;
}

/** Result of the delta-Bullington method with every intermediate. */
export interface DeltaBullingtonResult {
  /** diffraction loss Ld (dB) */
  Ld: number;
  /** Bullington loss of the actual profile, Lbulla (dB) */
  Lbulla: number;
  /** Bullington loss of the smooth profile with the effective heights, Lbulls (dB) */
  Lbulls: number;
  /** spherical-Earth loss with the effective heights, Ldsph (dB) */
  Ldsph: number;
  /** Tx antenna height above the smooth surface hts' (m) */
  hts_prime_m: number;
  /** Rx antenna height above the smooth surface hrs' (m) */
  hrs_prime_m: number;
  /** smooth-surface heights hst, hsr, hstd, hsrd (m amsl) and hobs (m) */
  hst_m: number;
  hsr_m: number;
  hstd_m: number;
  hsrd_m: number;
  hobs_m: number;
  /** intermediates of the two Bullington calculations and the spherical-Earth one */
  bullington_actual: BullingtonResult;
  bullington_smooth: BullingtonResult;
  spherical: SphericalEarthResult;
}

/**
 * Diffraction loss (dB) of a terrestrial path by the delta-Bullington method.
 *
 * Method: ITU-R P.526-15 §4.5 (§4.5.1 Bullington model, §4.5.2 complete method), the
 * same scheme as P.452-17 §4.2.1–4.2.3 and P.1812:
 *   Lbulla = Bullington loss of the actual profile with hts, hrs (`bullingtonFromArrays`);
 *   hts', hrs' = antenna heights above the smooth-Earth surface (`smoothEarthHeights`);
 *   Lbulls = Bullington loss of a zero-height profile with hts', hrs';
 *   Ldsph = spherical-Earth loss for hts', hrs' (`sphericalEarthDiffractionLoss`);
 *   Ld = Lbulla + max(Ldsph − Lbulls, 0).
 * J(ν) is the approximation of P.526-15 eq. (31) throughout. Checked against all 20 ITU-R
 * Study Group 3 validation cases (test/reference/delta-bullington.test.ts).
 * Ld is not monotone in every obstacle height: raising ground near a terminal moves the
 * smooth-Earth surface and can raise hts' or hrs' enough to lower Ldsph − Lbulls (a
 * property of the published method; test/unit/diffraction-methods.test.ts shows a case).
 * Validity: see DIFFRACTION_VALIDITY.delta_bullington. Antenna heights below the ground
 * at the terminals give NaN.
 * @param path profile (m, m amsl), antenna heights (m amsl), frequency (GHz), ae (m)
 * @param options sea fraction, polarisation, land εr and σ (S/m), wavelength override (m)
 * @returns Ld and every intermediate (dB, m); NaN fields for a bad path
 */
export function deltaBullingtonLoss(path: DiffractionPath, options: DeltaBullingtonOptions = {}): DeltaBullingtonResult {
  const lambda = options.lambda_m !== undefined ? options.lambda_m : pathLambdaM(path);
  const omega = options.omega ?? 0;
  const ok = isComputablePath(path) && lambda > 0 && lambda < Infinity && omega >= 0 && omega <= 1;
  if (!ok) return nanResult();
  const { d_m, h_m, hts_m, hrs_m, ae_m } = path;
  const sm = smoothEarthHeights(d_m, h_m, hts_m, hrs_m);
  const hts1 = sm.hts_prime_m;
  const hrs1 = sm.hrs_prime_m;
  const core = deltaBullingtonParts(d_m, h_m, hts_m, hrs_m, sm.hstd_m, sm.hsrd_m, ae_m, lambda, {
    omega,
    polarization: options.polarization,
    epsilon_r: options.epsilon_r,
    sigma_s_m: options.sigma_s_m,
  });
  const Lbulla = core.actual;
  const Lbulls = core.smooth;
  const sph = core.spherical;
  return {
    Ld: core.Ld,
    Lbulla: Lbulla.Lbull,
    Lbulls: Lbulls.Lbull,
    Ldsph: sph.Ldsph,
    hts_prime_m: hts1,
    hrs_prime_m: hrs1,
    hst_m: sm.hst_m,
    hsr_m: sm.hsr_m,
    hstd_m: sm.hstd_m,
    hsrd_m: sm.hsrd_m,
    hobs_m: sm.hobs_m,
    bullington_actual: Lbulla,
    bullington_smooth: Lbulls,
    spherical: sph,
  };
}

function nanResult(): DeltaBullingtonResult {
  const b: BullingtonResult = { Lbull: NaN, Luc: NaN, nu: NaN, los: false, Stim: NaN, Str: NaN, Srim: NaN, dbp_m: NaN };
  return {
    Ld: NaN, Lbulla: NaN, Lbulls: NaN, Ldsph: NaN, hts_prime_m: NaN, hrs_prime_m: NaN,
    hst_m: NaN, hsr_m: NaN, hstd_m: NaN, hsrd_m: NaN, hobs_m: NaN,
    bullington_actual: b, bullington_smooth: { ...b },
    spherical: { Ldsph: NaN, dlos_m: NaN, transhorizon: false, hse_m: NaN, hreq_m: NaN, aem_m: NaN, Ldft: NaN },
  };
}

/** Ground, polarisation and wavelength of `deltaBullingtonOverSurface`. */
export interface SurfaceDiffractionOptions {
  /** wavelength (m) used by the Bullington parts and hreq */
  lambda_m: number;
  /** fraction of the path over sea, 0–1 */
  omega: number;
  /** polarisation "h" or "v" */
  polarization: "h" | "v";
  /** frequency (GHz): the spherical-Earth first term in the Recommendations' practical units */
  frequency_ghz?: number;
}

/** Ld and its parts from `deltaBullingtonOverSurface` (dB). */
export interface SurfaceDiffractionLoss {
  Ld: number;
  Lbulla: number;
  Lbulls: number;
  Ldsph: number;
}

/**
 * Delta-Bullington diffraction loss (dB) when the smooth surface heights hstd, hsrd come
 * from the caller's path analysis (the profile of the Bullington part may differ from the
 * terrain that defines the surface, e.g. terrain plus representative clutter).
 * Method: ITU-R P.1812-6 §4.3.4 / P.452-18 §4.2.3 (same scheme as `deltaBullingtonLoss`):
 *   Lbulla = Bullington loss of the profile g with hts, hrs (eq. (21));
 *   hts' = hts − hstd, hrs' = hrs − hsrd (eq. (37a), (37b));
 *   Lbulls = Bullington loss of a zero-height profile with hts', hrs' (eq. (21));
 *   Ldsph = spherical-Earth loss for hts', hrs' (eq. (22)–(27));
 *   Ld = Lbulla + max(Ldsph − Lbulls, 0) (eq. (39)).
 * Equation numbers of P.1812-6. hts' or hrs' below 0 give NaN (antenna under the surface).
 * @param d_m distances from Tx (m)
 * @param g_m profile heights amsl for the Bullington part (m)
 * @param hts_m Tx antenna height amsl (m)
 * @param hrs_m Rx antenna height amsl (m)
 * @param hstd_m smooth surface at Tx (m amsl)
 * @param hsrd_m smooth surface at Rx (m amsl)
 * @param ae_m effective Earth radius (m)
 * @param options wavelength, sea fraction, polarisation, frequency
 * @returns Ld, Lbulla, Lbulls, Ldsph (dB)
 */
export function deltaBullingtonOverSurface(
  d_m: ArrayLike<number>,
  g_m: ArrayLike<number>,
  hts_m: number,
  hrs_m: number,
  hstd_m: number,
  hsrd_m: number,
  ae_m: number,
  options: SurfaceDiffractionOptions,
): SurfaceDiffractionLoss {
  const c = deltaBullingtonParts(d_m, g_m, hts_m, hrs_m, hstd_m, hsrd_m, ae_m, options.lambda_m, {
    omega: options.omega,
    polarization: options.polarization,
    frequency_ghz: options.frequency_ghz,
  });
  return { Ld: c.Ld, Lbulla: c.actual.Lbull, Lbulls: c.smooth.Lbull, Ldsph: c.spherical.Ldsph };
}

/**
 * The steps both delta-Bullington entry points share (the one home of the method): the
 * Bullington loss of the profile, of the zero-height profile with the heights above the
 * smooth surface, the spherical-Earth loss, and Ld = Lbulla + max(Ldsph − Lbulls, 0)
 * (P.526-15 §4.5.2; P.1812-6 eq. (37a), (37b), (39)).
 */
function deltaBullingtonParts(
  d_m: ArrayLike<number>,
  g_m: ArrayLike<number>,
  hts_m: number,
  hrs_m: number,
  hstd_m: number,
  hsrd_m: number,
  ae_m: number,
  lambda_m: number,
  ground: FirstTermOptions,
): { Ld: number; actual: BullingtonResult; smooth: BullingtonResult; spherical: SphericalEarthResult } {
  const actual = bullingtonFromArrays(d_m, g_m, hts_m, hrs_m, lambda_m, ae_m); // P.1812-6 eq. (21)
  const hts1 = hts_m - hstd_m; // P.1812-6 eq. (37a)
  const hrs1 = hrs_m - hsrd_m; // P.1812-6 eq. (37b)
  const smooth = bullingtonFromArrays(d_m, null, hts1, hrs1, lambda_m, ae_m); // P.1812-6 eq. (21)
  const spherical = sphericalEarthDiffractionLoss(d_m[d_m.length - 1], hts1, hrs1, ae_m, lambda_m, ground);
  const Ld = actual.Lbull + Math.max(spherical.Ldsph - smooth.Lbull, 0); // P.526-15 §4.5.2 (Ld); P.1812-6 eq. (39)
  return { Ld: Number.isNaN(spherical.Ldsph) ? NaN : Ld, actual, smooth, spherical };
}

/**
 * Diffraction loss not exceeded for p % of time from the losses at 50 % (ae) and β0 % (aβ).
 * Method: P.1812-6 eq. (40a), (41) (P.452-18 eq. (41a), (41)):
 *   Fi = I(p/100)/I(β0/100) for p > β0, else 1; Ldp = Ld50 + Fi·(Ldβ − Ld50); p = 50 gives Ld50.
 * @param p_pct time percentage (%), 0 < p ≤ 50
 * @param beta0_pct β0 (%)
 * @param Ld50_db diffraction loss for ae (dB)
 * @param Ldbeta_db diffraction loss for aβ (dB)
 * @returns Ldp (dB)
 */
export function diffractionLossForTime(p_pct: number, beta0_pct: number, Ld50_db: number, Ldbeta_db: number): number {
  if (p_pct >= 50) return Ld50_db;
  const Fi = p_pct > beta0_pct ? inverseComplementaryNormal(p_pct / 100) / inverseComplementaryNormal(beta0_pct / 100) : 1; // P.1812-6 eq. (40a)
  return Ld50_db + Fi * (Ldbeta_db - Ld50_db); // P.1812-6 eq. (41)
}
