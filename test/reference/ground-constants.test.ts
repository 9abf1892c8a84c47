import { describe, it, expect } from "vitest";
import { GROUND_CLASSES, LAND_GROUND_FITS, groundConstants } from "../../src/physics/ground-constants.ts";
import { complexPermittivity } from "../../src/physics/reflection-coefficient.ts";
import { waterPermittivity } from "../../src/physics/water-permittivity.ts";
import { expectClose } from "../helpers/expect-close.ts";

describe("water model (Meissner & Wentz 2004, as adopted by ITU-R P.527) against independent sources", () => {
  // Static permittivity of pure water: C. G. Malmberg & A. A. Maryott, J. Res. NBS 56(1), 1956,
  // ε(t) = 87.740 − 0.40008 t + 9.398e-4 t² − 1.410e-6 t³ (t in °C) — polynomial from memory.
  // The model's εs(T) is an independent fit to later data; tolerance 0.25 (0.3 %).
  const malmbergMaryott = (t: number) => 87.74 - 0.40008 * t + 9.398e-4 * t * t - 1.41e-6 * t ** 3;
  it.each([0, 10, 20, 25, 30, 40])("static εs of pure water at %s °C", (t) => {
    const { epsilon } = waterPermittivity({ frequency_ghz: 1e-6, temperature_c: t, salinity_ppt: 0 });
    expectClose(epsilon.re, malmbergMaryott(t), { abs: 0.25 }, { t, source: "Malmberg & Maryott 1956" });
  });

  // Practical Salinity Scale 1978 (UNESCO): standard sea water of S = 35 at 15 °C has the
  // conductivity of the KCl standard, 42.914 mS/cm = 4.2914 S/m (definition of PSS-78, from memory).
  it("ionic conductivity of S = 35 sea water at 15 °C is 4.2914 S/m (PSS-78)", () => {
    const { sigma_ionic_s_m } = waterPermittivity({ frequency_ghz: 1, temperature_c: 15, salinity_ppt: 35 });
    expectClose(sigma_ionic_s_m, 4.2914, { abs: 1e-3 }, "σ(15 °C, 35 ‰)");
  });

  // Independent double-Debye model of pure water: H. J. Liebe et al. (1991), as given in
  // ITU-R P.840-8 §2 (cloud liquid water), written here from memory:
  //   θ = 300/T(K), ε0 = 77.66 + 103.3(θ − 1), ε1 = 0.0671·ε0, ε2 = 3.52,
  //   fp = 20.20 − 146(θ − 1) + 316(θ − 1)² GHz, fs = 39.8·fp,
  //   ε'' = f(ε0 − ε1)/(fp(1 + (f/fp)²)) + f(ε1 − ε2)/(fs(1 + (f/fs)²)),
  //   ε'  = (ε0 − ε1)/(1 + (f/fp)²) + (ε1 − ε2)/(1 + (f/fs)²) + ε2.
  // The two fits differ by < 1 % below 30 GHz and by a few % up to 200 GHz (measured here).
  function liebe(f: number, tC: number): [number, number] {
    const th = 300 / (tC + 273.15);
    const e0 = 77.66 + 103.3 * (th - 1);
    const e1 = 0.0671 * e0;
    const e2 = 3.52;
    const fp = 20.2 - 146 * (th - 1) + 316 * (th - 1) ** 2;
    const fs = 39.8 * fp;
    const epp = (f * (e0 - e1)) / (fp * (1 + (f / fp) ** 2)) + (f * (e1 - e2)) / (fs * (1 + (f / fs) ** 2));
    const ep = (e0 - e1) / (1 + (f / fp) ** 2) + (e1 - e2) / (1 + (f / fs) ** 2) + e2;
    return [ep, epp];
  }
  it.each([
    [1, 10, 0.015],
    [3, 20, 0.015],
    [10, 20, 0.015],
    [20, 5, 0.015],
    [30, 20, 0.015],
    [60, 20, 0.04],
    [100, 20, 0.04],
    [200, 20, 0.04],
  ])("pure water at %s GHz, %s °C agrees with Liebe/P.840 within %s (relative)", (f, t, rel) => {
    const { epsilon } = waterPermittivity({ frequency_ghz: f, temperature_c: t, salinity_ppt: 0 });
    const [ep, epp] = liebe(f, t);
    expectClose(epsilon.re, ep, { rel }, { f, t, quantity: "ε'" });
    expectClose(-epsilon.im, epp, { rel }, { f, t, quantity: "ε''" });
  });
});

describe("groundConstants", () => {
  // ITU-R P.2040-3 Table 3 fits (from memory): εr = a·f^b, σ = c·f^d, f in GHz, 1–10 GHz.
  it.each(Object.entries(LAND_GROUND_FITS))("%s follows its P.2040-3 power law at 1, 3.16 and 10 GHz", (g, fit) => {
    for (const f of [1, Math.sqrt(10), 10]) {
      const r = groundConstants(g as keyof typeof LAND_GROUND_FITS, f);
      expectClose(r.epsilon_r, fit.a * f ** fit.b, { rel: 1e-14 }, { g, f, q: "εr" });
      expectClose(r.sigma_s_m, fit.c * f ** fit.d, { rel: 1e-14 }, { g, f, q: "σ" });
      expect(r.extrapolated).toBe(false);
    }
  });

  it("P.2040-3 Table 3 coefficients (from memory): very dry 3/0/0.00015/2.52, medium dry 15/−0.1/0.035/1.63, wet 30/−0.4/0.15/1.30", () => {
    expect(LAND_GROUND_FITS).toEqual({
      "very-dry-ground": { a: 3, b: 0, c: 0.00015, d: 2.52 },
      "medium-dry-ground": { a: 15, b: -0.1, c: 0.035, d: 1.63 },
      "wet-ground": { a: 30, b: -0.4, c: 0.15, d: 1.3 },
    });
  });

  // Low-frequency values of the ITU-R P.368-9 curve legend (from memory; the P.527-3 classes):
  // sea water (average salinity) εr 70, σ 5 S/m; fresh water εr 80; wet ground εr 30;
  // medium dry ground εr 15; very dry ground εr 3. At 30 MHz the models here should be close.
  it.each([
    ["sea-water", 70, 3, 5, 0.3],
    ["fresh-water", 80, 1, NaN, NaN],
    ["wet-ground", 30, 0, NaN, NaN],
    ["medium-dry-ground", 15, 0, NaN, NaN],
    ["very-dry-ground", 3, 0, NaN, NaN],
  ] as const)("%s at 30 MHz is close to the P.368-9 legend", (g, er, erTol, sg, sgTol) => {
    const r = groundConstants(g, 0.03);
    expectClose(r.epsilon_r, er, { abs: erTol + 1e-12 }, { g, q: "εr" });
    if (!Number.isNaN(sg)) expectClose(r.sigma_s_m, sg, { abs: sgTol }, { g, q: "σ" });
    expect(r.extrapolated).toBe(true);
  });

  it.each(["sea-water", "fresh-water"] as const)("%s: εr − j60λσ reproduces the water model's complex permittivity", (g) => {
    for (const f of [0.5, 2, 11, 38, 80]) {
      const r = groundConstants(g, f);
      const eta = complexPermittivity(r.epsilon_r, r.sigma_s_m, f);
      const { epsilon } = waterPermittivity({ frequency_ghz: f, temperature_c: 20, salinity_ppt: g === "sea-water" ? 35 : 0 });
      expectClose(eta.re, epsilon.re, { rel: 1e-14 }, { g, f, q: "Re" });
      expectClose(eta.im, epsilon.im, { rel: 1e-12 }, { g, f, q: "Im" });
    }
  });

  it("extrapolation is flagged outside the fit ranges, and land εr is held below 1 GHz", () => {
    expect(groundConstants("wet-ground", 0.5).extrapolated).toBe(true);
    expect(groundConstants("wet-ground", 12).extrapolated).toBe(true);
    expect(groundConstants("sea-water", 0.5).extrapolated).toBe(true);
    expect(groundConstants("sea-water", 90).extrapolated).toBe(false);
    expectClose(groundConstants("wet-ground", 0.2).epsilon_r, 30, { abs: 0 }, "held εr");
  });

  it("sea water depends on the stated temperature and salinity", () => {
    const warm = groundConstants("sea-water", 1, { temperature_c: 25, salinity_ppt: 35 });
    const brackish = groundConstants("sea-water", 1, { temperature_c: 20, salinity_ppt: 10 });
    const base = groundConstants("sea-water", 1);
    expect(warm.sigma_s_m).toBeGreaterThan(base.sigma_s_m);
    expect(brackish.sigma_s_m).toBeLessThan(base.sigma_s_m);
  });

  it("bad input gives NaN", () => {
    for (const g of GROUND_CLASSES) {
      expect(groundConstants(g, NaN).epsilon_r).toBeNaN();
      expect(groundConstants(g, -1).sigma_s_m).toBeNaN();
    }
    expect(groundConstants("lava" as never, 1).epsilon_r).toBeNaN();
    expect(waterPermittivity({ frequency_ghz: 1, temperature_c: 20, salinity_ppt: -1 }).epsilon.re).toBeNaN();
  });
});
