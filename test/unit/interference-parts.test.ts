import { describe, expect, it } from "vitest";
import { filterDiscriminationDb } from "../../src/analysis/interference.ts";
import { couplingGainDb } from "../../src/analysis/interference-antenna.ts";
import { elevationDeg, offAxisAngle } from "../../src/physics/off-axis-angle.ts";
import { envelopeAttenuationDb } from "../../src/physics/tabulated-envelope.ts";
import { powerSumDbm, thermalNoiseDbm, thresholdDegradationDb } from "../../src/physics/threshold-degradation.ts";
import { parseEnvelopeCsv } from "../../src/study/envelope-csv.ts";
import { expectClose } from "../helpers/expect-close.ts";

const HEADER = "angle_deg,h_copolar_db,h_crosspolar_db,v_copolar_db,v_crosspolar_db";

describe("envelope CSV (neutral format)", () => {
  it("reads a table spanning 0–180° and interpolates linearly, weighting the planes by cos²ψ/sin²ψ", () => {
    const { envelope, problems } = parseEnvelopeCsv(`# test\n${HEADER}\n0,0,30,0,32\n10,20,40,10,42\n180,60,70,50,72\n`, "t.csv", "f");
    expect(problems).toEqual([]);
    const env = envelope!;
    expectClose(envelopeAttenuationDb(env, 5, 0, false), 10, { abs: 1e-12 }, "horizontal plane, half-way");
    expectClose(envelopeAttenuationDb(env, 5, 90, false), 5, { abs: 1e-12 }, "vertical plane");
    expectClose(envelopeAttenuationDb(env, 5, 45, false), 7.5, { abs: 1e-12 }, "between the planes");
    expectClose(envelopeAttenuationDb(env, 10, 0, true), 40, { abs: 1e-12 }, "cross-polar");
    expectClose(envelopeAttenuationDb(env, 190, 0, false), envelopeAttenuationDb(env, 170, 0, false), { abs: 1e-12 }, "folded beyond 180°");
  });
  it("rejects a table that does not span 0–180°, naming the line", () => {
    const { envelope, problems } = parseEnvelopeCsv(`${HEADER}\n0,0,30,0,30\n90,40,50,40,50\n`, "t.csv", "pattern.envelope_csv");
    expect(envelope).toBeNull();
    expect(problems).toHaveLength(1);
    expect(problems[0]).toMatchObject({ file: "t.csv", line: 3, field: "pattern.envelope_csv" });
    expect(problems[0].expected).toMatch(/0° to 180°/);
  });
  it("rejects a wrong header, a negative attenuation and falling angles", () => {
    const { problems } = parseEnvelopeCsv(`angle,co\n0,0,30,0,30\n20,-1,30,0,30\n10,5,30,5,30\n180,60,70,60,70\n`, "t.csv", "f");
    expect(problems.map((p) => p.line)).toEqual([1, 3, 4]);
  });
});

describe("pointing geometry", () => {
  it("elevation over a curved Earth: level antennas 20 km apart look down by d/(2ae) (4/3 Earth)", () => {
    const ae = (4 / 3) * 6_371_000;
    expectClose(elevationDeg(100, 100, 20_000, ae), (-Math.atan(20_000 / (2 * ae)) * 180) / Math.PI, { abs: 1e-12 });
    expectClose(elevationDeg(0, 100, 1000, Infinity), (Math.atan(0.1) * 180) / Math.PI, { abs: 1e-12 });
  });
  it("off-axis angle equals the angle between unit vectors in a local east-north-up frame (independent vector method)", () => {
    const cases = [
      [10, 0, 40, 0],
      [350, 1, 20, -2],
      [90, 5, 270, -5],
      [0, -3, 0, 4],
      [123, 0.5, 301, 0.2],
    ];
    const vec = (az: number, el: number) => {
      const a = (az * Math.PI) / 180;
      const e = (el * Math.PI) / 180;
      return [Math.cos(e) * Math.sin(a), Math.cos(e) * Math.cos(a), Math.sin(e)];
    };
    for (const [ab, eb, at, et] of cases) {
      const u = vec(ab, eb);
      const v = vec(at, et);
      const dot = u[0] * v[0] + u[1] * v[1] + u[2] * v[2];
      const cross = Math.hypot(u[1] * v[2] - u[2] * v[1], u[2] * v[0] - u[0] * v[2], u[0] * v[1] - u[1] * v[0]);
      expectClose(offAxisAngle(ab, eb, at, et).theta_deg, (Math.atan2(cross, dot) * 180) / Math.PI, { abs: 1e-9 }, { ab, eb, at, et });
    }
  });
  it("splits the offset into azimuth and elevation components", () => {
    const o = offAxisAngle(350, 1, 20, -2);
    expectClose(o.azimuth_deg, 30, { abs: 1e-12 });
    expectClose(o.elevation_deg, -3, { abs: 1e-12 });
  });
});

describe("noise, threshold degradation and aggregation", () => {
  it("kT0 is −173.98 dBm/Hz at 290 K; a 28 MHz receiver with NF 5.5 dB has N = −94.01 dBm", () => {
    expectClose(thermalNoiseDbm(1, 0), -173.975, { abs: 0.001 }, "10·log10(1.380649e-23·290·1000)");
    expectClose(thermalNoiseDbm(28e6, 5.5), -173.975 + 74.472 + 5.5, { abs: 0.002 });
  });
  it("1 dB threshold degradation at I/N = −5.87 dB (common practice); 3.01 dB at I = N", () => {
    expectClose(thresholdDegradationDb(-100 - 5.867, -100), 1, { abs: 0.001 });
    expectClose(thresholdDegradationDb(-100, -100), 10 * Math.log10(2), { abs: 1e-12 });
    expect(thresholdDegradationDb(-Infinity, -100)).toBe(0);
  });
  it("power sum of two equal levels is 3.01 dB higher", () => {
    expectClose(powerSumDbm([-90, -90]), -90 + 10 * Math.log10(2), { abs: 1e-12 });
  });
  it("crossed polarisations: the power sum of the two co/cross products", () => {
    const g = couplingGainDb(40, { co_db: 10, cross_db: 40 }, 38, { co_db: 0, cross_db: 30 }, false);
    expectClose(g, 10 * Math.log10(10 ** ((40 - 10 + 38 - 30) / 10) + 10 ** ((40 - 40 + 38) / 10)), { abs: 1e-12 });
    expectClose(couplingGainDb(40, { co_db: 10, cross_db: 40 }, 38, { co_db: 0, cross_db: 30 }, true), 68, { abs: 1e-12 });
  });
});

describe("net filter discrimination by offset", () => {
  const p = { co_channel_ci_db: 30, adjacent_ci_db: [{ offset_mhz: 14, ci_db: -4 }, { offset_mhz: 28, ci_db: -30 }], threshold_degradation_db: 1, noise_figure_db: 6 };
  it("from C/I by offset: NFD = C/I co-channel − C/I at the offset, linear between offsets, none beyond the last", () => {
    expect(filterDiscriminationDb(p, 0, 14, 14)).toBe(0);
    expectClose(filterDiscriminationDb(p, 14, 14, 14)!, 34, { abs: 1e-12 });
    expectClose(filterDiscriminationDb(p, -21, 14, 14)!, 47, { abs: 1e-12 });
    expect(filterDiscriminationDb(p, 28.1, 14, 14)).toBeNull();
  });
  it("without a table only overlapping channels count, at 0 dB", () => {
    const q = { co_channel_ci_db: 30, threshold_degradation_db: 1, noise_figure_db: 6 };
    expect(filterDiscriminationDb(q, 10, 14, 14)).toBe(0);
    expect(filterDiscriminationDb(q, 14, 14, 14)).toBeNull();
  });
});
