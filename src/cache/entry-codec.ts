import { pad8, readFramed, writeFramed } from "./framed-buffer.ts";
import { numericTable, setOwn, tableRows } from "./numeric-table.ts";

/**
 * The bytes of one cache entry: any plain JSON-like value whose typed arrays (profile
 * distances and heights) are kept as raw binary rather than decimal text, so a 2 000-sample
 * profile costs 16 kB per array and reads back bit for bit.
 *
 * Layout: "RLC2" · byte order ("L" or "B") · 3 spare bytes · uint32 length of the JSON ·
 * the JSON (ASCII: other characters as \u escapes) · zero padding to a multiple of 8 · each
 * typed array's bytes, each padded to a multiple of 8. The JSON is [value, marks]. In the
 * value a typed array is {"$bin": [type, byteOffset, length]}, a number JSON cannot hold
 * exactly (NaN, ±∞ — k = ∞ gives an infinite effective radius — and −0) is {"$f": "Infinity"},
 * and a long array of same-shaped all-number objects is {"$table": [keys, column, column, …]};
 * marks lists the path (keys and indices from the root) of every such object, so that reading
 * an entry restores them without visiting the rest of the value.
 */

const MAGIC = "RLC2";

type TypedArray = Float64Array | Float32Array | Int32Array | Int16Array | Uint8Array | Uint16Array | Uint32Array | Int8Array;
type ArrayCtor = { new (buffer: ArrayBufferLike, byteOffset?: number, length?: number): TypedArray; BYTES_PER_ELEMENT: number };
const CTORS: Record<string, ArrayCtor> = { Float64Array, Float32Array, Int32Array, Int16Array, Int8Array, Uint8Array, Uint16Array, Uint32Array };

const NON_ASCII = /[\u0080-\uffff]/g;
const escapeChar = (c: string): string => `\\u${c.charCodeAt(0).toString(16).padStart(4, "0")}`;

/** Encode a value (objects, arrays, strings, numbers including NaN/±∞, booleans, null, typed arrays). */
export function encodeEntry(value: unknown): Buffer {
  const blobs: Uint8Array[] = [];
  let offset = 0;
  const path: (string | number)[] = [];
  const marks: (string | number)[][] = [];
  const bin = (v: ArrayBufferView): unknown => {
    const type = v.constructor.name;
    if (!(type in CTORS)) throw new TypeError(`cache entry: cannot store a ${type}`);
    blobs.push(new Uint8Array(v.buffer, v.byteOffset, v.byteLength));
    const meta = { $bin: [type, offset, (v as TypedArray).length] };
    offset += pad8(v.byteLength);
    return meta;
  };
  const walk = (v: unknown): unknown => {
    if (typeof v === "number") {
      if (Number.isFinite(v) && !Object.is(v, -0)) return v;
      marks.push([...path]);
      return { $f: Object.is(v, -0) ? "-0" : String(v) };
    }
    if (ArrayBuffer.isView(v)) {
      marks.push([...path]);
      return bin(v);
    }
    if (Array.isArray(v)) {
      const keys = numericTable(v);
      if (keys) {
        marks.push([...path]);
        return { $table: [keys, ...keys.map((k) => bin(Float64Array.from(v, (row) => (row as Record<string, number>)[k])))] };
      }
      return v.map((x, i) => {
        path.push(i);
        const out = walk(x);
        path.pop();
        return out;
      });
    }
    if (v && typeof v === "object") {
      const o: Record<string, unknown> = {};
      for (const [k, x] of Object.entries(v)) {
        if (x === undefined) continue;
        path.push(k);
        setOwn(o, k, walk(x));
        path.pop();
      }
      return o;
    }
    return v;
  };
  const tree = walk(value);
  const json = Buffer.from(JSON.stringify([tree, marks]).replace(NON_ASCII, escapeChar), "latin1");
  return writeFramed(MAGIC, json, blobs);
}

/** How decodeEntry gives back typed arrays. */
export interface DecodeOptions {
  /**
   * Give typed arrays as views of `buf`'s memory where it is suitably aligned, instead of
   * copies: no allocation or copying per array, but each view keeps all of `buf` alive and
   * its `.buffer` is `buf`'s (so read it with byteOffset and byteLength). Only for bytes
   * that nothing else will change (a file just read). Default false: every array is a copy.
   */
  views?: boolean;
}

/** Decode what encodeEntry wrote; null for bytes that are not a whole entry of this machine's byte order. */
export function decodeEntry(buf: Buffer, options: DecodeOptions = {}): unknown {
  const framed = readFramed(MAGIC, buf, "latin1");
  if (!framed) return null;
  const { dataStart } = framed;
  let parsed: unknown;
  try {
    parsed = JSON.parse(framed.json);
  } catch {
    return null;
  }
  if (!Array.isArray(parsed) || parsed.length !== 2 || !Array.isArray(parsed[1])) return null;
  const views = options.views === true;

  const array = (m: unknown): TypedArray | undefined => {
    if (!Array.isArray(m) || m.length !== 3) return undefined;
    const [type, off, length] = m as [unknown, unknown, unknown];
    const Ctor = typeof type === "string" && Object.hasOwn(CTORS, type) ? CTORS[type] : undefined;
    if (!Ctor || !Number.isInteger(off) || !Number.isInteger(length) || (off as number) < 0 || (length as number) < 0) return undefined;
    const start = dataStart + (off as number);
    const byteLength = (length as number) * Ctor.BYTES_PER_ELEMENT;
    if (start + byteLength > buf.byteLength) return undefined;
    if (views && (buf.byteOffset + start) % Ctor.BYTES_PER_ELEMENT === 0) return new Ctor(buf.buffer, buf.byteOffset + start, length as number);
    const ab = new ArrayBuffer(byteLength);
    new Uint8Array(ab).set(buf.subarray(start, start + byteLength));
    return new Ctor(ab);
  };
  // The value a marked object stands for; undefined when it is not a well-formed mark.
  const restore = (o: unknown): unknown => {
    if (!o || typeof o !== "object") return undefined;
    const m = o as Record<string, unknown>;
    if (typeof m.$f === "string") return Number(m.$f);
    if (m.$bin !== undefined) return array(m.$bin);
    if (Array.isArray(m.$table) && m.$table.length >= 2 && Array.isArray(m.$table[0])) {
      const [names, ...cols] = m.$table as [unknown[], ...unknown[]];
      const columns = cols.map((c) => array((c as Record<string, unknown> | null)?.$bin));
      if (names.length !== columns.length || names.some((k) => typeof k !== "string")) return undefined;
      if (columns.some((c) => !(c instanceof Float64Array) || c.length !== columns[0]!.length)) return undefined;
      return tableRows(names as string[], columns as Float64Array[]);
    }
    return undefined;
  };

  let root: unknown = parsed[0];
  for (const p of parsed[1] as unknown[]) {
    if (!Array.isArray(p)) return null;
    if (p.length === 0) {
      root = restore(root);
      if (root === undefined) return null;
      continue;
    }
    let parent: unknown = root;
    for (let i = 0; i < p.length - 1; i++) {
      parent = parent !== null && typeof parent === "object" && Object.hasOwn(parent, p[i]) ? (parent as Record<string, unknown>)[p[i]] : undefined;
    }
    const last = p[p.length - 1];
    if (parent === null || typeof parent !== "object" || !Object.hasOwn(parent, last)) return null;
    const v = restore((parent as Record<string, unknown>)[last]);
    if (v === undefined) return null;
    setOwn(parent as Record<string, unknown>, last, v);
  }
  return root;
}
