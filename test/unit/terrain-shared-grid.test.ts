import { execFileSync } from "node:child_process";
import { readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { Worker } from "node:worker_threads";
import { describe, expect, it } from "vitest";
import { sharedFloat32, sharedInt16 } from "../../src/terrain/shared-grid.ts";

// Elevation grids shared with worker threads (src/terrain/shared-grid.ts): exact lengths,
// zero-filled, shared for real, and — the reason the module exists — kept out of glibc's
// huge pages when the process runs with GLIBC_TUNABLES=glibc.malloc.hugetlb=1.

const MODULE = fileURLToPath(new URL("../../src/terrain/shared-grid.ts", import.meta.url));

describe("shared elevation grids", () => {
  it("has the grid's length, zeros, and a SharedArrayBuffer below and above 2 MiB", () => {
    for (const n of [1, 1000, 524_287, 524_288, 1_000_003]) {
      const f = sharedFloat32(n);
      expect(f.length).toBe(n);
      expect(f.buffer).toBeInstanceOf(SharedArrayBuffer);
      expect(f.buffer.byteLength).toBeGreaterThanOrEqual(n * 4);
      expect(f.every((x) => x === 0)).toBe(true);
      const i = sharedInt16(n);
      expect(i.length).toBe(n);
      expect(i.buffer).toBeInstanceOf(SharedArrayBuffer);
      expect(i.every((x) => x === 0)).toBe(true);
    }
    // from 2 MiB up the buffer is whole 64 KiB pages (the engine's memory), below it exact
    expect(sharedFloat32(1_000_003).buffer.byteLength % 65_536).toBe(0);
    expect(sharedFloat32(1000).buffer.byteLength).toBe(4000);
  });

  it("is shared with a worker thread, not copied", async () => {
    const grid = sharedFloat32(1_000_003);
    const w = new Worker(`const { parentPort } = require("node:worker_threads"); parentPort.once("message", (a) => { a[0] = 1.5; a[a.length - 1] = -2.25; parentPort.postMessage(a.length); });`, { eval: true });
    const length = await new Promise<number>((resolve, reject) => {
      w.once("message", resolve);
      w.once("error", reject);
      w.postMessage(grid);
    });
    await w.terminate();
    expect(length).toBe(1_000_003);
    expect(grid[0]).toBe(1.5);
    expect(grid[1_000_002]).toBe(-2.25);
  });

  // The transparent huge pages of glibc's tunable reach an allocation only when the kernel
  // gives them on request (THP "madvise"); with "always" every mapping may get them, with
  // "never" none. The control (a plain SharedArrayBuffer of the same size) shows whether the
  // tunable takes effect on this machine at all; only then is the grid's page size asserted.
  const thp = (() => {
    try {
      return /\[(\w+)\]/.exec(readFileSync("/sys/kernel/mm/transparent_hugepage/enabled", "utf8"))?.[1] ?? "";
    } catch {
      return "";
    }
  })();
  it.skipIf(thp !== "madvise")("keeps a 64 MiB grid in 4 kB pages under glibc.malloc.hugetlb=1, where a plain SharedArrayBuffer gets huge pages", (ctx) => {
    const script = (plain: boolean) => `
      import { readFileSync } from "node:fs";
      import { sharedFloat32 } from ${JSON.stringify(MODULE)};
      const n = 16 * 2 ** 20;
      const a = ${plain ? "new Float32Array(new SharedArrayBuffer(n * 4))" : "sharedFloat32(n)"};
      for (let i = 0; i < n; i += 1024) a[i] = 1;
      process.stdout.write(/AnonHugePages:\\s+(\\d+)/.exec(readFileSync("/proc/self/smaps_rollup", "utf8"))[1]);`;
    const env = { ...process.env, GLIBC_TUNABLES: "glibc.malloc.hugetlb=1" };
    const hugeKb = (plain: boolean) => Number(execFileSync(process.execPath, ["--import", "tsx", "--input-type=module", "-e", script(plain)], { env, encoding: "utf8" }));
    const control = hugeKb(true);
    if (control < 32 * 1024) ctx.skip(); // the tunable gave no huge pages here: nothing to tell apart
    expect(hugeKb(false)).toBeLessThan(8 * 1024);
  });
});
