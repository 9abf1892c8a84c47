import { mkdirSync, readFileSync, renameSync, statSync, writeFileSync } from "node:fs";
import { createRequire } from "node:module";
import { dirname, join, resolve } from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";

/**
 * The code a coverage worker thread runs, as a script for `new Worker(code, { eval: true })`.
 *
 * Preferred: coverage-worker.ts and its imports bundled into one CommonJS script by esbuild
 * (installed with tsx, which uses it for the same transform), cached in
 * node_modules/.cache/ridgeline/ and rebuilt when a bundled source changes (size or mtime).
 * A thread then starts in about 0.1 s instead of about 1 s for registering tsx and
 * transforming each module in every thread. The bundle is the same TypeScript compiled the
 * same way, so the numbers are the same.
 * Fallback (esbuild missing or failing): each thread registers tsx and imports the entry.
 */
export function coverageWorkerCode(): string {
  return workerThreadCode(new URL("./coverage-worker.ts", import.meta.url), "coverage-worker");
}

/**
 * The code of a worker thread whose entry is the TypeScript module `entry`, made as above (a
 * bundle cached as `<name>.cjs` beside `<name>.json`, or tsx as the fallback). Every worker
 * thread of the project loads its code through this (the coverage pool, the wave pool).
 */
export function workerThreadCode(entry: URL, name: string): string {
  const file = fileURLToPath(entry);
  try {
    return bundled(file, name);
  } catch {
    return viaTsx(file);
  }
}

interface Manifest {
  inputs: Record<string, string>;
}

function bundled(entry: string, name: string): string {
  const req = createRequire(import.meta.url);
  const root = resolve(dirname(entry), "../.."); // entries live in src/<folder>/
  const cacheDir = join(root, "node_modules", ".cache", "ridgeline");
  const codePath = join(cacheDir, `${name}.cjs`);
  const manifestPath = join(cacheDir, `${name}.json`);
  const stamp = (p: string) => {
    const s = statSync(p);
    return `${s.size}:${s.mtimeMs}`;
  };
  try {
    const m = JSON.parse(readFileSync(manifestPath, "utf8")) as Manifest;
    const inputs = Object.entries(m.inputs);
    if (inputs.length > 0 && inputs.every(([p, s]) => stamp(resolve(root, p)) === s)) return readFileSync(codePath, "utf8");
  } catch {
    // no cache or a stale one: build
  }
  const esbuild = req("esbuild") as typeof import("esbuild");
  const r = esbuild.buildSync({
    entryPoints: [entry],
    absWorkingDir: root,
    bundle: true,
    platform: "node",
    format: "cjs",
    target: "node20",
    write: false,
    metafile: true,
    logLevel: "silent",
  });
  const code = r.outputFiles[0].text;
  const manifest: Manifest = { inputs: {} };
  for (const p of Object.keys(r.metafile.inputs)) manifest.inputs[p] = stamp(resolve(root, p));
  try {
    mkdirSync(cacheDir, { recursive: true });
    // write then rename, so that concurrent processes never read half a file
    const tmp = `${process.pid}.${Date.now()}.tmp`;
    writeFileSync(join(cacheDir, `code.${tmp}`), code);
    renameSync(join(cacheDir, `code.${tmp}`), codePath);
    writeFileSync(join(cacheDir, `manifest.${tmp}`), JSON.stringify(manifest));
    renameSync(join(cacheDir, `manifest.${tmp}`), manifestPath);
  } catch {
    // read-only checkout: build again next time
  }
  return code;
}

function viaTsx(entry: string): string {
  const req = createRequire(import.meta.url);
  // Each thread registers tsx itself (module hooks are not inherited by worker threads in Node 20).
  const tsxApi = pathToFileURL(join(dirname(req.resolve("tsx/package.json")), "dist/esm/api/index.mjs")).href;
  const url = pathToFileURL(entry).href;
  return `import(${JSON.stringify(tsxApi)}).then(async (m) => { await m.register(); await import(${JSON.stringify(url)}); });`;
}
