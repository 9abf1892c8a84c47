#!/usr/bin/env node
// The `ridgeline` command. Node 20 cannot import .ts: run the CLI from a cached esbuild bundle of
// src/cli/main.ts (bin/bundle-cache.js; made again when a source changes), which starts in a
// fraction of the time tsx needs to register and transform every module. With
// RIDGELINE_NO_BUNDLE=1, or when no bundle can be had, register tsx and load the sources.
// Same code, same output either way (DEVELOPERS.md § How the CLI is loaded).
//
// Every command runs in this one node. (A large `ridgeline coverage` used to run itself again
// with glibc's huge-page tunable; since the visibility sweep touches less memory, that second
// process no longer paid: DEVELOPERS.md, src/coverage/.)

let main;
const noBundle = process.env.RIDGELINE_NO_BUNDLE;
if (!noBundle || noBundle === "0") {
  const { cachedBundle } = await import("./bundle-cache.js");
  const url = await cachedBundle("cli", "src/cli/main.ts");
  if (url) main = await import(url).then((m) => m.main, () => undefined);
}
if (!main) {
  await import("tsx/esm");
  ({ main } = await import("../src/cli/main.ts"));
}
process.exitCode = await main(process.argv.slice(2));
