import { ORDER, pad8 } from "./entry-codec.ts";

/**
 * Many cache entries (encodeEntry's bytes) in one file, with an index by key, so that a
 * study's rebuild reads one file rather than one per link.
 *
 * Layout: "RLP1" · byte order ("L" or "B") · 3 spare bytes · uint32 length of the index ·
 * the index, JSON [[key, offset, length], …] with offsets from the start of the data ·
 * zero padding to a multiple of 8 · each entry's bytes, each padded to a multiple of 8 (so
 * the typed arrays inside an entry stay aligned and can be read in place).
 */

const MAGIC = "RLP1";
const HEADER = 12;

/** The bytes of a pack holding `entries` (key and encoded entry), in the order given. */
export function encodePack(entries: Iterable<readonly [string, Uint8Array]>): Buffer {
  const index: [string, number, number][] = [];
  const parts: Uint8Array[] = [];
  let offset = 0;
  for (const [key, bytes] of entries) {
    index.push([key, offset, bytes.byteLength]);
    parts.push(bytes);
    offset += pad8(bytes.byteLength);
  }
  const json = Buffer.from(JSON.stringify(index), "utf8");
  const dataStart = pad8(HEADER + json.byteLength);
  const out = Buffer.alloc(dataStart + offset);
  out.write(MAGIC + ORDER, 0, "latin1");
  out.writeUInt32LE(json.byteLength, 8);
  json.copy(out, HEADER);
  let at = dataStart;
  for (const p of parts) {
    out.set(p, at);
    at += pad8(p.byteLength);
  }
  return out;
}

/**
 * The entries of a pack, key → bytes (views into `buf`, not copies); an empty map for bytes
 * that are not a whole pack of this machine's byte order. Each entry still needs
 * decodeEntry, which checks it in turn.
 */
export function decodePack(buf: Buffer): Map<string, Buffer> {
  const out = new Map<string, Buffer>();
  const read = readIndex(buf);
  if (!read) return out;
  for (const row of read.index) {
    if (!Array.isArray(row) || row.length !== 3) return new Map();
    const [key, offset, length] = row as unknown[];
    if (typeof key !== "string" || !Number.isInteger(offset) || !Number.isInteger(length)) return new Map();
    const start = read.dataStart + (offset as number);
    if ((offset as number) < 0 || (length as number) < 0 || start + (length as number) > buf.byteLength) return new Map();
    out.set(key, buf.subarray(start, start + (length as number)));
  }
  return out;
}

/**
 * The keys of a pack from its first bytes — the header and the index, which is all it
 * needs (the entries may be missing); an empty set for bytes that do not start a pack of
 * this machine's byte order.
 */
export function packKeys(start: Buffer): Set<string> {
  const keys = new Set<string>();
  for (const row of readIndex(start)?.index ?? []) if (Array.isArray(row) && typeof row[0] === "string") keys.add(row[0]);
  return keys;
}

/** Bytes of a pack's header, which says how long its index is (packIndexEnd). */
export const PACK_HEADER_BYTES = HEADER;

/**
 * From a pack's first PACK_HEADER_BYTES bytes: how many bytes from the start hold its header
 * and index (what packKeys needs); −1 for bytes that do not start a pack of this machine's
 * byte order.
 */
export function packIndexEnd(head: Buffer): number {
  if (head.byteLength < HEADER || head.toString("latin1", 0, 5) !== MAGIC + ORDER) return -1;
  return HEADER + head.readUInt32LE(8);
}

/** A pack's index (its rows unchecked) and where its entries start; null for bytes that do not start a pack. */
function readIndex(buf: Buffer): { index: unknown[]; dataStart: number } | null {
  const indexEnd = packIndexEnd(buf);
  if (indexEnd < 0 || indexEnd > buf.byteLength) return null;
  try {
    const index: unknown = JSON.parse(buf.toString("utf8", HEADER, indexEnd));
    return Array.isArray(index) ? { index, dataStart: pad8(indexEnd) } : null;
  } catch {
    return null;
  }
}
