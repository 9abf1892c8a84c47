import { describe, it, expect } from "vitest";
import fc from "fast-check";
import { complianceDistanceM, dbmToW, farFieldPowerDensityWm2, generalPublicReferenceLevelWm2 } from "../../src/physics/rf-exposure.ts";
import { expectClose } from "../helpers/expect-close.ts";

describe("general-public reference levels, ICNIRP 2020 Table 5 (whole body, 30 min; values from memory)", () => {
  // frequency (MHz) → S_inc (W/m²): 2 W/m² for 30–400 MHz, f/200 for 400–2000 MHz, 10 W/m² for 2–300 GHz.
  it.each([
    [30, 2],
    [150, 2],
    [400, 2],
    [458.5, 2.2925],
    [900, 4.5],
    [1800, 9],
    [2000, 10],
    [11_245, 10],
    [80_000, 10],
    [300_000, 10],
  ])("%s MHz → %s W/m²", (f, s) => {
    expectClose(generalPublicReferenceLevelWm2(f), s, { rel: 1e-12 }, { frequency_mhz: f });
  });

  it("gives NaN where the table has no power-density level (below 30 MHz, above 300 GHz) and for NaN", () => {
    for (const f of [10, 29.9, 300_001, Number.NaN, -5]) expect(generalPublicReferenceLevelWm2(f)).toBeNaN();
  });

  it("is continuous at the band edges and never decreases with frequency (invariant)", () => {
    expectClose(generalPublicReferenceLevelWm2(400 + 1e-9), 2, { abs: 1e-9 });
    expectClose(generalPublicReferenceLevelWm2(2000 + 1e-9), 10, { abs: 1e-9 });
    fc.assert(
      fc.property(fc.double({ min: 30, max: 300_000, noNaN: true }), fc.double({ min: 30, max: 300_000, noNaN: true }), (a, b) => {
        const [lo, hi] = a < b ? [a, b] : [b, a];
        return generalPublicReferenceLevelWm2(lo) <= generalPublicReferenceLevelWm2(hi);
      }),
    );
  });
});

describe("far-field compliance distance r = sqrt(EIRP/(4πS)) (common practice)", () => {
  // Worked by hand from the formula: 60 dBm = 1000 W; 1000/(4π·10) = 7.957747; sqrt = 2.820948 m.
  // 37 dBm − 1.5 dB + 12 dBi = 47.5 dBm = 56.2341 W at 458.5 MHz (S = 2.2925 W/m²):
  // 56.2341/(4π·2.2925) = 1.952004; sqrt = 1.397142 m.
  it.each([
    [60, 10, 2.820948],
    [47.5, 2.2925, 1.397142],
    [30, 10, 0.0892062],
  ])("EIRP %s dBm, S = %s W/m² → %s m", (eirp_dbm, s, r) => {
    expectClose(complianceDistanceM(dbmToW(eirp_dbm), s), r, { rel: 1e-6 }, { eirp_dbm, s });
  });

  it("dBm to watts: 30 dBm = 1 W, 60 dBm = 1 kW (definition)", () => {
    expectClose(dbmToW(30), 1, { rel: 1e-15 });
    expectClose(dbmToW(60), 1000, { rel: 1e-12 });
  });

  it("the density at the compliance distance equals the reference level; 4× EIRP doubles the distance (invariants)", () => {
    fc.assert(
      fc.property(fc.double({ min: 1e-3, max: 1e6, noNaN: true }), fc.double({ min: 0.1, max: 100, noNaN: true }), (eirp, s) => {
        const r = complianceDistanceM(eirp, s);
        expectClose(farFieldPowerDensityWm2(eirp, r), s, { rel: 1e-9 });
        expectClose(complianceDistanceM(4 * eirp, s), 2 * r, { rel: 1e-12 });
      }),
    );
  });

  it("bad numbers give NaN", () => {
    expect(complianceDistanceM(Number.NaN, 10)).toBeNaN();
    expect(complianceDistanceM(100, 0)).toBeNaN();
    expect(complianceDistanceM(-1, 10)).toBeNaN();
    expect(farFieldPowerDensityWm2(100, 0)).toBeNaN();
  });
});
