import { endianness } from "node:os";

/**
 * The bytes of one cache entry: any plain JSON-like value whose typed arrays (profile
 * distances and heights) are kept as raw binary rather than decimal text, so a 2 000-sample
 * profile costs 16 kB per array and reads back bit for bit.
 *
 * Layout: "RLC1" · byte order ("L" or "B") · 3 spare bytes · uint32 length of the JSON ·
 * the JSON (UTF-8) · zero padding to a multiple of 8 · each typed array's bytes, each padded
 * to a multiple of 8. In the JSON a typed array is {"$bin": [type, byteOffset, length]}, a
 * number JSON cannot hold exactly (NaN, ±∞ — k = ∞ gives an infinite effective radius — and
 * −0) is {"$f": "Infinity"}, and a
 * long array of same-shaped all-number objects is {"$table": [keys, column, column, …]}.
 */

const MAGIC = "RLC1";
const ORDER = endianness() === "LE" ? "L" : "B";
const HEADER = 12;

type TypedArray = Float64Array | Float32Array | Int32Array | Int16Array | Uint8Array | Uint16Array | Uint32Array | Int8Array;
const CTORS: Record<string, new (buffer: ArrayBuffer) => TypedArray> = {
  Float64Array,
  Float32Array,
  Int32Array,
  Int16Array,
  Int8Array,
  Uint8Array,
  Uint16Array,
  Uint32Array,
};

const pad8 = (n: number): number => (n + 7) & ~7;

/** Set an own property, even one named "__proto__" (plain assignment would set the prototype). */
const setOwn = (o: Record<string, unknown>, k: string, v: unknown): void => {
  if (k === "__proto__") Object.defineProperty(o, k, { value: v, enumerable: true, writable: true, configurable: true });
  else o[k] = v;
};

/**
 * The keys of an array of at least 8 objects that all have the same keys in the same order
 * and only finite numbers as values (a height-gain curve, reflection points); else null.
 * Such an array is stored as one float64 column per key, which reads back several times
 * faster than the same numbers as JSON text.
 */
function numericTable(rows: unknown[]): string[] | null {
  if (rows.length < 8) return null;
  const first = rows[0];
  if (!first || typeof first !== "object" || Array.isArray(first) || ArrayBuffer.isView(first)) return null;
  const keys = Object.keys(first);
  if (keys.length === 0) return null;
  for (const row of rows) {
    if (!row || typeof row !== "object" || Array.isArray(row)) return null;
    const rk = Object.keys(row);
    if (rk.length !== keys.length) return null;
    for (let i = 0; i < rk.length; i++) {
      const x = (row as Record<string, unknown>)[rk[i]];
      if (rk[i] !== keys[i] || typeof x !== "number" || !Number.isFinite(x)) return null;
    }
  }
  return keys;
}

/** Encode a value (objects, arrays, strings, numbers including NaN/±∞, booleans, null, typed arrays). */
export function encodeEntry(value: unknown): Buffer {
  const blobs: Uint8Array[] = [];
  let offset = 0;
  const walk = (v: unknown): unknown => {
    if (typeof v === "number") return Number.isFinite(v) && !Object.is(v, -0) ? v : { $f: Object.is(v, -0) ? "-0" : String(v) };
    if (ArrayBuffer.isView(v)) {
      const type = v.constructor.name;
      if (!(type in CTORS)) throw new TypeError(`cache entry: cannot store a ${type}`);
      const bytes = new Uint8Array(v.buffer, v.byteOffset, v.byteLength);
      const meta = { $bin: [type, offset, (v as TypedArray).length] };
      blobs.push(bytes);
      offset += pad8(bytes.byteLength);
      return meta;
    }
    if (Array.isArray(v)) {
      const keys = numericTable(v);
      if (keys) return { $table: [keys, ...keys.map((k) => walk(Float64Array.from(v, (row) => (row as Record<string, number>)[k])))] };
      return v.map(walk);
    }
    if (v && typeof v === "object") {
      const o: Record<string, unknown> = {};
      for (const [k, x] of Object.entries(v)) if (x !== undefined) setOwn(o, k, walk(x));
      return o;
    }
    return v;
  };
  const json = Buffer.from(JSON.stringify(walk(value)), "utf8");
  const dataStart = pad8(HEADER + json.byteLength);
  const out = Buffer.alloc(dataStart + offset);
  out.write(MAGIC + ORDER, 0, "latin1");
  out.writeUInt32LE(json.byteLength, 8);
  json.copy(out, HEADER);
  let at = dataStart;
  for (const b of blobs) {
    out.set(b, at);
    at += pad8(b.byteLength);
  }
  return out;
}

/** Decode what encodeEntry wrote; null for bytes that are not a whole entry of this machine's byte order. */
export function decodeEntry(buf: Buffer): unknown {
  if (buf.byteLength < HEADER || buf.toString("latin1", 0, 5) !== MAGIC + ORDER) return null;
  const jsonLength = buf.readUInt32LE(8);
  if (HEADER + jsonLength > buf.byteLength) return null;
  const dataStart = pad8(HEADER + jsonLength);
  let parsed: unknown;
  try {
    parsed = JSON.parse(buf.toString("utf8", HEADER, HEADER + jsonLength));
  } catch {
    return null;
  }
  // Restore typed arrays and non-finite numbers in place (the parsed tree is ours to change).
  let ok = true;
  const onlyKey = (o: Record<string, unknown>): boolean => {
    let n = 0;
    for (const _ in o) if (++n > 1) return false;
    return n === 1;
  };
  const special = (o: Record<string, unknown>): unknown => {
    // Most objects are ordinary: three property lookups tell, without allocating.
    if (o.$f === undefined && o.$bin === undefined && o.$table === undefined) return undefined;
    if (!onlyKey(o)) return undefined;
    if (typeof o.$f === "string") return Number(o.$f);
    if (Array.isArray(o.$table)) {
      const [names, ...cols] = o.$table as [string[], ...unknown[]];
      const columns = cols.map((c) => special(c as Record<string, unknown>)) as Float64Array[];
      if (!ok || columns.some((c) => !(c instanceof Float64Array))) {
        ok = false;
        return null;
      }
      const rows = new Array(columns[0].length);
      for (let r = 0; r < rows.length; r++) {
        const row: Record<string, number> = {};
        for (let c = 0; c < names.length; c++) setOwn(row, names[c], columns[c][r]);
        rows[r] = row;
      }
      return rows;
    }
    if (Array.isArray(o.$bin)) {
      const [type, off, length] = o.$bin as [string, number, number];
      const Ctor = CTORS[type];
      const bytesPer = Ctor ? (Ctor as unknown as { BYTES_PER_ELEMENT: number }).BYTES_PER_ELEMENT : 0;
      const start = dataStart + off;
      if (!Ctor || start + length * bytesPer > buf.byteLength) {
        ok = false;
        return null;
      }
      const ab = new ArrayBuffer(length * bytesPer);
      new Uint8Array(ab).set(buf.subarray(start, start + length * bytesPer));
      return new Ctor(ab);
    }
    return undefined;
  };
  const walk = (v: unknown): unknown => {
    if (v === null || typeof v !== "object") return v;
    if (Array.isArray(v)) {
      for (let i = 0; i < v.length; i++) if (v[i] !== null && typeof v[i] === "object") v[i] = walk(v[i]);
      return v;
    }
    const o = v as Record<string, unknown>;
    const s = special(o);
    if (s !== undefined) return s;
    for (const k in o) if (o[k] !== null && typeof o[k] === "object") o[k] = walk(o[k]);
    return o;
  };
  const value = walk(parsed);
  return ok ? value : null;
}
