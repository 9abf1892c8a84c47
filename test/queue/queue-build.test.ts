// `ridgeline build --queue` with `ridgeline worker`s on a redis-server the test starts: the
// site is the one a local build writes, byte for byte, also when a worker dies mid-task; a
// worker of another version takes no task; an unreachable Redis is a clear error (exit 2).
import { cpSync, mkdirSync, mkdtempSync, readFileSync, rmSync, symlinkSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { PROJECT_ROOT, runCli } from "../helpers/run-cli.ts";
import { startCli, stopCli, treeBytes, type CliProcess } from "./cli-process.ts";
import { freePort, startRedis, type TestRedis } from "./redis-server.ts";
import { writeQueueStudy } from "./queue-study.ts";

let redis: TestRedis;
let tmp: string;
let studies: string;
let localSite: Map<string, Buffer>;
const workers: CliProcess[] = [];

const worker = (name: string, extra: string[] = [], bin?: string): CliProcess => {
  // a worker's temporary folders inside the test's own: one killed with -9 cannot remove its own
  const w = startCli(["worker", "--queue", redis.url, "--name", name, ...extra], bin, undefined, { TMPDIR: join(tmp, "worker-tmp") });
  workers.push(w);
  return w;
};
const build = (out: string, extra: string[] = []) => startCli(["build", "--studies-dir", studies, "--out", out, "--queue", redis.url, ...extra]);

/** The differences between two sites: files only in one, and files whose bytes differ. */
function siteDifferences(a: Map<string, Buffer>, b: Map<string, Buffer>): string[] {
  const names = [...new Set([...a.keys(), ...b.keys()])].sort();
  return names.filter((n) => !a.has(n) || !b.has(n) || !a.get(n)!.equals(b.get(n)!));
}

beforeAll(async () => {
  redis = await startRedis();
  tmp = mkdtempSync(join(tmpdir(), "ridgeline-queue-test-"));
  mkdirSync(join(tmp, "worker-tmp"));
  studies = join(tmp, "studies");
  writeQueueStudy(studies);
  const local = runCli(["build", "--studies-dir", studies, "--out", join(tmp, "site-local"), "--no-cache"]);
  expect(local.status, local.stderr).toBe(0);
  localSite = treeBytes(join(tmp, "site-local"));
});

afterAll(async () => {
  await Promise.all(workers.map((w) => stopCli(w)));
  await redis?.stop();
  rmSync(tmp, { recursive: true, force: true });
});

describe("ridgeline build --queue", () => {
  it("builds a 44-link, two-coverage study on two workers into the same bytes as a local build", async () => {
    const w1 = worker("w1");
    const w2 = worker("w2");
    await Promise.all([w1.waitFor(/waiting for tasks/), w2.waitFor(/waiting for tasks/)]);
    const b = build(join(tmp, "site-queue"), ["--no-cache"]);
    expect(await b.exited, b.output()).toBe(0);
    // 44 links in batches of 25, two coverage maps of 2 tiles each and their assembly: 8
    // tasks; the composite made here from the maps
    expect(b.output()).toMatch(/queue: tasks 8\/8 done, 0 failed/);
    expect(b.output()).toMatch(/8 tasks on [12] workers?/);
    expect(b.output()).toMatch(/44 of 44 links from cache, 2 of 3 coverage maps from cache/);
    expect(b.output()).not.toContain(redis.password); // the URL is printed masked
    expect(b.output()).toContain(`redis://:****@127.0.0.1:${redis.port}`);
    expect(w1.output() + w2.output()).toMatch(/done "coverage cov-a tile 1\/2 of study queue-study"/);
    expect(w1.output() + w2.output()).toMatch(/done "coverage cov-b tile 2\/2 of study queue-study"/);
    expect(w1.output() + w2.output()).toMatch(/done "coverage cov-b of study queue-study \(assembly of 2 tiles\)"/);
    const site = treeBytes(join(tmp, "site-queue"));
    expect(siteDifferences(site, localSite)).toEqual([]);
    expect([...site.values()].some((bytes) => bytes.includes(redis.password))).toBe(false);
    await Promise.all([stopCli(w1), stopCli(w2)]);
    expect(w1.output()).toMatch(/stopping after the task/);
  });

  it("a worker killed (-9) in the middle of a coverage tile task: another worker runs it and the site is the same", async () => {
    // a dead worker's task is taken back within about twice --stall-seconds
    const a = worker("doomed", ["--stall-seconds", "4"]);
    await a.waitFor(/waiting for tasks/);
    const b = build(join(tmp, "site-killed"), ["--no-cache"]);
    await a.waitFor(/started "coverage cov-a/);
    a.proc.kill("SIGKILL");
    expect(await a.exited).toBe("SIGKILL");
    expect(a.output()).not.toMatch(/done "coverage cov-a/);
    const rescuer = worker("rescuer", ["--stall-seconds", "4"]);
    expect(await b.exited, b.output()).toBe(0);
    expect(rescuer.output()).toMatch(/started "coverage cov-a tile 1\/2 of study queue-study" \(attempt 2\)/);
    expect(siteDifferences(treeBytes(join(tmp, "site-killed")), localSite)).toEqual([]);
    await stopCli(rescuer);
  });

  it("maps whose tiles the coordinator's cache already holds: only their assembly is queued, the tiles sent from the cache, and the site is the same", async () => {
    const cacheDir = join(tmp, "cache-tiles-only");
    const first = runCli(["build", "--studies-dir", studies, "--out", join(tmp, "site-cached"), "--cache-dir", cacheDir]);
    expect(first.status, first.stderr).toBe(0);
    rmSync(join(cacheDir, "coverage"), { recursive: true, force: true }); // the maps and composite gone, their tiles kept
    const w = worker("assembler");
    await w.waitFor(/waiting for tasks/);
    const b = build(join(tmp, "site-from-tiles"), ["--cache-dir", cacheDir]);
    expect(await b.exited, b.output()).toBe(0);
    expect(b.output()).toMatch(/queue: tasks 2\/2 done, 0 failed/);
    expect(w.output()).toMatch(/done "coverage cov-a of study queue-study \(assembly of 2 tiles\)"/);
    expect(w.output()).not.toMatch(/tile \d\/2/);
    expect(siteDifferences(treeBytes(join(tmp, "site-from-tiles")), localSite)).toEqual([]);
    await stopCli(w);
  });

  it("a worker of another Ridgeline version refuses the tasks, says why, and exits 2; the build completes on a matching worker", async () => {
    // A copy of this checkout whose package.json names another version.
    const other = join(tmp, "other-version");
    mkdirSync(other);
    for (const part of ["bin", "src", "tsconfig.json"]) cpSync(join(PROJECT_ROOT, part), join(other, part), { recursive: true });
    const pkg = JSON.parse(readFileSync(join(PROJECT_ROOT, "package.json"), "utf8"));
    writeFileSync(join(other, "package.json"), JSON.stringify({ ...pkg, version: "0.0.1-other" }, null, 2));
    symlinkSync(join(PROJECT_ROOT, "node_modules"), join(other, "node_modules"));
    const stale = worker("stale", [], join(other, "bin", "ridgeline.js"));
    await stale.waitFor(/waiting for tasks/);
    const b = build(join(tmp, "site-versions"), ["--no-cache"]);
    expect(await stale.exited).toBe(2);
    expect(stale.output()).toMatch(/refused task ".*": the coordinator runs Ridgeline 0\.1\.0, this worker 0\.0\.1-other/);
    expect(stale.output()).not.toMatch(/started "/);
    await b.waitFor(/worker stale refused the tasks: the coordinator runs Ridgeline 0\.1\.0, this worker 0\.0\.1-other/);
    const good = worker("good");
    expect(await b.exited, b.output()).toBe(0);
    expect(siteDifferences(treeBytes(join(tmp, "site-versions")), localSite)).toEqual([]);
    await stopCli(good);
  });

  it("a task that fails three times fails the build, naming the task, the worker and the error; the previous _site is kept", async () => {
    const root = join(tmp, "failing");
    writeQueueStudy(root, "changed-terrain");
    const out = join(tmp, "site-local"); // a site that must survive the failed build
    const b = startCli(["build", "--studies-dir", root, "--out", out, "--queue", redis.url, "--no-cache"]);
    await b.waitFor(/tasks? queued/);
    // The terrain changes under the build: every worker now reads other bytes than the coordinator hashed.
    const tile = join(root, "changed-terrain", "dem", "S44W031.hgt");
    const bytes = readFileSync(tile);
    bytes[1000] ^= 0x7f;
    writeFileSync(tile, bytes);
    const w = worker("tired");
    expect(await b.exited).toBe(2);
    expect(b.output()).toMatch(/task "(links l00–l24|links l25–l43|coverage cov-[ab] tile [12]\/2) of study changed-terrain" failed and will not be retried \(up to 3 attempts, on any worker\); last error: worker tired: the terrain \(dem in .*changed-terrain\) differs from the coordinator's/);
    expect(w.output()).toMatch(/failed \(attempt 3\)/);
    expect(b.output()).not.toMatch(/\n\s+at /);
    expect(siteDifferences(treeBytes(out), localSite)).toEqual([]);
    await stopCli(w);
  });

  it("Redis unreachable: exit 2 naming the URL with its password masked and the reason; the previous _site is kept", async () => {
    const port = await freePort(); // nothing listens there
    const out = join(tmp, "site-local");
    const r = runCli(["build", "--studies-dir", studies, "--out", out, "--queue", `redis://:hunter2-secret@127.0.0.1:${port}/3`]);
    expect(r.status).toBe(2);
    expect(r.stderr).toContain(`cannot use Redis at redis://:****@127.0.0.1:${port}/3`);
    expect(r.stderr).toMatch(/ECONNREFUSED/);
    expect(r.stderr + r.stdout).not.toContain("hunter2-secret");
    expect(r.stderr).not.toMatch(/\n\s+at /); // no stack trace
    expect(siteDifferences(treeBytes(out), localSite)).toEqual([]);
  });

  it("a wrong password: exit 2 with the reason, the password not printed", () => {
    const r = runCli(["build", "--studies-dir", studies, "--out", join(tmp, "site-wrong"), "--queue", `redis://:not-the-password@127.0.0.1:${redis.port}`]);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/cannot use Redis at redis:\/\/:\*\*\*\*@127\.0\.0\.1:\d+: the server refused the password/);
    expect(r.stderr).not.toContain("not-the-password");
  });

  it("a worker with an unreachable Redis exits 2 the same way", () => {
    const r = runCli(["worker", "--queue", "redis://:pw-should-not-show@127.0.0.1:1"]);
    expect(r.status).toBe(2);
    expect(r.stderr).toContain("cannot use Redis at redis://:****@127.0.0.1:1");
    expect(r.stderr).not.toContain("pw-should-not-show");
  });
});
