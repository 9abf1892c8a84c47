import { readFileSync } from "node:fs";
import { describe, it } from "vitest";
import { reflectionCoefficient, type Polarization } from "../../src/physics/reflection-coefficient.ts";
import { expectClose, parseCsv } from "../helpers/expect-close.ts";

// Source: NumPy 2.4 complex128 evaluation of the same grazing-angle Fresnel formulas
// (test/fixtures/reflection/generate.py, README there). Tolerance 1e-9 on every component.
const rows = parseCsv(readFileSync(new URL("../fixtures/reflection/reflection_coefficients.csv", import.meta.url), "utf8"));

/** Phase difference folded into (−π, π], so −π and +π compare equal. */
function phaseDiff(a: number, b: number): number {
  const d = a - b;
  return Math.atan2(Math.sin(d), Math.cos(d));
}

describe("Fresnel reflection coefficient vs NumPy complex arithmetic", () => {
  it("fixture has all 294 rows", () => {
    expectClose(rows.length, 294, { abs: 0 }, "row count");
  });

  it.each(rows.map((r) => [`${r.ground} f=${r.frequency_ghz} GHz ψ=${r.grazing_angle_rad} ${r.polarization}`, r] as const))(
    "%s",
    (_label, r) => {
      const R = reflectionCoefficient({
        epsilon_r: Number(r.epsilon_r),
        sigma_s_m: Number(r.sigma_s_m),
        frequency_ghz: Number(r.frequency_ghz),
        grazing_angle_rad: Number(r.grazing_angle_rad),
        polarization: r.polarization as Polarization,
      });
      expectClose(R.re, Number(r.re), { abs: 1e-9 }, { ...r, quantity: "Re R" });
      expectClose(R.im, Number(r.im), { abs: 1e-9 }, { ...r, quantity: "Im R" });
      expectClose(R.magnitude, Number(r.magnitude), { abs: 1e-9 }, { ...r, quantity: "|R|" });
      expectClose(phaseDiff(R.phase_rad, Number(r.phase_rad)), 0, { abs: 1e-9 }, { ...r, quantity: "arg R" });
    },
  );
});
