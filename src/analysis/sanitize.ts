/**
 * Replace every NaN or ±Infinity in a result by null and say so in `warnings`, naming the
 * field, so that results.json never carries NaN and a page never prints it.
 * Returns a new object; the input is not changed.
 */
export function sanitizeNumbers<T>(value: T, warnings: string[], where: string): T {
  const walk = (v: unknown, path: string): unknown => {
    if (typeof v === "number") {
      if (Number.isFinite(v)) return v;
      warnings.push(`${where}: ${path} could not be computed (${String(v)}); shown as not available.`);
      return null;
    }
    if (Array.isArray(v)) return v.map((x, i) => walk(x, `${path}[${i}]`));
    if (v && typeof v === "object" && !ArrayBuffer.isView(v)) {
      const o: Record<string, unknown> = {};
      for (const [k, x] of Object.entries(v)) o[k] = walk(x, path ? `${path}.${k}` : k);
      return o;
    }
    return v;
  };
  return walk(value, "") as T;
}
