import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { linkPerformance } from "../../src/analysis/link-performance.ts";
import { reviewWarnings } from "../../src/site/review-warnings.ts";
import { loadStudy } from "../../src/study/load-study.ts";
import { studyHead, writeStudy } from "../helpers/tiny-study.ts";

// Regression tests for the faults hand checks of the demo found (issue 13), on small studies
// shaped like the demo's links.

const root = mkdtempSync(join(tmpdir(), "ridgeline-outage-faults-"));
afterAll(() => rmSync(root, { recursive: true, force: true }));

function studyAt(id: string, frequency_ghz: number, extra = "") {
  const yaml = `${studyHead("Faults", "constant_m: 50").replace("frequency_ghz: 6", `frequency_ghz: ${frequency_ghz}`)}climate:
  rain_rate_mm_h: 35
  dn1: -300
  sa_m: 90
sites:
  - { id: A, name: Alpha, lat_deg: -41.0, lon_deg: -32.2 }
  - { id: B, name: Bravo, lat_deg: -41.1, lon_deg: -32.2 }
links:
  - id: a-b
    from: { site: A, antenna_m: 20, gain_dbi: 38 }
    to: { site: B, antenna_m: 20, gain_dbi: 38 }
    radio: r1
${extra}`;
  const s = loadStudy(writeStudy(root, id, yaml));
  return { s, link: s.links[0], radio: s.radios[0] };
}

const path = { distance_m: 11_000, he_m: 300, hr_m: 400, mid_lat_deg: -41, received_dbm: -50, rx_gain_dbi: 38 };

describe("outage faults found in the demo", () => {
  it("blocked link: the annual multipath outage no longer reads 100 % while its worst month reads 63.2 %", () => {
    const { s, link, radio } = studyAt("blocked", 18.7);
    const p = linkPerformance(s, link, radio, { ...path, fade_margin_db: -2.6, rain_margin_db: -2.6 });
    const wm = p.availability.multipath_worst_month_pct as number;
    const yr = p.availability.multipath_annual_pct as number;
    expect(wm).toBeCloseTo(100 * (1 - Math.exp(-1)), 9);
    expect(yr).toBeLessThanOrEqual(wm);
    // the link does not close: the availability objective is the whole year, said as such, not as rain
    expect(p.objectives.availability.outage_pct).toBe(100);
    expect(p.availability.rain_annual_pct).toBeNull();
    expect(p.availability.rain_range).toBe("link_does_not_close");
  });

  it("UHF link: a rain margin with no solution reads 'below the method's range', not the 1e-5 % search floor (3.2 s a year)", () => {
    const { s, link, radio } = studyAt("uhf-rain", 0.4585);
    const p = linkPerformance(s, link, radio, { ...path, distance_m: 14_700, fade_margin_db: 58, rain_margin_db: 58 });
    expect(p.availability.rain_annual_pct).toBeNull();
    expect(p.availability.rain_range).toBe("below_method_range");
    expect(p.objectives.availability.outage_pct).toBe(0);
    expect(p.warnings.join("\n")).toMatch(/below the method's range/);
  });

  it("steep path: an inclination beyond the multipath method's 37 mrad warns", () => {
    const { s, link, radio } = studyAt("steep", 11.245);
    const p = linkPerformance(s, link, radio, { ...path, distance_m: 12_100, he_m: 300, hr_m: 869, fade_margin_db: 32, rain_margin_db: 32 });
    expect(p.availability.path_inclination_mrad as number).toBeGreaterThan(37);
    // (569 m rise over 12.1 km = 47.0 mrad; the one quantity formatter prints three significant figures without trailing zeros)
    expect(p.warnings.join("\n")).toMatch(/path inclination 47 mrad is outside the method's range 0–37 mrad/);
  });

  it("rain outage below 0.001 % is flagged as below the method's range (the page prints '< 0.001 %')", () => {
    const { s, link, radio } = studyAt("small-rain", 11.245);
    const p = linkPerformance(s, link, radio, { ...path, distance_m: 13_900, fade_margin_db: 31, rain_margin_db: 31 });
    expect(p.availability.rain_annual_pct as number).toBeLessThan(0.001);
    expect(p.availability.rain_range).toBe("below_0_001_pct");
  });

  it("458.5 MHz link: P.530 multipath and rain say they are applied outside their frequency range", () => {
    const { s, link, radio } = studyAt("uhf-range", 0.4585);
    const p = linkPerformance(s, link, radio, { ...path, distance_m: 14_700, fade_margin_db: 58, rain_margin_db: 58 });
    const w = p.warnings.join("\n");
    // the one quantity formatter states frequencies below 1 GHz in MHz
    expect(w).toMatch(/P\.530-16 §2\.3\.1, §2\.3\.2 .*frequency 458\.5 MHz is outside the method's range/);
    expect(w).toMatch(/P\.530-16 §2\.4\.1 .*frequency 458\.5 MHz is outside the method's range 1–100 GHz/);
    // and the page's grouping keeps them as warnings: only negligible gaseous absorption becomes a note
    const reviewed = reviewWarnings(p.warnings, { frequency_ghz: 0.4585 });
    const p530 = reviewed.groups.filter((g) => /P\.530-16 §2\.(3\.1|4\.1)/.test(g.method)).flatMap((g) => g.items);
    expect(p530.filter((i) => /458\.5 MHz is outside/.test(i))).toHaveLength(2);
    expect(reviewed.notes.join("\n")).not.toMatch(/P\.530/);
  });
});

describe("adaptive modulation through the link analysis (property)", () => {
  it("time shares and the outage sum to 100 %, and raising the thresholds lowers the time at or above every mode", async () => {
    const fc = (await import("fast-check")).default;
    const { s, link, radio } = studyAt("modes-prop", 18);
    fc.assert(
      fc.property(fc.array(fc.double({ min: 0.5, max: 12, noNaN: true }), { minLength: 1, maxLength: 6 }), fc.double({ min: 0.1, max: 8, noNaN: true }), (steps, raise) => {
        let t = -90;
        const modes = steps.map((st, i) => ({ name: `m${i}`, capacity_mbps: 50 * (i + 1), rx_threshold_dbm: (t += st) }));
        const run = (shift: number) =>
          linkPerformance(s, link, { ...radio, modes: modes.map((m) => ({ ...m, rx_threshold_dbm: m.rx_threshold_dbm + shift })) }, { ...path, fade_margin_db: 30, rain_margin_db: 30 }).adaptive_modulation!;
        const a = run(0);
        const b = run(raise);
        expect(a.modes.reduce((x, m) => x + m.time_share_pct, 0) + a.outage_pct).toBeCloseTo(100, 9);
        a.modes.forEach((m, i) => expect(b.modes[i].available_pct).toBeLessThanOrEqual(m.available_pct + 1e-12));
      }),
      { numRuns: 40 },
    );
  });
});
