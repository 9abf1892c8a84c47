import { describe, it, expect } from "vitest";
import fc from "fast-check";
import { heightGainCurve, spaceDiversitySpacing, twoRayRelativeLevelDb } from "../../src/physics/two-ray.ts";
import { smoothEarthReflectionPoint } from "../../src/physics/smooth-earth-reflection-point.ts";
import { divergenceFactor } from "../../src/physics/divergence-factor.ts";
import { rayleighCriterionHeightM, roughnessFactor } from "../../src/physics/surface-roughness.ts";
import { expectClose } from "../helpers/expect-close.ts";

const C = 299_792_458;

describe("twoRayRelativeLevelDb", () => {
  it("lies between 20·log10(1 − ρ) and 20·log10(1 + ρ) (triangle inequality)", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0, max: 0.999, noNaN: true }),
        fc.double({ min: -Math.PI, max: Math.PI, noNaN: true }),
        fc.double({ min: 0, max: 50, noNaN: true }),
        fc.double({ min: 0.001, max: 3, noNaN: true }),
        fc.double({ min: 0.1, max: 1, noNaN: true }),
        (mag, phase, delta, lambda, D) => {
          const L = twoRayRelativeLevelDb({ path_difference_m: delta, lambda_m: lambda, reflection: { magnitude: mag, phase_rad: phase }, divergence: D });
          const rho = mag * D;
          return L <= 20 * Math.log10(1 + rho) + 1e-9 && L >= 20 * Math.log10(1 - rho) - 1e-9;
        },
      ),
    );
  });

  it("R = −1: +6.02 dB when Δ = λ/2, a null when Δ = λ, 0 dB when Δ = λ/6 (common practice)", () => {
    const lambda = 0.05;
    const R = { magnitude: 1, phase_rad: Math.PI };
    expectClose(twoRayRelativeLevelDb({ path_difference_m: lambda / 2, lambda_m: lambda, reflection: R }), 20 * Math.log10(2), { abs: 1e-12 }, "peak");
    expect(twoRayRelativeLevelDb({ path_difference_m: lambda, lambda_m: lambda, reflection: R })).toBeLessThan(-250);
    // |1 − e^{−jπ/3}| = 1
    expectClose(twoRayRelativeLevelDb({ path_difference_m: lambda / 6, lambda_m: lambda, reflection: R }), 0, { abs: 1e-12 }, "unity");
  });

  it("no reflection (ρ = 0) gives 0 dB; bad input gives NaN", () => {
    expect(twoRayRelativeLevelDb({ path_difference_m: 3.3, lambda_m: 0.1, reflection: { magnitude: 0, phase_rad: 1 } })).toBe(0);
    expect(twoRayRelativeLevelDb({ path_difference_m: NaN, lambda_m: 0.1, reflection: { magnitude: 1, phase_rad: 1 } })).toBeNaN();
    expect(twoRayRelativeLevelDb({ path_difference_m: 1, lambda_m: 0, reflection: { magnitude: 1, phase_rad: 1 } })).toBeNaN();
  });
});

describe("heightGainCurve", () => {
  // Flat Earth, horizontal polarisation on a perfect conductor (R_h = −1 exactly): the field is
  // |1 − e^{−jkΔ}| = 2·|sin(kΔ/2)| with the closed-form Δ (plane-Earth two-ray model, e.g.
  // Parsons 2000 §2.4 — from memory). Compared in linear amplitude, tolerance 1e-9.
  it("flat Earth, perfect conductor: 2·|sin(kΔ/2)| with the closed-form Δ", () => {
    const d = 12_000;
    const f = 2.4;
    const lambda = C / (f * 1e9);
    const d_m = Array.from({ length: 121 }, (_, i) => i * 100);
    const h_m = d_m.map(() => 35);
    const rx = Array.from({ length: 60 }, (_, i) => 2 + i * 0.7);
    const curve = heightGainCurve({
      d_m, h_m, ae_m: Infinity, tx_antenna_m: 25, rx_antennas_m: rx, frequency_ghz: f,
      ground: { epsilon_r: 1, sigma_s_m: Infinity }, polarization: "horizontal",
    });
    curve.forEach((pt, i) => {
      const h2 = rx[i];
      const delta = Math.hypot(d, 25 + h2) - Math.hypot(d, 25 - h2);
      const amp = 2 * Math.abs(Math.sin((Math.PI * delta) / lambda));
      expectClose(10 ** (pt.relative_db / 20), amp, { abs: 1e-9 }, { h2 });
      expect(pt.reflections).toBe(1);
      expect(pt.rx_antenna_m).toBe(h2);
    });
  });

  it("peaks and nulls are spaced by spaceDiversitySpacing on a flat Earth", () => {
    const d = 20_000;
    const f = 6;
    const lambda = C / (f * 1e9);
    const sd = spaceDiversitySpacing({ lambda_m: lambda, d_m: d, h1_m: 50, h2_m: 30, ae_m: Infinity });
    const d_m = Array.from({ length: 201 }, (_, i) => i * 100);
    const h_m = d_m.map(() => 0);
    const at = (h: number) =>
      heightGainCurve({ d_m, h_m, ae_m: Infinity, tx_antenna_m: 50, rx_antennas_m: [h], frequency_ghz: f, ground: { epsilon_r: 1, sigma_s_m: Infinity }, polarization: "horizontal" })[0].relative_db;
    // kΔ at h2 + spacing_above differs by π, so for R = −1 the two powers are complementary:
    // |1 − e^{−jx}|² + |1 − e^{−j(x+π)}|² = (2 − 2cos x) + (2 + 2cos x) = 4
    const p = 10 ** (at(30) / 10) + 10 ** (at(30 + sd.spacing_above_m) / 10);
    expectClose(p, 4, { abs: 1e-6 }, "power sum across a half period");
  });

  it("divergence and roughness reduce the reflected ray; an invalid profile gives NaN", () => {
    const d_m = Array.from({ length: 301 }, (_, i) => i * 100);
    const h_m = d_m.map(() => 0);
    const base = { d_m, h_m, ae_m: 8_500_000, tx_antenna_m: 80, rx_antennas_m: [40], frequency_ghz: 7, ground: { epsilon_r: 70, sigma_s_m: 5 }, polarization: "vertical" as const };
    expect(heightGainCurve({ ...base, d_m: [0, 0], h_m: [0, 0] })[0].relative_db).toBeNaN();
    expect(heightGainCurve({ ...base, rx_antennas_m: [NaN] })[0].relative_db).toBeNaN();
    expect(heightGainCurve({ ...base, divergence: false })[0].reflections).toBe(1);
  });
});

describe("spaceDiversitySpacing", () => {
  // Flat Earth: spacing_above is found here independently from the closed-form Δ(h2) by bisection.
  it.each([
    [60, 40, 40_000, 6.7],
    [30, 30, 15_000, 11],
    [100, 20, 50_000, 2],
  ])("flat Earth h1=%s h2=%s d=%s f=%s GHz: λd/(4h1) and the exact half period", (h1, h2, d, f) => {
    const lambda = C / (f * 1e9);
    const sd = spaceDiversitySpacing({ lambda_m: lambda, d_m: d, h1_m: h1, h2_m: h2, ae_m: Infinity });
    expectClose(sd.spacing_m, (lambda * d) / (4 * h1), { rel: 1e-14 }, "λd/(4h1)");
    const delta = (h: number) => Math.hypot(d, h1 + h) - Math.hypot(d, h1 - h);
    let lo = h2;
    let hi = h2 + 10 * sd.spacing_m;
    for (let i = 0; i < 200; i++) {
      const m = (lo + hi) / 2;
      if (delta(m) - delta(h2) < lambda / 2) lo = m;
      else hi = m;
    }
    expectClose(sd.spacing_above_m, lo - h2, { rel: 1e-7 }, "exact half period");
    // and the local formula is within (spacing/h2)·… of it on a flat Earth (measured < 1e-4 here)
    expectClose(sd.spacing_m, lo - h2, { rel: 1e-4 }, "formula vs exact");
  });

  // Sphere: exact spherical geometry in the test (bisection on angle equality, then Δ), against
  // the smooth-Earth based half period. Parabolic-Earth error in Δ ~6e-5 relative → tolerance 2e-3.
  it.each([
    [60, 40, 40_000, 8_500_000, 6.7],
    [150, 80, 50_000, 8_494_667, 6.7],
    [40, 60, 25_000, 4_268_570, 13],
  ])("sphere h1=%s h2=%s d=%s ae=%s f=%s GHz", (h1, h2, d, ae, f) => {
    const lambda = C / (f * 1e9);
    const sd = spaceDiversitySpacing({ lambda_m: lambda, d_m: d, h1_m: h1, h2_m: h2, ae_m: ae });
    const delta = (h: number) => sphereDelta(h1, h, d, ae);
    let lo = h2;
    let hi = h2 + 10 * sd.spacing_m;
    for (let i = 0; i < 100; i++) {
      const m = (lo + hi) / 2;
      if (delta(m) - delta(h2) < lambda / 2) lo = m;
      else hi = m;
    }
    expectClose(sd.spacing_above_m, lo - h2, { rel: 2e-3 }, { h1, h2, d, ae });
    expectClose(sd.h1_eff_m, smoothEarthReflectionPoint(h1, h2, d, ae).h1_eff_m, { rel: 1e-14 }, "h1'");
  });

  it("bad input gives NaN", () => {
    expect(spaceDiversitySpacing({ lambda_m: NaN, d_m: 1e4, h1_m: 30, h2_m: 30, ae_m: Infinity }).spacing_m).toBeNaN();
    expect(spaceDiversitySpacing({ lambda_m: 0.05, d_m: 1e4, h1_m: -3, h2_m: 30, ae_m: Infinity }).spacing_above_m).toBeNaN();
  });
});

/** Exact reflected-minus-direct path on a circle of radius ae (bisection on angle equality). */
function sphereDelta(h1: number, h2: number, d: number, ae: number): number {
  const th = d / ae;
  const T = [0, ae + h1];
  const R = [(ae + h2) * Math.sin(th), (ae + h2) * Math.cos(th)];
  const g = (a: number) => {
    const P = [ae * Math.sin(a), ae * Math.cos(a)];
    const vt = [T[0] - P[0], T[1] - P[1]];
    const vr = [R[0] - P[0], R[1] - P[1]];
    const n = [Math.sin(a), Math.cos(a)];
    const f = Math.asin((vt[0] * n[0] + vt[1] * n[1]) / Math.hypot(vt[0], vt[1])) - Math.asin((vr[0] * n[0] + vr[1] * n[1]) / Math.hypot(vr[0], vr[1]));
    return { f, delta: Math.hypot(vt[0], vt[1]) + Math.hypot(vr[0], vr[1]) - Math.hypot(R[0] - T[0], R[1] - T[1]) };
  };
  let lo = 0;
  let hi = th;
  for (let i = 0; i < 200; i++) {
    const m = (lo + hi) / 2;
    if (g(m).f > 0) lo = m;
    else hi = m;
  }
  return g((lo + hi) / 2).delta;
}

describe("divergence and roughness factors", () => {
  it("divergence: 1 on a flat Earth, < 1 on a sphere, → 1 as ψ grows", () => {
    expect(divergenceFactor({ d1_m: 1e4, d2_m: 2e4, grazing_angle_rad: 0.003, ae_m: Infinity })).toBe(1);
    const a = divergenceFactor({ d1_m: 1e4, d2_m: 2e4, grazing_angle_rad: 0.003, ae_m: 8.5e6 });
    const b = divergenceFactor({ d1_m: 1e4, d2_m: 2e4, grazing_angle_rad: 0.03, ae_m: 8.5e6 });
    expect(a).toBeLessThan(b);
    expect(b).toBeLessThan(1);
    // [1 + 2·1e4·2e4/(8.5e6·3e4·sin 0.003)]^(−1/2), evaluated by hand: 1 + 0.5229 → 0.8103
    expectClose(a, 0.8103, { abs: 1e-4 }, "hand value");
    expect(divergenceFactor({ d1_m: -1, d2_m: 2e4, grazing_angle_rad: 0.003, ae_m: 8.5e6 })).toBeNaN();
  });

  it("roughness: 1 for a smooth surface; exp(−π²/8) at the Rayleigh criterion height (common practice)", () => {
    const lambda = 0.05;
    const psi = 0.01;
    expect(roughnessFactor({ sigma_h_m: 0, grazing_angle_rad: psi, lambda_m: lambda })).toBe(1);
    const hR = rayleighCriterionHeightM({ grazing_angle_rad: psi, lambda_m: lambda });
    expectClose(hR, lambda / (8 * Math.sin(psi)), { rel: 1e-15 }, "Rayleigh height");
    expectClose(roughnessFactor({ sigma_h_m: hR, grazing_angle_rad: psi, lambda_m: lambda }), Math.exp(-(Math.PI ** 2) / 8), { rel: 1e-12 }, "ρs");
    expect(roughnessFactor({ sigma_h_m: -1, grazing_angle_rad: psi, lambda_m: lambda })).toBeNaN();
  });
});
