/**
 * Arrays of same-shaped all-number records (a height-gain curve, reflection points) as
 * columns: the cache entry codec stores each key's values as one float64 column, which reads
 * back several times faster than the same numbers as JSON text.
 */

/** Set an own property, even one named "__proto__" (plain assignment would set the prototype). */
export const setOwn = (o: Record<string, unknown>, k: string, v: unknown): void => {
  if (k === "__proto__") Object.defineProperty(o, k, { value: v, enumerable: true, writable: true, configurable: true });
  else o[k] = v;
};

/**
 * The keys of an array of at least 8 objects that all have the same keys in the same order
 * and only finite numbers as values; else null (the array is then stored as it is).
 */
export function numericTable(rows: unknown[]): string[] | null {
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

/**
 * The records of a stored table: row r has key names[c] = columns[c][r], keys in the order
 * given. Each row is a copy of a template record with the values then set, which is faster
 * than adding keys one by one (every row then has the template's shape from the start); the
 * objects are the same.
 */
export function tableRows(names: string[], columns: ArrayLike<number>[]): Record<string, number>[] {
  const n = columns[0]?.length ?? 0;
  const rows: Record<string, number>[] = new Array(n);
  const template: Record<string, number> = {};
  for (const k of names) setOwn(template, k, 0);
  const keys = Object.keys(template); // property keys, not the strings JSON.parse made
  if (names.includes("__proto__") || keys.length !== names.length) {
    for (let r = 0; r < n; r++) {
      const row: Record<string, number> = {};
      for (let c = 0; c < names.length; c++) setOwn(row, names[c], columns[c][r]);
      rows[r] = row;
    }
    return rows;
  }
  const m = keys.length;
  for (let r = 0; r < n; r++) {
    const row = { ...template };
    for (let c = 0; c < m; c++) row[keys[c]] = columns[c][r];
    rows[r] = row;
  }
  return rows;
}
