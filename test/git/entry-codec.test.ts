import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { decodeEntry, encodeEntry, encodeEntryParts, FileBytes } from "../../src/cache/entry-codec.ts";
import { ResultCache } from "../../src/cache/result-cache.ts";
import { decodePack, encodePack, packKeys } from "../../src/cache/entry-pack.ts";

// The cache's byte format must give back exactly what went in: bit-identical numbers
// (including −0, NaN and ±∞), typed arrays of the same type, and objects with the same key
// order — the report is rendered from what comes back, and must not change by a byte.

const sameValue = (a: unknown, b: unknown): boolean => {
  if (typeof a === "number") return typeof b === "number" && Object.is(a, b);
  if (ArrayBuffer.isView(a)) return ArrayBuffer.isView(b) && a.constructor === b.constructor && Buffer.from(a.buffer, a.byteOffset, a.byteLength).equals(Buffer.from(b.buffer, b.byteOffset, b.byteLength));
  if (Array.isArray(a)) return Array.isArray(b) && a.length === b.length && a.every((x, i) => sameValue(x, b[i]));
  if (a && typeof a === "object") {
    if (!b || typeof b !== "object") return false;
    const ka = Object.keys(a);
    const kb = Object.keys(b);
    return ka.join("\0") === kb.join("\0") && ka.every((k) => sameValue((a as Record<string, unknown>)[k], (b as Record<string, unknown>)[k]));
  }
  return a === b;
};

const anyNumber = fc.oneof(fc.double(), fc.integer(), fc.constantFrom(NaN, Infinity, -Infinity, 0, -0, 1e-300, 5e-324));
const leaf = fc.oneof(anyNumber, fc.string(), fc.boolean(), fc.constant(null), fc.float64Array({ maxLength: 40 }), fc.float32Array({ maxLength: 9 }), fc.int16Array({ maxLength: 7 }));
const tree = fc.letrec((tie) => ({
  node: fc.oneof({ depthSize: "small" }, leaf, fc.array(tie("node"), { maxLength: 12 }), fc.dictionary(fc.string({ minLength: 1 }), tie("node"), { maxKeys: 6 })),
})).node;
const table = fc.array(fc.record({ rx_antenna_m: fc.double({ noNaN: true, noDefaultInfinity: true }), relative_db: fc.double({ noNaN: true, noDefaultInfinity: true }) }), { minLength: 0, maxLength: 30 });

describe("cache entry codec", () => {
  it("round-trips any JSON-like value with typed arrays and non-finite numbers (property)", () => {
    fc.assert(
      fc.property(tree, (v) => {
        expect(sameValue(v, decodeEntry(encodeEntry(v)))).toBe(true);
      }),
      { numRuns: 300 },
    );
  });

  it("writes a large entry piece by piece with the same bytes as in one buffer (property)", () => {
    const dir = mkdtempSync(join(tmpdir(), "ridgeline-entry-parts-"));
    try {
      const cache = new ResultCache(dir);
      let n = 0;
      fc.assert(
        fc.property(tree, (v) => {
          const whole = encodeEntry(v);
          expect(Buffer.concat(encodeEntryParts(v) as Uint8Array[]).equals(whole)).toBe(true); // no FileBytes in v
          const key = (n++).toString(16).padStart(16, "0");
          cache.putLarge("t", key, v);
          expect(cache.getBytes("t", key)?.equals(whole)).toBe(true);
        }),
        { numRuns: 100 },
      );
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });

  it("stores a file's bytes (FileBytes) as the Uint8Array of them, copied in pieces, and no entry for a file that changed size", () => {
    const dir = mkdtempSync(join(tmpdir(), "ridgeline-entry-file-"));
    try {
      const cache = new ResultCache(dir);
      // 9 MB and some: more than two pieces of the copy, and a length that needs padding
      for (const size of [0, 5, (9 << 20) + 3]) {
        const bytes = Uint8Array.from({ length: size }, (_, i) => (i * 31 + (i >> 9)) & 255);
        const path = join(dir, `f${size}.bin`);
        writeFileSync(path, bytes);
        const key = `f${size.toString(16)}`.padEnd(16, "0");
        const value = { name: "a.tif", bytes: new FileBytes(path, size), after: [1.5, "x"] };
        const expected = encodeEntry({ name: "a.tif", bytes, after: [1.5, "x"] });
        expect(encodeEntry(value).equals(expected)).toBe(true);
        cache.putLarge("t", key, value);
        expect(cache.getBytes("t", key)?.equals(expected)).toBe(true);
        expect(sameValue(decodeEntry(cache.getBytes("t", key)!), { name: "a.tif", bytes, after: [1.5, "x"] })).toBe(true);
      }
      const path = join(dir, "short.bin");
      writeFileSync(path, new Uint8Array(10));
      cache.putLarge("t", "5a".padEnd(16, "0"), { bytes: new FileBytes(path, 11) });
      cache.putLarge("t", "5b".padEnd(16, "0"), { bytes: new FileBytes(path, 9) });
      expect(cache.getBytes("t", "5a".padEnd(16, "0"))).toBeUndefined();
      expect(cache.getBytes("t", "5b".padEnd(16, "0"))).toBeUndefined();
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });

  it("gives back arrays of same-shaped number records as the same records (property)", () => {
    fc.assert(
      fc.property(table, (rows) => {
        const back = decodeEntry(encodeEntry({ height_gain: rows })) as { height_gain: typeof rows };
        expect(back.height_gain.length).toBe(rows.length);
        rows.forEach((r, i) => {
          expect(Object.keys(back.height_gain[i])).toEqual(Object.keys(r));
          expect(Object.is(back.height_gain[i].rx_antenna_m, r.rx_antenna_m)).toBe(true);
          expect(Object.is(back.height_gain[i].relative_db, r.relative_db)).toBe(true);
        });
      }),
    );
  });

  it("keeps profile arrays as the same typed arrays, bit for bit", () => {
    const d_m = Float64Array.from({ length: 1001 }, (_, i) => i * 30.7813615984440);
    const h = Float64Array.from(d_m, (d) => 400 + 100 * Math.sin(d / 977) + Number.EPSILON);
    const back = decodeEntry(encodeEntry({ profile: { d_m, h, k: Infinity, worst: NaN } })) as { profile: { d_m: Float64Array; h: Float64Array; k: number; worst: number } };
    expect(back.profile.d_m).toBeInstanceOf(Float64Array);
    expect(Buffer.from(back.profile.h.buffer).equals(Buffer.from(h.buffer))).toBe(true);
    expect(back.profile.k).toBe(Infinity);
    expect(back.profile.worst).toBeNaN();
  });

  it("gives back data that merely looks like the codec's marks as it was (property)", () => {
    const lookalike = fc.oneof(
      fc.constant({ $f: "Infinity" }),
      fc.constant({ $bin: ["Float64Array", 0, 1] }),
      fc.constant({ $table: [["a", "b"], { $bin: ["Float64Array", 0, 8] }, { $bin: ["Float64Array", 64, 8] }] }),
    );
    fc.assert(
      fc.property(fc.array(fc.oneof(lookalike, tree), { maxLength: 6 }), (v) => {
        expect(sameValue(v, decodeEntry(encodeEntry(v)))).toBe(true);
      }),
      { numRuns: 100 },
    );
  });

  it("reads typed arrays in place with views, and copies them when they are not aligned", () => {
    const h_m = Float64Array.from({ length: 300 }, (_, i) => Math.sin(i) * 1e3);
    const bytes = encodeEntry({ profile: { h_m, n: Int16Array.of(1, -2, 3) }, k: -0 });
    const inPlace = decodeEntry(bytes, { views: true }) as { profile: { h_m: Float64Array; n: Int16Array }; k: number };
    expect(inPlace.profile.h_m.buffer).toBe(bytes.buffer);
    expect(sameValue(inPlace.profile.h_m, h_m)).toBe(true);
    expect(Object.is(inPlace.k, -0)).toBe(true);
    const shifted = Buffer.alloc(bytes.length + 1);
    bytes.copy(shifted, 1);
    const copied = decodeEntry(shifted.subarray(1), { views: true }) as typeof inPlace;
    expect(copied.profile.h_m.buffer).not.toBe(shifted.buffer);
    expect(sameValue(copied.profile.h_m, h_m)).toBe(true);
    expect(sameValue(copied.profile.n, Int16Array.of(1, -2, 3))).toBe(true);
  });

  it("packs entries by key and gives each back whole; a damaged pack gives none", () => {
    const values = [{ a: Float64Array.of(1, 2, 3) }, { b: "ridge ″ crest", c: [NaN, Infinity] }, {}];
    const bytes = values.map((v) => encodeEntry(v));
    const pack = encodePack(bytes.map((b, i) => [`k${i}`, b] as const));
    const back = decodePack(pack);
    expect([...back.keys()]).toEqual(["k0", "k1", "k2"]);
    values.forEach((v, i) => {
      expect(back.get(`k${i}`)!.equals(bytes[i])).toBe(true);
      expect(sameValue(decodeEntry(back.get(`k${i}`)!, { views: true }), v)).toBe(true);
    });
    expect(decodePack(pack.subarray(0, pack.length - 8)).size).toBe(0);
    expect(decodePack(Buffer.from("not a pack")).size).toBe(0);
    // the keys come from the header and index alone (what ResultCache.readPackKeys reads)
    const indexEnd = 12 + pack.readUInt32LE(8);
    expect([...packKeys(pack.subarray(0, indexEnd))]).toEqual(["k0", "k1", "k2"]);
    expect(packKeys(pack.subarray(0, indexEnd - 1)).size).toBe(0);
    expect(packKeys(Buffer.from("not a pack")).size).toBe(0);
  });

  it("rejects truncated or foreign bytes instead of returning a wrong value", () => {
    const bytes = encodeEntry({ a: Float64Array.of(1, 2, 3), b: "x" });
    expect(decodeEntry(bytes.subarray(0, bytes.length - 8))).toBeNull();
    expect(decodeEntry(bytes.subarray(0, 20))).toBeNull();
    expect(decodeEntry(Buffer.from("not a cache entry at all"))).toBeNull();
    // a length field of 2^31 or more (found by the damaged-byte property below, on this entry)
    for (const at of [11, 15, 19]) {
      const huge = Buffer.from(encodeEntry(false));
      huge[at] = 0x80;
      expect(decodeEntry(huge), `byte ${at}`).toBeNull();
    }
  });

  it("rejects an entry whose stored array length is damaged (too long, too short, not a count)", () => {
    const bytes = encodeEntry({ warnings: ["a", "b", "c"], h: Float64Array.of(1, 2), x: 7.25 });
    // the numbers column holds the two lengths (3 and 2) and 7.25; find the 3 and replace it
    const three = Buffer.alloc(8);
    three.writeDoubleLE(3);
    const at = bytes.indexOf(three);
    expect(at).toBeGreaterThan(0);
    for (const bad of [1e12, 2, 4, 2.5, -1, NaN]) {
      const damaged = Buffer.from(bytes);
      damaged.writeDoubleLE(bad, at);
      expect(decodeEntry(damaged), String(bad)).toBeNull();
    }
    expect(decodeEntry(Buffer.from(bytes))).toEqual({ warnings: ["a", "b", "c"], h: Float64Array.of(1, 2), x: 7.25 });
  });

  it("never throws on a damaged byte, whatever the value (property)", () => {
    fc.assert(
      fc.property(tree, fc.nat(), fc.integer({ min: 0, max: 255 }), (v, where, byte) => {
        const bytes = Buffer.from(encodeEntry(v));
        bytes[where % bytes.length] = byte;
        expect(() => decodeEntry(bytes)).not.toThrow();
      }),
      { numRuns: 1000 },
    );
  });
});
