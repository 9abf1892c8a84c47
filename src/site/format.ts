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

const SUPERSCRIPT: Record<string, string> = { "-": "⁻", "0": "⁰", "1": "¹", "2": "²", "3": "³", "4": "⁴", "5": "⁵", "6": "⁶", "7": "⁷", "8": "⁸", "9": "⁹" };

/**
 * A small quantity (a percentage of time, say) to `sig` significant figures: plain from 0.1
 * up, as "1.24 × 10⁻⁴" below; "0" for zero and "—" for missing values.
 */
export function formatSmall(v: unknown, sig = 3): string {
  if (v === null || v === undefined || typeof v !== "number" || !Number.isFinite(v)) return "—";
  if (v === 0) return "0";
  if (Math.abs(v) >= 0.1) return formatNumber(Number(v.toPrecision(sig)), Math.max(0, sig - 1 - Math.floor(Math.log10(Math.abs(v)))));
  const [m, e] = v.toExponential(sig - 1).split("e");
  const exp = String(Number(e)).replace(/./g, (c) => SUPERSCRIPT[c] ?? c);
  return `${m.replace("-", "−")} × 10${exp}`;
}

/** A duration in seconds as "39 s", "12.5 min", "3.2 h" or "4.1 days" (per year, in tables). */
export function formatDuration(seconds: unknown): string {
  if (seconds === null || seconds === undefined || typeof seconds !== "number" || !Number.isFinite(seconds)) return "—";
  if (seconds < 60) return `${formatNumber(seconds, seconds < 10 ? 1 : 0)} s`;
  if (seconds < 3600) return `${formatNumber(seconds / 60, 1)} min`;
  if (seconds < 86_400 * 2) return `${formatNumber(seconds / 3600, 1)} h`;
  return `${formatNumber(seconds / 86_400, 1)} days`;
}
