import { readFileSync } from "node:fs";
import type { LinkProfile } from "../../../analysis/link-profile.ts";
import { rangeWarning } from "../../../analysis/range-warning.ts";
import { ZONE_COASTAL, ZONE_INLAND, ZONE_SEA } from "../../../physics/itu-path-geometry.ts";
import { P1812_CLUTTER, P1812_DEFAULTS, P1812_VALIDITY, p1812LocationSigmaDb, p1812Loss } from "../../../physics/p1812.ts";
import { P452_DEFAULTS, P452_VALIDITY, p452Loss } from "../../../physics/p452.ts";
import { parseProfileCsv, type ProfileClutterClass, type ProfileZone } from "../../../terrain/profile-csv.ts";
import { numberArg, UsageError } from "../../args.ts";

/** The ITU-R point-to-point methods `ridgeline path --method` offers. */
export const ITU_PATH_METHODS = ["p1812", "p452"] as const;
export type ItuPathMethod = (typeof ITU_PATH_METHODS)[number];

/** Options of the ITU methods (parsed by the path command, validated here). */
export const ITU_PATH_OPTIONS = ["time-pct", "location-pct", "sigma-l-db", "dn", "n0", "coast-km", "pressure-hpa", "temperature-c"];

const ONLY: Record<string, readonly ItuPathMethod[]> = {
  "time-pct": ["p1812", "p452"],
  dn: ["p1812", "p452"],
  n0: ["p1812", "p452"],
  "location-pct": ["p1812"],
  "sigma-l-db": ["p1812"],
  "coast-km": ["p452"],
  "pressure-hpa": ["p452"],
  "temperature-c": ["p452"],
};

export const ITU_PATH_USAGE = `  --method p1812 --time-pct P [--location-pct PL] [--sigma-l-db S] [--dn N] [--n0 N]
      ITU-R P.1812-6 basic transmission loss and field strength (0.03–6 GHz, p 1–50 %, pL 1–99 %)
  --method p452 --time-pct P [--from-gain-dbi G] [--to-gain-dbi G] [--coast-km TX,RX]
      [--pressure-hpa P] [--temperature-c T] [--dn N] [--n0 N]
      ITU-R P.452-18 basic transmission loss (0.1–50 GHz, p 0.001–50 %)
  A --profile CSV may carry clutter_class, clutter_height_m and zone columns.`;

/** What the path command hands to a method once the link is analysed. */
export interface PathMethodContext {
  from: readonly [number, number];
  to: readonly [number, number];
  profile: LinkProfile;
  /** the --profile file, to read its clutter and zone columns */
  profile_csv?: string;
  from_antenna_m: number;
  to_antenna_m: number;
  polarization: "h" | "v";
  from_gain_dbi: number;
  to_gain_dbi: number;
}

/** Fields a method adds to the link object, its warnings and the lines of the text output. */
export interface PathMethodOutput {
  fields: Record<string, unknown>;
  warnings: string[];
  lines: [string, string][];
}

/** A method whose options have been checked, ready to run on the analysed link. */
export interface PreparedPathMethod {
  run(ctx: PathMethodContext): PathMethodOutput;
}

/**
 * Check the ITU options against the method and the frequency (bad input → UsageError, exit 2,
 * naming the flag and the allowed range) and return the runner; null when `method` is not
 * an ITU method and no ITU option was given.
 */
export function prepareItuMethod(method: string | undefined, values: Map<string, string[]>, frequency_ghz: number): PreparedPathMethod | null {
  const v = (n: string) => values.get(n)?.[0];
  const itu = method !== undefined && (ITU_PATH_METHODS as readonly string[]).includes(method) ? (method as ItuPathMethod) : null;
  for (const [opt, allowed] of Object.entries(ONLY)) {
    if (v(opt) !== undefined && (itu === null || !allowed.includes(itu))) {
      throw new UsageError(`--${opt} applies only with --method ${allowed.join(" or ")}${method ? ` (received --method ${method})` : ""}.`);
    }
  }
  if (itu === null) return null;
  const V = itu === "p1812" ? P1812_VALIDITY : P452_VALIDITY;
  const [fmin, fmax] = V.frequency_ghz;
  if (!(frequency_ghz >= fmin && frequency_ghz <= fmax)) {
    throw new UsageError(`--frequency-ghz: received "${frequency_ghz}"; expected ${fmin}–${fmax} GHz for --method ${itu} (${V.recommendation}).`);
  }
  if (v("time-pct") === undefined) throw new UsageError(`--time-pct is required with --method ${itu}.`);
  const [pmin, pmax] = V.time_pct;
  const p = numberArg("time-pct", v("time-pct"), (x) => x >= pmin && x <= pmax, `a time percentage from ${pmin} to ${pmax} % for --method ${itu} (${V.recommendation})`);
  const dn = v("dn") === undefined ? undefined : numberArg("dn", v("dn"), (x) => x > 0 && x < 157, "ΔN from above 0 to below 157 N-units/km (the effective Earth radius needs ΔN < 157)");
  const n0 = v("n0") === undefined ? undefined : numberArg("n0", v("n0"), (x) => x >= 200 && x <= 450, "N0 from 200 to 450 N-units");
  if (itu === "p1812") {
    const [lmin, lmax] = P1812_VALIDITY.location_pct;
    const pL = v("location-pct") === undefined ? undefined : numberArg("location-pct", v("location-pct"), (x) => x >= lmin && x <= lmax, `a location percentage from ${lmin} to ${lmax} %`);
    const sigma = v("sigma-l-db") === undefined ? undefined : numberArg("sigma-l-db", v("sigma-l-db"), (x) => x >= 0 && x <= 30, "a location standard deviation from 0 to 30 dB");
    return { run: (ctx) => runP1812(ctx, frequency_ghz, p, pL, sigma, dn, n0) };
  }
  let coast: [number, number] | undefined;
  if (v("coast-km") !== undefined) {
    const parts = v("coast-km")!.split(",").map((s) => (s.trim() === "" ? NaN : Number(s)));
    if (parts.length !== 2 || !parts.every((x) => x >= 0 && x < 1e5)) throw new UsageError(`--coast-km: received "${v("coast-km")}"; expected TX,RX distances over land to the coast in km, each ≥ 0 (0 for a terminal at sea), e.g. 500,12.`);
    coast = [parts[0], parts[1]];
  }
  const pressure = v("pressure-hpa") === undefined ? undefined : numberArg("pressure-hpa", v("pressure-hpa"), (x) => x >= 300 && x <= 1100, "a dry-air pressure from 300 to 1100 hPa");
  const temperature = v("temperature-c") === undefined ? undefined : numberArg("temperature-c", v("temperature-c"), (x) => x >= -60 && x <= 60, "an air temperature from −60 to 60 °C");
  return { run: (ctx) => runP452(ctx, frequency_ghz, p, dn, n0, coast, pressure, temperature) };
}

const ZONE_CODE: Record<ProfileZone, number> = { sea: ZONE_SEA, coastal: ZONE_COASTAL, inland: ZONE_INLAND };

/** The profile in the methods' units with its clutter and zones (defaults: open, 0 m, inland). */
function methodProfile(ctx: PathMethodContext) {
  const n = ctx.profile.d_m.length;
  if (n < 3) throw new UsageError(`--profile: ${ctx.profile_csv ?? "the profile"} has ${n} points; the ITU methods need at least 3 (the two ends and a point between, for the horizon analysis).`);
  const d_km = Float64Array.from(ctx.profile.d_m, (x) => x / 1000);
  const h_m = ctx.profile.terrain_m;
  const csv = ctx.profile_csv !== undefined ? parseProfileCsv(readFileSync(ctx.profile_csv, "utf8"), ctx.profile_csv) : null;
  const classes: ProfileClutterClass[] | null = csv?.clutter_class ?? null;
  const R = csv?.clutter_height_m ?? (classes ? Float64Array.from(classes, (c) => P1812_CLUTTER[c].height_m) : new Float64Array(n));
  const zones = csv?.zone ?? null;
  const zone = zones ? Uint8Array.from(zones, (z) => ZONE_CODE[z]) : new Uint8Array(n).fill(ZONE_INLAND);
  const defaults: string[] = [];
  if (!zones) defaults.push("radio-climatic zone inland along the whole path (no zone column)");
  if (!classes && !csv?.clutter_height_m) defaults.push("clutter open/rural, representative clutter height 0 m (no clutter_class or clutter_height_m column)");
  else if (!csv?.clutter_height_m) defaults.push("representative clutter heights from the P.1812-6 Table 2 defaults for each clutter_class (no clutter_height_m column)");
  const rxClass: ProfileClutterClass = classes ? classes[n - 1] : "open";
  const seaPct = (100 * zone.reduce((s, z) => s + (z === ZONE_SEA ? 1 : 0), 0)) / n;
  return { d_km, h_m, R, zone, defaults, rxClass, rxClutter_m: R[n - 1], seaPct };
}

function runP1812(ctx: PathMethodContext, f: number, p: number, pL: number | undefined, sigma: number | undefined, dn: number | undefined, n0: number | undefined): PathMethodOutput {
  const mp = methodProfile(ctx);
  const defaults = [...mp.defaults];
  if (dn === undefined) defaults.push(`ΔN = ${P1812_DEFAULTS.dn} N-units/km`);
  if (n0 === undefined) defaults.push(`N0 = ${P1812_DEFAULTS.n0} N-units`);
  defaults.push(`distance to the coast ${P1812_DEFAULTS.dct_km} km at both ends (0 at an end in the sea zone)`);
  const location = pL ?? P1812_DEFAULTS.location_pct;
  // σL: given, else §4.8 for a 100 m square at the receiver's height over its clutter
  const sigmaL = sigma ?? p1812LocationSigmaDb(f, ctx.to_antenna_m, mp.rxClutter_m, 100);
  if (sigma === undefined && location !== 50) defaults.push(`σL = ${sigmaL.toFixed(2)} dB from P.1812-6 §4.8 for a 100 m square at the receiver (${ctx.to_antenna_m} m above ground, clutter ${mp.rxClutter_m} m)`);
  const r = p1812Loss({
    frequency_ghz: f, time_pct: p, location_pct: location, sigma_l_db: sigmaL,
    d_km: mp.d_km, h_m: mp.h_m, clutter_height_m: mp.R, zone: mp.zone,
    htg_m: ctx.from_antenna_m, hrg_m: ctx.to_antenna_m, polarization: ctx.polarization,
    tx_lat_deg: ctx.from[0], tx_lon_deg: ctx.from[1], rx_lat_deg: ctx.to[0], rx_lon_deg: ctx.to[1], dn, n0,
  });
  const warnings = validityWarnings("p1812", r.geometry.d_km, ctx, r.phi_path_deg);
  const g = r.geometry;
  return {
    fields: {
      basic_transmission_loss_db: r.Lb,
      field_strength_dbuv_m: r.Ep_dbuv_m,
      propagation_method: {
        method: "p1812",
        recommendation: P1812_VALIDITY.recommendation,
        time_pct: p,
        location_pct: location,
        sigma_l_db: sigmaL,
        field_strength_for: "1 kW e.r.p.",
        dn: dn ?? P1812_DEFAULTS.dn,
        n0: n0 ?? P1812_DEFAULTS.n0,
        defaults_used: defaults,
        receiver_clutter_class: mp.rxClass,
        sea_share_pct: mp.seaPct,
        path_type: g.transhorizon ? "transhorizon" : "line of sight",
        intermediates: {
          path_centre_latitude_deg: r.phi_path_deg, beta0_pct: r.beta0_pct, omega: r.omega, ae_km: r.ae_km,
          theta_t_mrad: g.theta_t_mrad, theta_r_mrad: g.theta_r_mrad, theta_mrad: g.theta_mrad, dlt_km: g.dlt_km, dlr_km: g.dlr_km,
          hstd_m: g.hstd_m, hsrd_m: g.hsrd_m, hte_m: g.hte_m, hre_m: g.hre_m, hm_m: g.hm_m,
          Lbfs_db: r.Lbfs, Lb0p_db: r.Lb0p, Lb0b_db: r.Lb0b, Ld50_db: r.Ld50, Ldb_db: r.Ldb, Ldp_db: r.Ldp,
          Lbs_db: r.Lbs, Lba_db: r.Lba, Lbc_db: r.blend.Lbc, Lloc_db: r.Lloc, Fi: r.blend.Fi, Fj: r.Fj, Fk: r.Fk,
        },
      },
    },
    warnings,
    lines: [
      ["Method", `${P1812_VALIDITY.recommendation}, ${p} % of time, ${location} % of locations (σL ${sigmaL.toFixed(2)} dB)`],
      ["Basic transmission loss", `${r.Lb.toFixed(2)} dB (${g.transhorizon ? "transhorizon" : "line of sight"}; diffraction ${r.Ldp.toFixed(2)} dB, troposcatter ${r.Lbs.toFixed(1)} dB)`],
      ["Field strength", `${r.Ep_dbuv_m.toFixed(2)} dBµV/m for 1 kW e.r.p.`],
      ["Defaults used", defaults.length ? defaults.join("; ") : "none"],
    ],
  };
}

function runP452(ctx: PathMethodContext, f: number, p: number, dn: number | undefined, n0: number | undefined, coast: [number, number] | undefined, pressure: number | undefined, temperature: number | undefined): PathMethodOutput {
  const mp = methodProfile(ctx);
  const defaults = [...mp.defaults];
  if (dn === undefined) defaults.push(`ΔN = ${P452_DEFAULTS.dn} N-units/km`);
  if (n0 === undefined) defaults.push(`N0 = ${P452_DEFAULTS.n0} N-units`);
  if (!coast) defaults.push(`distance to the coast ${P452_DEFAULTS.dct_km} km at both ends (0 at an end in the sea zone)`);
  if (pressure === undefined) defaults.push(`dry-air pressure ${P452_DEFAULTS.pressure_hpa} hPa`);
  if (temperature === undefined) defaults.push(`temperature ${P452_DEFAULTS.temperature_c} °C`);
  const r = p452Loss({
    frequency_ghz: f, time_pct: p, d_km: mp.d_km, h_m: mp.h_m, clutter_height_m: mp.R, zone: mp.zone,
    htg_m: ctx.from_antenna_m, hrg_m: ctx.to_antenna_m, polarization: ctx.polarization,
    tx_gain_dbi: ctx.from_gain_dbi, rx_gain_dbi: ctx.to_gain_dbi,
    tx_lat_deg: ctx.from[0], tx_lon_deg: ctx.from[1], rx_lat_deg: ctx.to[0], rx_lon_deg: ctx.to[1],
    dn, n0, dct_km: coast?.[0], dcr_km: coast?.[1], pressure_hpa: pressure, temperature_c: temperature,
  });
  const warnings = validityWarnings("p452", r.geometry.d_km, ctx, r.phi_path_deg);
  const g = r.geometry;
  return {
    fields: {
      basic_transmission_loss_db: r.Lb,
      propagation_method: {
        method: "p452",
        recommendation: P452_VALIDITY.recommendation,
        time_pct: p,
        dn: dn ?? P452_DEFAULTS.dn,
        n0: n0 ?? P452_DEFAULTS.n0,
        tx_gain_dbi: ctx.from_gain_dbi,
        rx_gain_dbi: ctx.to_gain_dbi,
        defaults_used: defaults,
        sea_share_pct: mp.seaPct,
        path_type: g.transhorizon ? "transhorizon" : "line of sight",
        intermediates: {
          path_centre_latitude_deg: r.phi_path_deg, beta0_pct: r.beta0_pct, omega: r.omega, ae_km: r.ae_km,
          theta_t_mrad: g.theta_t_mrad, theta_r_mrad: g.theta_r_mrad, theta_mrad: g.theta_mrad, dlt_km: g.dlt_km, dlr_km: g.dlr_km,
          hstd_m: g.hstd_m, hsrd_m: g.hsrd_m, hte_m: g.hte_m, hre_m: g.hre_m, hm_m: g.hm_m,
          Ag_db: r.Ag, Lbfsg_db: r.Lbfsg, Lb0p_db: r.Lb0p, Lb0b_db: r.Lb0b, Ld50_db: r.Ld50, Ldb_db: r.Ldb, Ldp_db: r.Ldp,
          Lbs_db: r.Lbs, Lba_db: r.Lba, Fi: r.blend.Fi, Fj: r.Fj, Fk: r.Fk,
        },
      },
    },
    warnings,
    lines: [
      ["Method", `${P452_VALIDITY.recommendation}, loss not exceeded for ${p} % of time`],
      ["Basic transmission loss", `${r.Lb.toFixed(2)} dB (${g.transhorizon ? "transhorizon" : "line of sight"}; diffraction ${r.Ldp.toFixed(2)} dB, ducting ${r.Lba.toFixed(1)} dB, troposcatter ${r.Lbs.toFixed(1)} dB)`],
      ["Defaults used", defaults.length ? defaults.join("; ") : "none"],
    ],
  };
}

function validityWarnings(method: ItuPathMethod, d_km: number, ctx: PathMethodContext, phi: number): string[] {
  const out: (string | null)[] = [];
  if (method === "p1812") {
    const V = P1812_VALIDITY;
    out.push(rangeWarning(V.recommendation, "path length", d_km, V.path_length_km, "km"));
    out.push(rangeWarning(V.recommendation, "from antenna height", ctx.from_antenna_m, V.antenna_height_m, "m"));
    out.push(rangeWarning(V.recommendation, "to antenna height", ctx.to_antenna_m, V.antenna_height_m, "m"));
    out.push(rangeWarning(V.recommendation, "path-centre latitude", phi, V.latitude_deg, "°"));
  } else {
    out.push(rangeWarning(P452_VALIDITY.recommendation, "path length", d_km, P452_VALIDITY.path_length_km, "km"));
  }
  return out.filter((w): w is string => w !== null);
}
