import { readFileSync } from "node:fs";
import { endianness } from "node:os";

/**
 * The bytes of one cache entry: any plain JSON-like value, split into its shape (keys and
 * nesting, without lengths), its numbers (one float64 column, so every number — NaN, ±∞ and
 * −0 included — reads back bit for bit without decimal text; the lengths of its arrays are in
 * it too), its other scalars (strings, booleans, null: a JSON array) and its typed arrays
 * (raw binary, read in place where aligned).
 *
 * Reading a link back is dominated by rebuilding its objects. As JSON text, most of that time
 * went into tokenising keys and converting 17-digit numbers. Here the numbers are binary, and
 * the shape — which leaves lengths out, so that the links of a study share a handful of
 * shapes — is parsed once per process and turned into a builder (`Plan`), kept by the shape's
 * hash: reading an entry whose shape was seen before parses only its short list of strings,
 * and a builder run for every link is soon compiled by the engine.
 *
 * Layout: "RLC3" · byte order ("L" or "B") · 3 spare bytes · uint32 shape length · uint32
 * scalars length · uint32 count of numbers · uint32 FNV-1a hash of the shape bytes (all
 * uint32 little-endian, bytes 8–23) · the shape (ASCII JSON) · the scalars (ASCII JSON array;
 * other characters as \u escapes) · zero padding to a multiple of 8 · the numbers (float64,
 * this machine's byte order) · each typed array's bytes, each padded to a multiple of 8.
 *
 * Shape grammar, as JSON, with what each reads in order: 0 a number (the next of the column) ·
 * 1 a scalar (the next of the list) · ["o", key, shape, key, shape, …] an object, keys in
 * order · ["a", shape, …] an array of these elements · ["r", shape] an array whose elements
 * all have that shape: its length (the next number), then the elements · ["b", type] a typed
 * array: its length (the next number), its bytes (the next binary part). An array of records
 * of one shape (reflection points, say) is therefore one "r" node, whatever its length.
 */

const MAGIC = "RLC3";
/** This machine's byte order as entries and packs record it ("L" or "B"). */
export const ORDER = endianness() === "LE" ? "L" : "B";

/** Round up to a multiple of 8 (for n below 2³¹). */
export const pad8 = (n: number): number => (n + 7) & ~7;
const HEADER = 24;
/** Longest array or typed array an entry may declare (a damaged length then reads as a miss, not as a huge allocation). */
const MAX_LENGTH = 1 << 28;

type TypedArray = Float64Array | Float32Array | Int32Array | Int16Array | Uint8Array | Uint16Array | Uint32Array | Int8Array;
type ArrayCtor = { new (buffer: ArrayBufferLike, byteOffset?: number, length?: number): TypedArray; BYTES_PER_ELEMENT: number };
const CTORS: Record<string, ArrayCtor> = { Float64Array, Float32Array, Int32Array, Int16Array, Int8Array, Uint8Array, Uint16Array, Uint32Array };

const NON_ASCII = /[\u0080-\uffff]/g;
const escapeChar = (c: string): string => `\\u${c.charCodeAt(0).toString(16).padStart(4, "0")}`;
const ascii = (json: string): Buffer => Buffer.from(json.replace(NON_ASCII, escapeChar), "latin1");

/** FNV-1a (32-bit) of bytes[from…to). */
function fnv1a(bytes: Uint8Array, from: number, to: number): number {
  let h = 0x811c9dc5;
  for (let i = from; i < to; i++) h = Math.imul(h ^ bytes[i], 0x01000193);
  return h >>> 0;
}

/**
 * A file's bytes as a value of an entry: encoded as the Uint8Array of its bytes would be, but
 * read from the file only as the entry is written (encodeEntryParts gives it as a part of its
 * own; ResultCache.putLarge copies it in pieces) — a coverage map's level GeoTIFF, hundreds of
 * MB, is not held in memory for it. The file must keep `byteLength` bytes until then.
 */
export class FileBytes {
  constructor(
    readonly path: string,
    readonly byteLength: number,
  ) {}
}

/** A part of an entry's bytes: in memory, or a file's bytes (FileBytes). */
export type EntryPart = Uint8Array | FileBytes;

/** Encode a value (objects, arrays, strings, numbers including NaN/±∞/−0, booleans, null, typed arrays, FileBytes). */
export function encodeEntry(value: unknown): Buffer {
  const parts = encodeEntryParts(value).map((p) => (p instanceof FileBytes ? fileBytes(p) : p));
  return parts.length === 1 ? (parts[0] as Buffer) : Buffer.concat(parts);
}

/** The bytes of a FileBytes, read now. */
function fileBytes(f: FileBytes): Buffer {
  const b = readFileSync(f.path);
  if (b.byteLength !== f.byteLength) throw new Error(`cache entry: ${f.path} holds ${b.byteLength} bytes, expected ${f.byteLength}`);
  return b;
}

/**
 * The bytes of encodeEntry(value) as consecutive parts: the head (shape, scalars, numbers) and
 * each typed array's own bytes, not copied (views of the value's arrays), or a FileBytes, with
 * padding. For writing a large entry (a coverage map's rasters and files) without a second
 * copy of it in memory.
 */
export function encodeEntryParts(value: unknown): EntryPart[] {
  const numbers: number[] = [];
  const scalars: unknown[] = [];
  const blobs: EntryPart[] = [];
  const shapeOf = (v: unknown): unknown => {
    switch (typeof v) {
      case "number":
        numbers.push(v);
        return 0;
      case "string":
      case "boolean":
        scalars.push(v);
        return 1;
      case "undefined": // in an array, as JSON writes it (object properties that are undefined are left out below)
        scalars.push(null);
        return 1;
      case "object":
        break;
      default:
        throw new TypeError(`cache entry: cannot store a ${typeof v}`);
    }
    if (v === null) {
      scalars.push(null);
      return 1;
    }
    if (v instanceof FileBytes) {
      numbers.push(v.byteLength);
      blobs.push(v);
      return ["b", "Uint8Array"];
    }
    if (ArrayBuffer.isView(v)) {
      const type = v.constructor.name;
      if (!Object.hasOwn(CTORS, type)) throw new TypeError(`cache entry: cannot store a ${type}`);
      numbers.push((v as TypedArray).length);
      blobs.push(new Uint8Array(v.buffer, v.byteOffset, v.byteLength));
      return ["b", type];
    }
    if (Array.isArray(v)) {
      // the length goes first; it is taken out again if the elements differ in shape
      const lengthAt = numbers.push(v.length) - 1;
      const shapes = v.map(shapeOf);
      const texts = shapes.map((s) => JSON.stringify(s));
      if (texts.every((t) => t === texts[0])) return ["r", shapes.length ? shapes[0] : 0];
      numbers.splice(lengthAt, 1);
      return ["a", ...shapes];
    }
    const out: unknown[] = ["o"];
    for (const [k, x] of Object.entries(v)) {
      if (x === undefined) continue;
      out.push(k, shapeOf(x));
    }
    return out;
  };
  const shape = ascii(JSON.stringify(shapeOf(value)));
  const text = ascii(JSON.stringify(scalars));
  const numbersAt = pad8(HEADER + shape.byteLength + text.byteLength);
  const out = Buffer.alloc(numbersAt + 8 * numbers.length);
  out.write(MAGIC + ORDER, 0, "latin1");
  out.writeUInt32LE(shape.byteLength, 8);
  out.writeUInt32LE(text.byteLength, 12);
  out.writeUInt32LE(numbers.length, 16);
  shape.copy(out, HEADER);
  out.writeUInt32LE(fnv1a(out, HEADER, HEADER + shape.byteLength), 20);
  text.copy(out, HEADER + shape.byteLength);
  new Float64Array(out.buffer, out.byteOffset + numbersAt, numbers.length).set(numbers);
  const parts: EntryPart[] = [out];
  for (const b of blobs) {
    parts.push(b);
    if (pad8(b.byteLength) > b.byteLength) parts.push(new Uint8Array(pad8(b.byteLength) - b.byteLength));
  }
  return parts;
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

/**
 * What a builder reads: the numbers, the scalars, the entry's bytes, where its binary parts
 * start, whether to give views. It leaves in `end` the numbers and scalars it read and where
 * its binary parts end, and throws BAD for a length that does not fit.
 */
type Build = (n: Float64Array, s: unknown[], b: Buffer, at: number, views: boolean, end: Float64Array) => unknown;

/** Thrown by a builder for an entry that does not fit its own shape (a damaged file). */
const BAD = new Error("cache entry does not fit its shape");

/** A shape's builder, with the shape's bytes to tell shapes of the same hash apart. */
interface Plan {
  shape: Buffer;
  build: Build;
}

/** Builders of the shapes seen in this process, by hash; cleared when it grows past PLAN_LIMIT. */
const plans = new Map<number, Plan[]>();
let planCount = 0;
const PLAN_LIMIT = 4096;
/** Shapes with more nodes than this are not turned into builders (their entries read as misses). */
const SHAPE_NODE_LIMIT = 100_000;

/** What a builder's code calls. */
const helpers = {
  /**
   * `m` elements made by `f`, in order. An element reads at least one number or scalar unless
   * it is an empty object, so `m` beyond what the entry holds (plus room for those) is damage.
   */
  list(m: number, f: () => unknown, n: Float64Array, s: unknown[]): unknown[] {
    if (m > n.length + s.length + 65_536) throw BAD;
    const a = new Array(m);
    for (let q = 0; q < m; q++) a[q] = f();
    return a;
  },
  /** A typed array of `m` elements at b[at…]: a view when asked for and aligned, else a copy. */
  typed(Ctor: ArrayCtor, b: Buffer, at: number, m: number, views: boolean): TypedArray {
    const bytes = m * Ctor.BYTES_PER_ELEMENT;
    if (at + bytes > b.byteLength) throw BAD;
    if (views && (b.byteOffset + at) % Ctor.BYTES_PER_ELEMENT === 0) return new Ctor(b.buffer, b.byteOffset + at, m);
    const ab = new ArrayBuffer(bytes);
    new Uint8Array(ab).set(b.subarray(at, at + bytes));
    return new Ctor(ab);
  },
  /** A length read from the numbers: a whole number from 0 to MAX_LENGTH. */
  length(m: number): number {
    if (!(Number.isInteger(m) && m >= 0 && m <= MAX_LENGTH)) throw BAD;
    return m;
  },
};

/**
 * The builder of a parsed shape: a function whose body is one expression that makes the
 * value — object and array literals reading each number and scalar in turn, loops for arrays
 * of one shape — so that making a value costs what writing it as a literal would, and every
 * value of a shape gets the same object layouts. Only this module's own tokens, indices it
 * counted and keys written by JSON.stringify (a JavaScript string literal) go into the source.
 * Null for anything that is not a shape, a shape too large, or where code generation is not
 * allowed (node --disallow-code-generation-from-strings): the entry then reads as a miss.
 */
function compile(shape: unknown): Build | null {
  let nodes = 0;
  const ctors: ArrayCtor[] = [];
  const expr = (v: unknown): string | null => {
    if (++nodes > SHAPE_NODE_LIMIT) return null;
    if (v === 0) return "n[i++]";
    if (v === 1) return "s[j++]";
    if (!Array.isArray(v) || v.length === 0) return null;
    const tag = v[0];
    if (tag === "o") {
      if (v.length % 2 !== 1) return null;
      const props: string[] = [];
      const seen = new Set<string>();
      for (let k = 1; k < v.length; k += 2) {
        const key = v[k];
        if (typeof key !== "string" || seen.has(key)) return null;
        seen.add(key);
        const x = expr(v[k + 1]);
        if (x === null) return null;
        // "__proto__" as a plain key would set the prototype; a computed key defines an own property
        props.push(`${key === "__proto__" ? `["__proto__"]` : JSON.stringify(key)}: ${x}`);
      }
      return `{${props.join(", ")}}`;
    }
    if (tag === "a") {
      const items: string[] = [];
      for (let k = 1; k < v.length; k++) {
        const x = expr(v[k]);
        if (x === null) return null;
        items.push(x);
      }
      return `[${items.join(", ")}]`;
    }
    if (tag === "r") {
      const x = v.length === 2 ? expr(v[1]) : null;
      return x === null ? null : `H.list(H.length(n[i++]), () => (${x}), n, s)`;
    }
    if (tag === "b") {
      const Ctor = v.length === 2 && typeof v[1] === "string" && Object.hasOwn(CTORS, v[1]) ? CTORS[v[1]] : undefined;
      if (!Ctor) return null;
      ctors.push(Ctor);
      const c = ctors.length - 1;
      return `(m = H.length(n[i++]), x = H.typed(C[${c}], b, p, m, views), p += (m * ${Ctor.BYTES_PER_ELEMENT} + 7) & ~7, x)`;
    }
    return null;
  };
  const body = expr(shape);
  if (body === null) return null;
  try {
    const make = new Function(
      "C",
      "H",
      `"use strict"; return (n, s, b, at, views, end) => { let i = 0, j = 0, p = at, m = 0, x = null; const v = ${body}; end[0] = i; end[1] = j; end[2] = p; return v; };`,
    ) as (C: ArrayCtor[], H: typeof helpers) => Build;
    return make(ctors, helpers);
  } catch {
    return null;
  }
}

/**
 * The plan for the shape in buf[from…to), looked up by the hash h the entry gives for it and
 * confirmed byte for byte (a wrong hash only costs a parse); else parsed and remembered now.
 * Null for a malformed shape.
 */
function planFor(buf: Buffer, from: number, to: number, h: number): Plan | null {
  const same = plans.get(h);
  if (same) for (const p of same) if (p.shape.length === to - from && buf.compare(p.shape, 0, p.shape.length, from, to) === 0) return p;
  let parsed: unknown;
  try {
    parsed = JSON.parse(buf.toString("latin1", from, to));
  } catch {
    return null;
  }
  const build = compile(parsed);
  if (!build) return null;
  if (planCount >= PLAN_LIMIT) {
    plans.clear();
    planCount = 0;
  }
  const plan: Plan = { shape: Buffer.from(buf.subarray(from, to)), build };
  plans.set(h, [...(plans.get(h) ?? []), plan]);
  planCount++;
  return plan;
}

/** Whether `b` starts like an entry of this machine's byte order and is long enough for its shape, scalars and numbers. */
function headerFits(b: Buffer): boolean {
  if (b.byteLength < HEADER || b.toString("latin1", 0, 5) !== MAGIC + ORDER) return false;
  const texts = HEADER + b.readUInt32LE(8) + b.readUInt32LE(12);
  // compared before pad8, whose bit operations hold only 31 bits
  return texts <= b.byteLength && pad8(texts) + 8 * b.readUInt32LE(16) <= b.byteLength;
}

const end = new Float64Array(3);

/** Decode what encodeEntry wrote; null for bytes that are not a whole entry of this machine's byte order. */
export function decodeEntry(buf: Buffer, options: DecodeOptions = {}): unknown {
  if (!headerFits(buf)) return null;
  const shapeLength = buf.readUInt32LE(8);
  const textLength = buf.readUInt32LE(12);
  const count = buf.readUInt32LE(16);
  const textAt = HEADER + shapeLength;
  const numbersAt = pad8(textAt + textLength);
  const plan = planFor(buf, HEADER, textAt, buf.readUInt32LE(20));
  if (!plan) return null;
  let scalars: unknown;
  try {
    scalars = textLength === 2 ? [] : JSON.parse(buf.toString("latin1", textAt, textAt + textLength));
  } catch {
    return null;
  }
  if (!Array.isArray(scalars)) return null;
  const numbers = (buf.byteOffset + numbersAt) % 8 === 0 ? new Float64Array(buf.buffer, buf.byteOffset + numbersAt, count) : new Float64Array(new Uint8Array(buf.subarray(numbersAt, numbersAt + 8 * count)).buffer);
  let value: unknown;
  try {
    value = plan.build(numbers, scalars, buf, numbersAt + 8 * count, options.views === true, end);
  } catch (e) {
    if (e === BAD) return null;
    throw e;
  }
  // every number and scalar read exactly once, and no binary part past the end
  return end[0] === count && end[1] === scalars.length && end[2] <= buf.byteLength ? value : null;
}
