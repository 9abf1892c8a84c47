import { createHash } from "node:crypto";
import { statSync } from "node:fs";
import { resolve } from "node:path";
import { forEachFilePiece } from "./file-pieces.ts";
import type { ResultCache } from "./result-cache.ts";

/** A file's bytes must be this much older than now before its digest is remembered (s). */
const SETTLE_S = 2;

/**
 * sha256 (hex) of a file's bytes. With a cache, the digest is remembered under the file's
 * identity (absolute path, size, inode, modification and change times in nanoseconds), so a
 * 25 MB DEM tile is hashed once rather than on every build; any write to the file changes its
 * change time and so its identity. As git does for its index, a file modified within the last
 * 2 s is hashed every time and not remembered: a second write in the same clock tick could
 * otherwise go unseen on file systems with coarse timestamps.
 */
export function fileDigest(path: string, cache: ResultCache | null = null): string {
  const abs = resolve(path);
  if (!cache) return hashFile(abs);
  const st = statSync(abs, { bigint: true });
  const identity = createHash("sha256").update(`file-digest-v1\0${abs}\0${st.size}\0${st.ino}\0${st.dev}\0${st.mtimeNs}\0${st.ctimeNs}`).digest("hex");
  const known = cache.get<string>("file-digest", identity);
  if (typeof known === "string") return known;
  const digest = hashFile(abs);
  const newest_ns = st.mtimeNs > st.ctimeNs ? st.mtimeNs : st.ctimeNs;
  if (BigInt(Date.now()) * 1_000_000n - newest_ns > BigInt(SETTLE_S) * 1_000_000_000n) cache.put("file-digest", identity, digest);
  return digest;
}

/** A piece of a file being hashed: one buffer, reused (reading a 26 MB tile whole wrote 6 000 fresh pages of memory first, which took longer than the hashing). */
const piece = Buffer.allocUnsafe(1 << 20);

/** sha256 (hex) of a file's bytes, read a piece at a time. */
function hashFile(abs: string): string {
  const h = createHash("sha256");
  forEachFilePiece(abs, piece, (b) => h.update(b));
  return h.digest("hex");
}
