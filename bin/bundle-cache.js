// The CLI as an esbuild bundle, cached between runs. Plain JavaScript: bin/ridgeline.js loads it
// before anything can compile TypeScript.
import { accessSync, closeSync, constants, fstatSync, mkdirSync, openSync, readdirSync, readFileSync, renameSync, rmSync, statSync, utimesSync, writeFileSync } from "node:fs";
import { createRequire } from "node:module";
import { dirname, join, relative, resolve, sep } from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";

/** Bump when the way bundles are made changes, so that bundles made the old way are rebuilt. */
export const RECIPE = 1;

/** The project folder (the one holding bin/ and src/). */
export const PROJECT_ROOT = fileURLToPath(new URL("../", import.meta.url));

/** Where bundles are kept: beside other tools' caches, ignored by git with node_modules/. */
export const CACHE_DIR = join(PROJECT_ROOT, "node_modules", ".cache", "ridgeline");

/** Files that shape every bundle beside the sources esbuild reports: this recipe, and the settings esbuild reads. */
const RECIPE_FILES = ["bin/bundle-cache.js", "tsconfig.json", "package.json"];

/** Bundles kept per name: the current one and two before it, for processes still loading chunks of those. */
const KEEP = 3;

/** "size:mtime" of a file (throws when it is missing). */
export function stamp(path) {
  const s = statSync(path);
  return `${s.size}:${s.mtimeMs}`;
}

/**
 * The manifest of bundle `name` when the bundle is fresh: made by this recipe and every input
 * (path relative to `root`) still has the size and mtime it had when it was bundled; else null.
 * Costs one small read and one stat per input.
 */
export function freshManifest(name, { root = PROJECT_ROOT, cacheDir = CACHE_DIR } = {}) {
  let m;
  try {
    m = JSON.parse(readFileSync(join(cacheDir, `${name}.json`), "utf8"));
  } catch {
    return null;
  }
  if (m?.recipe !== RECIPE || typeof m.entry !== "string" || !m.inputs || typeof m.inputs !== "object") return null;
  const inputs = Object.entries(m.inputs);
  if (inputs.length === 0) return null;
  try {
    for (const [p, s] of inputs) if (stamp(resolve(root, p)) !== s) return null;
    statSync(join(cacheDir, m.entry));
  } catch {
    return null; // an input was removed, or the bundle was
  }
  return m;
}

/**
 * Source text with `import.meta.url`, `import.meta.dirname` and `import.meta.filename` replaced
 * by the values they have in the original file, so that `new URL("../x", import.meta.url)`
 * finds the same file from inside a bundle. Other `import.meta` properties are left alone.
 */
export function withSourceLocation(text, path) {
  const values = { url: pathToFileURL(path).href, dirname: dirname(path), filename: path };
  return text.replace(/\bimport\.meta\.(url|dirname|filename)\b/g, (_, k) => JSON.stringify(values[k]));
}

/** esbuild, from this project or from beside tsx (which depends on it); throws when neither has it. */
export function loadEsbuild() {
  const req = createRequire(import.meta.url);
  try {
    return req("esbuild");
  } catch {
    return createRequire(req.resolve("tsx/package.json"))("esbuild");
  }
}

/**
 * Bundle `entry` (a path relative to `root`) and its project imports into ESM chunks; npm
 * packages stay imports. Dynamic `import()`s become chunks of their own (splitting), so a
 * package that only one command needs is loaded only by that command. Written to
 * `<cacheDir>/<name>/<hash>/` through a temporary folder and a rename, then the manifest through
 * a temporary file and a rename, so a concurrent process never reads half a bundle.
 * Returns the absolute path of the bundled entry.
 */
export async function buildBundle(name, entry, { root = PROJECT_ROOT, cacheDir = CACHE_DIR, esbuild = loadEsbuild(), sourcemap = false } = {}) {
  const inputs = {};
  const key = (p) => relative(root, p).split(sep).join("/");
  const sourceLocation = {
    name: "ridgeline-source-location",
    setup(b) {
      b.onLoad({ filter: /\.[cm]?[jt]s$/ }, (args) => {
        if (args.path.split(sep).includes("node_modules")) return undefined;
        // Stamp before reading: a file changed after this read has a newer stamp, so the next run rebuilds.
        const fd = openSync(args.path, "r");
        try {
          const s = fstatSync(fd);
          inputs[key(args.path)] = `${s.size}:${s.mtimeMs}`;
          const loader = /\.[cm]?ts$/.test(args.path) ? "ts" : "js";
          return { contents: withSourceLocation(readFileSync(fd, "utf8"), args.path), loader };
        } finally {
          closeSync(fd);
        }
      });
    },
  };
  const dir = join(cacheDir, name);
  mkdirSync(dir, { recursive: true });
  accessSync(dir, constants.W_OK); // a read-only install: fail before spending time on a build it cannot keep
  const tmp = join(dir, `.tmp-${process.pid}-${Date.now()}`);
  const r = await esbuild.build({
    entryPoints: { main: resolve(root, entry) },
    absWorkingDir: root,
    bundle: true,
    splitting: true,
    platform: "node",
    format: "esm",
    target: "node20",
    packages: "external",
    outdir: tmp,
    outExtension: { ".js": ".mjs" },
    chunkNames: "[name]-[hash]",
    sourcemap: sourcemap ? "inline" : false,
    write: false,
    metafile: true,
    logLevel: "silent",
    plugins: [sourceLocation],
  });
  for (const p of [...Object.keys(r.metafile.inputs).map((p) => resolve(root, p)), ...RECIPE_FILES.map((p) => join(PROJECT_ROOT, p))]) {
    const k = key(p);
    if (!(k in inputs)) inputs[k] = stamp(p);
  }
  const { createHash } = await import("node:crypto"); // only when building: start-up stays lean
  const h = createHash("sha256");
  const files = r.outputFiles.map((f) => ({ name: relative(tmp, f.path).split(sep).join("/"), contents: f.contents }));
  files.sort((a, b) => (a.name < b.name ? -1 : a.name > b.name ? 1 : 0));
  for (const f of files) h.update(`${f.name}\0`).update(f.contents).update("\0");
  const id = h.digest("hex").slice(0, 16);
  const final = join(dir, id);
  try {
    const now = new Date();
    utimesSync(final, now, now); // the same bundle is there already: mark it the newest
  } catch {
    for (const f of files) {
      mkdirSync(dirname(join(tmp, f.name)), { recursive: true });
      writeFileSync(join(tmp, f.name), f.contents);
    }
    try {
      renameSync(tmp, final);
    } catch (e) {
      rmSync(tmp, { recursive: true, force: true });
      if (e?.code !== "ENOTEMPTY" && e?.code !== "EEXIST") throw e; // else: another process renamed the same bundle first
    }
  }
  const manifest = { recipe: RECIPE, entry: `${name}/${id}/main.mjs`, inputs };
  const mtmp = join(cacheDir, `.${name}.json.${process.pid}-${Date.now()}.tmp`);
  writeFileSync(mtmp, JSON.stringify(manifest));
  renameSync(mtmp, join(cacheDir, `${name}.json`));
  pruneBundles(dir, id);
  return join(cacheDir, manifest.entry);
}

/** Remove all but the KEEP newest bundles of one name (never `current`), and stale temporary folders. */
function pruneBundles(dir, current) {
  try {
    const hour = 3600_000;
    const entries = readdirSync(dir, { withFileTypes: true }).filter((e) => e.isDirectory());
    const aged = entries.map((e) => ({ name: e.name, mtime: statSync(join(dir, e.name)).mtimeMs }));
    for (const e of aged) if (e.name.startsWith(".tmp-") && Date.now() - e.mtime > hour) rmSync(join(dir, e.name), { recursive: true, force: true });
    const bundles = aged.filter((e) => !e.name.startsWith(".") && e.name !== current).sort((a, b) => b.mtime - a.mtime);
    for (const e of bundles.slice(KEEP - 1)) rmSync(join(dir, e.name), { recursive: true, force: true });
  } catch {
    // pruning is housekeeping: never fail a run for it
  }
}

/**
 * The file URL of a fresh bundle of `entry` under `name`, building it when it is missing or
 * stale; null when it cannot be had (esbuild missing, a build error, a read-only checkout), so
 * that the caller loads the sources through tsx instead.
 */
export async function cachedBundle(name, entry, options = {}) {
  const m = freshManifest(name, options);
  if (m) return pathToFileURL(join(options.cacheDir ?? CACHE_DIR, m.entry)).href;
  try {
    return pathToFileURL(await buildBundle(name, entry, options)).href;
  } catch {
    return null;
  }
}
