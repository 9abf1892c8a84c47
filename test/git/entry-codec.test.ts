import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { decodeEntry, encodeEntry } from "../../src/cache/entry-codec.ts";

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

  it("stores arrays of same-shaped number records as columns and gives back the same records (property)", () => {
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

  it("rejects truncated or foreign bytes instead of returning a wrong value", () => {
    const bytes = encodeEntry({ a: Float64Array.of(1, 2, 3), b: "x" });
    expect(decodeEntry(bytes.subarray(0, bytes.length - 8))).toBeNull();
    expect(decodeEntry(bytes.subarray(0, 20))).toBeNull();
    expect(decodeEntry(Buffer.from("not a cache entry at all"))).toBeNull();
  });
});
