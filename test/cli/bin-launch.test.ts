import { spawnSync } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";
import { afterAll, beforeAll, describe, expect, it } from "vitest";

// bin/ridgeline.js run as the installed command is: its first line starts node through
// `env -S` with a glibc tunable (huge pages for large allocations, see DEVELOPERS.md), which the
// script takes out of the environment again, so that what ridgeline runs (git, chromium) starts
// with the caller's environment. A probe module loaded with --import reports the variable when
// node starts and when it exits.

const BIN = fileURLToPath(new URL("../../bin/ridgeline.js", import.meta.url));
let tmp: string;
let probe: string;
beforeAll(() => {
  tmp = mkdtempSync(join(tmpdir(), "ridgeline-bin-"));
  probe = join(tmp, "probe.mjs");
  writeFileSync(probe, 'process.stderr.write(`[start=${process.env.GLIBC_TUNABLES}]`);\nprocess.on("exit", () => process.stderr.write(`[exit=${process.env.GLIBC_TUNABLES}]`));\n');
});
afterAll(() => rmSync(tmp, { recursive: true, force: true }));

const run = (env: NodeJS.ProcessEnv) => {
  const r = spawnSync(BIN, ["help"], {
    encoding: "utf8",
    // node from this run first on the PATH, as npm puts it for an installed command
    env: { ...env, PATH: `${dirname(process.execPath)}:${process.env.PATH ?? ""}`, NODE_OPTIONS: `--import=${probe}` },
  });
  return { status: r.status, stdout: r.stdout, start: /\[start=([^\]]*)\]/.exec(r.stderr)?.[1], exit: /\[exit=([^\]]*)\]/.exec(r.stderr)?.[1] };
};

describe("bin/ridgeline.js as an executable", () => {
  it("starts with the huge-page tunable and leaves no trace of it in its environment", () => {
    const env = { ...process.env };
    delete env.GLIBC_TUNABLES;
    const r = run(env);
    expect(r.status).toBe(0);
    expect(r.stdout).toMatch(/Usage: ridgeline <command>/);
    expect(r.start).toBe("glibc.malloc.hugetlb=1:");
    expect(r.exit).toBe("undefined");
  });

  it("keeps the caller's own glibc tunables, after its own, and gives them back as they were", () => {
    const r = run({ ...process.env, GLIBC_TUNABLES: "glibc.malloc.arena_max=2" });
    expect(r.status).toBe(0);
    expect(r.start).toBe("glibc.malloc.hugetlb=1:glibc.malloc.arena_max=2");
    expect(r.exit).toBe("glibc.malloc.arena_max=2");
  });
});
