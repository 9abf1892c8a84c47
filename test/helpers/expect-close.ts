import { expect } from "vitest";

/**
 * Tolerance for one comparison: absolute (same unit as the values) and/or
 * relative (fraction of |expected|). The check passes when either holds.
 */
export interface Tolerance {
  abs?: number;
  rel?: number;
}

/**
 * Assert that `actual` is within tolerance of `expected`. On failure the message
 * prints the input (a label and any context), expected, actual, difference and tolerance.
 */
export function expectClose(
  actual: number,
  expected: number,
  tol: Tolerance,
  context: string | Record<string, unknown> = "",
): void {
  const diff = actual - expected;
  const absOk = tol.abs !== undefined && Math.abs(diff) <= tol.abs;
  const relOk = tol.rel !== undefined && Math.abs(diff) <= tol.rel * Math.abs(expected);
  const bothNaN = Number.isNaN(actual) && Number.isNaN(expected);
  if (!(absOk || relOk || bothNaN)) {
    const ctx = typeof context === "string" ? context : JSON.stringify(context);
    const relDiff = expected !== 0 ? Math.abs(diff / expected) : Infinity;
    expect.fail(
      `${ctx}\n  expected  ${expected}\n  actual    ${actual}\n  diff      ${diff} (relative ${relDiff.toExponential(3)})\n` +
        `  tolerance ${tol.abs !== undefined ? `abs ${tol.abs}` : ""}${tol.abs !== undefined && tol.rel !== undefined ? " or " : ""}${tol.rel !== undefined ? `rel ${tol.rel}` : ""}`,
    );
  }
}

/** Parse a small CSV with a header row into records of strings. */
export function parseCsv(text: string): Record<string, string>[] {
  const lines = text.split(/\r?\n/).filter((l) => l.trim() !== "" && !l.startsWith("#"));
  const header = lines[0].split(",").map((h) => h.trim());
  return lines.slice(1).map((line) => {
    const cells = line.split(",");
    const row: Record<string, string> = {};
    header.forEach((h, i) => (row[h] = (cells[i] ?? "").trim()));
    return row;
  });
}
