import { bullingtonFromArrays, type BullingtonResult } from "./bullington.ts";
import { isComputablePath, pathLambdaM, type DiffractionPath } from "./profile.ts";
import { smoothEarthHeights } from "./smooth-earth-heights.ts";
import { sphericalEarthDiffractionLoss, type SphericalEarthResult } from "./spherical-earth-diffraction.ts";

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
  const n = d_m.length;
  const Lbulla = bullingtonFromArrays(d_m, h_m, hts_m, hrs_m, lambda, ae_m);
  const sm = smoothEarthHeights(d_m, h_m, hts_m, hrs_m);
  const hts1 = sm.hts_prime_m;
  const hrs1 = sm.hrs_prime_m;
  const Lbulls = bullingtonFromArrays(d_m, null, hts1, hrs1, lambda, ae_m);
  const sph = sphericalEarthDiffractionLoss(d_m[n - 1], hts1, hrs1, ae_m, lambda, {
    omega,
    polarization: options.polarization,
    epsilon_r: options.epsilon_r,
    sigma_s_m: options.sigma_s_m,
  });
  const Ld = Lbulla.Lbull + Math.max(sph.Ldsph - Lbulls.Lbull, 0); // P.526-15 §4.5.2 (Ld)
  return {
    Ld: Number.isNaN(sph.Ldsph) ? NaN : Ld,
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
