import { readFileSync } from "node:fs";
import { describe, it, expect } from "vitest";
import fc from "fast-check";
import {
  COST231_HATA_VALIDITY,
  HATA_VALIDITY,
  hataLoss,
  type HataCitySize,
  type HataEnvironment,
  type HataModel,
} from "../../src/physics/hata.ts";
import { expectClose, parseCsv } from "../helpers/expect-close.ts";

// Second transcription of the formulas (test/fixtures/hata/README.md: not published values).
const rows = parseCsv(readFileSync(new URL("../fixtures/hata/hata.csv", import.meta.url), "utf8"));

describe("Hata formulas vs an independent transcription (Python)", () => {
  it("fixture has 100 rows", () => expect(rows.length).toBe(100));
  it.each(rows.map((r) => [`${r.model} f=${r.frequency_mhz} hb=${r.base_m} hm=${r.mobile_m} d=${r.distance_km} ${r.environment}/${r.city_size}`, r] as const))(
    "%s",
    (_l, r) => {
      const res = hataLoss({
        frequency_mhz: Number(r.frequency_mhz),
        base_m: Number(r.base_m),
        mobile_m: Number(r.mobile_m),
        distance_km: Number(r.distance_km),
        environment: r.environment as HataEnvironment,
        city_size: r.city_size as HataCitySize,
        model: r.model as HataModel,
      });
      expectClose(res.loss_db, Number(r.loss_db), { abs: 1e-9 }, r);
      expect(res.model).toBe(r.model);
      expect(res.warnings).toEqual([]);
    },
  );
});

describe("Hata: quoted values and structure", () => {
  const base = { base_m: 30, mobile_m: 1.5, distance_km: 1, environment: "urban", city_size: "small-medium" } as const;

  // The often-quoted urban value ~126.4 dB (common practice; from memory, no worked example cited).
  it("urban 900 MHz, hb 30 m, hm 1.5 m, 1 km, small-medium city ≈ 126.4 dB", () => {
    const r = hataLoss({ ...base, frequency_mhz: 900 });
    expectClose(r.loss_db, 126.4, { abs: 0.05 }, "Okumura–Hata");
    expect(r.model).toBe("okumura-hata");
  });

  // The brief quoted "~136.4 dB"; the COST-231 formula gives 136.20 dB (a(hm) = 0.043 dB,
  // 46.3 + 33.9·log 1800 − 13.82·log 30 = 136.24 dB). Checked at the formula's value.
  it("COST-231 urban 1800 MHz, hb 30 m, hm 1.5 m, 1 km, medium city = 136.20 dB (Cm = 0)", () => {
    const r = hataLoss({ ...base, frequency_mhz: 1800 });
    expectClose(r.loss_db, 136.197, { abs: 0.001 }, "COST-231 Hata");
    expect(r.model).toBe("cost231-hata");
  });

  it("slope per decade of distance is 44.9 − 6.55·log10(hb) (Hata 1980)", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 150, max: 2000, noNaN: true }),
        fc.double({ min: 30, max: 200, noNaN: true }),
        fc.double({ min: 1, max: 2, noNaN: true }),
        (f, hb, d) => {
          const a = hataLoss({ ...base, frequency_mhz: f, base_m: hb, distance_km: d }).loss_db;
          const b = hataLoss({ ...base, frequency_mhz: f, base_m: hb, distance_km: 10 * d }).loss_db;
          expectClose(b - a, 44.9 - 6.55 * Math.log10(hb), { abs: 1e-9 }, { f, hb, d });
        },
      ),
    );
  });

  it("suburban and open-area offsets at 900 MHz: 2·(log(f/28))² + 5.4 = 9.94 dB, 28.51 dB", () => {
    const u = hataLoss({ ...base, frequency_mhz: 900 }).loss_db;
    expectClose(u - hataLoss({ ...base, frequency_mhz: 900, environment: "suburban" }).loss_db, 9.94, { abs: 0.005 }, "suburban");
    expectClose(u - hataLoss({ ...base, frequency_mhz: 900, environment: "open" }).loss_db, 28.51, { abs: 0.005 }, "open");
  });

  it("COST-231 metropolitan centre adds Cm = 3 dB", () => {
    const m = hataLoss({ ...base, frequency_mhz: 1900 }).loss_db;
    expectClose(hataLoss({ ...base, frequency_mhz: 1900, city_size: "large" }).loss_db - m, 3, { abs: 1e-12 }, "Cm");
  });

  it("a(hm) ≈ 0 at hm = 1.5 m: small-medium and large city agree within 0.1 dB at 900 MHz", () => {
    const s = hataLoss({ ...base, frequency_mhz: 900 }).loss_db;
    const l = hataLoss({ ...base, frequency_mhz: 900, city_size: "large" }).loss_db;
    expectClose(l, s, { abs: 0.1 }, "a(1.5 m)");
  });
});

describe("Hata validity warnings", () => {
  const ok = { frequency_mhz: 900, base_m: 50, mobile_m: 1.5, distance_km: 5, environment: "urban", city_size: "small-medium" } as const;

  it("exported ranges", () => {
    expect(HATA_VALIDITY).toEqual({ frequency_mhz: [150, 1500], base_m: [30, 200], mobile_m: [1, 10], distance_km: [1, 20] });
    expect(COST231_HATA_VALIDITY).toEqual({ frequency_mhz: [1500, 2000], base_m: [30, 200], mobile_m: [1, 10], distance_km: [1, 20] });
  });

  it("inside the ranges: no warning", () => {
    expect(hataLoss(ok).warnings).toEqual([]);
    expect(hataLoss({ ...ok, frequency_mhz: 1800 }).warnings).toEqual([]);
  });

  it.each([
    [{ distance_km: 0.5 }, /Okumura–Hata: distance 0\.5 km is outside the validity range 1–20 km/],
    [{ distance_km: 35 }, /Okumura–Hata: distance 35 km .*1–20 km/],
    [{ base_m: 15 }, /Okumura–Hata: base-station height 15 m .*30–200 m/],
    [{ mobile_m: 12 }, /Okumura–Hata: mobile height 12 m .*1–10 m/],
    [{ frequency_mhz: 100 }, /Okumura–Hata: frequency 100 MHz .*150–1500 MHz/],
    [{ frequency_mhz: 2400 }, /COST-231 Hata: frequency 2400 MHz .*1500–2000 MHz/],
    [{ frequency_mhz: 1800, distance_km: 0.2 }, /COST-231 Hata: distance 0\.2 km .*1–20 km/],
    [{ frequency_mhz: 1200, model: "cost231-hata" }, /COST-231 Hata: frequency 1200 MHz .*1500–2000 MHz/],
    [{ frequency_mhz: 300, city_size: "large" }, /large-city mobile correction .* 300 MHz uses the ≥ 400 MHz form/],
    [{ environment: "open", city_size: "large" }, /applies to urban areas only/],
    [{ frequency_mhz: 1800, environment: "open" }, /COST-231 Hata: open areas are not defined/],
  ] as const)("%o warns", (change, pattern) => {
    const r = hataLoss({ ...ok, ...change });
    expect(r.warnings.some((w) => pattern.test(w))).toBe(true);
    expect(Number.isFinite(r.loss_db)).toBe(true);
  });

  it("non-positive or NaN inputs give NaN with a warning", () => {
    for (const change of [{ distance_km: 0 }, { base_m: NaN }, { frequency_mhz: -900 }, { environment: "desert" as never }]) {
      const r = hataLoss({ ...ok, ...change });
      expect(r.loss_db).toBeNaN();
      expect(r.warnings.length).toBeGreaterThan(0);
    }
  });
});
