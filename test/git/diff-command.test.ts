import { execFileSync } from "node:child_process";
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { analyzeStudy, type AnalyzedStudy } from "../../src/analysis/analyze-study.ts";
import { diffRevisions } from "../../src/cli/commands/diff.ts";
import type { StudiesDiff } from "../../src/diff/study-diff.ts";
import { loadStudy } from "../../src/study/load-study.ts";
import { expectClose } from "../helpers/expect-close.ts";
import { runCliAsync } from "./run-cli-async.ts";
import { smallStudyYaml, writeSmallStudy } from "./small-study.ts";

// Issue 6, acceptance: in a temporary git repository with two commits where one antenna
// height changes, `diff` names exactly that change and the links it moves, with the right
// deltas — checked against analysing each revision directly.

const git = (cwd: string, ...args: string[]) =>
  execFileSync("git", ["-c", "user.name=Ridgeline test", "-c", "user.email=test@example.invalid", "-c", "commit.gpgsign=false", ...args], { cwd, stdio: ["ignore", "pipe", "pipe"] }).toString();

let tmp: string;
let repo: string;
let studyDir: string;
let before: AnalyzedStudy;
let after: AnalyzedStudy;
type Run = Awaited<ReturnType<typeof runCliAsync>>;
let json: Run;
let text: Run;
let unknown: Run;

beforeAll(async () => {
  tmp = mkdtempSync(join(tmpdir(), "ridgeline-diff-"));
  repo = join(tmp, "repo");
  studyDir = writeSmallStudy(join(repo, "studies"), "ridge", { antennaAB: 10 });
  git(repo, "init", "-q");
  git(repo, "add", ".");
  git(repo, "commit", "-q", "-m", "Ridge study, revision A");
  before = await analyzeStudy(loadStudy(join(studyDir, "study.yaml")));
  writeFileSync(join(studyDir, "study.yaml"), smallStudyYaml({ antennaAB: 40 }));
  git(repo, "commit", "-q", "-am", "Raise the antenna at Alpha on a-b to 40 m");
  after = await analyzeStudy(loadStudy(join(studyDir, "study.yaml")));
  const common = ["--studies-dir", join(repo, "studies"), "--cache-dir", join(tmp, "cache")];
  [json, text, unknown] = await Promise.all([
    runCliAsync(["diff", "HEAD~1", "HEAD", "--json", "--out", join(tmp, "site-json"), ...common]),
    runCliAsync(["diff", "HEAD~1", "--out", join(tmp, "site"), ...common]),
    runCliAsync(["diff", "no-such-rev", "--out", join(tmp, "site-bad"), ...common]),
  ]);
}, 120_000);
afterAll(() => rmSync(tmp, { recursive: true, force: true }));

describe("ridgeline diff between two commits", () => {
  it("names exactly the one input that changed, and the link it feeds", () => {
    expect(json.status, json.stderr).toBe(0);
    const d = JSON.parse(json.stdout) as StudiesDiff;
    expect(d.from.rev).toBe("HEAD~1");
    expect(d.to.commit).toBe(git(repo, "rev-parse", "HEAD").trim());
    expect(d.thresholds).toEqual({ fade_margin_db: 0.5, availability_pct: 0.001, clearance_f1: 0.05 });
    expect(d.studies.map((s) => [s.id, s.status])).toEqual([["ridge", "changed"]]);
    expect(d.studies[0].inputs).toEqual([
      { kind: "antenna", subject: "link a-b", field: "from.antenna_m", before: 10, after: 40, delta: 30, unit: "m", links: ["a-b"], text: "link a-b: antenna height at A (from end) 10 m → 40 m (+30 m)" },
    ]);
  });

  it("reports only the link whose results moved, with the deltas of the two analyses", () => {
    const d = JSON.parse(json.stdout) as StudiesDiff;
    const results = d.studies[0].results;
    expect(results.map((r) => [r.link, r.status])).toEqual([["a-b", "changed"]]);
    const b = before.result.links.find((l) => l.id === "a-b")!;
    const a = after.result.links.find((l) => l.id === "a-b")!;
    const change = (q: string, k: string | null = null) => results[0].changes.find((c) => c.quantity === q && c.k_label === k)!;
    // Tolerance: both sides are the same computation, serialised as JSON (exact round trip).
    expectClose(change("fade_margin_db").delta!, a.fade_margin_db! - b.fade_margin_db!, { abs: 1e-9 }, "fade margin delta (dB)");
    expect(change("fade_margin_db").before).toBe(b.fade_margin_db);
    expect(change("fade_margin_db").after).toBe(a.fade_margin_db);
    expectClose(change("availability_pct").delta!, a.availability_pct! - b.availability_pct!, { abs: 1e-9 }, "availability delta (%)");
    // the performance objective (worst month) is compared beside availability (year)
    expect(Math.abs(a.performance_pct! - b.performance_pct!)).toBeGreaterThan(d.thresholds.availability_pct);
    expectClose(change("performance_pct").delta!, a.performance_pct! - b.performance_pct!, { abs: 1e-9 }, "performance delta (%)");
    for (const k of ["4/3", "2/3"]) {
      const cb = b.clearance.find((c) => c.k_label === k)!;
      const ca = a.clearance.find((c) => c.k_label === k)!;
      expectClose(change("min_clearance_f1", k).delta!, ca.min_clearance_f1 - cb.min_clearance_f1, { abs: 1e-9 }, `clearance delta at k = ${k} (F1)`);
    }
    // The analyses agree that the other links did not move at all.
    for (const id of ["a-c", "b-c"]) {
      expect(after.result.links.find((l) => l.id === id)!.fade_margin_db).toBe(before.result.links.find((l) => l.id === id)!.fade_margin_db);
    }
  });

  it("prints a terminal summary and writes a self-contained changes page", () => {
    expect(text.status, text.stderr).toBe(0);
    expect(text.stdout).toContain("→ working tree");
    expect(text.stdout).toContain("link a-b: antenna height at A (from end) 10 m → 40 m (+30 m)  [feeds a-b]");
    expect(text.stdout).toMatch(/\n {4}a-b {2}.*fade margin .* dB \(\+\d+\.\d\d dB\)/);
    expect(text.stdout).not.toMatch(/\n {4}(a-c|b-c) /);
    const page = join(tmp, "site", "changes", "index.html");
    expect(existsSync(page)).toBe(true);
    const html = readFileSync(page, "utf8");
    expect(html).toContain('href="../assets/ridgeline.css"');
    expect(html).toContain("from.antenna_m");
    expect(html).toContain('href="../studies/ridge/links/a-b/index.html"');
    expect(html).not.toMatch(/<script|https?:\/\//);
    expect(html).toContain("Performance, worst month (%)");
  });

  it("exits 2 with a clear message for an unknown revision", () => {
    expect(unknown.status).toBe(2);
    expect(unknown.stderr).toContain('unknown revision "no-such-rev"');
    expect(unknown.stderr).not.toMatch(/\n\s+at /);
  });

  it("uses the working tree's copy of a terrain folder git does not hold, and says so", async () => {
    const repo2 = join(tmp, "repo2");
    const dir = writeSmallStudy(join(repo2, "studies"), "ridge", { antennaAB: 10 });
    writeFileSync(join(repo2, ".gitignore"), "dem/\n");
    git(repo2, "init", "-q");
    git(repo2, "add", ".");
    git(repo2, "commit", "-q", "-m", "Study without its DEM in git");
    expect(git(repo2, "ls-files")).not.toContain(".hgt");
    writeFileSync(join(dir, "study.yaml"), smallStudyYaml({ antennaAB: 40 }));
    const d = await diffRevisions("HEAD", null, { studiesDir: join(repo2, "studies"), cacheDir: null });
    expect(d.notes).toEqual(["ridge: dem is not in git at " + git(repo2, "rev-parse", "--short", "HEAD").trim() + "; the working tree's copy was used for that revision."]);
    expect(d.studies[0].inputs.map((c) => c.field)).toEqual(["from.antenna_m"]);
    expect(d.studies[0].results.map((r) => r.link)).toEqual(["a-b"]);
  });

  it("reports no changes between a commit and an unchanged working tree", async () => {
    const d = await diffRevisions("HEAD", null, { studiesDir: join(repo, "studies"), cacheDir: join(tmp, "cache") });
    expect(d.studies.map((s) => [s.id, s.status, s.inputs.length, s.results.length])).toEqual([["ridge", "unchanged", 0, 0]]);
  });
});
