import { createHash } from "node:crypto";
import { readFileSync } from "node:fs";
import { dirname, relative, resolve } from "node:path";
import { fileURLToPath } from "node:url";

/** Modules whose code decides a link's numbers; the fingerprint follows their imports. */
const ENTRY_POINTS = ["analysis/analyze-study.ts", "analysis/analyze-link.ts", "study/load-study.ts", "terrain/open-terrain.ts"];

// Relative specifiers of static imports and re-exports (`import … from "./x.ts"`,
// `export … from "./x.ts"`, `import "./x.ts"`) and of dynamic imports with a literal.
const IMPORT = /(?:\bfrom\s*|\bimport\s*\(?\s*)["'](\.{1,2}\/[^"']+)["']/g;

const SRC = fileURLToPath(new URL("../", import.meta.url));
const rel = (f: string) => relative(SRC, f).split("\\").join("/");
const toPath = (m: string) => (m.startsWith("file:") ? fileURLToPath(m) : resolve(SRC, m));

/** Every project module reachable from `entries` (absolute paths) by relative imports, with its bytes. */
function reachableSources(entries: string[]): Map<string, Buffer> {
  const seen = new Map<string, Buffer>();
  const visit = (file: string) => {
    if (seen.has(file)) return;
    let bytes: Buffer;
    try {
      bytes = readFileSync(file);
    } catch {
      return; // a specifier that is not a file here: nothing to hash
    }
    seen.set(file, bytes);
    for (const m of bytes.toString("utf8").matchAll(IMPORT)) visit(resolve(dirname(file), m[1]));
  };
  for (const e of entries) visit(e);
  return seen;
}

const memo = new Map<string, string>();

/**
 * sha256 over the source of the given modules and, transitively, every project module they
 * import (path relative to src/ and bytes, sorted by path). Modules are file: URLs (a
 * module's own `import.meta.url`) or paths relative to src/. Read once per process.
 */
export function modulesFingerprint(modules: string[]): string {
  const entries = [...new Set(modules.map(toPath))].sort();
  const id = entries.join("\0");
  const known = memo.get(id);
  if (known) return known;
  const sources = reachableSources(entries);
  const h = createHash("sha256");
  for (const f of [...sources.keys()].sort()) h.update(`${rel(f)}\0`).update(sources.get(f)!).update("\0");
  const digest = h.digest("hex");
  memo.set(id, digest);
  return digest;
}

/**
 * The fingerprint of the code that computes link results (analysis, geodesy, physics, study
 * loading, terrain — everything the analysis entry points import). Part of every cache key
 * beside the tool version, so that a changed formula never reuses old results even when
 * package.json's version was not bumped, while changes to rendering or to unrelated analyses
 * leave the cache valid.
 */
export function codeFingerprint(): string {
  return modulesFingerprint(ENTRY_POINTS);
}

/** The files the code fingerprint covers, relative to src/ (for tests and diagnostics). */
export function codeFingerprintFiles(): string[] {
  return [...reachableSources(ENTRY_POINTS.map(toPath)).keys()].map(rel).sort();
}
