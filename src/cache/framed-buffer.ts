import { endianness } from "node:os";

/**
 * The layout shared by cache entries and packs: 4-byte magic, one byte of byte order
 * ("L"/"B"), 3 spare bytes, the JSON length (uint32 LE) at byte 8, the JSON from byte 12, then
 * binary parts each starting on an 8-byte boundary (so typed arrays can be read in place).
 */
const HEADER = 12;
const ORDER = endianness() === "LE" ? "L" : "B";

/** Round up to a multiple of 8. */
export const pad8 = (n: number): number => (n + 7) & ~7;

/** Bytes of `json` and `parts` in the framed layout under `magic` (4 characters). */
export function writeFramed(magic: string, json: Buffer, parts: Uint8Array[]): Buffer {
  const dataStart = pad8(HEADER + json.byteLength);
  let size = dataStart;
  for (const p of parts) size += pad8(p.byteLength);
  const out = Buffer.alloc(size);
  out.write(magic + ORDER, 0, "latin1");
  out.writeUInt32LE(json.byteLength, 8);
  json.copy(out, HEADER);
  let at = dataStart;
  for (const p of parts) {
    out.set(p, at);
    at += pad8(p.byteLength);
  }
  return out;
}

/** The JSON text and the offset where binary parts start, or null if `buf` is not framed under `magic` in this machine's byte order. */
export function readFramed(magic: string, buf: Buffer, encoding: "latin1" | "utf8"): { json: string; dataStart: number } | null {
  if (buf.byteLength < HEADER || buf.toString("latin1", 0, 5) !== magic + ORDER) return null;
  const jsonLength = buf.readUInt32LE(8);
  if (HEADER + jsonLength > buf.byteLength) return null;
  return { json: buf.toString(encoding, HEADER, HEADER + jsonLength), dataStart: pad8(HEADER + jsonLength) };
}
