import { readSync } from "node:fs";

/** The tags of one TIFF image file directory: numeric values as numbers, ASCII as a string. */
export interface TiffDirectory {
  littleEndian: boolean;
  tags: Map<number, number[] | string>;
}

/** TIFF 6.0 field types → size in bytes (TIFF 6.0 §2, "Types"). */
const TYPE_SIZE: Record<number, number> = { 1: 1, 2: 1, 3: 2, 4: 4, 5: 8, 6: 1, 7: 1, 8: 2, 9: 4, 10: 8, 11: 4, 12: 8, 16: 8, 17: 8, 18: 8 };

/**
 * Read the first image file directory (IFD 0) of a classic TIFF (TIFF 6.0 §2) from an open
 * file, reading only the header, the directory and the values it points to. Returns null
 * for anything else (not a TIFF, BigTIFF, a directory outside the file): the caller then
 * uses the general reader.
 * @param fd open file descriptor
 * @param size file size (bytes)
 */
export function readTiffDirectory(fd: number, size: number): TiffDirectory | null {
  const head = readAt(fd, 0, Math.min(8, size));
  if (head.length < 8) return null;
  const order = head.toString("latin1", 0, 2);
  if (order !== "II" && order !== "MM") return null;
  const le = order === "II";
  const u16 = (b: Buffer, o: number) => (le ? b.readUInt16LE(o) : b.readUInt16BE(o));
  const u32 = (b: Buffer, o: number) => (le ? b.readUInt32LE(o) : b.readUInt32BE(o));
  if (u16(head, 2) !== 42) return null; // 43 = BigTIFF: left to the general reader
  const ifd = u32(head, 4);
  if (ifd + 2 > size) return null;
  const n = u16(readAt(fd, ifd, 2), 0);
  if (ifd + 2 + 12 * n > size) return null;
  const entries = readAt(fd, ifd + 2, 12 * n);
  const tags = new Map<number, number[] | string>();
  for (let e = 0; e < n; e++) {
    const o = 12 * e;
    const tag = u16(entries, o);
    const type = u16(entries, o + 2);
    const count = u32(entries, o + 4);
    const unit = TYPE_SIZE[type];
    if (unit === undefined) continue;
    const bytes = unit * count;
    let buf: Buffer;
    let at: number;
    if (bytes <= 4) {
      buf = entries;
      at = o + 8;
    } else {
      const off = u32(entries, o + 8);
      if (off + bytes > size) return null;
      buf = readAt(fd, off, bytes);
      at = 0;
    }
    tags.set(tag, decodeValues(buf, at, type, count, le));
  }
  return { littleEndian: le, tags };
}

function decodeValues(b: Buffer, at: number, type: number, count: number, le: boolean): number[] | string {
  if (type === 2) {
    const s = b.toString("latin1", at, at + count);
    const nul = s.indexOf("\0");
    return nul >= 0 ? s.slice(0, nul) : s;
  }
  const out = new Array<number>(count);
  for (let i = 0; i < count; i++) {
    switch (type) {
      case 1:
      case 7:
        out[i] = b[at + i];
        break;
      case 6:
        out[i] = b.readInt8(at + i);
        break;
      case 3:
        out[i] = le ? b.readUInt16LE(at + 2 * i) : b.readUInt16BE(at + 2 * i);
        break;
      case 8:
        out[i] = le ? b.readInt16LE(at + 2 * i) : b.readInt16BE(at + 2 * i);
        break;
      case 4:
        out[i] = le ? b.readUInt32LE(at + 4 * i) : b.readUInt32BE(at + 4 * i);
        break;
      case 9:
        out[i] = le ? b.readInt32LE(at + 4 * i) : b.readInt32BE(at + 4 * i);
        break;
      case 11:
        out[i] = le ? b.readFloatLE(at + 4 * i) : b.readFloatBE(at + 4 * i);
        break;
      case 12:
        out[i] = le ? b.readDoubleLE(at + 8 * i) : b.readDoubleBE(at + 8 * i);
        break;
      case 5:
      case 10: {
        const s = type === 10;
        const p = at + 8 * i;
        const num = s ? (le ? b.readInt32LE(p) : b.readInt32BE(p)) : le ? b.readUInt32LE(p) : b.readUInt32BE(p);
        const den = s ? (le ? b.readInt32LE(p + 4) : b.readInt32BE(p + 4)) : le ? b.readUInt32LE(p + 4) : b.readUInt32BE(p + 4);
        out[i] = num / den;
        break;
      }
      default: {
        // 8-byte integers (BigTIFF types): as doubles
        const p = at + 8 * i;
        out[i] = Number(le ? b.readBigUInt64LE(p) : b.readBigUInt64BE(p));
      }
    }
  }
  return out;
}

/** `length` bytes of the file from `offset` (fewer at the end of the file). */
export function readAt(fd: number, offset: number, length: number): Buffer {
  const b = Buffer.allocUnsafe(length);
  let got = 0;
  while (got < length) {
    const r = readSync(fd, b, got, length - got, offset + got);
    if (r === 0) break;
    got += r;
  }
  return got === length ? b : b.subarray(0, got);
}
