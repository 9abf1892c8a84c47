import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import {
  dryPressureFromTotalHpa,
  gasPathAttenuation,
  gasSpecificAttenuation,
  REFERENCE_ATMOSPHERE,
  waterVapourPressureHpa,
} from "../../src/physics/gas-attenuation.ts";
import { P676_OXYGEN_LINES, P676_WATER_VAPOUR_LINES } from "../../src/physics/p676-lines.ts";
import { expectClose, parseCsv } from "../helpers/expect-close.ts";

const fixture = (name: string) => readFileSync(new URL(`../fixtures/itu/p676/${name}`, import.meta.url), "utf8");

// Reference: ITU-R Study Group 3 validation examples for P.676-12 Annex 1
// (test/fixtures/itu/README.md): γo, γw, γ at p = 1013.25 hPa DRY pressure, T = 288.15 K, ρ = 7.5 g/m³.
const rows = parseCsv(fixture("gamma_sea_level_validation.csv"));
// Tolerance 0.1 % relative per quantity (the task's requirement); the fixture's γw at 1 GHz
// carries three significant digits (5.09E-05), which is the largest difference (9e-5 relative).
const TOL = { rel: 1e-3 };

describe("P.676-12 Annex 1 specific attenuation against the ITU-R validation examples", () => {
  it("has all 350 validation rows", () => expect(rows.length).toBe(350));

  it.each(rows)("f = $f_GHz GHz", (r) => {
    const g = gasSpecificAttenuation({
      frequency_ghz: +r.f_GHz,
      pressure_dry_hpa: +r.p_dry_hPa,
      temperature_k: +r.T_K,
      water_vapour_density_g_m3: +r.rho_g_per_m3,
    });
    expectClose(g.gamma_o_db_km, +r.gamma_o_db_per_km, TOL, { f: r.f_GHz, q: "gamma_o" });
    expectClose(g.gamma_w_db_km, +r.gamma_w_db_per_km, TOL, { f: r.f_GHz, q: "gamma_w" });
    expectClose(g.gamma_db_km, +r.gamma_db_per_km, TOL, { f: r.f_GHz, q: "gamma" });
  });

  it("largest relative error over all rows stays below 1e-4 (measured: γo 7.1e-8, γw 9.1e-5, γ 4.0e-8)", () => {
    let worst = 0;
    for (const r of rows) {
      const g = gasSpecificAttenuation({
        frequency_ghz: +r.f_GHz,
        pressure_dry_hpa: +r.p_dry_hPa,
        temperature_k: +r.T_K,
        water_vapour_density_g_m3: +r.rho_g_per_m3,
      });
      worst = Math.max(
        worst,
        Math.abs(g.gamma_o_db_km / +r.gamma_o_db_per_km - 1),
        Math.abs(g.gamma_w_db_km / +r.gamma_w_db_per_km - 1),
        Math.abs(g.gamma_db_km / +r.gamma_db_per_km - 1),
      );
    }
    expect(worst).toBeLessThan(1e-4);
  });
});

describe("P.676-12 line tables compiled into src/physics/p676-lines.ts", () => {
  // The generated TypeScript must equal the committed Tables 1 and 2 (scripts/generate-p676-lines.ts).
  it.each([
    ["table1_oxygen_lines.csv", P676_OXYGEN_LINES, 44],
    ["table2_water_vapour_lines.csv", P676_WATER_VAPOUR_LINES, 35],
  ] as const)("%s", (file, lines, count) => {
    const csv = parseCsv(fixture(file)).map((row) => Object.values(row).map(Number));
    expect(lines.length).toBe(count);
    expect(csv.map((r) => [...r])).toEqual(lines.map((l) => [...l]));
  });
});

describe("pressure, vapour and path helpers", () => {
  it("e = ρT/216.7 (P.676-12 eq. (4)): 7.5 g/m³ at 288.15 K is 9.9729 hPa", () => {
    expectClose(waterVapourPressureHpa(7.5, 288.15), 9.97289, { abs: 1e-5 }, "e");
  });

  it("dry pressure of the reference atmosphere is 1013.25 hPa total minus e", () => {
    const { pressure_total_hpa, temperature_k, water_vapour_density_g_m3 } = REFERENCE_ATMOSPHERE;
    expectClose(
      dryPressureFromTotalHpa(pressure_total_hpa, temperature_k, water_vapour_density_g_m3),
      1013.25 - 9.97289,
      { abs: 1e-5 },
      "p_dry",
    );
  });

  it("in a line wing (10 GHz) taking total pressure as dry pressure overstates γ by about 1.5 % (pressure broadening)", () => {
    const common = { frequency_ghz: 10, temperature_k: 288.15, water_vapour_density_g_m3: 7.5 };
    const asDry = gasSpecificAttenuation({ ...common, pressure_dry_hpa: 1013.25 }).gamma_db_km;
    const fromTotal = gasSpecificAttenuation({ ...common, pressure_dry_hpa: dryPressureFromTotalHpa(1013.25, 288.15, 7.5) }).gamma_db_km;
    expect(fromTotal).toBeLessThan(asDry);
    expectClose(fromTotal, asDry, { rel: 0.02 }, "within 2 %");
  });

  it("path attenuation is γ·d with d in km (P.676-12 eq. (10))", () => {
    expectClose(gasPathAttenuation(0.2, 25_000), 5, { abs: 1e-12 }, "0.2 dB/km × 25 km");
    expect(gasPathAttenuation(0.2, 0)).toBe(0);
    expect(gasPathAttenuation(0.2, -1)).toBeNaN();
  });
});

describe("invariants", () => {
  it("dry air has no water-vapour attenuation, and γw grows with humidity", () => {
    fc.assert(
      fc.property(fc.double({ min: 1, max: 1000, noNaN: true }), fc.double({ min: 0.1, max: 30, noNaN: true }), (f, rho) => {
        const base = { frequency_ghz: f, pressure_dry_hpa: 1013.25, temperature_k: 288.15 };
        const dry = gasSpecificAttenuation({ ...base, water_vapour_density_g_m3: 0 });
        const wet = gasSpecificAttenuation({ ...base, water_vapour_density_g_m3: rho });
        const wetter = gasSpecificAttenuation({ ...base, water_vapour_density_g_m3: rho * 1.5 });
        return dry.gamma_w_db_km === 0 && wet.gamma_w_db_km > 0 && wetter.gamma_w_db_km > wet.gamma_w_db_km;
      }),
    );
  });

  it("γ = γo + γw and all are positive across 1–1000 GHz", () => {
    fc.assert(
      fc.property(fc.double({ min: 1, max: 1000, noNaN: true }), (f) => {
        const g = gasSpecificAttenuation({ frequency_ghz: f, pressure_dry_hpa: 1003.28, temperature_k: 288.15, water_vapour_density_g_m3: 7.5 });
        return g.gamma_o_db_km > 0 && g.gamma_w_db_km > 0 && Math.abs(g.gamma_db_km - g.gamma_o_db_km - g.gamma_w_db_km) <= 1e-15 * g.gamma_db_km;
      }),
    );
  });

  it("the 60 GHz oxygen complex and the 22.235 GHz water line are local maxima (common practice)", () => {
    const g = (f: number) =>
      gasSpecificAttenuation({ frequency_ghz: f, pressure_dry_hpa: 1013.25, temperature_k: 288.15, water_vapour_density_g_m3: 7.5 });
    expect(g(60).gamma_o_db_km).toBeGreaterThan(g(50).gamma_o_db_km);
    expect(g(60).gamma_o_db_km).toBeGreaterThan(g(70).gamma_o_db_km);
    expect(g(22.235).gamma_w_db_km).toBeGreaterThan(g(20).gamma_w_db_km);
    expect(g(22.235).gamma_w_db_km).toBeGreaterThan(g(25).gamma_w_db_km);
  });

  it("NaN or non-physical input gives NaN", () => {
    const ok = { frequency_ghz: 10, pressure_dry_hpa: 1013.25, temperature_k: 288.15, water_vapour_density_g_m3: 7.5 };
    for (const bad of [{ frequency_ghz: NaN }, { frequency_ghz: 0 }, { temperature_k: 0 }, { pressure_dry_hpa: -1 }, { water_vapour_density_g_m3: -1 }]) {
      expect(gasSpecificAttenuation({ ...ok, ...bad }).gamma_db_km).toBeNaN();
    }
  });
});
