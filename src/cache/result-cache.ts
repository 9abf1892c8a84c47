import { mkdirSync, readFileSync, renameSync, rmSync, writeFileSync } from "node:fs";
import { readFile } from "node:fs/promises";
import { join, resolve } from "node:path";
import { decodeEntry, encodeEntry } from "./entry-codec.ts";

/** Default cache folder, relative to the project root (the working directory). */
export const DEFAULT_CACHE_DIR = ".ridgeline-cache";

let tmpCounter = 0;

/**
 * A content-addressed store of computed results on disk: `<dir>/<kind>/<k0k1>/<key>.bin`,
 * where key is a sha256 (hex) of everything the value depends on (see cache-keys.ts), so an
 * entry is never stale — a changed input gives a different key. Entries are written to a
 * temporary file and renamed into place, so concurrent builds never read half an entry; an
 * unreadable or corrupt entry counts as a miss. Failing to write (read-only disk, full disk)
 * never fails a build: the value is simply not cached and `writeErrors` counts it.
 */
export class ResultCache {
  readonly dir: string;
  writeErrors = 0;

  constructor(dir: string = DEFAULT_CACHE_DIR) {
    this.dir = resolve(dir);
  }

  private file(kind: string, key: string): string {
    if (!/^[a-z-]+$/.test(kind) || !/^[0-9a-f]{16,}$/.test(key)) throw new TypeError(`bad cache kind/key: ${kind}/${key}`);
    return join(this.dir, kind, key.slice(0, 2), `${key}.bin`);
  }

  /** The stored value, or undefined when absent or unreadable. */
  get<T>(kind: string, key: string): T | undefined {
    let buf: Buffer;
    try {
      buf = readFileSync(this.file(kind, key));
    } catch {
      return undefined;
    }
    const v = decodeEntry(buf);
    return v === null ? undefined : (v as T);
  }

  /**
   * The stored value, read without blocking: start many reads at once (they proceed on the
   * I/O threads) and decode each as it is awaited.
   */
  async getAsync<T>(kind: string, key: string): Promise<T | undefined> {
    let buf: Buffer;
    try {
      buf = await readFile(this.file(kind, key));
    } catch {
      return undefined;
    }
    const v = decodeEntry(buf);
    return v === null ? undefined : (v as T);
  }

  /** Store a value (atomically replacing any entry under that key). */
  put(kind: string, key: string, value: unknown): void {
    const file = this.file(kind, key);
    const tmp = `${file}.tmp-${process.pid}-${tmpCounter++}`;
    try {
      mkdirSync(join(this.dir, kind, key.slice(0, 2)), { recursive: true });
      writeFileSync(tmp, encodeEntry(value));
      renameSync(tmp, file);
    } catch {
      this.writeErrors++;
      rmSync(tmp, { force: true });
    }
  }
}
