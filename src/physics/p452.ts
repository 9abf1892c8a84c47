/**
 * ITU-R P.452-18 (10/2023): prediction of interference between stations on the surface of
 * the Earth, about 0.1–50 GHz, clear-air mechanisms. Pure functions, no I/O; NaN for bad
 * numbers, no throwing.
 *
 * API
 *   `p452Loss(input)` → `P452Result`: basic transmission loss Lb (dB) not exceeded for p % of
 *     an average year, with every intermediate (geometry, Lbfsg, Lb0p, Lb0β, Ld50, Ldp, Lbs,
 *     Lba, the blend).
 *   Inputs (`P452Input`): frequency_ghz; time_pct (0.001–50); d_km (distances from Tx, km,
 *     first 0, increasing, any spacing); h_m (terrain amsl, m); clutter_height_m
 *     (representative clutter height per point, m, default 0); zone (ZONE_SEA /
 *     ZONE_COASTAL / ZONE_INLAND per point — the P.1812 codes, default inland); htg_m, hrg_m
 *     (antenna heights above ground, m); polarization; tx_gain_dbi, rx_gain_dbi (gains towards
 *     the horizon along the path, dBi, default 0); path-centre latitude phi_path_deg or Tx/Rx
 *     coordinates (deg); dn (ΔN, default 45), n0 (N0, default 325); dct_km, dcr_km (distance
 *     to the coast, default 500 km, 0 for a terminal point at sea); pressure_hpa (dry-air
 *     pressure, default 1013.25), temperature_c (default 15).
 *   The geometry (`pathGeometry`), delta-Bullington (`deltaBullingtonOverSurface`,
 *     `diffractionLossForTime`), ducting (`ductingLayerReflectionLoss`) and blend
 *     (`clearAirBlend`) are the ones P.1812-6 uses (src/physics/p1812.ts); only the line of
 *     sight with gaseous absorption, the troposcatter with aperture coupling and Fj differ.
 * Equation numbers: those of P.452-18 Annex 1 as ITU-R WP 3M's reference implementation
 * labels them (the -17 numbering for the unchanged steps); not re-read against the -18 text.
 * Clutter in this edition: representative clutter heights along the profile are added to the
 * terrain for the diffraction calculation at every point but the terminals (the distributed
 * clutter model of -18, which replaced the terminal clutter-loss model of -17).
 */
import { clearAirBlend, interpolationFj, interpolationFk, type ClearAirBlend } from "./itu-blend.ts";
import { ductingLayerReflectionLoss } from "./itu-anomalous.ts";
import { deltaBullingtonOverSurface, diffractionLossForTime } from "./delta-bullington.ts";
import { gasSpecificAttenuation } from "./gas-attenuation.ts";
import {
  beta0Pct,
  EARTH_RADIUS_BETA_KM,
  effectiveEarthRadiusKm,
  longestZoneSectionKm,
  newPathGeometry,
  pathCentreLatitudeDeg,
  pathGeometry,
  seaFraction,
  ZONE_INLAND,
  ZONE_SEA,
  type PathGeometry,
} from "./itu-path-geometry.ts";

/** Where P.452-18 applies (§1); outside: warn. */
export const P452_VALIDITY = {
  recommendation: "ITU-R P.452-18",
  frequency_ghz: [0.1, 50] as const,
  time_pct: [0.001, 50] as const,
  path_length_km: [0, 10000] as const,
} as const;

/**
 * Representative clutter is left out of the profile within this distance (km) of either
 * terminal. Inferred from the published P.452-18 validation examples (the flat 5 km
 * profiles with clutter from 20 m and from 50 m out are reproduced only with this rule); the
 * wording of the -18 text was not at hand when this was written.
 */
export const P452_TERMINAL_CLUTTER_FREE_KM = 0.05;

/** Defaults used when a value is not given (stated in outputs). */
export const P452_DEFAULTS = { dn: 45, n0: 325, dct_km: 500, dcr_km: 500, pressure_hpa: 1013.25, temperature_c: 15, gain_dbi: 0 } as const;

/** Inputs of `p452Loss`. */
export interface P452Input {
  frequency_ghz: number;
  time_pct: number;
  d_km: ArrayLike<number>;
  h_m: ArrayLike<number>;
  clutter_height_m?: ArrayLike<number>;
  zone?: ArrayLike<number>;
  htg_m: number;
  hrg_m: number;
  polarization: "h" | "v";
  tx_gain_dbi?: number;
  rx_gain_dbi?: number;
  phi_path_deg?: number;
  tx_lat_deg?: number;
  tx_lon_deg?: number;
  rx_lat_deg?: number;
  rx_lon_deg?: number;
  dn?: number;
  n0?: number;
  dct_km?: number;
  dcr_km?: number;
  pressure_hpa?: number;
  temperature_c?: number;
}

/** Result of `p452Loss` (dB unless the name says). */
export interface P452Result {
  /** basic transmission loss Lb not exceeded for p % of time (eq. (64)) */
  Lb: number;
  geometry: PathGeometry;
  phi_path_deg: number;
  dtm_km: number;
  dlm_km: number;
  omega: number;
  beta0_pct: number;
  ae_km: number;
  /** Stim − Str (m/km) of the terrain profile (no clutter), the argument of Fj */
  slope_excess_m_km: number;
  Fj: number;
  Fk: number;
  /** gaseous absorption on the line-of-sight path Ag (ρ = 7.5 + 2.5ω) */
  Ag: number;
  Lbfsg: number;
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
}

/**
 * Gaseous absorption (dB) on a terrestrial path of length d at water-vapour density ρ.
 * Method: P.452-18 eq. (9), (9a): Ag = [γo + γw(ρ)]·d, γ by ITU-R P.676 Annex 1
 * (`gasSpecificAttenuation`, line by line) at the given dry-air pressure and temperature.
 * @param d_km path length (km)
 * @param f_ghz frequency (GHz)
 * @param rho_g_m3 water-vapour density (g/m³)
 * @param pressure_hpa dry-air pressure (hPa)
 * @param temperature_c temperature (°C)
 * @returns Ag (dB)
 */
export function p452GasAttenuation(d_km: number, f_ghz: number, rho_g_m3: number, pressure_hpa: number, temperature_c: number): number {
  const g = gasSpecificAttenuation({ frequency_ghz: f_ghz, pressure_dry_hpa: pressure_hpa, temperature_k: temperature_c + 273.15, water_vapour_density_g_m3: rho_g_m3 });
  return g.gamma_db_km * d_km; // P.452-18 eq. (9)
}

/**
 * Troposcatter basic transmission loss (dB) not exceeded for p % of time.
 * Method: P.452-18 §4.3 eq. (45), (45a), (45b):
 *   Lf = 25·log f − 2.5·[log(f/2)]², Lc = 0.051·exp(0.055·(Gt + Gr)),
 *   Lbs = 190 + Lf + 20·log d + 0.573·θ − 0.15·N0 + Lc + Ag − 10.1·[−log(p/50)]^0.7,
 *   Ag at ρ = 3 g/m³ over the whole path.
 * @param d_km path length (km)
 * @param theta_mrad path angular distance (mrad)
 * @param f_ghz frequency (GHz)
 * @param p_pct time percentage (%)
 * @param n0 N0 (N-units)
 * @param gt_dbi Tx gain towards the horizon (dBi)
 * @param gr_dbi Rx gain towards the horizon (dBi)
 * @param ag_db gaseous absorption at ρ = 3 g/m³ (dB), from `p452GasAttenuation`
 * @returns Lbs (dB)
 */
export function p452Troposcatter(d_km: number, theta_mrad: number, f_ghz: number, p_pct: number, n0: number, gt_dbi: number, gr_dbi: number, ag_db: number): number {
  const lf = Math.log10(f_ghz / 2);
  const Lf = 25 * Math.log10(f_ghz) - 2.5 * lf * lf; // P.452-18 eq. (45a)
  const Lc = 0.051 * Math.exp(0.055 * (gt_dbi + gr_dbi)); // P.452-18 eq. (45b)
  return 190 + Lf + 20 * Math.log10(d_km) + 0.573 * theta_mrad - 0.15 * n0 + Lc + ag_db - 10.1 * Math.pow(-Math.log10(p_pct / 50), 0.7); // P.452-18 eq. (45)
}

/**
 * P.452-18 basic transmission loss for a path (see the module comment):
 *   Lbfsg = 92.4 + 20·log f + 20·log dfs + Ag, dfs = sqrt(d² + ((hts − hrs)/1000)²) (eq. (8), (8a));
 *   Esp, Esβ, Lb0p, Lb0β as P.1812-6 (eq. (10a)–(12));
 *   Ld50 (ae), Ldβ (aβ), Ldp by the delta-Bullington method on terrain + clutter (§4.2);
 *   Lbs (eq. (45)); Lba = ducting/layer reflection (with Alf below 0.5 GHz, as the
 *     validation examples have it) + Ag over the great-circle d (eq. (46));
 *   Fj from Stim − Str of the terrain profile without clutter (eq. (14), (15), (58)), Fk (eq. (59));
 *   Lb = −5·log(10^(−0.2·Lbs) + 10^(−0.2·Lbam)) (eq. (64)).
 * @param input see `P452Input`
 * @returns Lb and every intermediate
 */
export function p452Loss(input: P452Input): P452Result {
  const n = input.d_km.length;
  const f = input.frequency_ghz;
  const p = input.time_pct;
  const zone = input.zone ?? new Uint8Array(n).fill(ZONE_INLAND);
  const R = input.clutter_height_m;
  const d_m = new Float64Array(n);
  const g_m = new Float64Array(n);
  const dtot = input.d_km[n - 1] - input.d_km[0];
  const near = P452_TERMINAL_CLUTTER_FREE_KM - 1e-9; // tolerance for distances such as 5 − 4.95
  for (let i = 0; i < n; i++) {
    const di = input.d_km[i];
    d_m[i] = di * 1000;
    const clutter = R && di >= near && dtot - di >= near ? R[i] : 0;
    g_m[i] = input.h_m[i] + clutter; // P.452-18 §4.2 (g = h + R, clear of the terminals)
  }
  const phi =
    input.phi_path_deg ??
    pathCentreLatitudeDeg(input.tx_lat_deg ?? NaN, input.tx_lon_deg ?? NaN, input.rx_lat_deg ?? NaN, input.rx_lon_deg ?? NaN, dtot / 2);
  const dtm = longestZoneSectionKm(input.d_km, zone, (z) => z !== ZONE_SEA);
  const dlm = longestZoneSectionKm(input.d_km, zone, (z) => z === ZONE_INLAND);
  const b0 = beta0Pct(phi, dtm, dlm); // P.452-18 eq. (2)
  const ae = effectiveEarthRadiusKm(input.dn ?? P452_DEFAULTS.dn); // P.452-18 eq. (6a)
  const omega = seaFraction(input.d_km, zone);
  const geo = pathGeometry(input.d_km, input.h_m, input.htg_m, input.hrg_m, ae, f, newPathGeometry());
  const hts = geo.hts_m;
  const hrs = geo.hrs_m;
  const pressure = input.pressure_hpa ?? P452_DEFAULTS.pressure_hpa;
  const temperature = input.temperature_c ?? P452_DEFAULTS.temperature_c;
  const dct = input.dct_km ?? (zone[0] === ZONE_SEA ? 0 : P452_DEFAULTS.dct_km);
  const dcr = input.dcr_km ?? (zone[n - 1] === ZONE_SEA ? 0 : P452_DEFAULTS.dcr_km);

  // Fj from the slopes of the terrain profile, clutter not included (P.452-18 eq. (14), (15), (58));
  // the validation examples with clutter confirm terrain only
  const Ce = 1 / ae;
  let stim = -Infinity;
  for (let i = 1; i < n - 1; i++) {
    const di = input.d_km[i];
    const s = (input.h_m[i] + 500 * Ce * di * (dtot - di) - hts) / di; // P.452-18 eq. (14)
    if (s > stim) stim = s;
  }
  const str = (hrs - hts) / dtot; // P.452-18 eq. (15)
  const Fj = interpolationFj(stim - str); // P.452-18 eq. (58)
  const Fk = interpolationFk(dtot); // P.452-18 eq. (59)

  const dh = (hts - hrs) / 1000;
  const dfs = Math.sqrt(dtot * dtot + dh * dh); // P.452-18 eq. (8a)
  const Ag = p452GasAttenuation(dfs, f, 7.5 + 2.5 * omega, pressure, temperature); // P.452-18 eq. (9), (9a)
  const AgGround = p452GasAttenuation(dtot, f, 7.5 + 2.5 * omega, pressure, temperature); // P.452-18 eq. (9) over the great-circle d (ducting)
  const Lbfsg = 92.4 + 20 * Math.log10(f) + 20 * Math.log10(dfs) + Ag; // P.452-18 eq. (8)
  const e = 2.6 * (1 - Math.exp(-0.1 * (geo.dlt_km + geo.dlr_km)));
  const Lb0p = Lbfsg + e * Math.log10(p / 50); // P.452-18 eq. (10a), (11)
  const Lb0b = Lbfsg + e * Math.log10(b0 / 50); // P.452-18 eq. (10b), (12)

  const opts = { lambda_m: 0.2998 / f, omega, polarization: input.polarization, frequency_ghz: f };
  const d50 = deltaBullingtonOverSurface(d_m, g_m, hts, hrs, geo.hstd_m, geo.hsrd_m, ae * 1000, opts);
  const db = deltaBullingtonOverSurface(d_m, g_m, hts, hrs, geo.hstd_m, geo.hsrd_m, EARTH_RADIUS_BETA_KM * 1000, opts);
  const Ldp = diffractionLossForTime(p, b0, d50.Ld, db.Ld); // P.452-18 eq. (41)

  const Lba =
    ductingLayerReflectionLoss({
      d_km: dtot, dlt_km: geo.dlt_km, dlr_km: geo.dlr_km, dct_km: dct, dcr_km: dcr, dlm_km: dlm,
      hts_m: hts, hrs_m: hrs, hte_m: geo.hte_m, hre_m: geo.hre_m, hm_m: geo.hm_m,
      theta_t_mrad: geo.theta_t_mrad, theta_r_mrad: geo.theta_r_mrad, f_ghz: f, p_pct: p, omega,
      ae_km: ae, beta0_pct: b0, low_frequency_correction: true,
    }) + AgGround; // P.452-18 eq. (46)
  const Ag3 = p452GasAttenuation(dtot, f, 3, pressure, temperature);
  const Lbs = p452Troposcatter(dtot, geo.theta_mrad, f, p, input.n0 ?? P452_DEFAULTS.n0, input.tx_gain_dbi ?? 0, input.rx_gain_dbi ?? 0, Ag3); // P.452-18 eq. (45)
  const blend = clearAirBlend(p, b0, omega, Lbfsg, Lb0p, Lb0b, d50.Ld, Ldp, Lba, Lbs, Fj, Fk);
  return {
    Lb: blend.Lbc, // P.452-18 eq. (64)
    geometry: geo,
    phi_path_deg: phi,
    dtm_km: dtm,
    dlm_km: dlm,
    omega,
    beta0_pct: b0,
    ae_km: ae,
    slope_excess_m_km: stim - str,
    Fj,
    Fk,
    Ag,
    Lbfsg,
    Lb0p,
    Lb0b,
    Lbulla: d50.Lbulla,
    Lbulls: d50.Lbulls,
    Ldsph: d50.Ldsph,
    Ld50: d50.Ld,
    Ldb: db.Ld,
    Ldp,
    Lba,
    Lbs,
    blend,
  };
}
