import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { studyJsonSchema } from "../../src/study/json-schema.ts";
import { loadStudy, parseK } from "../../src/study/load-study.ts";
import { InputError } from "../../src/study/input-error.ts";
import { expectClose } from "../helpers/expect-close.ts";
import { PROJECT_ROOT } from "../helpers/run-cli.ts";
import { TINY_STUDY, writeStudy } from "../helpers/tiny-study.ts";

const root = mkdtempSync(join(tmpdir(), "ridgeline-loader-"));
afterAll(() => rmSync(root, { recursive: true, force: true }));

describe("study loader", () => {
  it("accepts k as a number, a fraction, inf, or a refractivity gradient (ITU-R P.453)", () => {
    expect(parseK(1.2)).toBe(1.2);
    expectClose(parseK("4/3"), 4 / 3, { abs: 1e-15 });
    expect(parseK("inf")).toBe(Infinity);
    // P.453: k = 1/(1 + a·dN/dh·1e-6), a = 6371 km; the median −40 N/km gives k ≈ 4/3 (common practice).
    expectClose(parseK({ gradient_n_km: -40 }), 1 / (1 - 6371 * 40e-6), { rel: 1e-12 });
  });

  it("fills the documented defaults when design and climate are omitted", () => {
    const s = loadStudy(writeStudy(root, "defaults", TINY_STUDY));
    expect(s.design.k_factors.map((k) => k.label)).toEqual(["4/3", "2/3"]);
    expect(s.design.clearance_criteria.map((c) => [c.k.label, c.min_f1])).toEqual([
      ["4/3", 1],
      ["2/3", 0.6],
    ]);
    expect(s.climate.pressure_hpa).toBe(1013.25);
    expect(s.climate.temperature_c).toBe(15);
    expect(s.climate.water_vapour_g_m3).toBe(7.5);
    expect(s.design.diffraction_method).toBe("delta_bullington");
  });

  it("reports every problem of a file at once", () => {
    const bad = TINY_STUDY.replace("lat_deg: -33.4500", "lat_deg: 95").replace("frequency_ghz: 6", "frequency_ghz: 0").replace("to: { site: B,", "to: { site: Z,");
    try {
      loadStudy(writeStudy(root, "many", bad));
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(InputError);
      // Schema problems come first; cross-reference checks run once the schema passes.
      expect((e as InputError).problems.map((p) => p.field).sort()).toEqual(["radios[0].frequency_ghz", "sites[0].lat_deg"]);
    }
  });

  it("the committed JSON Schema is generated from the current definition (npm run schema)", () => {
    expect(readFileSync(join(PROJECT_ROOT, "schema/study.schema.json"), "utf8")).toBe(studyJsonSchema());
  });

  it("the demo study points editors at the schema", () => {
    expect(readFileSync(join(PROJECT_ROOT, "content/studies/kestrel-vale/study.yaml"), "utf8")).toMatch(/^# yaml-language-server: \$schema=\.\.\/\.\.\/\.\.\/schema\/study\.schema\.json/);
  });
});
