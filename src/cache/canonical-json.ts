/**
 * JSON with object keys sorted at every level, so that two equal values always give the same
 * text whatever order their keys were written in. Non-finite numbers, which JSON cannot hold,
 * are written as the strings "NaN", "Infinity" and "-Infinity" (a cache key must tell k = ∞
 * from a missing value). `undefined` members are left out, as JSON.stringify does.
 * For hashing only: the output is not meant to be parsed back.
 */
export function canonicalJson(value: unknown): string {
  if (value === null || value === undefined) return "null";
  if (typeof value === "number") return Number.isFinite(value) ? JSON.stringify(value) : JSON.stringify(String(value));
  if (typeof value === "string" || typeof value === "boolean") return JSON.stringify(value);
  if (ArrayBuffer.isView(value)) return canonicalJson(Array.from(value as unknown as ArrayLike<number>));
  if (Array.isArray(value)) return `[${value.map(canonicalJson).join(",")}]`;
  if (typeof value === "object") {
    const entries = Object.entries(value as Record<string, unknown>)
      .filter(([, v]) => v !== undefined && typeof v !== "function")
      .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
    return `{${entries.map(([k, v]) => `${JSON.stringify(k)}:${canonicalJson(v)}`).join(",")}}`;
  }
  return JSON.stringify(String(value));
}
