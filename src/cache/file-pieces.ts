import { closeSync, openSync, readSync } from "node:fs";

/**
 * Read a file from its start to its end a piece at a time into `buf` (reused), handing each
 * piece to `onPiece` (a view of `buf`, valid until the next call): for hashing or copying a
 * file of hundreds of MB without holding it, or writing fresh memory for it.
 * @returns the file's length in bytes
 */
export function forEachFilePiece(path: string, buf: Buffer, onPiece: (piece: Buffer) => void): number {
  const fd = openSync(path, "r");
  let total = 0;
  try {
    for (let n; (n = readSync(fd, buf, 0, buf.length, null)) > 0; total += n) onPiece(buf.subarray(0, n));
  } finally {
    closeSync(fd);
  }
  return total;
}
