import { describe, expect, it } from "vitest";
import { p452Loss, type P452Result } from "../../src/physics/p452.ts";
import { expectClose } from "../helpers/expect-close.ts";
import { readP452Cases, readP452Profile, type P452Profile } from "../helpers/itu-p452-fixtures.ts";

// Source: the ITU-R P.452-18 validation examples published with ITU-R WP 3M's reference
// implementation (455 cases on 13 profiles, 0.1–50 GHz, 0.001–50 %),
// test/fixtures/itu/p452/README.md. ΔN and N0 are the examples' own path-centre values.
// Tolerances: Lb 0.01 dB as the issue asks. The intermediates are printed to 6 decimals
// (geometry) and 8 decimals (losses): geometry within 1e-5 (m, km, mrad, %) — ae is printed
// from an unrounded ΔN, 3.5e-5 km off at worst — and every loss within 1e-4 dB.
// Measured maxima (Node 20): Lb 2.1e-7 dB; Lbfsg, Lb0p, Lb0β 5e-9 dB; Ld50, Ldp, Ldsph 7.1e-6 dB;
// Lbs 2.1e-7 dB; Lba 9.1e-8 dB; θ 6.1e-7 mrad; hstd, hsrd, hte, hre, hm ≤ 3.9e-7 m; ae 3.5e-5 km.
const cases = readP452Cases();
const profiles = new Map<string, P452Profile>();

function run(c: Record<string, string>): P452Result {
  const file = c.profile_file;
  if (!profiles.has(file)) profiles.set(file, readP452Profile(file));
  const p = profiles.get(file)!;
  const n = (k: string) => Number(c[k]);
  return p452Loss({
    frequency_ghz: n("f (GHz)"), time_pct: n("p (%)"),
    d_km: p.d_km, h_m: p.h_m, clutter_height_m: p.clutter_height_m, zone: p.zone,
    htg_m: n("htg (m)"), hrg_m: n("hrg (m)"), polarization: n("pol (1-h/2-v)") === 2 ? "v" : "h",
    tx_gain_dbi: n("Gt (dBi)"), rx_gain_dbi: n("Gr (dBi)"),
    tx_lat_deg: n("phit_n (deg)"), tx_lon_deg: n("phit_e (deg)"), rx_lat_deg: n("phir_n (deg)"), rx_lon_deg: n("phir_e (deg)"),
    dn: n("DN"), n0: n("N0"), dct_km: n("dct (km)"), dcr_km: n("dcr (km)"),
    pressure_hpa: n("press (hPa)"), temperature_c: n("temp (deg C)"),
  });
}

const GEOMETRY: [string, (r: P452Result) => number, number][] = [
  ["ae", (r) => r.ae_km, 1e-4], ["dtot", (r) => r.geometry.d_km, 1e-5], ["hts", (r) => r.geometry.hts_m, 1e-5], ["hrs", (r) => r.geometry.hrs_m, 1e-5],
  ["theta_t", (r) => r.geometry.theta_t_mrad, 1e-5], ["theta_r", (r) => r.geometry.theta_r_mrad, 1e-5], ["theta", (r) => r.geometry.theta_mrad, 1e-5],
  ["hm", (r) => r.geometry.hm_m, 1e-5], ["hte", (r) => r.geometry.hte_m, 1e-5], ["hre", (r) => r.geometry.hre_m, 1e-5],
  ["hstd", (r) => r.geometry.hstd_m, 1e-5], ["hsrd", (r) => r.geometry.hsrd_m, 1e-5], ["dlt", (r) => r.geometry.dlt_km, 1e-5], ["dlr", (r) => r.geometry.dlr_km, 1e-5],
  ["dtm", (r) => r.dtm_km, 1e-5], ["dlm", (r) => r.dlm_km, 1e-5], ["b0", (r) => r.beta0_pct, 1e-5], ["omega", (r) => r.omega, 1e-5],
];
const LOSSES: [string, (r: P452Result) => number][] = [
  ["Lbfsg", (r) => r.Lbfsg], ["Lb0p", (r) => r.Lb0p], ["Lb0b", (r) => r.Lb0b], ["Ldsph", (r) => r.Ldsph],
  ["Ld50", (r) => r.Ld50], ["Ldp", (r) => r.Ldp], ["Lbs", (r) => r.Lbs], ["Lba", (r) => r.Lba],
];

describe("ITU-R P.452-18 validation examples (455 cases)", () => {
  it("has all 455 cases on 13 profiles", () => {
    expect(cases.length).toBe(455);
    expect(new Set(cases.map((c) => c.profile_file)).size).toBe(13);
  });

  it.each(cases.map((c, i) => [i + 1, c.profile_file, c["f (GHz)"], c["p (%)"], c]))("case %i (%s, %s GHz, p %s %%)", (_i, file, f, p, c) => {
    const row = c as Record<string, string>;
    const r = run(row);
    const ctx = { file, f_ghz: f, p_pct: p };
    expectClose(r.Lb, Number(row.Lb), { abs: 0.01 }, { ...ctx, quantity: "Lb" });
    for (const [k, get, tol] of GEOMETRY) expectClose(get(r), Number(row[k]), { abs: tol }, { ...ctx, quantity: k });
    for (const [k, get] of LOSSES) expectClose(get(r), Number(row[k]), { abs: 1e-4 }, { ...ctx, quantity: k });
    expect(r.geometry.transhorizon ? "Trans-Horizon" : "Line of Sight").toBe(row.path === "Trans-Horizon" ? "Trans-Horizon" : "Line of Sight");
  });

  it("reports the maximum Lb error over the 455 cases", () => {
    let max = 0;
    for (const c of cases) max = Math.max(max, Math.abs(run(c).Lb - Number(c.Lb)));
    console.info(`P.452-18 max |Lb error| over 455 cases: ${max.toExponential(2)} dB`);
    expect(max).toBeLessThan(1e-5);
  });

  it("exercises line-of-sight and transhorizon paths, sea, clutter near the terminals, both polarisations", () => {
    const runs = cases.map(run);
    expect(runs.some((r) => r.geometry.transhorizon)).toBe(true);
    expect(runs.some((r) => !r.geometry.transhorizon)).toBe(true);
    expect(runs.some((r) => r.omega > 0.5)).toBe(true);
    expect(cases.some((c) => c["pol (1-h/2-v)"] === "1") && cases.some((c) => c["pol (1-h/2-v)"] === "2")).toBe(true);
  });
});
