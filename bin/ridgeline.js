#!/usr/bin/env -S GLIBC_TUNABLES=glibc.malloc.hugetlb=1:${GLIBC_TUNABLES} node
// The `ridgeline` command. Node 20 cannot import .ts: run the CLI from a cached esbuild bundle of
// src/cli/main.ts (bin/bundle-cache.js; made again when a source changes), which starts in a
// fraction of the time tsx needs to register and transform every module. With
// RIDGELINE_NO_BUNDLE=1, or when no bundle can be had, register tsx and load the sources.
// Same code, same output either way (DEVELOPERS.md § How the CLI is loaded).
//
// The first line asks glibc (2.35 and later; others ignore it) to back large allocations with
// transparent huge pages (madvise): a coverage grid holds tens of MB of elevations and
// results, and touching fresh memory 4 kB page by page costs about 3 ms per MB on some
// virtual machines, a third to two thirds of that in 2 MB pages (measured on ours; see
// DEVELOPERS.md, src/analysis/coverage/). glibc reads it when the process starts; it is taken
// out of the environment here so that programs this one runs (git, chromium) start as they
// would have.
import { cachedBundle } from "./bundle-cache.js";

const OURS = "glibc.malloc.hugetlb=1:";
if (process.env.GLIBC_TUNABLES?.startsWith(OURS)) {
  const rest = process.env.GLIBC_TUNABLES.slice(OURS.length);
  if (rest) process.env.GLIBC_TUNABLES = rest;
  else delete process.env.GLIBC_TUNABLES;
}

let main;
const noBundle = process.env.RIDGELINE_NO_BUNDLE;
if (!noBundle || noBundle === "0") {
  const url = await cachedBundle("cli", "src/cli/main.ts");
  if (url) main = await import(url).then((m) => m.main, () => undefined);
}
if (!main) {
  await import("tsx/esm");
  ({ main } = await import("../src/cli/main.ts"));
}
process.exitCode = await main(process.argv.slice(2));
