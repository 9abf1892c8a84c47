/** Unit of a study field from its name's suffix (antenna_m → "m", frequency_ghz → "GHz"); "" when none. */
export function unitOf(field: string): string {
  const suffixes: [RegExp, string][] = [
    [/_dbm$/, "dBm"],
    [/_dbi$/, "dBi"],
    [/_db$/, "dB"],
    [/_ghz$/, "GHz"],
    [/_pct$/, "%"],
    [/_deg$/, "°"],
    [/_mm_h$/, "mm/h"],
    [/_hpa$/, "hPa"],
    [/_g_m3$/, "g/m³"],
    [/_c$/, "°C"],
    [/_f1$/, "F1"],
    [/_m$/, "m"],
  ];
  return suffixes.find(([re]) => re.test(field))?.[1] ?? "";
}

/**
 * A number for a change report: at most `digits` decimals, trailing zeros dropped, a true
 * minus sign, and a leading "+" when `signed` (so deltas read +2.5 / −16). Deterministic.
 */
export function showNumber(v: number, digits = 6, signed = false): string {
  if (!Number.isFinite(v)) return String(v);
  let s = String(Number(v.toFixed(digits)));
  if (s === "-0") s = "0";
  if (s.startsWith("-")) return `−${s.slice(1)}`;
  return signed && s !== "0" ? `+${s}` : s;
}

/** A number with exactly `digits` decimals, a true minus sign and optionally a leading "+". */
export function showFixed(v: number, digits: number, signed = false): string {
  if (!Number.isFinite(v)) return String(v);
  let s = v.toFixed(digits);
  if (Number(s) === 0) s = (0).toFixed(digits);
  if (s.startsWith("-")) return `−${s.slice(1)}`;
  return signed && Number(s) !== 0 ? `+${s}` : s;
}

/**
 * "36 m → 20 m (+16 m)" for numbers with a unit; "h → v" otherwise. Input values are shown as
 * written (up to `digits` decimals); with `fixed`, every number gets exactly `digits` decimals
 * (results: "48.00 dB → 50.00 dB (+2.00 dB)").
 */
export function showBeforeAfter(before: unknown, after: unknown, unit: string, digits = 6, fixed = false): string {
  const u = unit ? (unit === "%" || unit === "°" ? unit : ` ${unit}`) : "";
  const num = (v: number, signed = false) => (fixed ? showFixed(v, digits, signed) : showNumber(v, digits, signed));
  const one = (v: unknown) => (v === null || v === undefined ? "—" : typeof v === "number" ? `${num(v)}${u}` : String(v));
  const delta = typeof before === "number" && typeof after === "number" ? ` (${num(after - before, true)}${u})` : "";
  return `${one(before)} → ${one(after)}${delta}`;
}
