import { spawnSync } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { afterAll, beforeAll, describe, expect, it } from "vitest";

// bin/ridgeline.js runs every command, a large coverage grid too, in the node it was started
// in, with the environment as given (it once ran a large coverage again in a second node with
// glibc's huge-page tunable, which no longer paid: DEVELOPERS.md, src/coverage/). A probe
// module loaded with --import reports, from every node it starts in, its pid and the variable.

const BIN = fileURLToPath(new URL("../../bin/ridgeline.js", import.meta.url));
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

describe("bin/ridgeline.js: one node per command", () => {
  it("runs help, a small and a large coverage grid in the node it was started in, leaving the environment alone, and returns the command's exit code", () => {
    for (const [args, status] of [[["help"], 0], [large.map((a) => (a === "100" ? "10" : a)), 2], [large, 2]] as const) {
      const r = spawnSync(process.execPath, [BIN, ...args], { encoding: "utf8", env: envWith("glibc.malloc.arena_max=2") });
      expect(r.status, args.join(" ")).toBe(status);
      expect(nodes(r.stderr), args.join(" ")).toEqual([{ pid: r.pid, tunables: "glibc.malloc.arena_max=2" }]);
    }
  });
});
