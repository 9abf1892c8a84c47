import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { parabolicEquationField, PE_FREE_SPACE_EXCESS_LIMIT_DB, type ParabolicEquationInput } from "../../src/physics/parabolic-equation/split-step.ts";
import { expectClose } from "../helpers/expect-close.ts";

// Regression: on a smooth convex UHF slope (synthetic demo terrain, test/fixtures/wave-uhf-slope)
// vertical polarisation at θmax 30° on a grid refined 2× gave an "excess loss" of −138 dB, a
// field 138 dB above free space, reported as a result. Measured cause: with |α|·Δz < 1 (the
// ground's Brewster angle resolved by the grid) the impedance boundary's mixed transform
// amplifies the field by up to 1.45× in one step on flat ground (4× with its mode left out),
// and the terrain-following frame's tilts re-excite it step after step. The solver now refuses
// any field above the ground stronger than free space by more than PE_FREE_SPACE_EXCESS_LIMIT_DB
// (two-ray +6 dB plus margin) as a numerical instability, with what to change.
// Values: this solver, 2026-12-05.
const rows = readFileSync(new URL("../fixtures/wave-uhf-slope/harrow-top-135deg-2km.csv", import.meta.url), "utf8")
  .trim()
  .split("\n")
  .slice(1)
  .map((l) => l.split(",").map(Number));
const base: ParabolicEquationInput = {
  d_m: rows.map((r) => r[0]),
  ground_m: rows.map((r) => r[1]),
  frequency_ghz: 0.4585,
  tx_antenna_m: 30,
  rx_antenna_m: 3,
  polarization: "v",
  ground: { kind: "impedance", epsilon_r: 15, sigma_s_m: 0.005 },
  refractivity: { kind: "k-factor", k: 4 / 3 },
  beamwidth_deg: 30,
};
/** Δz at θmax 30° at 458.5 MHz, λ/(2 sin θmax) (pe-grid.ts) rounded as in the lead's reproduction */
const DZ30 = 0.654;
/** the default grid's range step on this profile (9.9 m) */
const DX = parabolicEquationField(base).grid.dx_m;

describe("wave solution: a field far above free space is refused, never reported", () => {
  it.each([
    ["θmax 30°, Δz/2, Δx/2 (gave −138 dB)", DZ30 / 2, DX / 2],
    // not caught: Δz/4, Δx/8 gives −0.85 dB (about 60 dB off the coarse grids) with the field at
    // most +18 dB above free space, under the limit; see DEVELOPERS.md, "The wave solution"
  ])("vertical polarisation on a UHF slope, %s: refused as a numerical instability", (_, dz_m, dx_m) => {
    const r = parabolicEquationField({ ...base, grid: { dz_m, dx_m, max_angle_deg: 30 } });
    expect(r.status).toBe("refused");
    expect(Number.isNaN(r.excess_loss_db)).toBe(true);
    expect(r.reason).toMatch(/^numerical instability: the field reaches \d+ dB above free space/);
    expect(r.reason).toMatch(/Brewster angle/);
    expect(r.reason).toMatch(/use the default grid/);
  });

  it.each([
    // [polarisation, grid, measured excess loss (dB)]
    ["v", undefined, 61.38],
    ["v", { dz_m: DZ30, dx_m: DX, max_angle_deg: 30 }, 61.44],
    ["h", undefined, 67.29],
    ["h", { dz_m: DZ30 / 2, dx_m: DX / 2, max_angle_deg: 30 }, 67.39],
  ] as const)("polarisation %s, grid %j: still solved (%f dB)", (polarization, grid, want) => {
    const r = parabolicEquationField({ ...base, polarization, grid });
    expect(r.status).toBe("ok");
    expectClose(r.excess_loss_db, want, { abs: 0.05 }, { polarization, grid });
  });

  it("flat ground on the default grid (two-ray field up to +6 dB) is not refused", () => {
    const r = parabolicEquationField({ ...base, ground_m: rows.map(() => 800), ground: { kind: "pec" } });
    expect(r.status).toBe("ok");
    expect(PE_FREE_SPACE_EXCESS_LIMIT_DB).toBeGreaterThan(6.02); // two-ray sum with |R| = 1: 20·log10 2 (common practice)
  });

  it("flat impedance ground, vertical polarisation, θmax 30° on a grid refined 2×: refused (the field reached +22 dB at 0.1 km, where two rays give at most +6)", () => {
    const r = parabolicEquationField({ ...base, ground_m: rows.map(() => 800), grid: { dz_m: DZ30 / 2, dx_m: DX / 2, max_angle_deg: 30 } });
    expect(r.status).toBe("refused");
    expect(r.reason).toMatch(/numerical instability/);
  });
});
