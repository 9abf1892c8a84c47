import { closeSync, existsSync, fstatSync, mkdirSync, openSync, readFileSync, readSync, renameSync, rmSync, writeFileSync, writeSync } from "node:fs";
import { readFile } from "node:fs/promises";
import { join, resolve } from "node:path";
import { decodeEntry, encodeEntry, encodeEntryParts, FileBytes, type EntryPart } from "./entry-codec.ts";
import { decodePack, encodePack, PACK_HEADER_BYTES, packIndexEnd, packKeys } from "./entry-pack.ts";
import { forEachFilePiece } from "./file-pieces.ts";

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
 *
 * Beside the entries, a pack (entry-pack.ts) `<dir>/pack/<k0k1>/<name>.bin` gathers the
 * entries one study needs into one file, read in one go on the next build. A pack is only a
 * faster way to the same entries: it is looked up by the same content keys, so a pack left by
 * an older study version merely lacks (or has extra) keys, and the entries stay on their own too.
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
    const buf = this.getBytes(kind, key);
    if (buf === undefined) return undefined;
    const v = decodeEntry(buf);
    return v === null ? undefined : (v as T);
  }

  /** An entry's bytes (for decodeEntry, or to pack), read without blocking; undefined when absent. */
  async getBytesAsync(kind: string, key: string): Promise<Buffer | undefined> {
    try {
      return await readFile(this.file(kind, key));
    } catch {
      return undefined;
    }
  }

  /**
   * Store a value (atomically replacing any entry under that key). Returns the entry's bytes
   * (for a pack), or null when the value could not be encoded.
   */
  put(kind: string, key: string, value: unknown): Buffer | null {
    let bytes: Buffer;
    try {
      bytes = encodeEntry(value);
    } catch {
      this.writeErrors++;
      return null;
    }
    this.writeFile(kind, key, bytes);
    return bytes;
  }

  /**
   * Store a large value as put does, written piece by piece (encodeEntryParts): its typed
   * arrays are not copied into one buffer first, and its FileBytes are copied from their files
   * a few MB at a time. A file shorter than it was said to be leaves the entry unwritten.
   */
  putLarge(kind: string, key: string, value: unknown): void {
    let parts: EntryPart[];
    try {
      parts = encodeEntryParts(value);
    } catch {
      this.writeErrors++;
      return;
    }
    this.writeFile(kind, key, parts);
  }

  /**
   * The entries of the pack `name` (key → entry bytes); empty when absent or unreadable.
   * Read in one call: a pack is a few megabytes, which readFile would fetch in 512 kB pieces,
   * each a round trip through the I/O threads.
   */
  readPack(name: string): Map<string, Buffer> {
    try {
      return decodePack(readFileSync(this.file("pack", name)));
    } catch {
      return new Map();
    }
  }

  /**
   * The keys the pack `name` holds, read from its index alone (not its entries); empty when
   * absent or unreadable. To know that an entry is at hand without reading it.
   */
  readPackKeys(name: string): Set<string> {
    let fd: number | null = null;
    try {
      fd = openSync(this.file("pack", name), "r");
      const head = Buffer.alloc(PACK_HEADER_BYTES);
      if (readSync(fd, head, 0, head.length, 0) !== head.length) return new Set();
      const indexEnd = packIndexEnd(head);
      if (indexEnd < 0 || indexEnd > fstatSync(fd).size) return new Set(); // not a pack, or a damaged length
      const start = Buffer.alloc(indexEnd);
      if (readSync(fd, start, 0, start.length, 0) !== start.length) return new Set();
      return packKeys(start);
    } catch {
      return new Set();
    } finally {
      if (fd !== null) closeSync(fd);
    }
  }

  /** An entry's bytes, read now; undefined when absent or unreadable. */
  getBytes(kind: string, key: string): Buffer | undefined {
    try {
      return readFileSync(this.file(kind, key));
    } catch {
      return undefined;
    }
  }

  /** Whether an entry is stored under `key` (not whether it is readable). */
  has(kind: string, key: string): boolean {
    return existsSync(this.file(kind, key));
  }

  /** Store an entry's bytes as they are (an entry encoded elsewhere, e.g. by a queue worker). */
  putBytes(kind: string, key: string, bytes: Uint8Array): void {
    this.writeFile(kind, key, bytes);
  }

  /** Replace the pack `name` with these entries (key and entry bytes), atomically. */
  writePack(name: string, entries: Iterable<readonly [string, Uint8Array]>): void {
    this.writeFile("pack", name, encodePack(entries));
  }

  private writeFile(kind: string, key: string, bytes: Uint8Array | EntryPart[]): void {
    const file = this.file(kind, key);
    const tmp = `${file}.tmp-${process.pid}-${tmpCounter++}`;
    try {
      mkdirSync(join(this.dir, kind, key.slice(0, 2)), { recursive: true });
      if (Array.isArray(bytes)) writeParts(tmp, bytes);
      else writeFileSync(tmp, bytes);
      renameSync(tmp, file);
    } catch {
      this.writeErrors++;
      rmSync(tmp, { force: true });
    }
  }
}

/** Write byte ranges (or files' bytes) one after the other into a new file. */
function writeParts(path: string, parts: EntryPart[]): void {
  const fd = openSync(path, "w");
  try {
    for (const p of parts) {
      if (p instanceof FileBytes) copyFileBytes(p, fd);
      else for (let at = 0; at < p.byteLength; ) at += writeSync(fd, p, at, p.byteLength - at);
    }
  } finally {
    closeSync(fd);
  }
}

/** Copy a FileBytes' file to fd in pieces; throws when the file does not hold its byteLength bytes. */
function copyFileBytes(f: FileBytes, fd: number): void {
  const buf = Buffer.allocUnsafe(Math.min(COPY_PIECE_BYTES, Math.max(1, f.byteLength)));
  let at = 0;
  const total = forEachFilePiece(f.path, buf, (piece) => {
    const n = Math.min(piece.length, f.byteLength - at); // never more than the entry said
    for (let w = 0; w < n; ) w += writeSync(fd, piece, w, n - w);
    at += n;
  });
  if (total !== f.byteLength) throw new Error(`cache entry: ${f.path} does not hold ${f.byteLength} bytes`);
}

/** Piece size for copying a file into an entry. */
const COPY_PIECE_BYTES = 4 << 20;
