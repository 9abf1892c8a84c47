import { describe, expect, it } from "vitest";
import { formatFrequency, formatK, formatLatLon, formatPercent, formatRatio, formatSigned, formatSmall, formatValue } from "../../src/format/quantity.ts";

// One formatter for every quantity (issue 18 §3). Styles are house rules; the SI spacing of a
// number and its unit follows the SI Brochure, 9th ed., §5.4.3.

describe("formatFrequency: MHz below 1 GHz, GHz above, fixed decimals", () => {
  it.each([
    [0.4585, "458.5 MHz"],
    [0.4585125, "458.5125 MHz"],
    [11.245, "11.245 GHz"],
    [18.7, "18.700 GHz"],
    [1, "1.000 GHz"],
    [NaN, "—"],
  ])("%s GHz → %s", (ghz, text) => expect(formatFrequency(ghz)).toBe(text));
  it("regression: the harr-los caption printed 1.125e+4 MHz for 11 245 MHz", () => expect(formatFrequency(11.245)).not.toMatch(/e\+/));
});

describe("formatK: as the study wrote it", () => {
  it.each([
    ["4/3", "4/3"],
    [4 / 3, "4/3"],
    [2 / 3, "2/3"],
    ["inf", "∞"],
    [1.2, "1.2"],
    [0.75, "0.75"],
  ] as [unknown, string][])("%s → %s", (k, text) => expect(formatK(k)).toBe(text));
});

describe("signs, small values and percentages", () => {
  it.each([
    [12, "+12.00"],
    [-0.5, "−0.50"],
    [-0.001, "0.00"],
    [0, "0.00"],
  ])("formatSigned(%s) → %s (no '− 0.00')", (v, text) => expect(formatSigned(v, 2)).toBe(text));
  it.each([
    [1.22e-4, "1.22 × 10⁻⁴"],
    [0.00982, "9.82 × 10⁻³"],
    [0.5, "0.500"],
  ])("formatSmall(%s) → %s", (v, text) => expect(formatSmall(v, 3)).toBe(text));
  it.each([
    [99.99988, "99.99988"],
    [0, "0"],
    [63.2, "63.20"],
    [1e-5, "1.00 × 10⁻⁵"],
  ])("formatPercent(%s) → %s", (v, text) => expect(formatPercent(v)).toBe(text));
  it.each([
    ["1e-6", "10⁻⁶"],
    ["1e-4", "10⁻⁴"],
    ["2e-5", "2.00 × 10⁻⁵"],
  ])("formatRatio(%s) → %s", (v, text) => expect(formatRatio(v)).toBe(text));
  it("lat/lon with true minus signs", () => expect(formatLatLon(-41.07514, -32.20986)).toBe("−41.07514°, −32.20986°"));
  it("range values without exponent and with the unit spaced", () => {
    expect(formatValue(0.4585, "GHz")).toBe("458.5 MHz");
    expect(formatValue(0.001, "%")).toBe("0.001 %");
    expect(formatValue(100, "GHz")).toBe("100.000 GHz");
    expect(formatValue(1.02, "")).toBe("1.02");
  });
});
