import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { TINY_STUDY, writeStudy } from "../helpers/tiny-study.ts";
import { runCliAsync } from "./run-cli-async.ts";

// Issue 6, acceptance: `ridgeline check` exits 0 for a passing study, 1 for a failing one and
// 2 for a broken one; --json prints the same rows for machines. Run as a child process, as CI
// would run it.

let root: string;
let good: string;
let broken: string;
type Run = Awaited<ReturnType<typeof runCliAsync>>;
const runs: Record<string, Run> = {};

beforeAll(async () => {
  root = mkdtempSync(join(tmpdir(), "ridgeline-check-"));
  good = join(root, "studies");
  broken = join(root, "broken");
  writeStudy(good, "passing", TINY_STUDY);
  // A receiver threshold of −20 dBm: the link cannot close, so its target is missed.
  writeStudy(good, "failing", TINY_STUDY.replace("rx_threshold_dbm: -75", "rx_threshold_dbm: -20"));
  // The same failing link marked as a rejected design: computed and shown, not counted (issue 18 §4).
  writeStudy(join(root, "aside"), "rejected", TINY_STUDY.replace("rx_threshold_dbm: -75", "rx_threshold_dbm: -20").replace("  - id: a-b\n", "  - id: a-b\n    design_status: rejected\n    design_reason: kept to record why it was dropped\n"));
  writeStudy(broken, "broken", TINY_STUDY.replace("to: { site: B,", "to: { site: Z,"));
  const cases: Record<string, string[]> = {
    pass: ["check", "passing", "--studies-dir", good],
    fail: ["check", "failing", "--studies-dir", good],
    json: ["check", "--json", "--studies-dir", good],
    rejected: ["check", "rejected", "--studies-dir", join(root, "aside")],
    broken: ["check", "--studies-dir", broken],
    unknownId: ["check", "nosuch", "--studies-dir", good],
  };
  const results = await Promise.all(Object.entries(cases).map(async ([k, args]) => [k, await runCliAsync(args)] as const));
  for (const [k, r] of results) runs[k] = r;
}, 120_000);
afterAll(() => rmSync(root, { recursive: true, force: true }));

describe("ridgeline check as a CI gate", () => {
  it("leaves a rejected design out of the exit code but still shows it computed", () => {
    expect(runs.rejected.status, runs.rejected.stderr).toBe(0);
    expect(runs.rejected.stdout).toMatch(/MISSED \(rejected, not counted\)/);
    expect(runs.rejected.stdout).toMatch(/1 alternative or rejected design not counted/);
  });
  it("exits 0 when every target is met", () => {
    expect(runs.pass.status, runs.pass.stderr).toBe(0);
    expect(runs.pass.stdout).toMatch(/passing\s+a-b\s+meets.*\bmet\b/);
    expect(runs.pass.stdout).toContain("The link meets its targets.");
  });

  it("exits 1 when a target is missed, naming the link", () => {
    expect(runs.fail.status, runs.fail.stderr).toBe(1);
    expect(runs.fail.stdout).toMatch(/failing\s+a-b\s.*MISSED/);
    expect(runs.fail.stdout).toContain("1 of 1 link misses a target.");
  });

  it("--json lists every link with its verdict; one failing study fails the gate", () => {
    expect(runs.json.status).toBe(1);
    const out = JSON.parse(runs.json.stdout) as { links: { study: string; link: string; target_met: boolean; fade_margin_db: number }[]; missed: number; total: number };
    expect(out.total).toBe(2);
    expect(out.missed).toBe(1);
    expect(out.links.map((l) => [l.study, l.link, l.target_met])).toEqual([
      ["failing", "a-b", false],
      ["passing", "a-b", true],
    ]);
    // Same link and budget, threshold 55 dB higher: the fade margin drops by exactly 55 dB.
    expect(out.links[1].fade_margin_db - out.links[0].fade_margin_db).toBeCloseTo(55, 9);
  });

  it("exits 2 on bad input with a message and no stack trace", () => {
    for (const r of [runs.broken, runs.unknownId]) {
      expect(r.status, r.stdout).toBe(2);
      expect(r.stderr).toMatch(/^ridgeline check: /);
      expect(r.stderr).not.toMatch(/\n\s+at /);
    }
    expect(runs.broken.stderr).toContain("links[0].to.site");
    expect(runs.unknownId.stderr).toContain('study id "nosuch"');
  });
});
