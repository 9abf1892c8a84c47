// Preload for tests: `node --import ./record-modules.mjs …` appends the URL of every module the
// process resolves (one per line) to the file named by RIDGELINE_RECORD_MODULES, so that a test
// can tell which code a run actually loaded (the CLI bundle, or the TypeScript sources).
import { register } from "node:module";

const hooks = `
import { appendFileSync } from "node:fs";
export async function resolve(specifier, context, next) {
  const r = await next(specifier, context);
  appendFileSync(${JSON.stringify(process.env.RIDGELINE_RECORD_MODULES ?? "")}, r.url + "\\n");
  return r;
}`;
if (process.env.RIDGELINE_RECORD_MODULES) register(`data:text/javascript,${encodeURIComponent(hooks)}`);
