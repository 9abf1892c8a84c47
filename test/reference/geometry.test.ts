import { describe, it } from "vitest";
import fc from "fast-check";
import { earthBulgeM } from "../../src/physics/earth-bulge.ts";
import { fresnelRadiusM } from "../../src/physics/fresnel-radius.ts";
import { freeSpaceLossDb } from "../../src/physics/free-space-loss.ts";
import { expectClose } from "../helpers/expect-close.ts";

describe("first Fresnel radius", () => {
  // ITU-R P.530-18 eq. (2): F1 = 17.3·sqrt(d1·d2/(f·d)) m with d in km and f in GHz.
  // 17.3 rounds sqrt(c/1e9 · 1e3) = 17.314; so the check uses the unrounded constant.
  it.each([
    [10, 5_000, 5_000],
    [6, 2_000, 18_000],
    [0.9, 12_000, 3_000],
    [38, 700, 800],
  ])("f=%s GHz d1=%s m d2=%s m", (f, d1, d2) => {
    const lambda = 299_792_458 / (f * 1e9);
    const expected = Math.sqrt(299_792_458 / 1e9 * 1e3) * Math.sqrt(((d1 / 1e3) * (d2 / 1e3)) / (f * ((d1 + d2) / 1e3)));
    expectClose(fresnelRadiusM(1, lambda, d1, d2), expected, { rel: 1e-12 }, { f, d1, d2 });
  });

  it("textbook value: 10 km hop at 6 GHz, midpath F1 ≈ 11.2 m (P.530 eq. (2) with 17.3 gives 11.17 m)", () => {
    const lambda = 299_792_458 / 6e9;
    expectClose(fresnelRadiusM(1, lambda, 5000, 5000), 11.17, { abs: 0.02 }, "midpath F1");
  });

  it("zone n scales as sqrt(n) and vanishes at the ends", () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 9 }), fc.double({ min: 1, max: 1e5, noNaN: true }), (n, d1) => {
        const r1 = fresnelRadiusM(1, 0.05, d1, 3000);
        expectClose(fresnelRadiusM(n, 0.05, d1, 3000), r1 * Math.sqrt(n), { rel: 1e-12 });
        return fresnelRadiusM(1, 0.05, 0, 3000) === 0;
      }),
    );
  });
});

describe("Earth bulge", () => {
  // Common practice: midpath bulge h = d²/(8·k·a) for d in m; 50 km at k = 4/3 → 36.8 m;
  // the textbook form h(m) = d1·d2/(12.74·k) with km gives 36.79 m (from memory).
  it.each([
    [50_000, 4 / 3, (50_000 ** 2) / (8 * (4 / 3) * 6_371_000)],
    [20_000, 2 / 3, (20_000 ** 2) / (8 * (2 / 3) * 6_371_000)],
  ])("D=%s m k=%s midpath", (D, k, expected) => {
    expectClose(earthBulgeM(D / 2, D / 2, k * 6_371_000), expected, { rel: 1e-12 }, { D, k });
  });
  it("textbook form d1·d2/(12.74·k) (km in, m out) for 50 km at k = 4/3", () => {
    expectClose(earthBulgeM(25_000, 25_000, (4 / 3) * 6_371_000), (25 * 25) / (12.742 * (4 / 3)), { rel: 1e-4 });
  });
  it("k = inf gives a flat Earth; NaN in gives NaN out", () => {
    expectClose(earthBulgeM(1000, 2000, Infinity), 0, { abs: 0 });
    expectClose(earthBulgeM(NaN, 2000, 8.5e6), NaN, { abs: 0 });
  });
});

describe("free-space loss, ITU-R P.525-4 eq. (4)", () => {
  // P.525-4 eq. (4): Lbf = 32.4 + 20 log f(MHz) + 20 log d(km); the exact constant is
  // 20·log10(4π·1e9/c) = 32.4478 dB for f in MHz... expressed for f in GHz and d in km:
  // 92.4478 dB. Values computed from the definition with c = 299 792 458 m/s.
  const exact = (d_km: number, f_ghz: number) => 20 * Math.log10((4 * Math.PI * 1e12) / 299_792_458) + 20 * Math.log10(f_ghz) + 20 * Math.log10(d_km);
  it.each([
    [1, 1],
    [10, 6],
    [47.3, 11],
    [3.2, 23],
    [80, 0.9],
  ])("d=%s km f=%s GHz", (d, f) => {
    expectClose(freeSpaceLossDb(d * 1000, f), exact(d, f), { abs: 0.01 }, { d, f });
  });
  it("the exact constant for GHz and km is 92.45 dB (P.525 rounds it to 92.4)", () => {
    expectClose(freeSpaceLossDb(1000, 1), 92.4478, { abs: 1e-4 });
  });
  it("doubling distance adds 20·log10 2 dB", () => {
    fc.assert(
      fc.property(fc.double({ min: 10, max: 1e6, noNaN: true }), fc.double({ min: 0.1, max: 100, noNaN: true }), (d, f) => {
        expectClose(freeSpaceLossDb(2 * d, f) - freeSpaceLossDb(d, f), 20 * Math.log10(2), { abs: 1e-9 });
        return true;
      }),
    );
  });
});
