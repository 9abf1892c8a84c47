/**
 * JSON with object keys sorted at every level, so that two equal values always give the same
 * text whatever order their keys were written in. Non-finite numbers, which JSON cannot hold,
 * are written as the strings "NaN", "Infinity" and "-Infinity" (a cache key must tell k = ∞
 * from a missing value). `undefined` members (and functions) are left out, as JSON.stringify
 * does. Keys are sorted by UTF-16 code unit. For hashing only: not meant to be parsed back.
 * Written as one pass that appends to a string (every link's key on every build goes through it).
 */
export function canonicalJson(value: unknown): string {
  if (value === null || value === undefined) return "null";
  if (typeof value === "number") return Number.isFinite(value) ? JSON.stringify(value) : JSON.stringify(String(value));
  if (typeof value === "string" || typeof value === "boolean") return JSON.stringify(value);
  if (ArrayBuffer.isView(value)) return canonicalJson(Array.from(value as unknown as ArrayLike<number>));
  if (Array.isArray(value)) {
    let out = "[";
    for (let i = 0; i < value.length; i++) out += (i ? "," : "") + canonicalJson(value[i]);
    return `${out}]`;
  }
  if (typeof value === "object") {
    const o = value as Record<string, unknown>;
    const keys = Object.keys(o).sort(); // the default order of strings is by UTF-16 code unit
    let out = "{";
    let first = true;
    for (const k of keys) {
      const v = o[k];
      if (v === undefined || typeof v === "function") continue;
      out += `${first ? "" : ","}${JSON.stringify(k)}:${canonicalJson(v)}`;
      first = false;
    }
    return `${out}}`;
  }
  return JSON.stringify(String(value));
}
