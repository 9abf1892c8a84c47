/**
 * ITU-R P.1812-6 (09/2021): path-specific prediction for point-to-area terrestrial services,
 * 30 MHz – 6 GHz. Pure functions, no I/O; NaN for bad numbers, no throwing.
 *
 * API
 *   `p1812Loss(input)` → `P1812Result`: basic transmission loss Lb (dB) not exceeded for p %
 *     of time and pL % of locations, field strength Ep (dBµV/m) for `ptx_kw` (1 kW e.r.p. by
 *     default), and every intermediate (geometry, Lbfs, Lb0p, Lb0β, Ld50, Ldβ, Ldp, Lbs, Lba,
 *     Lbc, …).
 *   Inputs (`P1812Input`): frequency_ghz; time_pct (1–50); location_pct (1–99, default 50);
 *     sigma_l_db (location variability σL, dB, default 0 — see `p1812LocationSigmaDb`);
 *     d_km (distances from Tx, km, first 0, increasing, any spacing); h_m (terrain amsl, m);
 *     clutter_height_m (representative clutter height per point, m, default 0);
 *     zone (per point, ZONE_SEA / ZONE_COASTAL / ZONE_INLAND, default inland);
 *     htg_m, hrg_m (antenna heights above ground, m); polarization "h" | "v";
 *     path-centre latitude phi_path_deg, or tx/rx latitude/longitude (deg);
 *     dn (ΔN, N-units/km, default 45), n0 (N0, N-units, default 325);
 *     dct_km, dcr_km (distance to coast, km, default 500, 0 when the terminal point is sea).
 *   For a coverage sweep: `p1812CellLoss(cell, out)` does everything after the profile
 *     analysis from scalars (geometry of `pathGeometry` or running horizons, the caller's
 *     Ld50/Ldβ from `deltaBullingtonOverSurface` or an incremental equivalent) into a reused
 *     `P1812CellOutput` — no allocation per cell. `p1812Path` + `pathGeometry` +
 *     `p1812PathLoss` is the same on a whole profile.
 * Terminal clutter in this edition: the representative clutter heights of the profile are
 * added to the terrain for the diffraction calculation at every point but the two
 * terminals (§3.2); the terminal clutter losses of earlier editions are gone (the terminal
 * clutter category only sets σL through the receiver's height relative to its clutter).
 */
import { clearAirBlend, interpolationFj, interpolationFk, type ClearAirBlend } from "./itu-blend.ts";
import { anomalousConstants, ductingLayerReflectionLoss, ductingLossLowerBound, type AnomalousConstants, type AnomalousInput } from "./itu-anomalous.ts";
import { deltaBullingtonOverSurface, diffractionLossForTime } from "./delta-bullington.ts";
import {
  beta0Pct,
  EARTH_RADIUS_BETA_KM,
  effectiveEarthRadiusKm,
  inlandTau,
  inverseComplementaryNormal,
  longestZoneSectionKm,
  newPathGeometry,
  pathCentreLatitudeDeg,
  pathGeometry,
  seaFraction,
  ZONE_INLAND,
  ZONE_SEA,
  type PathGeometry,
} from "./itu-path-geometry.ts";

/** Where P.1812-6 applies (§1 and the Recommendation's scope); outside: warn. */
export const P1812_VALIDITY = {
  recommendation: "ITU-R P.1812-6",
  frequency_ghz: [0.03, 6] as const,
  time_pct: [1, 50] as const,
  location_pct: [1, 99] as const,
  antenna_height_m: [1, 3000] as const,
  path_length_km: [0.25, 3000] as const,
  latitude_deg: [-80, 80] as const,
} as const;

/** Defaults the method uses when a value is not given (stated in outputs). */
export const P1812_DEFAULTS = { dn: 45, n0: 325, dct_km: 500, dcr_km: 500, location_pct: 50, sigma_l_db: 0, ptx_kw: 1 } as const;

/**
 * Clutter categories of P.1812-6 Table 2 with their default representative clutter heights
 * (m) — water/sea 0, open/rural 0, suburban 10, urban/trees/forest 15, dense urban 20.
 * Codes 1–5 as in the Recommendation's validation profiles. The heights are Table 2's as
 * remembered (not re-read for this edition); the published validation profiles use 10 m and
 * 15 m for suburban and urban points, consistent with them.
 */
export const P1812_CLUTTER = {
  water: { code: 1, height_m: 0 },
  open: { code: 2, height_m: 0 },
  suburban: { code: 3, height_m: 10 },
  urban: { code: 4, height_m: 15 },
  dense_urban: { code: 5, height_m: 20 },
} as const;

export type P1812ClutterClass = keyof typeof P1812_CLUTTER;

/** Inputs of `p1812Loss`. */
export interface P1812Input {
  frequency_ghz: number;
  time_pct: number;
  location_pct?: number;
  sigma_l_db?: number;
  d_km: ArrayLike<number>;
  h_m: ArrayLike<number>;
  clutter_height_m?: ArrayLike<number>;
  zone?: ArrayLike<number>;
  htg_m: number;
  hrg_m: number;
  polarization: "h" | "v";
  phi_path_deg?: number;
  tx_lat_deg?: number;
  tx_lon_deg?: number;
  rx_lat_deg?: number;
  rx_lon_deg?: number;
  dn?: number;
  n0?: number;
  dct_km?: number;
  dcr_km?: number;
  ptx_kw?: number;
}

/** Result of `p1812Loss`: every intermediate of the method (dB unless the name says). */
export interface P1812Result {
  /** basic transmission loss Lb (eq. (69)) */
  Lb: number;
  /** field strength Ep (dBµV/m) for ptx_kw e.r.p. (eq. (70)) */
  Ep_dbuv_m: number;
  geometry: PathGeometry;
  phi_path_deg: number;
  dtm_km: number;
  dlm_km: number;
  omega: number;
  beta0_pct: number;
  ae_km: number;
  Fj: number;
  Fk: number;
  Lbfs: number;
  Lb0p: number;
  Lb0b: number;
  Lbulla: number;
  Lbulls: number;
  Ldsph: number;
  Ld50: number;
  Ldb: number;
  Ldp: number;
  Lba: number;
  Lbs: number;
  blend: ClearAirBlend;
  /** location term −I(pL/100)·σL added to Lbc (0 at sea) */
  Lloc: number;
}

/** Line-of-sight losses of `p1812LineOfSight` (dB). */
export interface LineOfSightLoss {
  Lbfs: number;
  Lb0p: number;
  Lb0b: number;
}

/**
 * Line-of-sight basic transmission losses with the time-percentage enhancements.
 * Method: P.1812-6 §4.2 eq. (8)–(11):
 *   dfs = sqrt(d² + ((hts − hrs)/1000)²) (eq. (8a)); Lbfs = 92.4 + 20·log f + 20·log dfs (eq. (8));
 *   Esp = 2.6·[1 − exp(−0.1·(dlt + dlr))]·log(p/50) (eq. (9a)), Esβ likewise with β0 (eq. (9b));
 *   Lb0p = Lbfs + Esp (eq. (10)); Lb0β = Lbfs + Esβ (eq. (11)).
 * @param d_km path length (km)
 * @param hts_m Tx antenna height amsl (m)
 * @param hrs_m Rx antenna height amsl (m)
 * @param f_ghz frequency (GHz)
 * @param p_pct time percentage (%)
 * @param beta0_pct β0 (%)
 * @param dlt_km Tx horizon distance (km)
 * @param dlr_km Rx horizon distance (km)
 * @param out optional object to fill
 * @param k terms of f and p alone (default: computed; see `p1812CellConstants`)
 * @returns Lbfs, Lb0p, Lb0b (dB)
 */
export function p1812LineOfSight(
  d_km: number,
  hts_m: number,
  hrs_m: number,
  f_ghz: number,
  p_pct: number,
  beta0_pct: number,
  dlt_km: number,
  dlr_km: number,
  out?: LineOfSightLoss,
  k: { twentyLogF: number; logP50: number } = { twentyLogF: 20 * Math.log10(f_ghz), logP50: Math.log10(p_pct / 50) },
): LineOfSightLoss {
  const o = out ?? ({} as LineOfSightLoss);
  const dh = (hts_m - hrs_m) / 1000;
  const dfs = Math.sqrt(d_km * d_km + dh * dh); // P.1812-6 eq. (8a)
  const Lbfs = 92.4 + k.twentyLogF + 20 * Math.log10(dfs); // P.1812-6 eq. (8)
  const e = 2.6 * (1 - Math.exp(-0.1 * (dlt_km + dlr_km)));
  o.Lbfs = Lbfs;
  o.Lb0p = Lbfs + e * k.logP50; // P.1812-6 eq. (9a), (10)
  o.Lb0b = Lbfs + e * Math.log10(beta0_pct / 50); // P.1812-6 eq. (9b), (11)
  return o;
}

/**
 * Basic transmission loss due to troposcatter not exceeded for p % of time (dB).
 * Method: P.1812-6 §4.4 eq. (44), (45):
 *   Lf = 25·log f − 2.5·[log(f/2)]²;
 *   Lbs = 190.1 + Lf + 20·log d + 0.573·θ − 0.15·N0 − 10.125·[log(50/p)]^0.7.
 * @param d_km path length (km)
 * @param theta_mrad path angular distance θ (mrad)
 * @param f_ghz frequency (GHz)
 * @param p_pct time percentage (%)
 * @param n0 sea-level surface refractivity N0 (N-units)
 * @param c the terms of f, p and N0 alone (default: computed; see `p1812CellConstants`)
 * @returns Lbs (dB)
 */
export function p1812Troposcatter(d_km: number, theta_mrad: number, f_ghz: number, p_pct: number, n0: number, c = troposcatterConstant(f_ghz, p_pct, n0)): number {
  return c + 20 * Math.log10(d_km) + 0.573 * theta_mrad; // P.1812-6 eq. (44)
}

/** 190.1 + Lf − 0.15·N0 − 10.125·[log(50/p)]^0.7: the terms of eq. (44) without d and θ. */
function troposcatterConstant(f_ghz: number, p_pct: number, n0: number): number {
  const lf = Math.log10(f_ghz / 2);
  const Lf = 25 * Math.log10(f_ghz) - 2.5 * lf * lf; // P.1812-6 eq. (45)
  return 190.1 + Lf - 0.15 * n0 - 10.125 * Math.pow(Math.log10(50 / p_pct), 0.7); // P.1812-6 eq. (44)
}

/** The terms of `p1812CellLoss` that depend on f, p, N0 and ae alone (one object per coverage). */
export interface P1812CellConstants {
  frequency_ghz: number;
  time_pct: number;
  n0: number;
  ae_km: number;
  /** 20·log f (f in GHz) */
  twentyLogF: number;
  /** log(p/50) */
  logP50: number;
  /** eq. (44) without its d and θ terms */
  troposcatter: number;
  anomalous: AnomalousConstants;
  /** I(p/100) of eq. (40) */
  Ip: number;
}

/**
 * The terms of `p1812CellLoss` that depend on f, p, N0 and ae alone, for a coverage to
 * compute once instead of for every cell.
 * @param f_ghz frequency (GHz)
 * @param p_pct time percentage (%)
 * @param n0 N0 (N-units)
 * @param ae_km median effective Earth radius (km)
 */
export function p1812CellConstants(f_ghz: number, p_pct: number, n0: number, ae_km: number): P1812CellConstants {
  return {
    frequency_ghz: f_ghz,
    time_pct: p_pct,
    n0,
    ae_km,
    twentyLogF: 20 * Math.log10(f_ghz),
    logP50: Math.log10(p_pct / 50),
    troposcatter: troposcatterConstant(f_ghz, p_pct, n0),
    anomalous: anomalousConstants(f_ghz, p_pct, ae_km, true),
    Ip: inverseComplementaryNormal(p_pct / 100),
  };
}

/**
 * Field strength (dBµV/m) for 1 kW e.r.p. from the basic transmission loss, scaled to ptx_kw.
 * Method: P.1812-6 eq. (70): Ep = 199.36 + 20·log f − Lb (f in GHz), + 10·log(Ptx/1 kW).
 * @param Lb_db basic transmission loss (dB)
 * @param f_ghz frequency (GHz)
 * @param ptx_kw e.r.p. (kW), default 1
 * @returns Ep (dBµV/m)
 */
export function p1812FieldStrengthDbuvM(Lb_db: number, f_ghz: number, ptx_kw = 1): number {
  return 199.36 + 20 * Math.log10(f_ghz) - Lb_db + 10 * Math.log10(ptx_kw); // P.1812-6 eq. (70)
}

/**
 * Standard deviation σL (dB) of the location variability.
 * Method: P.1812-6 §4.8: σL = (0.024·f + 0.52)·wa^0.28 (f in GHz, wa the width in m of the
 * square area over which the variability applies), times uh = 1 for a receiver at or below
 * its representative clutter height R, 1 − (h − R)/10 for R < h < R + 10, 0 above.
 * (0.024 for the f coefficient: P.1812-5 printed 0.0024, a misprint noted by ITU-R WP 3K.)
 * @param f_ghz frequency (GHz)
 * @param hrg_m receiver height above ground (m)
 * @param clutter_m representative clutter height at the receiver (m)
 * @param wa_m area width (m), e.g. 100
 * @returns σL (dB)
 */
export function p1812LocationSigmaDb(f_ghz: number, hrg_m: number, clutter_m: number, wa_m: number): number {
  const base = (0.024 * f_ghz + 0.52) * Math.pow(wa_m, 0.28); // P.1812-6 §4.8 (σL)
  const uh = hrg_m < clutter_m ? 1 : hrg_m >= clutter_m + 10 ? 0 : 1 - (hrg_m - clutter_m) / 10; // P.1812-6 §4.8 (uh)
  return base * uh;
}

/** Precomputed per-path values of `p1812PathLoss` (build once with `p1812Path`). */
export interface P1812Path {
  frequency_ghz: number;
  polarization: "h" | "v";
  d_km: ArrayLike<number>;
  /** distances in m for the Bullington parts */
  d_m: Float64Array;
  /** terrain + representative clutter, terminals bare (m amsl) */
  g_m: Float64Array;
  htg_m: number;
  hrg_m: number;
  rx_at_sea: boolean;
  phi_path_deg: number;
  dtm_km: number;
  dlm_km: number;
  omega: number;
  beta0_pct: number;
  ae_km: number;
  n0: number;
  dct_km: number;
  dcr_km: number;
  ptx_kw: number;
}

/**
 * The per-path constants of P.1812-6 §3 (path-centre latitude, dtm, dlm, ω, β0, ae, the
 * clutter-augmented profile g). NaN values in the result mark bad input.
 * @param input see `P1812Input`
 * @returns the path
 */
export function p1812Path(input: P1812Input): P1812Path {
  const n = input.d_km.length;
  const zone = input.zone ?? new Uint8Array(n).fill(ZONE_INLAND);
  const R = input.clutter_height_m;
  const d_m = new Float64Array(n);
  const g_m = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    d_m[i] = input.d_km[i] * 1000;
    g_m[i] = input.h_m[i] + (R && i > 0 && i < n - 1 ? R[i] : 0); // P.1812-6 §3.2 (g = h + R, terminals excluded)
  }
  const dtot = input.d_km[n - 1] - input.d_km[0];
  const phi =
    input.phi_path_deg ??
    pathCentreLatitudeDeg(input.tx_lat_deg ?? NaN, input.tx_lon_deg ?? NaN, input.rx_lat_deg ?? NaN, input.rx_lon_deg ?? NaN, dtot / 2);
  const dtm = longestZoneSectionKm(input.d_km, zone, (z) => z !== ZONE_SEA);
  const dlm = longestZoneSectionKm(input.d_km, zone, (z) => z === ZONE_INLAND);
  return {
    frequency_ghz: input.frequency_ghz,
    polarization: input.polarization,
    d_km: input.d_km,
    d_m,
    g_m,
    htg_m: input.htg_m,
    hrg_m: input.hrg_m,
    rx_at_sea: zone[n - 1] === ZONE_SEA,
    phi_path_deg: phi,
    dtm_km: dtm,
    dlm_km: dlm,
    omega: seaFraction(input.d_km, zone),
    beta0_pct: beta0Pct(phi, dtm, dlm),
    ae_km: effectiveEarthRadiusKm(input.dn ?? P1812_DEFAULTS.dn),
    n0: input.n0 ?? P1812_DEFAULTS.n0,
    dct_km: zone[0] === ZONE_SEA ? 0 : input.dct_km ?? P1812_DEFAULTS.dct_km,
    dcr_km: zone[n - 1] === ZONE_SEA ? 0 : input.dcr_km ?? P1812_DEFAULTS.dcr_km,
    ptx_kw: input.ptx_kw ?? P1812_DEFAULTS.ptx_kw,
  };
}

/**
 * P.1812-6 basic transmission loss for a path (see the module comment).
 * @param input see `P1812Input`
 * @returns Lb, Ep and every intermediate
 */
export function p1812Loss(input: P1812Input): P1812Result {
  const path = p1812Path(input);
  const geo = pathGeometry(input.d_km, input.h_m, input.htg_m, input.hrg_m, path.ae_km, input.frequency_ghz, newPathGeometry());
  return p1812PathLoss(path, geo, input.time_pct, input.location_pct ?? P1812_DEFAULTS.location_pct, input.sigma_l_db ?? P1812_DEFAULTS.sigma_l_db);
}

/**
 * Scalars a coverage sweep has for one cell: the path geometry (running horizons and smooth
 * surface), the diffraction losses it computed (e.g. incrementally along a radial), and the
 * per-path constants. Fill one object per worker and pass it to `p1812CellLoss`.
 */
export interface P1812CellInput {
  frequency_ghz: number;
  time_pct: number;
  location_pct: number;
  sigma_l_db: number;
  d_km: number;
  hts_m: number;
  hrs_m: number;
  theta_t_mrad: number;
  theta_r_mrad: number;
  theta_mrad: number;
  dlt_km: number;
  dlr_km: number;
  hte_m: number;
  hre_m: number;
  hm_m: number;
  omega: number;
  beta0_pct: number;
  ae_km: number;
  dlm_km: number;
  dct_km: number;
  dcr_km: number;
  n0: number;
  rx_at_sea: boolean;
  /** diffraction loss for ae (50 % of time) and for aβ (β0 % of time) (dB) */
  Ld50_db: number;
  Ldbeta_db: number;
}

/** Reusable scratch and output of `p1812CellLoss` (create once per worker with `newP1812CellOutput`). */
export interface P1812CellOutput {
  Lb: number;
  Ep_1kw_dbuv_m: number;
  Ldp: number;
  Lba: number;
  Lbs: number;
  Lloc: number;
  Fj: number;
  Fk: number;
  los: LineOfSightLoss;
  blend: ClearAirBlend;
  anomalous: AnomalousInput;
}

/** A fresh `P1812CellOutput`. */
export function newP1812CellOutput(): P1812CellOutput {
  return {
    Lb: NaN, Ep_1kw_dbuv_m: NaN, Ldp: NaN, Lba: NaN, Lbs: NaN, Lloc: NaN, Fj: NaN, Fk: NaN,
    los: { Lbfs: NaN, Lb0p: NaN, Lb0b: NaN },
    blend: { Fi: NaN, Lbd50: NaN, Lbd: NaN, Lminb0p: NaN, Lminbap: NaN, Lbda: NaN, Lbam: NaN, Lbc: NaN },
    anomalous: {
      d_km: NaN, dlt_km: NaN, dlr_km: NaN, dct_km: NaN, dcr_km: NaN, dlm_km: NaN, hts_m: NaN, hrs_m: NaN, hte_m: NaN, hre_m: NaN, hm_m: NaN,
      theta_t_mrad: NaN, theta_r_mrad: NaN, f_ghz: NaN, p_pct: NaN, omega: NaN, ae_km: NaN, beta0_pct: NaN, low_frequency_correction: true,
    },
  };
}

/**
 * P.1812-6 §4.2–4.9 for one cell from scalars (no profile, no allocation): line of sight,
 * time interpolation of the diffraction loss, ducting/layer reflection, troposcatter,
 * blending, location variability and field strength for 1 kW e.r.p.:
 *   Lb = max(Lb0p, Lbc + Lloc), Lloc = −I(pL/100)·σL, 0 for a receiver at sea (eq. (69));
 *   Ep = 199.36 + 20·log f − Lb (eq. (70)).
 * @param c the cell's scalars
 * @param out reusable output (its `los`, `blend`, `anomalous` are filled too)
 * @param k terms of f, p, N0 and ae alone (from `p1812CellConstants` for c's values; default: computed)
 * @param tau τ of eq. (3) for c.dlm_km (default: computed)
 * @param ductingBound a lower bound of Lba from `p1812DuctingLowerBound` (default: none). When it
 *   is above Lbd = Lb0p + Ldp, Lba has no effect on Lbc (see there): the bound stands in for
 *   it (out.Lba is then the bound, out.Fk NaN: eq. (61) does not use it) and c.hm_m, c.hte_m,
 *   c.hre_m are not read.
 * @param losDone true when out.los already holds `p1812LineOfSight` for c (a coverage that
 *   needed Lb0p first): it is not computed again
 * @returns `out`
 */
export function p1812CellLoss(
  c: P1812CellInput,
  out: P1812CellOutput,
  k: P1812CellConstants = p1812CellConstants(c.frequency_ghz, c.time_pct, c.n0, c.ae_km),
  tau = inlandTau(c.dlm_km),
  ductingBound = NaN,
  losDone = false,
): P1812CellOutput {
  const f = c.frequency_ghz;
  const p = c.time_pct;
  const Fj = interpolationFj(c.theta_mrad); // P.1812-6 eq. (57)
  const los = losDone ? out.los : p1812LineOfSight(c.d_km, c.hts_m, c.hrs_m, f, p, c.beta0_pct, c.dlt_km, c.dlr_km, out.los, k);
  const Ldp = diffractionLossForTime(p, c.beta0_pct, c.Ld50_db, c.Ldbeta_db); // P.1812-6 eq. (41)
  // a bound above Lbd decides eq. (61) as Lba would (Lbda = Lbd), and Fk is then not used
  const useBound = ductingBound > los.Lb0p + Ldp;
  const Fk = useBound ? NaN : interpolationFk(c.d_km); // P.1812-6 eq. (58)
  const Lba = useBound ? ductingBound : ductingLayerReflectionLoss(anomalousInput(c, out.anomalous), k.anomalous, tau); // P.1812-6 eq. (46)
  const Lbs = p1812Troposcatter(c.d_km, c.theta_mrad, f, p, c.n0, k.troposcatter); // P.1812-6 eq. (44)
  const blend = clearAirBlend(p, c.beta0_pct, c.omega, los.Lbfs, los.Lb0p, los.Lb0b, c.Ld50_db, Ldp, Lba, Lbs, Fj, Fk, out.blend, k.Ip);
  const Lloc = c.rx_at_sea || c.sigma_l_db === 0 ? 0 : -inverseComplementaryNormal(c.location_pct / 100) * c.sigma_l_db; // P.1812-6 eq. (69) (location term)
  const Lb = Math.max(los.Lb0p, blend.Lbc + Lloc); // P.1812-6 eq. (69)
  out.Lb = Lb;
  out.Ep_1kw_dbuv_m = 199.36 + k.twentyLogF - Lb; // P.1812-6 eq. (70)
  out.Ldp = Ldp;
  out.Lba = Lba;
  out.Lbs = Lbs;
  out.Lloc = Lloc;
  out.Fj = Fj;
  out.Fk = Fk;
  return out;
}

/** c's values in the ducting loss's input `a` (filled in place). */
function anomalousInput(c: P1812CellInput, a: AnomalousInput): AnomalousInput {
  a.d_km = c.d_km;
  a.dlt_km = c.dlt_km;
  a.dlr_km = c.dlr_km;
  a.dct_km = c.dct_km;
  a.dcr_km = c.dcr_km;
  a.dlm_km = c.dlm_km;
  a.hts_m = c.hts_m;
  a.hrs_m = c.hrs_m;
  a.hte_m = c.hte_m;
  a.hre_m = c.hre_m;
  a.hm_m = c.hm_m;
  a.theta_t_mrad = c.theta_t_mrad;
  a.theta_r_mrad = c.theta_r_mrad;
  a.f_ghz = c.frequency_ghz;
  a.p_pct = c.time_pct;
  a.omega = c.omega;
  a.ae_km = c.ae_km;
  a.beta0_pct = c.beta0_pct;
  a.low_frequency_correction = true;
  return a;
}

/**
 * A lower bound of the ducting loss Lba for the cell (`ductingLossLowerBound`), which needs
 * neither hm nor hte, hre. Lba enters the result only through Lminbap = η·ln(exp(Lba/η) +
 * exp(Lb0p/η)) ≥ Lba (eq. (60)), and where Lminbap > Lbd = Lb0p + Ldp, Lbda = Lbd (eq. (61))
 * whatever Lminbap is. So where this bound is above Lbd, Lba has no effect: a coverage then
 * skips the roughness search and passes the bound to `p1812CellLoss` in place of Lba — the
 * same Lbc, exactly.
 * @param c the cell's scalars (hm_m, hte_m, hre_m not read)
 * @param out scratch (its `anomalous` is filled)
 * @param k terms of f, p, N0 and ae alone
 * @param target what the bound will be compared with (Lbd): a cruder bound that reaches it may be returned
 * @returns a value ≤ Lba (dB)
 */
export function p1812DuctingLowerBound(c: P1812CellInput, out: P1812CellOutput, k: P1812CellConstants, target = Infinity): number {
  return ductingLossLowerBound(anomalousInput(c, out.anomalous), k.anomalous, target);
}

/**
 * P.1812-6 §4 on a precomputed path and geometry: the delta-Bullington losses for ae and aβ
 * on the clutter-augmented profile (§4.3), then `p1812CellLoss`.
 * @param path from `p1812Path`
 * @param geo from `pathGeometry` on the terrain heights
 * @param p_pct time percentage (%)
 * @param pL_pct location percentage (%)
 * @param sigmaL_db σL (dB)
 * @returns Lb, Ep and every intermediate
 */
export function p1812PathLoss(path: P1812Path, geo: PathGeometry, p_pct: number, pL_pct: number, sigmaL_db: number): P1812Result {
  const f = path.frequency_ghz;
  const hts = geo.hts_m;
  const hrs = geo.hrs_m;
  const opts = { lambda_m: 0.2998 / f, omega: path.omega, polarization: path.polarization, frequency_ghz: f };
  const d50 = deltaBullingtonOverSurface(path.d_m, path.g_m, hts, hrs, geo.hstd_m, geo.hsrd_m, path.ae_km * 1000, opts);
  const db = deltaBullingtonOverSurface(path.d_m, path.g_m, hts, hrs, geo.hstd_m, geo.hsrd_m, EARTH_RADIUS_BETA_KM * 1000, opts);
  const cell = p1812CellLoss(
    {
      frequency_ghz: f, time_pct: p_pct, location_pct: pL_pct, sigma_l_db: sigmaL_db, d_km: geo.d_km, hts_m: hts, hrs_m: hrs,
      theta_t_mrad: geo.theta_t_mrad, theta_r_mrad: geo.theta_r_mrad, theta_mrad: geo.theta_mrad, dlt_km: geo.dlt_km, dlr_km: geo.dlr_km,
      hte_m: geo.hte_m, hre_m: geo.hre_m, hm_m: geo.hm_m, omega: path.omega, beta0_pct: path.beta0_pct, ae_km: path.ae_km,
      dlm_km: path.dlm_km, dct_km: path.dct_km, dcr_km: path.dcr_km, n0: path.n0, rx_at_sea: path.rx_at_sea,
      Ld50_db: d50.Ld, Ldbeta_db: db.Ld,
    },
    newP1812CellOutput(),
  );
  return {
    Lb: cell.Lb,
    Ep_dbuv_m: p1812FieldStrengthDbuvM(cell.Lb, f, path.ptx_kw), // P.1812-6 eq. (70)
    geometry: geo,
    phi_path_deg: path.phi_path_deg,
    dtm_km: path.dtm_km,
    dlm_km: path.dlm_km,
    omega: path.omega,
    beta0_pct: path.beta0_pct,
    ae_km: path.ae_km,
    Fj: cell.Fj,
    Fk: cell.Fk,
    Lbfs: cell.los.Lbfs,
    Lb0p: cell.los.Lb0p,
    Lb0b: cell.los.Lb0b,
    Lbulla: d50.Lbulla,
    Lbulls: d50.Lbulls,
    Ldsph: d50.Ldsph,
    Ld50: d50.Ld,
    Ldb: db.Ld,
    Ldp: cell.Ldp,
    Lba: cell.Lba,
    Lbs: cell.Lbs,
    blend: cell.blend,
    Lloc: cell.Lloc,
  };
}
