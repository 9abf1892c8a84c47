import { spawn, spawnSync } from "node:child_process";
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { afterAll, beforeAll, describe, expect, it } from "vitest";

// bin/ridgeline.js runs a large `ridgeline coverage` again in a second node with glibc's
// huge-page tunable (DEVELOPERS.md, src/coverage/) when the kernel leaves transparent
// huge pages to madvise; every other command, and small grids, run in the first. A probe module
// loaded with --import reports, from every node it starts in, its pid and the variable.

const BIN = fileURLToPath(new URL("../../bin/ridgeline.js", import.meta.url));
const THP = (() => {
  try {
    return readFileSync("/sys/kernel/mm/transparent_hugepage/enabled", "utf8");
  } catch {
    return "";
  }
})();
const reexecs = process.platform === "linux" && THP.includes("[madvise]");
let tmp: string;
let probe: string;
beforeAll(() => {
  tmp = mkdtempSync(join(tmpdir(), "ridgeline-bin-"));
  probe = join(tmp, "probe.mjs");
  writeFileSync(probe, "process.stderr.write(`[node ${process.pid} ${process.env.GLIBC_TUNABLES ?? '-'}]\\n`);\n");
});
afterAll(() => rmSync(tmp, { recursive: true, force: true }));

const envWith = (tunables?: string) => {
  const env: NodeJS.ProcessEnv = { ...process.env, NODE_OPTIONS: `--import=${probe}` };
  delete env.GLIBC_TUNABLES;
  if (tunables) env.GLIBC_TUNABLES = tunables;
  return env;
};
const nodes = (stderr: string) => [...stderr.matchAll(/\[node (\d+) (\S+)\]/g)].map((m) => ({ pid: Number(m[1]), tunables: m[2] }));
// a coverage request that fails validation (no --terrain): the command exits 2 at once
const large = ["coverage", "--site", "45,9", "--radius-km", "100", "--resolution-m", "30", "--antenna-m", "30", "--receiver-m", "2", "--frequency-ghz", "0.9", "--method", "visibility", "--out", "x.tif"];

describe("bin/ridgeline.js: huge pages for large coverage grids", () => {
  it("runs other commands and small grids in one node, leaving the environment alone", () => {
    for (const args of [["help"], large.map((a) => (a === "100" ? "10" : a))]) {
      const r = spawnSync(process.execPath, [BIN, ...args], { encoding: "utf8", env: envWith("glibc.malloc.arena_max=2") });
      expect(nodes(r.stderr), args.join(" ")).toEqual([{ pid: expect.any(Number), tunables: "glibc.malloc.arena_max=2" }]);
    }
  });

  it("runs a large grid in a second node with the tunable added to the caller's, and passes its exit code on", () => {
    const r = spawnSync(process.execPath, [BIN, ...large], { encoding: "utf8", env: envWith("glibc.malloc.arena_max=2") });
    expect(r.status).toBe(2); // the child's usage error
    expect(r.stderr).toMatch(/--terrain/);
    const seen = nodes(r.stderr);
    if (!reexecs) {
      expect(seen).toHaveLength(1);
      return;
    }
    expect(seen.map((n) => n.tunables)).toEqual(["glibc.malloc.arena_max=2", "glibc.malloc.hugetlb=1:glibc.malloc.arena_max=2"]);
    // a tunable already naming hugetlb (the caller's choice, or the second node) starts no other node
    const again = spawnSync(process.execPath, [BIN, ...large], { encoding: "utf8", env: envWith("glibc.malloc.hugetlb=0") });
    expect(nodes(again.stderr)).toHaveLength(1);
  });

  it.runIf(reexecs)("passes a SIGTERM on to the second node and ends as it ended", async () => {
    // a large Hata grid over constant terrain: seconds of work, enough to be stopped midway
    const args = ["coverage", "--site", "45,9", "--terrain", "constant:100", "--radius-km", "60", "--resolution-m", "30", "--antenna-m", "30", "--receiver-m", "2", "--frequency-ghz", "0.9", "--method", "hata", "--out", join(tmp, "hata.tif")];
    const parent = spawn(process.execPath, [BIN, ...args], { env: envWith(), stdio: ["ignore", "ignore", "pipe"] });
    let stderr = "";
    const second = await new Promise<number>((resolve) => {
      parent.stderr.on("data", (d) => {
        stderr += String(d);
        const seen = nodes(stderr);
        if (seen.length >= 2) resolve(seen[1].pid);
      });
    });
    parent.kill("SIGTERM");
    const [code, signal] = await new Promise<[number | null, string | null]>((resolve) => parent.on("exit", (c, s) => resolve([c, s])));
    expect(code).toBeNull();
    expect(signal).toBe("SIGTERM");
    const alive = () => {
      try {
        process.kill(second, 0);
        return true;
      } catch {
        return false;
      }
    };
    for (let i = 0; i < 50 && alive(); i++) await new Promise((r) => setTimeout(r, 100));
    expect(alive()).toBe(false);
    expect(existsSync(join(tmp, "hata.tif"))).toBe(false);
  });
});
