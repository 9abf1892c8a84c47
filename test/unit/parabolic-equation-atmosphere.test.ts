import { describe, expect, it } from "vitest";
import { kFactorFromGradient } from "../../src/physics/k-factor.ts";
import { modifiedRefractivity, STANDARD_M_GRADIENT_PER_M } from "../../src/physics/parabolic-equation/modified-refractivity.ts";
import { parabolicEquationField, type ParabolicEquationInput } from "../../src/physics/parabolic-equation/split-step.ts";
import { expectClose } from "../helpers/expect-close.ts";

describe("modified refractivity", () => {
  it("a gradient and the k it implies (P.452-17 eq. (5), unrounded) give the same m(z)", () => {
    for (const g of [-40, 0, -100, 30]) {
      const a = modifiedRefractivity({ kind: "gradient", dN_dh_n_per_km: g });
      const b = modifiedRefractivity({ kind: "k-factor", k: kFactorFromGradient(g) });
      for (const z of [0, 10, 250, 1000]) expectClose(a(z), b(z), { abs: 1e-12, rel: 1e-9 }, { g, z });
    }
  });
  it("a table interpolates linearly and continues with the standard 0.118 M/m above its top", () => {
    const m = modifiedRefractivity({ kind: "profile", height_m: [0, 30, 100], m_units: [340, 330, 338] });
    expectClose(m(15) * 1e6, 335, { abs: 1e-9 });
    expectClose(m(65) * 1e6, 334, { abs: 1e-9 });
    expectClose(m(200) * 1e6, 338 + 100 * STANDARD_M_GRADIENT_PER_M, { abs: 1e-9 });
  });
  it("a table that is not ascending gives NaN (no throwing)", () => {
    expect(modifiedRefractivity({ kind: "profile", height_m: [0, 0], m_units: [1, 2] })(5)).toBeNaN();
  });
});

describe("wave solution in a surface duct", () => {
  // A 40 m evaporation-like surface duct (M falls 12 units, then the standard gradient)
  // traps a 10 GHz wave launched inside it: far beyond the normal horizon the loss is much
  // less than in the standard atmosphere (common practice: ducts give beyond-horizon signals).
  const D = 60000;
  const n = 601;
  const base: ParabolicEquationInput = {
    d_m: Float64Array.from({ length: n }, (_, i) => (i * D) / (n - 1)),
    ground_m: new Float64Array(n),
    frequency_ghz: 10,
    tx_antenna_m: 10,
    rx_antenna_m: 10,
    polarization: "h",
    ground: { kind: "impedance", epsilon_r: 70, sigma_s_m: 40 },
    refractivity: { kind: "k-factor", k: 4 / 3 },
    beamwidth_deg: 3,
  };
  it("is at least 20 dB stronger at 60 km than in the standard atmosphere", () => {
    const standard = parabolicEquationField(base);
    const duct = parabolicEquationField({ ...base, refractivity: { kind: "profile", height_m: [0, 40], m_units: [350, 338] } });
    expect(standard.status).toBe("ok");
    expect(duct.status).toBe("ok");
    expect(standard.excess_loss_db - duct.excess_loss_db).toBeGreaterThan(20);
  });
  it("NaN in gives a bad-input status, not a throw", () => {
    expect(parabolicEquationField({ ...base, frequency_ghz: NaN }).status).toBe("bad-input");
    expect(parabolicEquationField({ ...base, tx_antenna_m: NaN }).status).toBe("bad-input");
  });
  it("a grid above the memory limit is refused with the reason", () => {
    const r = parabolicEquationField({ ...base, memory_limit_bytes: 1024 });
    expect(r.status).toBe("refused");
    expect(r.reason).toMatch(/needs .* MiB, above the limit of/);
  });
});
