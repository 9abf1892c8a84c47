/**
 * The one home for writing a quantity as text: pages, captions, figure labels, warnings and the
 * CLI all call these, so a value reads the same everywhere. Deterministic (no locale), true minus
 * signs (U+2212), a space between a number and its unit (SI Brochure, 9th ed., §5.4.3), "—" for a
 * missing value, never exponent notation ("e+4") in text a person reads.
 *
 * A leaf module: it imports nothing of the project, so every layer may use it.
 */

const MINUS = "−";

const isNum = (v: unknown): v is number => typeof v === "number" && Number.isFinite(v);

/** A number with fixed decimals and a true minus sign; "—" for missing values; −0.00 prints as 0.00. */
export function formatNumber(v: unknown, digits = 1): string {
  if (!isNum(v)) return "—";
  const s = v.toFixed(digits);
  const z = Number(s) === 0 ? (0).toFixed(digits) : s;
  return z.startsWith("-") ? `${MINUS}${z.slice(1)}` : z;
}

/** The same for figure labels, where the value is always a number. */
export const fixed = (v: number, digits: number): string => formatNumber(v, digits);

/** A number with an explicit sign: "+12.00", "−1.50"; zero prints without a sign ("0.00"). */
export function formatSigned(v: unknown, digits = 1): string {
  if (!isNum(v)) return "—";
  const s = formatNumber(v, digits);
  return Number(v.toFixed(digits)) > 0 ? `+${s}` : s;
}

const SUPERSCRIPT: Record<string, string> = { "-": "⁻", "0": "⁰", "1": "¹", "2": "²", "3": "³", "4": "⁴", "5": "⁵", "6": "⁶", "7": "⁷", "8": "⁸", "9": "⁹" };

/** 10 to an integer power as "10⁻⁶". */
export function powerOfTen(exponent: number): string {
  return `10${String(exponent).replace(/./g, (c) => SUPERSCRIPT[c] ?? c)}`;
}

/**
 * A small quantity (a percentage of time, a conductivity) to `sig` significant figures: plain
 * from 0.1 up, as "1.24 × 10⁻⁴" below; "0" for zero and "—" for missing values.
 */
export function formatSmall(v: unknown, sig = 3): string {
  if (!isNum(v)) return "—";
  if (v === 0) return "0";
  if (Math.abs(v) >= 0.1) return formatNumber(Number(v.toPrecision(sig)), Math.max(0, sig - 1 - Math.floor(Math.log10(Math.abs(v)))));
  const [m, e] = v.toExponential(sig - 1).split("e");
  return `${m.replace("-", MINUS)} × ${powerOfTen(Number(e))}`;
}

/** A bit-error ratio as the study wrote it ("1e-6" → "10⁻⁶", "2e-5" → "2 × 10⁻⁵"). */
export function formatRatio(v: unknown): string {
  const n = typeof v === "string" ? Number(v) : v;
  if (!isNum(n) || n <= 0) return typeof v === "string" ? v : "—";
  const e = Math.floor(Math.log10(n) + 1e-12);
  const m = n / 10 ** e;
  if (Math.abs(m - 1) < 1e-9) return powerOfTen(e);
  return formatSmall(n, 3);
}

/**
 * A percentage of time. Near 100 % (availability) with `digits` decimals, enough to tell
 * 99.999 from 99.9999; below 99 % with two; small shares (unavailability) by formatSmall.
 * No unit: callers add " %".
 */
export function formatPercent(v: unknown, digits = 5): string {
  if (!isNum(v)) return "—";
  if (v >= 99) return formatNumber(v, digits);
  if (v >= 0.1) return formatNumber(v, 2);
  return formatSmall(v, 3);
}

/** A duration in seconds as "39 s", "12.5 min", "3.2 h" or "4.1 days" (per year, in tables). */
export function formatDuration(seconds: unknown): string {
  if (!isNum(seconds)) return "—";
  if (seconds < 60) return `${formatNumber(seconds, seconds < 10 ? 1 : 0)} s`;
  if (seconds < 3600) return `${formatNumber(seconds / 60, 1)} min`;
  if (seconds < 86_400 * 2) return `${formatNumber(seconds / 3600, 1)} h`;
  return `${formatNumber(seconds / 86_400, 1)} days`;
}

/**
 * A carrier frequency given in GHz, with its unit: MHz with one decimal below 1 GHz
 * ("458.5 MHz"), GHz with three decimals from 1 GHz up ("11.245 GHz"). A value the fixed
 * decimals would round (a 12.5 kHz channel, 458.5125 MHz) keeps up to three more.
 */
export function formatFrequency(ghz: unknown): string {
  if (!isNum(ghz) || ghz <= 0) return "—";
  const [value, unit, digits] = ghz < 1 ? [ghz * 1000, "MHz", 1] : [ghz, "GHz", 3];
  let d = digits;
  while (d < digits + 3 && Math.abs(Number(value.toFixed(d)) - value) > 1e-9 * Math.max(1, value)) d++;
  return `${formatNumber(value, d)} ${unit}`;
}

/**
 * An effective Earth-radius factor k as the study wrote it: its label ("4/3", "inf" as "∞",
 * "1.2") when there is one, else the number with up to three decimals and 4/3 and 2/3 as
 * fractions.
 */
export function formatK(k: unknown): string {
  if (typeof k === "string") return k === "inf" ? "∞" : k.replace(/-(?=\d)/g, MINUS);
  if (!isNum(k)) return k === Infinity ? "∞" : "—";
  for (const [num, den] of [[4, 3], [2, 3], [1, 1]] as const) if (Math.abs(k - num / den) < 1e-9) return den === 1 ? String(num) : `${num}/${den}`;
  return formatNumber(k, 3).replace(/\.?0+$/, "");
}

/** A latitude and longitude pair in decimal degrees with true minus signs: "−41.07514°, −32.20986°". */
export function formatLatLon(lat_deg: unknown, lon_deg: unknown, digits = 5): string {
  return `${formatNumber(lat_deg, digits)}°, ${formatNumber(lon_deg, digits)}°`;
}

/**
 * A value with a unit, rounded to about three significant figures without exponent notation:
 * for range statements in warnings ("0.001–1 %", "458.5 MHz"). GHz values go through
 * formatFrequency.
 */
export function formatValue(v: number, unit: string): string {
  if (unit === "GHz") return formatFrequency(v);
  const text =
    Math.abs(v) >= 100 || Number.isInteger(v)
      ? formatNumber(v, 0)
      : Math.abs(v) >= 0.001
        ? formatNumber(Number(v.toPrecision(3)), Math.max(0, 2 - Math.floor(Math.log10(Math.abs(v))))).replace(/(\.\d*?)0+$/, "$1").replace(/\.$/, "")
        : formatSmall(v, 3);
  return unit ? `${text} ${unit}` : text;
}
