import { execFileSync } from "node:child_process";
import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { StudiesDiff } from "../../src/diff/study-diff.ts";
import { runCliAsync } from "../git/run-cli-async.ts";
import { twoLinkYaml } from "./two-link-study.ts";

// Issue 14: `check` fails a study whose receiver misses its C/I or degradation limit (and
// --json says so); `diff` reports the interference change when a channel change fixes it.

const git = (cwd: string, ...args: string[]) =>
  execFileSync("git", ["-c", "user.name=Ridgeline test", "-c", "user.email=test@example.invalid", "-c", "commit.gpgsign=false", ...args], { cwd, stdio: ["ignore", "pipe", "pipe"] }).toString();

let tmp: string;
let repo: string;
type Run = Awaited<ReturnType<typeof runCliAsync>>;
let checkBefore: Run;
let checkAfter: Run;
let diffJson: Run;
let diffText: Run;

beforeAll(async () => {
  tmp = mkdtempSync(join(tmpdir(), "ridgeline-ifx-diff-"));
  repo = join(tmp, "repo");
  const dir = join(repo, "studies", "pair");
  mkdirSync(dir, { recursive: true });
  writeFileSync(join(dir, "study.yaml"), twoLinkYaml());
  git(repo, "init", "-q");
  git(repo, "add", ".");
  git(repo, "commit", "-q", "-m", "Both links on one channel pair");
  const common = ["--studies-dir", join(repo, "studies")];
  checkBefore = await runCliAsync(["check", "--json", ...common]);
  writeFileSync(join(dir, "study.yaml"), twoLinkYaml("{ go_mhz: 2400, return_mhz: 2500, bandwidth_mhz: 28 }"));
  git(repo, "commit", "-q", "-am", "Move link b to another channel pair");
  [checkAfter, diffJson, diffText] = await Promise.all([
    runCliAsync(["check", "--json", ...common]),
    runCliAsync(["diff", "HEAD~1", "HEAD", "--json", "--out", join(tmp, "site-json"), ...common]),
    runCliAsync(["diff", "HEAD~1", "HEAD", "--out", join(tmp, "site"), ...common]),
  ]);
}, 120_000);
afterAll(() => rmSync(tmp, { recursive: true, force: true }));

describe("check and diff with interference", () => {
  it("check exits 1 when a receiver misses its C/I, and --json names it with its figures", () => {
    expect(checkBefore.status, checkBefore.stderr).toBe(1);
    const out = JSON.parse(checkBefore.stdout);
    expect(out.missed).toBe(0); // every link meets its own targets: the failure is interference alone
    expect(out.interference.total).toBe(4);
    const a = out.interference.receivers.find((r: { receiver: string }) => r.receiver === "a go");
    expect(a).toMatchObject({ link: "a", met: false, allowed_degradation_db: 1 });
    expect(a.worst_ci_margin_db).toBeLessThan(0);
    expect(a.threshold_degradation_long_term_db).toBeGreaterThan(1);
    expect(a.reasons.join(" ")).toMatch(/C\/I at the threshold below the requirement/);
  });
  it("check exits 0 once link b is on another channel pair", () => {
    expect(checkAfter.status, checkAfter.stderr).toBe(0);
    expect(JSON.parse(checkAfter.stdout).interference.missed).toBe(0);
  });
  it("diff reports the receivers whose interference verdict flipped", () => {
    expect(diffJson.status, diffJson.stderr).toBe(0);
    const d = JSON.parse(diffJson.stdout) as StudiesDiff;
    const ch = d.studies[0].interference.find((c) => c.receiver === "a go")!;
    expect(ch).toMatchObject({ status: "changed", met_before: false, met_after: true, threshold_degradation_after_db: 0 });
    expect(d.studies[0].inputs.some((i) => i.subject === "link b" && i.field === "frequency_plan")).toBe(true);
    expect(diffText.stdout).toMatch(/interference\n\s+a go\s+interference MISSED → met/);
    expect(readFileSync(join(tmp, "site", "changes", "index.html"), "utf8")).toMatch(/<h3>Interference<\/h3>[\s\S]*<strong>a go<\/strong>: interference MISSED → met/);
  });
});
