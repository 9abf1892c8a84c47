// Types of bin/bundle-cache.js for the TypeScript that imports it (the tests).

/** Where a bundle lives and what it was made from. */
export interface BundleManifest {
  recipe: number;
  /** The bundled entry, relative to the cache folder. */
  entry: string;
  /** Every input, relative to the project root, with its "size:mtime" when it was bundled. */
  inputs: Record<string, string>;
}

export interface BundleOptions {
  /** Folder that entry and the manifest's inputs are relative to (default: the project). */
  root?: string;
  /** Where bundles and manifests are kept (default: node_modules/.cache/ridgeline). */
  cacheDir?: string;
}

export const RECIPE: number;
export const PROJECT_ROOT: string;
export const CACHE_DIR: string;
export function stamp(path: string): string;
export function freshManifest(name: string, options?: BundleOptions): BundleManifest | null;
export function withSourceLocation(text: string, path: string): string;
export function loadEsbuild(): typeof import("esbuild");
export function buildBundle(name: string, entry: string, options?: BundleOptions & { esbuild?: typeof import("esbuild"); sourcemap?: boolean }): Promise<string>;
export function cachedBundle(name: string, entry: string, options?: BundleOptions): Promise<string | null>;
