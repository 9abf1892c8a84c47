import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { BAND_CHECK_ABSORBED_SHARE, BAND_CHECK_RECEIVER_SHARE, bandCheck, PE_WIDENED_MAX_ANGLE_DEG, receiverUpperBandShare, RECEIVER_WINDOW_CELLS, widenedBand } from "../../src/physics/parabolic-equation/band-check.ts";
import { parabolicEquationField } from "../../src/physics/parabolic-equation/split-step.ts";
import { analyzeLink } from "../../src/analysis/analyze-link.ts";
import { openStudyTerrain } from "../../src/analysis/analyze-study.ts";
import { linkWave } from "../../src/analysis/link-wave.ts";
import { loadStudy } from "../../src/study/load-study.ts";
import { expectClose } from "../helpers/expect-close.ts";

// The band check (band-check.ts): the share of the field's power the angular filter absorbs,
// and the share of the receiver's local angular spectrum in the band's upper half. Checked
// against plane waves of known vertical wavenumber (a plane wave e^{ipz} has all its power at p:
// Fourier analysis, common practice) and a beam aimed inside and outside the band.

describe("wave solution: the band check's measures", () => {
  const dz = 0.1;
  const pLimit = Math.PI / dz;
  const plane = (p: number, n = 512) => {
    const re = new Float64Array(n + 1);
    const im = new Float64Array(n + 1);
    for (let j = 0; j <= n; j++) {
      re[j] = Math.cos(p * j * dz);
      im[j] = Math.sin(p * j * dz);
    }
    return { re, im };
  };
  it.each([0, 0.2, 0.35])("a plane wave at %f of the band has (almost) none of its power in the upper half", (f) => {
    const { re, im } = plane(f * pLimit);
    expect(receiverUpperBandShare(re, im, 200.3, dz, pLimit)).toBeLessThan(1e-4);
  });
  it.each([0.65, 0.8, -0.7])("a plane wave at %f of the band has (almost) all of it there", (f) => {
    const { re, im } = plane(f * pLimit);
    expect(receiverUpperBandShare(re, im, 200.3, dz, pLimit)).toBeGreaterThan(1 - 1e-4);
  });
  it("any field: the share lies in [0, 1]; a plane wave below 0.4 of the band has under 0.1 % of its power in the upper half, one above 0.6 over 99.9 %", () => {
    fc.assert(
      fc.property(fc.double({ min: -1, max: 1, noNaN: true }), fc.double({ min: 0, max: 500, noNaN: true }), (f, t) => {
        const { re, im } = plane(f * pLimit);
        const share = receiverUpperBandShare(re, im, t, dz, pLimit);
        expect(share).toBeGreaterThanOrEqual(0);
        expect(share).toBeLessThanOrEqual(1);
        if (Math.abs(f) < 0.4) expect(share).toBeLessThan(1e-3);
        if (Math.abs(f) > 0.6) expect(share).toBeGreaterThan(0.999);
      }),
    );
  });
  it("a receiver near the array's ends is measured on a window moved inside it", () => {
    const { re, im } = plane(0.8 * pLimit);
    expect(receiverUpperBandShare(re, im, 2, dz, pLimit)).toBeGreaterThan(0.999);
    expect(receiverUpperBandShare(re, im, 511, dz, pLimit)).toBeGreaterThan(0.999);
    // an array shorter than the window: a narrower window (8 cells each side here); under 8 cells, no measure
    expect(receiverUpperBandShare(re.subarray(0, RECEIVER_WINDOW_CELLS), im.subarray(0, RECEIVER_WINDOW_CELLS), 5, dz, pLimit)).toBeGreaterThan(0.99);
    const low = plane(0.2 * pLimit);
    expect(receiverUpperBandShare(low.re.subarray(0, RECEIVER_WINDOW_CELLS), low.im.subarray(0, RECEIVER_WINDOW_CELLS), 5, dz, pLimit)).toBeLessThan(0.01);
    expect(receiverUpperBandShare(re.subarray(0, 7), im.subarray(0, 7), 3, dz, pLimit)).toBeNaN();
  });
  it("flags the band when either share is over its threshold", () => {
    expect(bandCheck(Math.log(1 - BAND_CHECK_ABSORBED_SHARE) + 0.01, 0).too_narrow).toBe(false);
    expect(bandCheck(Math.log(1 - BAND_CHECK_ABSORBED_SHARE) - 0.01, 0).too_narrow).toBe(true);
    expect(bandCheck(0, BAND_CHECK_RECEIVER_SHARE * 0.9).too_narrow).toBe(false);
    expect(bandCheck(0, BAND_CHECK_RECEIVER_SHARE * 1.1).too_narrow).toBe(true);
    expectClose(bandCheck(Math.log(0.25), 0).absorbed_share, 0.75, { abs: 1e-12 });
  });
  it("widens θmax threefold up to the ceiling, and there refines Δz to λ/2", () => {
    expect(widenedBand(8.1, 0.016)).toEqual({ max_angle_deg: 8.1 * 3 });
    expect(widenedBand(15, 0.65)).toEqual({ max_angle_deg: PE_WIDENED_MAX_ANGLE_DEG, dz_m: 0.325 });
  });
});

describe("wave solution: the band check on a beam inside and outside the band", () => {
  // free space in effect (ground far below the beam), 10 GHz, 2 km: a 2° beam aimed 2° up (the
  // solver narrows a beam to 0.7 θmax, but not its aim)
  const D = 2000;
  const n = 101;
  const d = Float64Array.from({ length: n }, (_, i) => (i * D) / (n - 1));
  const base = {
    d_m: d,
    ground_m: new Float64Array(n),
    frequency_ghz: 10,
    tx_antenna_m: 300,
    rx_antenna_m: 300 + D * Math.tan((2 * Math.PI) / 180),
    polarization: "h" as const,
    ground: { kind: "pec" as const },
    refractivity: { kind: "k-factor" as const, k: 1e9 },
    beamwidth_deg: 2,
  };
  it("a beam well inside the band: the filter takes under 1 % and the receiver's field is in the band's lower half", () => {
    const r = parabolicEquationField({ ...base, grid: { max_angle_deg: 15 } });
    expect(r.status, r.reason).toBe("ok");
    expect(r.band_check!.absorbed_share).toBeLessThan(0.01);
    expect(r.band_check!.receiver_upper_share).toBeLessThan(1e-3);
    expect(r.band_check!.too_narrow).toBe(false);
  });
  it("the same beam with θmax 2.2° (the filter from 1.65°, below its aim): the band is flagged as too narrow", () => {
    const r = parabolicEquationField({ ...base, grid: { max_angle_deg: 2.2 } });
    expect(r.status, r.reason).toBe("ok");
    expect(r.band_check!.absorbed_share).toBeGreaterThan(BAND_CHECK_ABSORBED_SHARE);
    expect(r.band_check!.too_narrow).toBe(true);
  });
});

describe("wave solution: a band found too narrow whose wider grid is refused keeps the narrow answer, with a warning naming the band", () => {
  it("pell-kvtw (demo) under a memory limit between its narrow and its wider grid", async () => {
    const study = loadStudy("content/studies/kestrel-vale/study.yaml");
    study.design.wave_solution = false;
    const terrain = await openStudyTerrain(study);
    const link = study.links.find((l) => l.id === "pell-kvtw")!;
    const { result, figure } = analyzeLink(study, link, terrain);
    const args = [study, figure.profile, result.ends, result.frequency_ghz, link.polarization, {}] as const;
    const wide = linkWave(...args);
    const narrowDeg = wide.wave.band_check!.widened_from_deg!;
    expect(wide.wave.grid.max_angle_deg).toBeGreaterThan(narrowDeg);
    const narrow = linkWave(...args, { grid: { max_angle_deg: narrowDeg } });
    const limitMib = (narrow.wave.grid.memory_mib + wide.wave.grid.memory_mib) / 2;
    const r = linkWave(...args, { memory_limit_bytes: limitMib * 1048576 });
    expect(r.wave.status).toBe("ok");
    expect(r.wave.grid.max_angle_deg).toBe(narrowDeg);
    expect(r.wave.excess_loss_db).toBe(narrow.wave.excess_loss_db);
    expect(r.wave.band_check!.widened_from_deg).toBeNull();
    expect(r.warnings.join(" ")).toMatch(new RegExp(`band of angles \\(θmax ${narrowDeg.toFixed(1)}°.*was not computed: .*MiB`));
  });
});

describe("wave solution: a clear path whose narrow band lost the beam (test/fixtures/wave-narrow-band, a fuzz case)", () => {
  it("is widened and answers near free space (every diffraction method 0 dB), not 143 dB below it", async () => {
    const study = loadStudy("test/fixtures/wave-narrow-band/study.yaml");
    study.design.wave_solution = false;
    const terrain = await openStudyTerrain(study);
    const link = study.links[0];
    const { result, figure } = analyzeLink(study, link, terrain);
    expect(Object.values(result.diffraction_db_by_method ?? {}).every((v) => v === 0)).toBe(true);
    const args = [study, figure.profile, result.ends, result.frequency_ghz, link.polarization, {}] as const;
    const w = linkWave(...args);
    expect(w.wave.status).toBe("ok");
    // measured 2026-12-05: narrow band 14.7°, absorbed share 1 − 8e-10, 142.90 dB; widened 30°, λ/2: 1.33 dB
    const narrowDeg = w.wave.band_check!.widened_from_deg!;
    expectClose(narrowDeg, 14.66, { abs: 0.01 });
    expect(w.wave.band_check!.absorbed_share).toBeGreaterThan(0.999);
    expectClose(w.wave.excess_loss_db!, 1.33, { abs: 0.05 });
  });
});
