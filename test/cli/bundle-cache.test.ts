import { mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, statSync, utimesSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { dirname, join } from "node:path";
import { pathToFileURL } from "node:url";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { buildBundle, cachedBundle, freshManifest, PROJECT_ROOT, RECIPE, stamp, withSourceLocation, type BundleManifest } from "../../bin/bundle-cache.js";

// bin/bundle-cache.js: when the CLI bundle counts as fresh, how it is made again, and that the
// bundled code sees its original file's location (the project resolves package.json, src/ files
// and templates with `new URL(…, import.meta.url)`).

let tmp: string;
beforeAll(() => {
  tmp = mkdtempSync(join(tmpdir(), "ridgeline-bundle-"));
});
afterAll(() => rmSync(tmp, { recursive: true, force: true }));

const write = (path: string, text: string) => {
  mkdirSync(dirname(path), { recursive: true });
  writeFileSync(path, text);
};
const T0 = new Date("2026-01-02T03:04:05Z");
const T1 = new Date("2026-01-02T03:04:06Z");

describe("freshManifest: a bundle is fresh while every input keeps its size and mtime", () => {
  // Each case starts from a fresh fake project: two inputs and a bundled entry, with a manifest
  // written as buildBundle writes it, then changes one thing.
  const cases: { what: string; change: (root: string, cache: string) => void; fresh: boolean }[] = [
    { what: "nothing changed", change: () => {}, fresh: true },
    { what: "an input rewritten with the same size (new mtime)", change: (r) => (write(join(r, "src/a.ts"), "export const a = 2;\n"), utimesSync(join(r, "src/a.ts"), T1, T1)), fresh: false },
    { what: "an input with a new size (same mtime)", change: (r) => (write(join(r, "src/b.ts"), "export const b = 10;\n"), utimesSync(join(r, "src/b.ts"), T0, T0)), fresh: false },
    { what: "an input removed", change: (r) => rmSync(join(r, "src/b.ts")), fresh: false },
    { what: "the bundled entry removed", change: (_r, c) => rmSync(join(c, "cli/x/main.mjs")), fresh: false },
    { what: "a manifest from another recipe", change: (_r, c) => patchManifest(c, (m) => ({ ...m, recipe: RECIPE + 1 })), fresh: false },
    { what: "a manifest without inputs", change: (_r, c) => patchManifest(c, (m) => ({ ...m, inputs: {} })), fresh: false },
    { what: "a manifest that is not JSON", change: (_r, c) => writeFileSync(join(c, "cli.json"), "{"), fresh: false },
    { what: "no manifest", change: (_r, c) => rmSync(join(c, "cli.json")), fresh: false },
  ];
  function patchManifest(cache: string, f: (m: BundleManifest) => unknown) {
    writeFileSync(join(cache, "cli.json"), JSON.stringify(f(JSON.parse(readFileSync(join(cache, "cli.json"), "utf8")))));
  }
  for (const [i, c] of cases.entries()) {
    it(`${c.what} → ${c.fresh ? "fresh" : "stale"}`, () => {
      const root = join(tmp, `fresh-${i}`);
      const cache = join(root, "cache");
      write(join(root, "src/a.ts"), "export const a = 1;\n");
      write(join(root, "src/b.ts"), "export const b = 1;\n");
      for (const f of ["src/a.ts", "src/b.ts"]) utimesSync(join(root, f), T0, T0);
      write(join(cache, "cli/x/main.mjs"), "export {};\n");
      const manifest: BundleManifest = { recipe: RECIPE, entry: "cli/x/main.mjs", inputs: { "src/a.ts": stamp(join(root, "src/a.ts")), "src/b.ts": stamp(join(root, "src/b.ts")) } };
      writeFileSync(join(cache, "cli.json"), JSON.stringify(manifest));
      c.change(root, cache);
      const m = freshManifest("cli", { root, cacheDir: cache });
      if (c.fresh) expect(m).toEqual(manifest);
      else expect(m).toBeNull();
    });
  }
});

describe("withSourceLocation", () => {
  const file = join(tmpdir(), "project", "src", "dir", "mod.ts"); // any path: only the text changes
  const url = pathToFileURL(file).href;
  it.each([
    ["new URL(\"../x.json\", import.meta.url)", `new URL("../x.json", ${JSON.stringify(url)})`],
    ["[import.meta.dirname, import.meta.filename]", `[${JSON.stringify(dirname(file))}, ${JSON.stringify(file)}]`],
    ["a(import.meta.url); b(import.meta.url)", `a(${JSON.stringify(url)}); b(${JSON.stringify(url)})`],
    // other properties and longer names are not the module's location: left alone
    ["import.meta.resolve(\"./y.ts\")", "import.meta.resolve(\"./y.ts\")"],
    ["import.meta.urlish", "import.meta.urlish"],
  ])("%s", (source, expected) => {
    expect(withSourceLocation(source, file)).toBe(expected);
  });
});

describe("buildBundle / cachedBundle on a small project", () => {
  let root: string;
  let cache: string;
  const entryDir = () => readdirSync(join(cache, "cli")).filter((d) => !d.startsWith("."));
  beforeAll(() => {
    root = join(tmp, "project");
    cache = join(root, "node_modules", ".cache", "ridgeline");
    write(join(root, "src/cli/main.ts"), ["import { where } from \"../where.ts\";", "export async function main(): Promise<unknown> {", "  const lazy = await import(\"./lazy.ts\");", "  return { main: import.meta.url, where: where(), lazy: lazy.info() };", "}", ""].join("\n"));
    write(join(root, "src/where.ts"), "export const where = (): string => new URL(\"../data/version.txt\", import.meta.url).pathname;\n");
    write(join(root, "src/cli/lazy.ts"), "import { readFileSync } from \"node:fs\";\nexport const info = () => ({ url: import.meta.url, version: readFileSync(new URL(\"../../data/version.txt\", import.meta.url), \"utf8\").trim() });\n");
    write(join(root, "src/cli/uses-package.ts"), "import { parse } from \"yaml\";\nexport const y = (s: string): unknown => parse(s);\n");
    write(join(root, "src/cli/with-package.ts"), "export const load = () => import(\"./uses-package.ts\");\n");
    write(join(root, "data/version.txt"), "1.2.3\n");
  });

  it("bundles the sources: each module keeps its own file URL, and dynamic imports stay separate chunks", async () => {
    const entry = await buildBundle("cli", "src/cli/main.ts", { root, cacheDir: cache });
    const { main } = await import(pathToFileURL(entry).href);
    expect(await main()).toEqual({
      main: pathToFileURL(join(root, "src/cli/main.ts")).href,
      where: pathToFileURL(join(root, "data/version.txt")).pathname,
      lazy: { url: pathToFileURL(join(root, "src/cli/lazy.ts")).href, version: "1.2.3" },
    });
    const files = readdirSync(dirname(entry));
    expect(files.some((f) => f.startsWith("lazy-"))).toBe(true);
    expect(readFileSync(entry, "utf8")).not.toContain("info = ");
    const manifest = freshManifest("cli", { root, cacheDir: cache });
    expect(manifest).not.toBeNull();
    expect(Object.keys(manifest!.inputs)).toEqual(expect.arrayContaining(["src/cli/main.ts", "src/where.ts", "src/cli/lazy.ts"]));
    // The recipe itself and the settings esbuild reads are inputs too.
    const recipe = Object.keys(manifest!.inputs).filter((k) => /(^|\/)(bin\/bundle-cache\.js|tsconfig\.json|package\.json)$/.test(k));
    expect(recipe).toHaveLength(3);
  });

  it("leaves npm packages as imports (packages: external)", async () => {
    const entry = await buildBundle("pkg", "src/cli/with-package.ts", { root, cacheDir: cache });
    const chunks = readdirSync(dirname(entry)).map((f) => readFileSync(join(dirname(entry), f), "utf8"));
    expect(chunks.some((c) => /from\s*"yaml"/.test(c))).toBe(true);
    expect(chunks.join("\n")).not.toMatch(/function\s+parseDocument|class\s+Composer/); // yaml's own code is not copied in
  });

  it("reuses a fresh bundle, and makes it again when a source changes", async () => {
    const first = await cachedBundle("cli", "src/cli/main.ts", { root, cacheDir: cache });
    const manifestTime = statSync(join(cache, "cli.json")).mtimeMs;
    expect(await cachedBundle("cli", "src/cli/main.ts", { root, cacheDir: cache })).toBe(first);
    expect(statSync(join(cache, "cli.json")).mtimeMs).toBe(manifestTime); // not rebuilt

    write(join(root, "data/version.txt"), "1.2.4\n"); // read at run time, not bundled: same bundle
    expect(await cachedBundle("cli", "src/cli/main.ts", { root, cacheDir: cache })).toBe(first);

    write(join(root, "src/cli/lazy.ts"), readFileSync(join(root, "src/cli/lazy.ts"), "utf8").replace("version:", "changed: true, version:"));
    expect(freshManifest("cli", { root, cacheDir: cache })).toBeNull();
    const second = await cachedBundle("cli", "src/cli/main.ts", { root, cacheDir: cache });
    expect(second).not.toBeNull();
    expect(second).not.toBe(first);
    const { main } = await import(second!);
    expect((await main()).lazy).toEqual({ url: pathToFileURL(join(root, "src/cli/lazy.ts")).href, changed: true, version: "1.2.4" });
  });

  it("keeps the three newest bundles of a name", async () => {
    for (const n of [1, 2, 3, 4]) {
      write(join(root, "src/where.ts"), `export const where = (): string => new URL("../data/version.txt", import.meta.url).pathname + "${"#".repeat(n)}";\n`);
      await cachedBundle("cli", "src/cli/main.ts", { root, cacheDir: cache });
    }
    const kept = entryDir();
    expect(kept).toHaveLength(3);
    expect(kept).toContain(freshManifest("cli", { root, cacheDir: cache })!.entry.split("/")[1]);
  });

  it("gives null (so the caller uses tsx) when the sources do not compile", async () => {
    write(join(root, "src/broken.ts"), "export const = ;\n");
    expect(await cachedBundle("broken", "src/broken.ts", { root, cacheDir: cache })).toBeNull();
  });
});

describe("the real CLI bundles", () => {
  let dir: string;
  let manifest: BundleManifest;
  const chunk = (name: string) => readFileSync(join(dir, name), "utf8");
  const staticImports = (name: string) => [...chunk(name).matchAll(/^(?:import|export)\s[^;]*?from\s*"([^"]+)"|^import\s*"([^"]+)"/gms)].map((m) => m[1] ?? m[2]);
  /** Every module a chunk loads before it runs (its static imports, followed through the chunks). */
  const staticGraph = (name: string, seen = new Set<string>()): Set<string> => {
    for (const s of staticImports(name)) {
      if (seen.has(s)) continue;
      seen.add(s);
      if (s.startsWith("./")) staticGraph(s.slice(2), seen);
    }
    return seen;
  };
  beforeAll(async () => {
    const cache = join(tmp, "real");
    const entry = await buildBundle("cli", "src/cli/main.ts", { cacheDir: cache });
    dir = dirname(entry);
    manifest = JSON.parse(readFileSync(join(cache, "cli.json"), "utf8"));
  }, 60_000);

  it("from src/cli/main.ts, with the modules that find files by their own URL among its inputs", () => {
    expect(Object.keys(manifest.inputs)).toEqual(expect.arrayContaining(["src/cli/main.ts", "src/analysis/provenance.ts", "src/cache/code-fingerprint.ts", "src/coverage/worker-code.ts", "bin/bundle-cache.js", "tsconfig.json", "package.json"]));
    expect(Object.keys(manifest.inputs).every((k) => !k.includes("node_modules"))).toBe(true);
  });

  it("with no import.meta left in the bundled code", () => {
    const withMeta = readdirSync(dir).filter((f) => chunk(f).includes("import.meta"));
    expect(withMeta).toEqual([]);
  });

  it("keeps the commands lazy: starting loads no npm package, and only build, serve and pdf reach Eleventy", () => {
    expect([...staticGraph("main.mjs")].filter((s) => !s.startsWith("./") && !s.startsWith("node:"))).toEqual([]);
    // main.ts imports each command when it is asked for: those are the bundle's dynamic imports
    const commands = [...chunk("main.mjs").matchAll(/import\("\.\/([^"]+)"\)/g)].map((m) => m[1]);
    expect(commands.map((c) => c.split("-")[0]).sort()).toEqual(["build", "check", "coverage", "diff", "import", "new", "path", "pdf", "serve", "worker"]);
    const reaching = commands.filter((c) => staticGraph(c).has("@11ty/eleventy")).map((c) => c.split("-")[0]).sort();
    expect(reaching).toEqual(["build", "pdf", "serve"]);
  });
});

describe("import.meta in the sources", () => {
  it("is only ever .url, .dirname or .filename, which the bundle replaces by the file's own values", () => {
    const files = readdirSync(join(PROJECT_ROOT, "src"), { recursive: true, encoding: "utf8" }).filter((f) => f.endsWith(".ts"));
    const other = files.flatMap((f) => [...readFileSync(join(PROJECT_ROOT, "src", f), "utf8").matchAll(/\bimport\.meta\b(?!\.(url|dirname|filename)\b)/g)].map(() => f));
    expect(files.length).toBeGreaterThan(50);
    expect(other).toEqual([]);
  });
});
