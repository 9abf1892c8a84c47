import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { InputError } from "../../src/study/input-error.ts";
import { loadStudy } from "../../src/study/load-study.ts";
import { analyzeStudy } from "../../src/analysis/analyze-study.ts";
import { runCli } from "../helpers/run-cli.ts";
import { TINY_STUDY, writeStudy } from "../helpers/tiny-study.ts";

// Bad input for the microwave-performance fields (issue 13): each problem names the field,
// the value received and what would fix it.

const root = mkdtempSync(join(tmpdir(), "ridgeline-linkperf-input-"));
afterAll(() => rmSync(root, { recursive: true, force: true }));

function problemsOf(id: string, yaml: string): InputError["problems"] {
  try {
    loadStudy(writeStudy(root, id, yaml));
  } catch (e) {
    if (e instanceof InputError) return e.problems;
    throw e;
  }
  return [];
}

describe("renamed design allowance", () => {
  it("a study still using field_margin_db gets an error naming design_allowance_db", () => {
    const p = problemsOf("old-key", `${TINY_STUDY}design:\n  field_margin_db: 2\n`);
    expect(p).toHaveLength(1);
    expect(p[0].field).toBe("design.field_margin_db");
    expect(p[0].expected).toMatch(/"design_allowance_db" instead/);
    expect(p[0].line).toBeGreaterThan(1);
  });

  it("design_allowance_db is read and defaults to 0 dB", () => {
    expect(loadStudy(writeStudy(root, "new-key", `${TINY_STUDY}design:\n  design_allowance_db: 2\n`)).design.design_allowance_db).toBe(2);
    expect(loadStudy(writeStudy(root, "no-key", TINY_STUDY)).design.design_allowance_db).toBe(0);
  });
});

/** TINY_STUDY with lines added to its radio r1 and to its link a-b. */
function withRadio(radio: string, link = ""): string {
  return TINY_STUDY.replace("    rx_threshold_dbm: -75\n", `    rx_threshold_dbm: -75\n${radio}`).replace("    radio: r1\n", `    radio: r1\n${link}`);
}

describe("bad microwave-performance input", () => {
  it("a signature with a negative width is an error naming the field and the value", () => {
    const p = problemsOf("neg-width", withRadio("    signature: { width_mhz: -20, depth_minimum_phase_db: 20, depth_non_minimum_phase_db: 18 }\n"));
    expect(p.map((x) => x.field)).toEqual(["radios[0].signature.width_mhz"]);
    expect(p[0].received).toContain("-20");
    expect(p[0].expected).toMatch(/≥ 0\.01/);
  });

  it("modes not ordered by threshold are an error saying how to order them", () => {
    const modes = "    modes:\n      - { name: QPSK, capacity_mbps: 40, rx_threshold_dbm: -80 }\n      - { name: 64-QAM, capacity_mbps: 120, rx_threshold_dbm: -84 }\n";
    const p = problemsOf("modes-order", withRadio(modes));
    expect(p.map((x) => x.field)).toEqual(["radios[0].modes"]);
    expect(p[0].expected).toMatch(/rising threshold and rising capacity/);
  });

  it("a space-diversity spacing outside the method's 3–23 m gives a range warning, not silence", async () => {
    const s = loadStudy(writeStudy(root, "spacing", withRadio("", "    diversity: { space: { spacing_m: 40 } }\n")));
    const a = await analyzeStudy(s);
    expect(a.result.links[0].warnings.join("\n")).toMatch(/antenna spacing 40 m is outside the method's range 3–23 m/);
    expect(a.result.links[0].diversity?.improvement).toBeGreaterThanOrEqual(1);
  });

  it("a co-channel dual-polarised link whose radio lacks XPD figures is an error naming the missing keys", async () => {
    const s = loadStudy(writeStudy(root, "xpd-missing", withRadio("", "    co_channel_dual_polarised: true\n")));
    await expect(analyzeStudy(s)).rejects.toThrow(InputError);
    await analyzeStudy(s).catch((e: InputError) => expect(e.problems[0].expected).toMatch(/xpd_db and co_channel_ci_db on radio r1/));
  });

  it("a capacity target naming a mode the radio lacks is an error listing the modes", async () => {
    const modes = "    modes:\n      - { name: QPSK, capacity_mbps: 40, rx_threshold_dbm: -84 }\n      - { name: 64-QAM, capacity_mbps: 120, rx_threshold_dbm: -75 }\n";
    const s = loadStudy(writeStudy(root, "mode-name", withRadio(modes, "    capacity_target: { mode: 256-QAM, availability_pct: 99.99 }\n")));
    await analyzeStudy(s).then(
      () => expect.unreachable(),
      (e: InputError) => {
        expect(e.problems[0].field).toBe("links[0].capacity_target.mode");
        expect(e.problems[0].expected).toMatch(/QPSK, 64-QAM/);
      },
    );
  });

  it("ridgeline check exits 2 on such input, with no stack trace", () => {
    writeStudy(root, "cli-bad", withRadio("    signature: { width_mhz: -20, depth_minimum_phase_db: 20, depth_non_minimum_phase_db: 18 }\n"));
    const r = runCli(["check", "--studies-dir", root, "cli-bad"]);
    expect(r.status, r.stderr).toBe(2);
    expect(r.stderr).toMatch(/cli-bad\/study\.yaml:\d+:\d+/);
    expect(r.stderr).toContain("width_mhz");
    expect(r.stderr).not.toMatch(/\n\s+at .+:\d+:\d+\)?\n/);
  });
});
