import { mkdtempSync, readdirSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join, relative } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { runCliAsync } from "./run-cli-async.ts";

// Issue 6, acceptance: two builds of the demo are byte-identical. Three builds of
// content/studies: without the cache, with an empty cache, and with the cache those filled —
// every file of the three sites must be the same bytes (so the cache changes nothing either).

let tmp: string;
const files = (dir: string): string[] =>
  readdirSync(dir, { withFileTypes: true, recursive: true })
    .filter((e) => e.isFile())
    .map((e) => relative(dir, join(e.parentPath, e.name)))
    .sort();

let builds: { status: number | null; stderr: string; dir: string }[] = [];

beforeAll(async () => {
  tmp = mkdtempSync(join(tmpdir(), "ridgeline-repro-"));
  const cache = join(tmp, "cache");
  const build = async (name: string, extra: string[]) => ({ ...(await runCliAsync(["build", "--out", join(tmp, name), ...extra])), dir: join(tmp, name) });
  const [a, b] = await Promise.all([build("no-cache", ["--no-cache"]), build("cold", ["--cache-dir", cache])]);
  const c = await build("warm", ["--cache-dir", cache]);
  builds = [a, b, c];
}, 120_000);
afterAll(() => rmSync(tmp, { recursive: true, force: true }));

describe("ridgeline build is reproducible", () => {
  it("builds succeed and say where results came from", () => {
    for (const b of builds) expect(b.status, b.stderr).toBe(0);
    expect(builds[0].stderr).toMatch(/cache off/);
    expect(builds[1].stderr).toMatch(/\b0 of (\d+) links from cache/);
    const m = /(\d+) of (\d+) links from cache/.exec(builds[2].stderr);
    expect(m, builds[2].stderr).not.toBeNull();
    expect(m![1]).toBe(m![2]);
    expect(Number(m![2])).toBeGreaterThan(0);
  });

  it("every file of the site is byte-identical across the three builds", () => {
    const [a, b, c] = builds.map((x) => x.dir);
    const list = files(a);
    expect(list).toContain("index.html");
    expect(list.some((f) => f.endsWith("results.json"))).toBe(true);
    expect(files(b)).toEqual(list);
    expect(files(c)).toEqual(list);
    const differing = list.filter((f) => {
      const x = readFileSync(join(a, f));
      return !x.equals(readFileSync(join(b, f))) || !x.equals(readFileSync(join(c, f)));
    });
    expect(differing).toEqual([]);
  });

  it("every study and link page, and results.json, carry the study's provenance", () => {
    const a = builds[0].dir;
    const results = files(a).filter((f) => f.endsWith("results.json"));
    for (const r of results) {
      const p = JSON.parse(readFileSync(join(a, r), "utf8")).provenance as { tool_version: string; inputs_sha256: string; git_commit: string | null; git_dirty: boolean | null };
      expect(p.tool_version).toMatch(/^\d+\.\d+\.\d+/);
      expect(p.inputs_sha256).toMatch(/^[0-9a-f]{64}$/);
      const dir = r.slice(0, -"results.json".length);
      const pages = files(a).filter((f) => f.startsWith(dir) && f.endsWith(".html"));
      expect(pages.length).toBeGreaterThan(1);
      for (const page of pages) {
        const html = readFileSync(join(a, page), "utf8");
        expect(html, page).toContain(p.inputs_sha256.slice(0, 16));
        expect(html, page).toContain(p.git_commit ? p.git_commit.slice(0, 12) : "not in git");
      }
    }
  });

  it("pages carry no build-time clock: the study's date is the only date", () => {
    const today = new Date().toISOString().slice(0, 10);
    const a = builds[0].dir;
    const studyDates = files(a).filter((f) => f.endsWith("results.json")).map((f) => JSON.parse(readFileSync(join(a, f), "utf8")).date);
    if (studyDates.includes(today)) return; // today is a study's own date: nothing to tell apart
    const withToday = files(a).filter((f) => readFileSync(join(a, f), "utf8").includes(today));
    expect(withToday).toEqual([]);
  });
});
