import { formatFrequency, formatNumber } from "../format/quantity.ts";

/** A link's (or a coverage's) warnings as a reviewer reads them. */
export interface ReviewedWarnings {
  /** One entry per method, in first-seen order: the method and what left its range, deduplicated. */
  groups: { method: string; items: string[] }[];
  /** Terms too small to matter, stated once as a note rather than a warning. */
  notes: string[];
}

/** Below this frequency gaseous absorption is a negligible term (common practice: < 0.1 dB/km's tenth). */
const GAS_NEGLIGIBLE_BELOW_GHZ = 1;

/**
 * Group warnings by the method they name ("ITU-R P.530-16 §2.4.1: frequency … is outside …"),
 * drop repeats, and turn the extrapolation of gaseous absorption below 1 GHz — where it is a
 * few hundredths of a dB — into one note.
 * @param ctx.frequency_ghz carrier frequency (GHz)
 * @param ctx.gases_db gaseous absorption over the path (dB), when known
 */
export function reviewWarnings(warnings: readonly string[], ctx: { frequency_ghz?: number; gases_db?: number | null }): ReviewedWarnings {
  const groups: ReviewedWarnings["groups"] = [];
  const notes: string[] = [];
  const seen = new Set<string>();
  for (const w of warnings) {
    if (seen.has(w)) continue;
    seen.add(w);
    const m = /^((?:ITU-R |Diffraction \(|Okumura|COST)[^:]*): (.+)$/.exec(w);
    const method = m ? m[1] : "";
    const item = m ? m[2] : w;
    if (method.startsWith("ITU-R P.676") && ctx.frequency_ghz !== undefined && ctx.frequency_ghz < GAS_NEGLIGIBLE_BELOW_GHZ) {
      const amount = typeof ctx.gases_db === "number" ? `${formatNumber(ctx.gases_db, 2)} dB over this path` : "a few hundredths of a dB";
      notes.push(`Gaseous absorption is negligible at ${formatFrequency(ctx.frequency_ghz)} (${amount}); it is taken from ${method}, whose range starts at 1 GHz.`);
      continue;
    }
    let g = groups.find((x) => x.method === method);
    if (!g) groups.push((g = { method, items: [] }));
    g.items.push(item.charAt(0).toUpperCase() + item.slice(1));
  }
  return { groups, notes };
}
