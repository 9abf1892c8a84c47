#!/usr/bin/env node
// The `ridgeline` command. Node 20 cannot import .ts: run the CLI from a cached esbuild bundle of
// src/cli/main.ts (bin/bundle-cache.js; made again when a source changes), which starts in a
// fraction of the time tsx needs to register and transform every module. With
// RIDGELINE_NO_BUNDLE=1, or when no bundle can be had, register tsx and load the sources.
// Same code, same output either way (DEVELOPERS.md § How the CLI is loaded).
//
// A large `ridgeline coverage` on Linux runs itself again in a new node with glibc's
// `glibc.malloc.hugetlb=1` tunable, which has glibc (2.35 and later; others and musl ignore it)
// back large allocations with transparent huge pages when the kernel leaves them to madvise.
// A 100 km grid at 30 m touches well over 100 MB of elevations and results, and fresh memory
// touched 4 kB page by page costs about 3 ms per MB on some virtual machines, a tenth to two
// thirds of that in 2 MB pages (measured on ours; DEVELOPERS.md, src/coverage/).
// glibc reads tunables only when a process starts, hence the second process, which costs
// about 0.12–0.15 s: worth it from a radius of some 2 000 cells (16 M cells in the square), not
// below. (Setting the variable on the first line, `#!/usr/bin/env -S …`, would cost nothing,
// but npm's Windows launchers and busybox's env cannot read that line.)
import { spawn } from "node:child_process";
import { once } from "node:events";
import { readFileSync } from "node:fs";

if (process.argv[2] === "coverage" && largeGrid(process.argv.slice(3)) && hugePagesOnRequest()) {
  const tunables = ["glibc.malloc.hugetlb=1", process.env.GLIBC_TUNABLES].filter(Boolean).join(":");
  const child = spawn(process.execPath, [...process.execArgv, ...process.argv.slice(1)], { stdio: "inherit", env: { ...process.env, GLIBC_TUNABLES: tunables } });
  // a signal meant for this process (a supervisor's SIGTERM) reaches the one doing the work
  const forward = (signal) => child.kill(signal);
  for (const signal of ["SIGINT", "SIGTERM", "SIGHUP"]) process.on(signal, forward);
  const [code, signal] = await once(child, "exit");
  if (signal) {
    process.removeAllListeners(signal);
    process.kill(process.pid, signal); // end as it ended
  }
  process.exit(code ?? 1);
}

/** Whether the coverage options ask for a radius of 2 000 cells or more (the command itself checks them). */
function largeGrid(args) {
  const value = (name) => {
    const i = args.findIndex((a) => a === `--${name}` || a.startsWith(`--${name}=`));
    return i < 0 ? NaN : Number(args[i].includes("=") ? args[i].slice(args[i].indexOf("=") + 1) : args[i + 1]);
  };
  return (value("radius-km") * 1000) / value("resolution-m") >= 2000;
}

/** Linux whose transparent huge pages are left to madvise, and no huge-page tunable set yet (so the second process does not start a third). */
function hugePagesOnRequest() {
  if (process.platform !== "linux" || /glibc\.malloc\.hugetlb/.test(process.env.GLIBC_TUNABLES ?? "")) return false;
  try {
    return readFileSync("/sys/kernel/mm/transparent_hugepage/enabled", "utf8").includes("[madvise]");
  } catch {
    return false;
  }
}

let main;
const noBundle = process.env.RIDGELINE_NO_BUNDLE;
if (!noBundle || noBundle === "0") {
  const { cachedBundle } = await import("./bundle-cache.js"); // after the check above: a process that only starts another loads nothing more
  const url = await cachedBundle("cli", "src/cli/main.ts");
  if (url) main = await import(url).then((m) => m.main, () => undefined);
}
if (!main) {
  await import("tsx/esm");
  ({ main } = await import("../src/cli/main.ts"));
}
process.exitCode = await main(process.argv.slice(2));
