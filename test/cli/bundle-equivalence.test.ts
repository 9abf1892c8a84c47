import { spawn } from "node:child_process";
import { mkdtempSync, readdirSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join, relative } from "node:path";
import { fileURLToPath } from "node:url";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { PROJECT_ROOT } from "../helpers/run-cli.ts";

// bin/ridgeline.js runs a cached esbuild bundle of the CLI, or with RIDGELINE_NO_BUNDLE=1 the
// TypeScript sources through tsx. Both must print the same bytes, compute the same cache keys
// (tool version and code fingerprint, which the bundled modules find through their original
// file URLs) and build the same site. `build` runs Eleventy, which loads the site modules through
// tsx as separate instances beside the bundle's: the analysed studies are handed over on
// globalThis (src/site/site-data.ts), and the byte-identical builds below prove that this holds.

const BIN = join(PROJECT_ROOT, "bin", "ridgeline.js");
const RECORDER = fileURLToPath(new URL("./record-modules.mjs", import.meta.url));
type Run = { status: number | null; stdout: string; stderr: string; modules: string[] };

let tmp: string;
let seq = 0;
/** Run the CLI from the project root, the bundle (default) or tsx, recording the modules it resolves. */
function run(args: string[], mode: "bundle" | "tsx"): Promise<Run> {
  const record = join(tmp, `modules-${seq++}.txt`);
  const env: NodeJS.ProcessEnv = { ...process.env, FORCE_COLOR: "0", RIDGELINE_RECORD_MODULES: record };
  if (mode === "tsx") env.RIDGELINE_NO_BUNDLE = "1";
  else delete env.RIDGELINE_NO_BUNDLE;
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, ["--import", RECORDER, BIN, ...args], { cwd: PROJECT_ROOT, env });
    let stdout = "";
    let stderr = "";
    child.stdout.on("data", (c) => (stdout += c));
    child.stderr.on("data", (c) => (stderr += c));
    child.on("error", reject);
    child.on("close", (status) => {
      let modules: string[] = [];
      try {
        modules = readFileSync(record, "utf8").split("\n").filter(Boolean);
      } catch {
        // nothing resolved through the hooks
      }
      resolve({ status, stdout, stderr, modules });
    });
  });
}

const files = (dir: string): string[] =>
  readdirSync(dir, { withFileTypes: true, recursive: true })
    .filter((e) => e.isFile())
    .map((e) => relative(dir, join(e.parentPath, e.name)))
    .sort();

const PATH = ["path", "--from", "-41.12,-32.41", "--to", "-41.05,-32.30", "--terrain", "constant:120", "--frequency-ghz", "11.245", "--from-antenna-m", "30", "--to-antenna-m", "25", "--k", "4/3", "--k", "2/3", "--rain-rate-mm-h", "35", "--json"];
const commands: Record<string, string[]> = {
  path: PATH,
  check: ["check", "kestrel-vale"],
  checkJson: ["check", "kestrel-vale", "--json"],
  coverageUsage: ["coverage"],
};
const runs: Record<string, { bundle: Run; tsx: Run }> = {};
let builds: { bundle: Run; tsx: Run; dirs: { bundle: string; tsx: string } };

beforeAll(async () => {
  tmp = mkdtempSync(join(tmpdir(), "ridgeline-bundle-cli-"));
  // The bundle first, alone, so that it is built (or found fresh) before the parallel runs.
  runs.coverageUsage = { bundle: await run(commands.coverageUsage, "bundle"), tsx: await run(commands.coverageUsage, "tsx") };
  for (const [k, args] of Object.entries(commands)) {
    if (k === "coverageUsage") continue;
    const [bundle, tsx] = await Promise.all([run(args, "bundle"), run(args, "tsx")]);
    runs[k] = { bundle, tsx };
  }
  // The bundle fills a fresh cache; the tsx build must then take every link and coverage map from it.
  const cache = join(tmp, "cache");
  const dirs = { bundle: join(tmp, "site-bundle"), tsx: join(tmp, "site-tsx") };
  const bundle = await run(["build", "--out", dirs.bundle, "--cache-dir", cache], "bundle");
  const tsx = await run(["build", "--out", dirs.tsx, "--cache-dir", cache], "tsx");
  builds = { bundle, tsx, dirs };
}, 600_000); // the demo's P.1812 coverages are computed once per build with a fresh cache
afterAll(() => rmSync(tmp, { recursive: true, force: true }));

const srcModule = (u: string) => u.startsWith("file:") && fileURLToPath(u).startsWith(join(PROJECT_ROOT, "src")) && u.endsWith(".ts");
const bundleModule = (u: string) => /\/node_modules\/\.cache\/ridgeline\/cli\/[0-9a-f]{16}\/main\.mjs$/.test(u);

describe("the CLI bundle and the tsx path", () => {
  it("run different code: the bundle loads no src/*.ts module, tsx loads them and no bundle", () => {
    const { bundle, tsx } = runs.path;
    expect(bundle.modules.length, "the module recorder saw nothing").toBeGreaterThan(0);
    expect(bundle.modules.filter(bundleModule)).toHaveLength(1);
    expect(bundle.modules.filter(srcModule)).toEqual([]);
    expect(tsx.modules.filter(bundleModule)).toEqual([]);
    expect(tsx.modules).toContain(new URL("src/cli/main.ts", `file://${PROJECT_ROOT}`).href);
  });

  it.each(Object.keys(commands))("%s: same exit status, stdout and stderr", (k) => {
    const { bundle, tsx } = runs[k];
    expect(bundle.status, bundle.stderr).toBe(tsx.status);
    expect(bundle.stdout).toBe(tsx.stdout);
    expect(bundle.stderr).toBe(tsx.stderr);
  });

  it("give the expected exit statuses (path 0; check of the demo 0: its blocked mill-aldr path is a rejected design, shown but not counted; coverage without options 2)", () => {
    expect(runs.path.bundle.status, runs.path.bundle.stderr).toBe(0);
    expect(JSON.parse(runs.path.bundle.stdout).losses_db.free_space).toBeGreaterThan(100);
    expect(runs.check.bundle.status, runs.check.bundle.stderr).toBe(0);
    expect(runs.check.bundle.stdout).toMatch(/mill-aldr .* MISSED \(rejected, not counted\)/);
    expect(JSON.parse(runs.checkJson.bundle.stdout).links.length).toBeGreaterThan(0);
    expect(runs.coverageUsage.bundle.status).toBe(2);
    expect(runs.coverageUsage.bundle.stderr).toMatch(/^ridgeline coverage: --site is required/);
  });

  it("compute the same cache keys: a tsx build takes every link and coverage map from the bundle build's cache", () => {
    expect(builds.bundle.status, builds.bundle.stderr).toBe(0);
    expect(builds.tsx.status, builds.tsx.stderr).toBe(0);
    expect(builds.bundle.stderr).toMatch(/\b0 of \d+ links from cache/);
    const links = /(\d+) of (\d+) links from cache/.exec(builds.tsx.stderr);
    const maps = /(\d+) of (\d+) coverage maps from cache/.exec(builds.tsx.stderr);
    expect(links, builds.tsx.stderr).not.toBeNull();
    expect(maps, builds.tsx.stderr).not.toBeNull();
    expect(links![1]).toBe(links![2]);
    expect(maps![1]).toBe(maps![2]);
    expect(Number(links![2])).toBeGreaterThan(0);
  });

  it("build byte-identical sites, with the same tool version and inputs hash in results.json", () => {
    const list = files(builds.dirs.bundle);
    expect(list).toContain("index.html");
    expect(files(builds.dirs.tsx)).toEqual(list);
    const differing = list.filter((f) => !readFileSync(join(builds.dirs.bundle, f)).equals(readFileSync(join(builds.dirs.tsx, f))));
    expect(differing).toEqual([]);
    const results = JSON.parse(readFileSync(join(builds.dirs.bundle, "studies", "kestrel-vale", "results.json"), "utf8"));
    expect(results.provenance.tool_version).toBe(JSON.parse(readFileSync(join(PROJECT_ROOT, "package.json"), "utf8")).version);
    expect(results.provenance.inputs_sha256).toMatch(/^[0-9a-f]{64}$/);
  });
});
