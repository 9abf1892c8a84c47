#!/usr/bin/env node
// The `ridgeline` command. Node 20 cannot import .ts statically: register tsx, then load the CLI.
import "tsx/esm";

const { main } = await import("../src/cli/main.ts");
process.exitCode = await main(process.argv.slice(2));
