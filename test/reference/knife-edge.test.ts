import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import {
  fresnelKirchhoffNu,
  knifeEdgeLossApprox,
  knifeEdgeLossExact,
} from "../../src/physics/knife-edge.ts";
import { expectClose, parseCsv } from "../helpers/expect-close.ts";

const grid = parseCsv(readFileSync(new URL("../fixtures/fresnel/knife_edge_scipy.csv", import.meta.url), "utf8"));

describe("knife-edge loss J(ν), exact (P.526-15 eqs. (26)–(27))", () => {
  it("matches J(ν) from SciPy scipy.special.fresnel for ν ∈ [−3, 10] within 0.01 dB", () => {
    // Source: test/fixtures/fresnel/knife_edge_scipy.csv (SciPy 1.17, generate.py).
    let maxErr = 0;
    for (const r of grid) {
      const nu = Number(r.nu);
      const J = knifeEdgeLossExact(nu);
      expectClose(J, Number(r.J_db), { abs: 0.01 }, { nu });
      maxErr = Math.max(maxErr, Math.abs(J - Number(r.J_db)));
    }
    // Measured max error about 1e-11 dB; guard the headroom as well.
    expect(maxErr).toBeLessThan(1e-9);
  });

  it("grazing incidence: J(0) = 20·log10 2 (P.526-15 §4.1)", () => {
    expectClose(knifeEdgeLossExact(0), 20 * Math.log10(2), { abs: 1e-9 }, "J(0)");
  });
});

describe("knife-edge loss J(ν), approximation (P.526-15 eq. (31))", () => {
  it.each([
    // ν, value of eq. (31) worked by hand: 6.9 + 20·log10(sqrt((ν−0.1)²+1) + ν − 0.1)
    [0, 6.9 + 20 * Math.log10(Math.sqrt(1.01) - 0.1)],
    [1, 6.9 + 20 * Math.log10(Math.sqrt(1.81) + 0.9)],
    [-0.5, 6.9 + 20 * Math.log10(Math.sqrt(1.36) - 0.6)],
    [-0.79, 0],
    [-3, 0],
  ])("J(%s)", (nu, expected) => {
    expectClose(knifeEdgeLossApprox(nu), expected, { abs: 1e-12 }, { nu });
  });

  it("stays within 0.13 dB of the exact J(ν) for −0.78 < ν ≤ 10 (measured 0.123 dB at ν ≈ 4.57)", () => {
    let maxDiff = 0;
    for (let k = -77; k <= 1000; k++) {
      const nu = k / 100;
      maxDiff = Math.max(maxDiff, Math.abs(knifeEdgeLossApprox(nu) - Number(grid[k + 300].J_db)));
      expect(Number(grid[k + 300].nu)).toBe(nu);
    }
    expect(maxDiff).toBeGreaterThan(0.1); // the approximation is not exact …
    expect(maxDiff).toBeLessThan(0.13); // … but close
  });

  it("NaN in gives NaN", () => {
    expect(knifeEdgeLossApprox(NaN)).toBeNaN();
    expect(knifeEdgeLossExact(NaN)).toBeNaN();
  });
});

describe("Fresnel–Kirchhoff parameter ν (P.526-15 eq. (22))", () => {
  it("agrees with the equivalent angle form ν = θ·sqrt(2·d1·d2/(λ·(d1 + d2))) (P.526-15 §4.1)", () => {
    for (const [h, d1, d2, lambda] of [
      [10, 2000, 5000, 0.05],
      [-3, 150, 9000, 0.3],
      [40, 12_000, 800, 0.0125],
    ]) {
      const theta = h / d1 + h / d2; // diffraction angle (rad), small-angle form used by P.526
      const nuAngle = theta * Math.sqrt((2 * d1 * d2) / (lambda * (d1 + d2)));
      expectClose(fresnelKirchhoffNu(h, d1, d2, lambda), nuAngle, { rel: 1e-12 }, { h, d1, d2, lambda });
    }
  });

  it("gives NaN for non-positive distances or wavelength", () => {
    expect(fresnelKirchhoffNu(1, 0, 1, 1)).toBeNaN();
    expect(fresnelKirchhoffNu(1, 1, -1, 1)).toBeNaN();
    expect(fresnelKirchhoffNu(1, 1, 1, 0)).toBeNaN();
    expect(fresnelKirchhoffNu(NaN, 1, 1, 1)).toBeNaN();
  });
});

describe("textbook worked example", () => {
  // T. S. Rappaport, Wireless Communications: Principles and Practice, 2nd ed., Example 4.7
  // (values from memory): λ = 1/3 m, d1 = d2 = 1 km.
  //   (a) h = 25 m: ν ≈ 2.74, loss ≈ 22 dB read from the book's knife-edge graph, and
  //       21.7 dB from the book's approximation Gd = 20·log10(0.225/ν) for ν > 2.4;
  //   (b) h = 0: ν = 0, loss 6 dB;
  //   (c) h = −25 m: ν ≈ −2.74, loss about 0–1 dB (graph).
  const lambda = 1 / 3;
  it("(a) h = 25 m: ν = 2.74 and J ≈ 22 dB", () => {
    const nu = fresnelKirchhoffNu(25, 1000, 1000, lambda);
    expectClose(nu, 2.74, { abs: 0.005 }, "ν (book, 2 decimals)");
    // Independent: ν² = h²·2(d1+d2)/(λ·d1·d2) = 625·2·2000/(1/3·1e6) = 7.5 exactly.
    expectClose(nu * nu, 7.5, { rel: 1e-14 }, "ν² by hand");
    const J = knifeEdgeLossExact(nu);
    expectClose(J, 22, { abs: 0.5 }, "J vs graph reading");
    expectClose(J, -20 * Math.log10(0.225 / nu), { abs: 0.1 }, "J vs the book's large-ν approximation");
  });
  it("(b) h = 0: ν = 0 and J = 6.02 dB", () => {
    expect(fresnelKirchhoffNu(0, 1000, 1000, lambda)).toBe(0);
    expectClose(knifeEdgeLossExact(0), 6.02, { abs: 0.005 }, "J(0)");
  });
  it("(c) h = −25 m: ν = −2.74 and |J| below 1 dB", () => {
    const nu = fresnelKirchhoffNu(-25, 1000, 1000, lambda);
    expectClose(nu, -2.74, { abs: 0.005 }, "ν");
    expect(Math.abs(knifeEdgeLossExact(nu))).toBeLessThan(1);
  });
});
