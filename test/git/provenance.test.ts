import { execFileSync } from "node:child_process";
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { analyzeStudy } from "../../src/analysis/analyze-study.ts";
import { TOOL_VERSION } from "../../src/analysis/provenance.ts";
import { loadStudy } from "../../src/study/load-study.ts";
import { TINY_STUDY, writeStudy } from "../helpers/tiny-study.ts";

// Issue 6: provenance in results — tool version, inputs hash, the git commit of the study and
// whether its folder differs from that commit; both git fields null outside git.

const git = (cwd: string, ...args: string[]) =>
  execFileSync("git", ["-c", "user.name=Ridgeline test", "-c", "user.email=test@example.invalid", "-c", "commit.gpgsign=false", ...args], { cwd, stdio: ["ignore", "pipe", "pipe"] }).toString().trim();

let tmp: string;
let repo: string;
const provenance = async (file: string) => (await analyzeStudy(loadStudy(file))).result.provenance;

beforeAll(() => {
  tmp = mkdtempSync(join(tmpdir(), "ridgeline-prov-"));
  repo = join(tmp, "repo");
  writeStudy(join(repo, "studies"), "tiny", TINY_STUDY);
  mkdirSync(join(repo, "notes"));
  writeFileSync(join(repo, "notes", "todo.txt"), "first\n");
  git(repo, "init", "-q");
  git(repo, "add", ".");
  git(repo, "commit", "-q", "-m", "Tiny study");
});
afterAll(() => rmSync(tmp, { recursive: true, force: true }));

describe("provenance of a study's results", () => {
  const file = () => join(repo, "studies", "tiny", "study.yaml");

  it("names HEAD and a clean folder for a committed study", async () => {
    const p = await provenance(file());
    expect(p.tool_version).toBe(TOOL_VERSION);
    expect(p.git_commit).toBe(git(repo, "rev-parse", "HEAD"));
    expect(p.git_dirty).toBe(false);
    expect(p.inputs_sha256).toMatch(/^[0-9a-f]{64}$/);
  });

  it("is clean when only files outside the study's folder changed", async () => {
    writeFileSync(join(repo, "notes", "todo.txt"), "second\n");
    expect((await provenance(file())).git_dirty).toBe(false);
  });

  it("is dirty when a file in the study's folder is new or changed, and the inputs hash follows the study", async () => {
    const clean = await provenance(file());
    writeFileSync(join(repo, "studies", "tiny", "survey-notes.txt"), "untracked\n");
    expect((await provenance(file())).git_dirty).toBe(true);
    rmSync(join(repo, "studies", "tiny", "survey-notes.txt"));
    writeFileSync(file(), TINY_STUDY.replace("revision: A", "revision: B"));
    const edited = await provenance(file());
    expect(edited.git_dirty).toBe(true);
    expect(edited.git_commit).toBe(clean.git_commit);
    expect(edited.inputs_sha256).not.toBe(clean.inputs_sha256);
    writeFileSync(file(), TINY_STUDY);
    expect(await provenance(file())).toEqual(clean);
  });

  it("has null git fields outside a git repository", async () => {
    const outside = writeStudy(join(tmp, "plain"), "tiny", TINY_STUDY);
    const p = await provenance(outside);
    expect(p.git_commit).toBeNull();
    expect(p.git_dirty).toBeNull();
    // Same bytes in, same inputs hash, wherever the study sits.
    expect(p.inputs_sha256).toBe((await provenance(file())).inputs_sha256);
  });
});
