import { execFileSync } from "node:child_process";
import { mkdirSync, mkdtempSync, rmSync, symlinkSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { annualFadeExceedancePercent } from "../../src/physics/worst-month-to-annual.ts";
import { fadeDepthExceedancePercent } from "../../src/physics/multipath-fading.ts";
import { multipathActivityFactor } from "../../src/physics/dispersive-fading.ts";
import { diversityOutageProbability } from "../../src/physics/diversity.ts";
import { runCase, type CaseResult } from "../fuzz/run-case.ts";
import { expectClean, sub } from "../helpers/hostile-case.ts";
import { expectClose } from "../helpers/expect-close.ts";
import { TINY_STUDY } from "../helpers/tiny-study.ts";

// Regression tests for what the fuzzer found once its grammar produced the link-performance
// and interference fields (test/fuzz/generate-features.ts): hangs on envelope CSVs that are
// pipes or devices, NaN from patterns and P.452 outside their frequency ranges, NaN from
// P.530's interpolation for a tiny multipath occurrence factor, and free texts and ids of the
// new fields that escaped the name rules. Each runs the pipeline in-process (run-case.ts).

let root: string;
beforeAll(() => {
  root = mkdtempSync(join(tmpdir(), "ridgeline-hostile-features-"));
});
afterAll(() => rmSync(root, { recursive: true, force: true }));

let n = 0;
async function run(yaml: string, extra: (dir: string) => void = () => {}): Promise<CaseResult> {
  const studies = join(root, `r${n++}`);
  const dir = join(studies, "s");
  mkdirSync(dir, { recursive: true });
  extra(dir);
  writeFileSync(join(dir, "study.yaml"), yaml);
  return runCase(studies, "s", null);
}

/** TINY_STUDY (6 GHz radio r1, link a-b) with an envelope CSV on the from-end. */
const WITH_ENVELOPE = sub("from: { site: A, antenna_m: 30, gain_dbi: 34, feeder_loss_db: 1 }", "from: { site: A, antenna_m: 30, gain_dbi: 34, feeder_loss_db: 1, pattern: { envelope_csv: env.csv } }");

/** TINY_STUDY asking for interference, the link on `goMhz`, both ends with `pattern`. */
const interferenceStudy = (frequencyGhz: number, goMhz: number, pattern: string) =>
  sub(
    "    radio: r1\n",
    `    radio: r1\n    frequency_plan: { go_mhz: ${goMhz}, return_mhz: ${goMhz + Math.max(56, 0.08 * goMhz)}, bandwidth_mhz: 28 }\n  - id: a-c\n    from: { site: A, antenna_m: 30, gain_dbi: 34, pattern: ${pattern} }\n    to: { site: C, antenna_m: 30, gain_dbi: 34, pattern: ${pattern} }\n    radio: r1\n    frequency_plan: { go_mhz: ${goMhz}, return_mhz: ${goMhz + Math.max(56, 0.08 * goMhz)}, bandwidth_mhz: 28 }\ninterference: {}\n`,
    sub(
      "links:\n",
      "  - id: C\n    name: Charlie\n    lat_deg: -33.4000\n    lon_deg: -70.6000\nlinks:\n",
      sub("    rx_threshold_dbm: -75\n", "    rx_threshold_dbm: -75\n    interference: { co_channel_ci_db: 30, noise_figure_db: 5 }\n", sub("frequency_ghz: 6", `frequency_ghz: ${frequencyGhz}`)),
    ),
  );

describe("envelope CSV files are checked before they are read", () => {
  it("an envelope_csv that is a named pipe is refused at once (was a hang)", async () => {
    expectClean(await run(WITH_ENVELOPE, (d) => execFileSync("mkfifo", [join(d, "env.csv")])), /links\[0\]\.from\.pattern\.envelope_csv[\s\S]*a named pipe[\s\S]*a regular file/);
  }, 10_000);

  it("an envelope_csv symlinked to /dev/zero is refused (was a hang reading without end)", async () => {
    expectClean(await run(WITH_ENVELOPE, (d) => symlinkSync("/dev/zero", join(d, "env.csv"))), /a symbolic link to \/dev\/zero, outside the study folder/);
  }, 10_000);

  it("an envelope_csv outside the study folder is not read, and no line of it is printed", async () => {
    const r = await run(sub("envelope_csv: env.csv", "envelope_csv: ../../../../etc/passwd", WITH_ENVELOPE));
    expectClean(r, /envelope_csv[\s\S]*outside the study folder/);
    expect(r.detail).not.toMatch(/root:/);
  });

  it("an envelope_csv folder is refused as not a regular file", async () => {
    expectClean(await run(WITH_ENVELOPE, (d) => mkdirSync(join(d, "env.csv"))), /a folder[\s\S]*a regular file/);
  });
});

describe("interference outside the methods' frequency ranges is not available, not NaN", () => {
  it.each([
    ["F.1245 at 0.4 GHz (was worst_ci_margin_db NaN)", 0.4, 400, "f1245"],
    ["P.452 at 80 GHz (was interference_long_term_dbm NaN)", 80, 80000, "f699"],
  ])("%s", async (_name, f, go, pattern) => {
    const r = await run(interferenceStudy(f, go, pattern));
    expect(r.outcome, r.detail).toBe("success");
  });
});

describe("P.530 interpolation with a tiny multipath occurrence factor", () => {
  // P.530-16 §2.3.2: at A = 0 the interpolation gives 1 − e^(−1) = 63.2 % whatever p0; a p0 of
  // 7.8e-13 % (1 km at 80 GHz, 9 km up) made ln((100 − pt)/100) round to 0 and the annual figure NaN.
  it("the annual multipath percentage at A = 0 is 63.2 %, not NaN (multipath_annual_pct was NaN)", () => {
    expectClose(fadeDepthExceedancePercent(7.76e-13, 0).pw_pct, 63.212, { abs: 0.01 }, "worst month");
    expectClose(annualFadeExceedancePercent(7.76e-13, 0, 10.8).p_pct, 63.212, { abs: 0.01 }, "year");
    expect(Number.isFinite(annualFadeExceedancePercent(1e-20, 3, 10.8).p_pct)).toBe(true);
  });
});

describe("P.530 diversity with a tiny multipath occurrence factor", () => {
  // P.530-16 §2.3.6 Step 2: η = 1 − exp(−0.2·P0^0.75) ≈ 0.2·P0^0.75 for small P0. On a 1.1 m
  // link with frequency diversity p0 was 1.2e-19 %, exp(−x) rounded to 1, η to 0, and the
  // performance outage was NaN (fuzzer, seed 1, case 8609 of 10 000).
  it("η is positive and the diversity outage finite for p0 = 1.2e-19 % (performance outage was NaN)", () => {
    const p0 = 1.183681316096215e-19;
    expectClose(multipathActivityFactor(p0), 0.2 * (p0 / 100) ** 0.75, { rel: 1e-9 }, "η, small-x limit");
    const d = diversityOutageProbability(1e-29, 0, p0, 3);
    expect(Number.isFinite(d.Pd), JSON.stringify(d)).toBe(true);
    expectClose(multipathActivityFactor(50), 1 - Math.exp(-0.2 * 0.5 ** 0.75), { rel: 1e-12 }, "η unchanged for an ordinary p0");
  });
});

describe("free texts and ids of the new fields follow the name rules", () => {
  const modes = (name: string) => sub("    rx_threshold_dbm: -75\n", `    rx_threshold_dbm: -75\n    modes:\n      - { name: ${JSON.stringify(name)}, capacity_mbps: 50, rx_threshold_dbm: -75 }\n`);
  it.each([
    ["a NUL in a mode name", "Q\u0000PSK", /radios\[0\]\.modes\[0\]\.name[\s\S]*without control characters/],
    ["a line break in a mode name", "QPSK\n<script>", /radios\[0\]\.modes\[0\]\.name[\s\S]*on one line/],
    ["a 300-character mode name", "Q".repeat(300), /at most 200 characters/],
  ])("%s is rejected", async (_name, name, message) => {
    expectClean(await run(modes(name)), message);
  });

  it("two modes with one name are rejected (the capacity target names its mode)", async () => {
    const yaml = sub("    rx_threshold_dbm: -75\n", "    rx_threshold_dbm: -75\n    modes:\n      - { name: QPSK, capacity_mbps: 50, rx_threshold_dbm: -75 }\n      - { name: QPSK, capacity_mbps: 100, rx_threshold_dbm: -70 }\n");
    expectClean(await run(yaml), /modes with different names/);
  });

  it("two external transmitters with one id (in other letter case) are rejected (the tables and results name a transmitter by its id)", async () => {
    const ext = (id: string) => `    - { id: ${id}, site: B, toward_site: A, antenna_m: 30, gain_dbi: 35, frequency_mhz: 6000, bandwidth_mhz: 28, polarization: v, tx_power_dbm: 20 }\n`;
    const yaml = interferenceStudy(6, 6000, "f699").replace("interference: {}\n", `interference:\n  external:\n${ext("ext")}${ext("EXT")}`);
    expectClean(await run(yaml), /interference\.external\[1\]\.id[\s\S]*an id not used before/);
  });

  it.each([`x" onmouseover="alert(1)`, "CON", "e".repeat(300)])("an external transmitter id %j is rejected with the id rule", async (ext) => {
    const yaml = interferenceStudy(6, 6000, "f699").replace("interference: {}\n", `interference:\n  external:\n    - { id: ${JSON.stringify(ext)}, site: B, toward_site: A, antenna_m: 30, gain_dbi: 35, frequency_mhz: 6000, bandwidth_mhz: 28, polarization: v, tx_power_dbm: 20 }\n`);
    expectClean(await run(yaml), /interference\.external\[0\]\.id[\s\S]*1–64 characters/);
  });
});

describe("numbers too small to compute with are out of range", () => {
  const link = (extra: string) => sub("    radio: r1\n", `    radio: r1\n${extra}`);
  it.each([
    ["a frequency-diversity spacing of 5e-324 MHz (was a NaN performance outage: Δf/1000 underflowed to 0)", link("    diversity: { frequency: { spacing_mhz: 5.0e-324 } }\n"), /links\[0\]\.diversity\.frequency\.spacing_mhz/],
    ["a space-diversity spacing of 1e-9 m", link("    diversity: { space: { spacing_m: 1.0e-9 } }\n"), /links\[0\]\.diversity\.space\.spacing_m/],
    ["a signature width of 5e-324 MHz", sub("    rx_threshold_dbm: -75\n", "    rx_threshold_dbm: -75\n    signature: { width_mhz: 5.0e-324, depth_minimum_phase_db: 10, depth_non_minimum_phase_db: 10 }\n"), /radios\[0\]\.signature\.width_mhz/],
    ["a go channel at 5e-324 MHz", link("    frequency_plan: { go_mhz: 5.0e-324, return_mhz: 6500, bandwidth_mhz: 28 }\n"), /links\[0\]\.frequency_plan\.go_mhz/],
  ])("%s", async (_name, yaml, message) => {
    expectClean(await run(yaml), message);
  });
});
