import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { analyzeStudy } from "../../src/analysis/analyze-study.ts";
import { groundConstants } from "../../src/physics/ground-constants.ts";
import { reflectionCoefficient } from "../../src/physics/reflection-coefficient.ts";
import { loadStudy } from "../../src/study/load-study.ts";
import { expectClose } from "../helpers/expect-close.ts";
import { TINY_STUDY, writeStudy } from "../helpers/tiny-study.ts";

const root = mkdtempSync(join(tmpdir(), "ridgeline-refl-"));
afterAll(() => rmSync(root, { recursive: true, force: true }));

describe("height-gain curve over a smooth flat sea", () => {
  it("matches the exact flat-Earth two-ray sum at every height (interference lobes resolved)", async () => {
    const yaml = TINY_STUDY.replace("  constant_m: 50", "  constant_m: 0")
      .replace("radios:", 'design:\n  k_factors: ["inf"]\n  clearance_criteria: [{ k: "inf", min_f1: 0.6 }]\nclimate:\n  ground: sea_water\nradios:')
      .replace("frequency_ghz: 6", "frequency_ghz: 8");
    const { result, figures } = await analyzeStudy(loadStudy(writeStudy(root, "sea", yaml)));
    const l = result.links[0];
    const curve = figures.get(l.id)!.height_gain;
    expect(curve.relative_db.length).toBe(curve.rx_antenna_m.length);
    const hg = Array.from(curve.rx_antenna_m, (rx_antenna_m, i) => ({ rx_antenna_m, relative_db: curve.relative_db[i] }));
    expect(hg.length).toBeGreaterThan(250);
    const d = l.distance_m;
    const lambda = 299_792_458 / 8e9;
    const h1 = l.ends.from.antenna_amsl_m;
    const g = groundConstants("sea-water", 8);
    // Independent closed form (common practice): image antenna below a flat mirror; the
    // reflection point where the angles are equal; Δ from the exact distances.
    for (const p of hg) {
      const h2 = p.rx_antenna_m;
      const delta = Math.hypot(d, h1 + h2) - Math.hypot(d, h1 - h2);
      const psi = Math.atan((h1 + h2) / d);
      const R = reflectionCoefficient({ epsilon_r: g.epsilon_r, sigma_s_m: g.sigma_s_m, frequency_ghz: 8, grazing_angle_rad: psi, polarization: "vertical" });
      const k = (2 * Math.PI) / lambda;
      const re = 1 + R.magnitude * Math.cos(-(k * delta - R.phase_rad));
      const im = R.magnitude * Math.sin(-(k * delta - R.phase_rad));
      const expected = 20 * Math.log10(Math.hypot(re, im));
      // Deep nulls are steep: compare in linear amplitude there.
      expectClose(10 ** (p.relative_db / 20), 10 ** (expected / 20), { abs: 0.01 }, { h2, expected, actual: p.relative_db });
    }
    expect(Math.max(...hg.map((p) => p.relative_db))).toBeGreaterThan(5); // near +6 dB peaks
    expect(Math.min(...hg.map((p) => p.relative_db))).toBeLessThan(-10); // deep nulls
    expect(l.reflection!.height_gain_half_period_m).toBeGreaterThan(0);
  });
});
