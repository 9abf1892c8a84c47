import { createHash } from "node:crypto";
import { readFileSync } from "node:fs";
import { dirname, relative, resolve } from "node:path";
import { fileURLToPath } from "node:url";

/** Modules whose code decides a link's numbers; the fingerprint follows their imports. */
const ENTRY_POINTS = ["analysis/analyze-study.ts", "analysis/analyze-link.ts", "study/load-study.ts", "terrain/open-terrain.ts"];

// Relative specifiers of static imports and re-exports (`import … from "./x.ts"`,
// `export … from "./x.ts"`, `import "./x.ts"`) and of dynamic imports with a literal.
const IMPORT = /(?:\bfrom\s*|\bimport\s*\(?\s*)["'](\.{1,2}\/[^"']+)["']/g;

let memo: string | null = null;

/** Every project module reachable from the entry points by relative imports, with its bytes. */
function reachableSources(): Map<string, Buffer> {
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
  for (const e of ENTRY_POINTS) visit(resolve(SRC, e));
  return seen;
}

const SRC = fileURLToPath(new URL("../", import.meta.url));
const rel = (f: string) => relative(SRC, f).split("\\").join("/");

/**
 * sha256 over the source of every module that computes link results: the entry points above
 * and, transitively, every project module they import (path relative to src/ and bytes,
 * sorted by path). Part of every cache key beside the tool version, so that a changed formula
 * never reuses old results even when package.json's version was not bumped, while changes to
 * rendering or to unrelated analyses leave the cache valid. Read once per process.
 */
export function codeFingerprint(): string {
  if (memo !== null) return memo;
  const sources = reachableSources();
  const h = createHash("sha256");
  for (const f of [...sources.keys()].sort()) h.update(`${rel(f)}\0`).update(sources.get(f)!).update("\0");
  memo = h.digest("hex");
  return memo;
}

/** The files the code fingerprint covers, relative to src/ (for tests and diagnostics). */
export function codeFingerprintFiles(): string[] {
  return [...reachableSources().keys()].map(rel).sort();
}
