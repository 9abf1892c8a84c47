import { describe, it, expect } from "vitest";
import fc from "fast-check";
import { complexPermittivity, reflectionCoefficient, type Polarization } from "../../src/physics/reflection-coefficient.ts";
import { GROUND_CLASSES, groundConstants } from "../../src/physics/ground-constants.ts";
import { expectClose } from "../helpers/expect-close.ts";

const R = (epsilon_r: number, sigma_s_m: number, frequency_ghz: number, grazing_angle_rad: number, polarization: Polarization) =>
  reflectionCoefficient({ epsilon_r, sigma_s_m, frequency_ghz, grazing_angle_rad, polarization });

describe("reflection coefficient: known limits", () => {
  // Fresnel limit (Parsons 2000 §2.3, from memory): at grazing incidence every finite ground
  // reflects with R = −1 for both polarisations. |R + 1| = O(ψ/√η) for h and O(ηψ/√η) for v,
  // so ψ = 1e-9 rad leaves < 1e-6.
  const cases = GROUND_CLASSES.flatMap((g) => [0.1, 2, 18].map((f) => [g, f] as const));
  it.each(cases)("ψ → 0 gives R → −1 for %s at %s GHz", (g, f) => {
    const { epsilon_r, sigma_s_m } = groundConstants(g, f);
    for (const pol of ["horizontal", "vertical"] as const) {
      const r = R(epsilon_r, sigma_s_m, f, 1e-9, pol);
      expectClose(r.re, -1, { abs: 1e-6 }, { g, f, pol, part: "re" });
      expectClose(r.im, 0, { abs: 1e-6 }, { g, f, pol, part: "im" });
    }
  });

  it("perfect conductor (σ = Infinity): R_h = −1 and R_v = +1 at every angle", () => {
    for (const psi of [0, 0.01, 0.3, 1, Math.PI / 2]) {
      expectClose(R(15, Infinity, 5, psi, "horizontal").re, -1, { abs: 0 }, { psi });
      expectClose(R(15, Infinity, 5, psi, "vertical").re, 1, { abs: 0 }, { psi });
    }
  });

  // σ → ∞: |R_h + 1| ≈ 2·sinψ/√|η| and |R_v − 1| ≈ 2/(√|η|·sinψ); σ = 1e12 S/m at 5 GHz gives
  // √|η| ≈ 1.9e6, so both are below 1e-4 for ψ ≥ 0.05 rad.
  it("very large finite σ approaches the perfect conductor (σ = 1e12 S/m → |R ∓ 1| < 1e-4 at ψ ≥ 0.05)", () => {
    for (const psi of [0.05, 0.3, 1, Math.PI / 2]) {
      const h = R(15, 1e12, 5, psi, "horizontal");
      const v = R(15, 1e12, 5, psi, "vertical");
      expectClose(Math.hypot(h.re + 1, h.im), 0, { abs: 1e-4 }, { psi, pol: "h" });
      expectClose(Math.hypot(v.re - 1, v.im), 0, { abs: 1e-4 }, { psi, pol: "v" });
    }
  });

  it.each([3, 4, 15, 30, 80])("lossless εr = %s: R_v = 0 exactly at the Brewster angle atan(1/√εr)", (er) => {
    const psiB = Math.atan(1 / Math.sqrt(er)); // Brewster: tan θB = √εr from the normal
    expectClose(R(er, 0, 1, psiB, "vertical").magnitude, 0, { abs: 1e-12 }, { er, psiB });
  });

  // Lossy ground: |R_v| has a non-zero minimum (pseudo-Brewster angle) close to atan(1/√εr)
  // when the loss term 60λσ is small against εr (common practice). Grid search 1e-5 rad.
  it.each([
    ["medium-dry-ground", 2],
    ["very-dry-ground", 5],
    ["wet-ground", 8],
    ["sea-water", 18],
  ] as const)("|R_v| minimum of %s at %s GHz lies near the pseudo-Brewster angle", (g, f) => {
    const { epsilon_r, sigma_s_m } = groundConstants(g, f);
    let best = { psi: NaN, mag: Infinity };
    for (let psi = 1e-5; psi < Math.PI / 2; psi += 1e-5) {
      const m = R(epsilon_r, sigma_s_m, f, psi, "vertical").magnitude;
      if (m < best.mag) best = { psi, mag: m };
    }
    const eta = complexPermittivity(epsilon_r, sigma_s_m, f);
    const psiPB = Math.atan(1 / Math.sqrt(Math.hypot(eta.re, eta.im))); // |η| form, loss included
    expectClose(best.psi, psiPB, { rel: 0.1 }, { g, f, epsilon_r, sigma_s_m });
    expect(best.mag).toBeLessThan(R(epsilon_r, sigma_s_m, f, psiPB / 4, "vertical").magnitude);
    expect(best.mag).toBeLessThan(R(epsilon_r, sigma_s_m, f, Math.min(Math.PI / 2, psiPB * 4), "vertical").magnitude);
  });

  it("normal incidence (ψ = π/2): R_v = −R_h (the two polarisations coincide up to the sign convention)", () => {
    fc.assert(
      fc.property(fc.double({ min: 1, max: 100, noNaN: true }), fc.double({ min: 0, max: 10, noNaN: true }), (er, sg) => {
        const h = R(er, sg, 3, Math.PI / 2, "horizontal");
        const v = R(er, sg, 3, Math.PI / 2, "vertical");
        expectClose(v.re, -h.re, { abs: 1e-12 }, { er, sg });
        expectClose(v.im, -h.im, { abs: 1e-12 }, { er, sg });
      }),
    );
  });

  it("passive ground: |R| ≤ 1 for εr ≥ 1, σ ≥ 0, any ψ", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 1, max: 100, noNaN: true }),
        fc.double({ min: 0, max: 100, noNaN: true }),
        fc.double({ min: 0.01, max: 100, noNaN: true }),
        fc.double({ min: 0, max: Math.PI / 2, noNaN: true }),
        fc.constantFrom<Polarization>("horizontal", "vertical"),
        (er, sg, f, psi, pol) => R(er, sg, f, psi, pol).magnitude <= 1 + 1e-12,
      ),
    );
  });

  it("no contrast (εr = 1, σ = 0) reflects nothing at every ψ, grazing included (fast-check found 0/0 there)", () => {
    for (const pol of ["horizontal", "vertical"] as const) {
      for (const psi of [0, 1e-9, 0.3, Math.PI / 2]) expectClose(R(1, 0, 0.01, psi, pol).magnitude, 0, { abs: 1e-7 }, { pol, psi });
    }
  });

  it("NaN in → NaN out; ψ outside [0, π/2] and negative σ give NaN", () => {
    expect(R(NaN, 0.01, 1, 0.1, "horizontal").magnitude).toBeNaN();
    expect(R(15, NaN, 1, 0.1, "horizontal").magnitude).toBeNaN();
    expect(R(15, 0.01, NaN, 0.1, "vertical").magnitude).toBeNaN();
    expect(R(15, 0.01, 1, NaN, "vertical").magnitude).toBeNaN();
    expect(R(15, 0.01, 1, -0.1, "vertical").magnitude).toBeNaN();
    expect(R(15, 0.01, 1, 2, "horizontal").magnitude).toBeNaN();
    expect(R(15, -1, 1, 0.1, "horizontal").magnitude).toBeNaN();
  });

  it("η uses 60·λ·σ: 18·σ/f_GHz to 0.07 % (ITU-R shorthand)", () => {
    const eta = complexPermittivity(15, 0.005, 2);
    expectClose(eta.im, (-18 * 0.005) / 2, { rel: 1e-3 }, "Im η");
    expectClose(eta.re, 15, { abs: 0 }, "Re η");
  });
});
