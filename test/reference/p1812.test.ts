import { describe, expect, it } from "vitest";
import { p1812FieldStrengthDbuvM, p1812LocationSigmaDb, p1812Loss, type P1812Result } from "../../src/physics/p1812.ts";
import { inverseComplementaryNormal } from "../../src/physics/itu-path-geometry.ts";
import { expectClose } from "../helpers/expect-close.ts";
import { readP1812Cases, readP1812Profile, type P1812Case } from "../helpers/itu-p1812-fixtures.ts";

// Source: the ITU-R P.1812-6 validation examples published with ITU-R WP 3K's reference
// implementation (36 cases on 12 profiles, p = 1, 10, 50 %), test/fixtures/itu/p1812/README.md.
// Tolerances: Lb and Ep 0.01 dB as the issue asks; every intermediate within its printed
// precision (one unit in the 10th significant digit, `printedPrecision`).
// Measured maxima (Node 20): Lb 5.0e-8 dB, Ep 4.8e-9 dB, every loss ≤ 5e-8 dB, geometry ≤ 3e-7 (ae, km).
const cases = readP1812Cases();

function run(c: P1812Case): P1812Result {
  const p = readP1812Profile(c.profile);
  const v = (k: string) => c.values.get(k)!;
  return p1812Loss({
    frequency_ghz: v("f (GHz)"), time_pct: v("p (%)"), location_pct: v("pL (%)"), sigma_l_db: v("sigmaL (dB)"),
    d_km: p.d_km, h_m: p.h_m, clutter_height_m: p.clutter_height_m, zone: p.zone,
    htg_m: v("htg (m)"), hrg_m: v("hrg (m)"), polarization: v("pol") === 2 ? "v" : "h",
    // coordinates from the profile header: the results print them to 10 digits, which moves
    // the path-centre latitude, hence β0, by ~1e-9 (more than β0's printed precision)
    tx_lat_deg: p.tx_lat_deg, tx_lon_deg: p.tx_lon_deg, rx_lat_deg: p.rx_lat_deg, rx_lon_deg: p.rx_lon_deg,
    dn: v("DN"), n0: v("N0"), dct_km: v("dct (km)"), dcr_km: v("dcr (km)"), ptx_kw: v("Ptx (kW)"),
  });
}

/**
 * One unit in the last printed digit: the results print 10 significant digits (`%.10g`),
 * so 10^(floor(log10 |v|) − 9); values printed near zero (e.g. Fk = 9.8e-15, a rounding
 * residue of 1 − 0.5·(1 + tanh(…))) get 1e-9 instead.
 */
function printedPrecision(v: number): number {
  return Math.max(Math.pow(10, Math.floor(Math.log10(Math.abs(v))) - 9), 1e-9);
}

/** [label in the results file (with its equation), value from our result] */
const INTERMEDIATES: [string, (r: P1812Result) => number][] = [
  ["dlt (km)", (r) => r.geometry.dlt_km], ["dlr (km)", (r) => r.geometry.dlr_km],
  ["th_t (mrad)", (r) => r.geometry.theta_t_mrad], ["th_r (mrad)", (r) => r.geometry.theta_r_mrad], ["th (mrad)", (r) => r.geometry.theta_mrad],
  ["hts (m)", (r) => r.geometry.hts_m], ["hrs (m)", (r) => r.geometry.hrs_m],
  ["w", (r) => r.omega], ["dtm (km)", (r) => r.dtm_km], ["dlm (km)", (r) => r.dlm_km],
  ["phi (deg)", (r) => r.phi_path_deg], ["b0 (%)", (r) => r.beta0_pct], ["ae (km)", (r) => r.ae_km],
  ["hst (m)", (r) => r.geometry.hst_ls_m], ["hsr (m)", (r) => r.geometry.hsr_ls_m],
  ["hst (m) Eq (90a)", (r) => r.geometry.hst_m], ["hsr (m) Eq (90b)", (r) => r.geometry.hsr_m],
  ["hstd (m)", (r) => r.geometry.hstd_m], ["hsrd (m)", (r) => r.geometry.hsrd_m],
  ["hte (m)", (r) => r.geometry.hte_m], ["hre (m)", (r) => r.geometry.hre_m], ["hm (m)", (r) => r.geometry.hm_m],
  ["Fi", (r) => r.blend.Fi], ["Fj", (r) => r.Fj], ["Fk", (r) => r.Fk],
  ["Lbfs", (r) => r.Lbfs], ["Lb0p", (r) => r.Lb0p], ["Lb0b", (r) => r.Lb0b],
  ["Lbulla (dB)", (r) => r.Lbulla], ["Lbulls (dB)", (r) => r.Lbulls], ["Ldsph (dB)", (r) => r.Ldsph],
  ["Ld50 (dB)", (r) => r.Ld50], ["Ldb (dB)", (r) => r.Ldb], ["Ldp (dB)", (r) => r.Ldp],
  ["Lbd50 (dB)", (r) => r.blend.Lbd50], ["Lbd (dB)", (r) => r.blend.Lbd], ["Lminb0p (dB)", (r) => r.blend.Lminb0p],
  ["Lba (dB)", (r) => r.Lba], ["Lminbap (dB)", (r) => r.blend.Lminbap], ["Lbda (dB)", (r) => r.blend.Lbda],
  ["Lbam (dB)", (r) => r.blend.Lbam], ["Lbs (dB)", (r) => r.Lbs], ["Lbc (dB)", (r) => r.blend.Lbc],
];

describe("ITU-R P.1812-6 validation examples (36 cases)", () => {
  it("has all 36 cases on 12 profiles", () => {
    expect(cases.length).toBe(36);
    expect(new Set(cases.map((c) => c.profile)).size).toBe(12);
  });

  it.each(cases.map((c) => [c.name, c]))("%s: Lb and Ep within 0.01 dB", (_n, c) => {
    const r = run(c as P1812Case);
    const v = (k: string) => (c as P1812Case).values.get(k)!;
    expectClose(r.Lb, v("Lb (dB)"), { abs: 0.01 }, { case: _n, quantity: "Lb eq. (69)" });
    expectClose(r.Ep_dbuv_m, v("Ep (dBuV/m) w.r.t. Ptx"), { abs: 0.01 }, { case: _n, quantity: "Ep eq. (70)" });
  });

  it.each(cases.map((c) => [c.name, c]))("%s: every printed intermediate", (_n, c) => {
    const r = run(c as P1812Case);
    for (const [label, get] of INTERMEDIATES) {
      const want = (c as P1812Case).values.get(label);
      expect(want, `${label} missing from ${_n}`).toBeDefined();
      expectClose(get(r), want!, { abs: printedPrecision(want!) }, { case: _n, quantity: label });
    }
  });

  it("the profile headers carry the coordinates the results print", () => {
    for (const c of cases) {
      const p = readP1812Profile(c.profile);
      expectClose(p.tx_lat_deg, c.values.get("phi_t (deg)")!, { abs: 1e-8 }, c.name);
      expectClose(p.rx_lon_deg, c.values.get("lam_r (deg)")!, { abs: 1e-8 }, c.name);
    }
  });

  it("reports the maximum errors over the 36 cases", () => {
    let lb = 0;
    let ep = 0;
    for (const c of cases) {
      const r = run(c);
      lb = Math.max(lb, Math.abs(r.Lb - c.values.get("Lb (dB)")!));
      ep = Math.max(ep, Math.abs(r.Ep_dbuv_m - c.values.get("Ep (dBuV/m) w.r.t. Ptx")!));
    }
    console.info(`P.1812-6 max |error| over 36 cases: Lb ${lb.toExponential(2)} dB, Ep ${ep.toExponential(2)} dB`);
    expect(lb).toBeLessThan(1e-6);
  });

  it("exercises line-of-sight and transhorizon paths, land and sea, both polarisations", () => {
    const runs = cases.map(run);
    expect(runs.some((r) => r.geometry.transhorizon)).toBe(true);
    expect(runs.some((r) => !r.geometry.transhorizon)).toBe(true);
    expect(runs.some((r) => r.omega > 0)).toBe(true);
    expect(cases.some((c) => c.values.get("pol") === 2)).toBe(true);
  });
});

describe("P.1812-6 §4.8 location variability and eq. (70) field strength", () => {
  // The published cases all use pL = 50 %, σL = 0: check §4.8 from its formula instead.
  const c = cases.find((x) => x.name === "b2iseac_rural_land_10km_3")!;
  it("pL = 50 % leaves Lb unchanged; pL = 90 % adds I-inverse(0.1)·σL = 1.2816·σL (P.1812-6 eq. (69))", () => {
    const base = run(c);
    const p = readP1812Profile(c.profile);
    const v = (k: string) => c.values.get(k)!;
    const at = (pL: number, sigma: number) =>
      p1812Loss({
        frequency_ghz: v("f (GHz)"), time_pct: v("p (%)"), location_pct: pL, sigma_l_db: sigma,
        d_km: p.d_km, h_m: p.h_m, clutter_height_m: p.clutter_height_m, zone: p.zone, htg_m: v("htg (m)"), hrg_m: v("hrg (m)"),
        polarization: "h", phi_path_deg: base.phi_path_deg, dn: v("DN"), n0: v("N0"),
      }).Lb;
    // I(0.5) of the approximation is ~1e-9, not exactly 0
    expectClose(at(50, 5.5), base.Lb, { abs: 1e-6 }, "pL 50 %");
    // standard normal quantile 1.28155 (SciPy norm.isf(0.1)); the Recommendation's approximation is within 4.5e-4
    expectClose(at(90, 5.5) - base.Lb, 1.28155 * 5.5, { abs: 5.5 * 4.5e-4 }, "pL 90 %");
    expectClose(at(10, 5.5) - base.Lb, -1.28155 * 5.5, { abs: 5.5 * 4.5e-4 }, "pL 10 %");
  });

  it("I(x) matches the normal quantiles (SciPy norm.isf) within the approximation's 4.5e-4", () => {
    for (const [x, q] of [[0.5, 0], [0.1, 1.281552], [0.01, 2.326348], [0.9, -1.281552], [0.05, 1.644854]] as const) {
      expectClose(inverseComplementaryNormal(x), q, { abs: 4.5e-4 }, `I(${x})`);
    }
  });

  it("σL = (0.024 f + 0.52)·wa^0.28 with the height factor uh (§4.8)", () => {
    // 600 MHz, wa = 100 m: (0.0144 + 0.52)·100^0.28 = 0.5344·3.6308 = 1.9403 dB (hand calculation)
    expectClose(p1812LocationSigmaDb(0.6, 1.5, 10, 100), 0.5344 * Math.pow(100, 0.28), { abs: 1e-9 }, "below clutter");
    expectClose(p1812LocationSigmaDb(0.6, 15, 10, 100), 0.5 * 0.5344 * Math.pow(100, 0.28), { abs: 1e-9 }, "5 m above clutter");
    expect(p1812LocationSigmaDb(0.6, 25, 10, 100)).toBe(0);
  });

  it("Ep = 199.36 + 20 log f − Lb for 1 kW, +10 log Ptx", () => {
    expectClose(p1812FieldStrengthDbuvM(100, 1), 99.36, { abs: 1e-12 }, "1 GHz, 100 dB");
    expectClose(p1812FieldStrengthDbuvM(100, 1, 10), 109.36, { abs: 1e-12 }, "10 kW");
  });
});
