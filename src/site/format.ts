/**
 * A number for a page: fixed decimals, a true minus sign, "—" for missing values.
 * Deterministic (no locale): the same value always prints the same way.
 */
export function formatNumber(v: unknown, digits = 1): string {
  if (v === null || v === undefined || typeof v !== "number" || !Number.isFinite(v)) return "—";
  const s = v.toFixed(digits);
  const z = Number(s) === 0 ? (0).toFixed(digits) : s;
  return z.startsWith("-") ? `−${z.slice(1)}` : z;
}
