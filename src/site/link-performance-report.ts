import type { LinkResult } from "../analysis/results.ts";
import { formatSmall } from "../format/quantity.ts";

/** One line of an objective's table: a mechanism, its outage and where it comes from. */
export interface OutageRow {
  mechanism: string;
  reference: string;
  /** Outage (%), or null when not applicable. */
  pct: number | null;
  /** Shown instead of the number (a range statement such as "< 0.001 %"). */
  text?: string;
  /** Seconds in the objective's period (worst month or year). */
  seconds: number | null;
  total?: boolean;
}

export interface ObjectiveTable {
  title: string;
  period: string;
  rows: OutageRow[];
  achieved_pct: number;
  target_pct: number;
  met: boolean;
}

export interface LinkPerformanceReport {
  performance: ObjectiveTable | null;
  availability: ObjectiveTable | null;
  combined: { availability_pct: number; note: string } | null;
  /** Design and minimum antenna heights at each end, or null when the search found none. */
  heights: { end: string; site: string; design_m: number; minimum_m: number; raise_m: number }[] | null;
}

const SECONDS_PER_YEAR = 365.25 * 86_400;
/** The worst month as the Recommendation counts it: 30 days (common practice). */
const SECONDS_PER_MONTH = 30 * 86_400;
const num = (v: unknown): number | null => (typeof v === "number" && Number.isFinite(v) ? v : null);

const RAIN_TEXT: Record<string, string> = {
  below_0_001_pct: "< 0.001 % (below the method's 0.001–1 %; extrapolated)",
  below_method_range: "below the method's range (< 0.001 %), counted as 0",
  above_1_pct: "> 1 % (above the method's range)",
  link_does_not_close: "— (the link does not close)",
  no_rain_rate: "not computed (no rain rate)",
};

/** The two objectives' tables and the minimum heights of a link, from its result only. */
export function linkPerformanceReport(l: LinkResult): LinkPerformanceReport {
  const av = l.availability ?? {};
  const o = l.objectives;
  const month = (p: number | null) => (p === null ? null : (p / 100) * SECONDS_PER_MONTH);
  const year = (p: number | null) => (p === null ? null : (p / 100) * SECONDS_PER_YEAR);
  let performance: ObjectiveTable | null = null;
  let availability: ObjectiveTable | null = null;
  if (o) {
    const flat = num(av.multipath_worst_month_pct);
    const disp = num(av.dispersive_worst_month_pct);
    const rows: OutageRow[] = [
      { mechanism: "Flat multipath fading", reference: "ITU-R P.530-16 §2.3.1–§2.3.2", pct: flat, seconds: month(flat) },
      disp === null
        ? { mechanism: "Dispersive (selective) fading", reference: "ITU-R P.530-16 §2.3.6", pct: null, text: "not assessed: the radio has no signature", seconds: null }
        : { mechanism: "Dispersive (selective) fading", reference: "ITU-R P.530-16 §2.3.6 (signature method)", pct: disp, seconds: month(disp) },
    ];
    if (l.diversity) {
      rows.push({ mechanism: `Flat + dispersive with ${l.diversity.kind} diversity (improvement ${formatSmall(l.diversity.improvement, 3)})`, reference: "ITU-R P.530-16 §6.2.2", pct: l.diversity.outage_with_pct, seconds: month(l.diversity.outage_with_pct) });
    }
    if (l.xpd) rows.push({ mechanism: "Cross-polar discrimination, clear air", reference: "ITU-R P.530-16 §4.1", pct: l.xpd.clear_air_worst_month_pct, seconds: month(l.xpd.clear_air_worst_month_pct) });
    rows.push({ mechanism: l.diversity ? "Total (with diversity)" : "Total", reference: l.diversity ? "diversity outage + XPD" : "sum of the above", pct: o.performance.outage_pct, seconds: month(o.performance.outage_pct), total: true });
    performance = { title: "Performance: short fades", period: "average worst month", rows, achieved_pct: o.performance.achieved_pct, target_pct: o.performance.target_pct, met: o.performance.met };

    const rain = num(av.rain_annual_pct);
    const range = typeof av.rain_range === "string" ? av.rain_range : "within";
    const arows: OutageRow[] = [{ mechanism: "Rain", reference: "ITU-R P.838-3, P.530-16 §2.4.1", pct: rain, ...(RAIN_TEXT[range] ? { text: RAIN_TEXT[range] } : {}), seconds: year(rain) }];
    if (l.xpd) arows.push({ mechanism: "Cross-polar discrimination, rain", reference: "ITU-R P.530-16 §4.2", pct: l.xpd.rain_annual_pct, seconds: year(l.xpd.rain_annual_pct) });
    if (!((l.fade_margin_db ?? 0) > 0)) arows.push({ mechanism: "Median level below threshold", reference: "link budget", pct: 100, seconds: year(100) });
    arows.push({ mechanism: "Total", reference: "sum of the above", pct: o.availability.outage_pct, seconds: year(o.availability.outage_pct), total: true });
    availability = { title: "Availability: long outages", period: "average year", rows: arows, achieved_pct: o.availability.achieved_pct, target_pct: o.availability.target_pct, met: o.availability.met };
  }
  const mh = l.minimum_heights;
  const heights = mh
    ? [
        { end: "From", site: l.ends.from.name, design_m: l.ends.from.antenna_m, minimum_m: mh.from_antenna_m, raise_m: Math.max(0, mh.from_antenna_m - l.ends.from.antenna_m) },
        { end: "To", site: l.ends.to.name, design_m: l.ends.to.antenna_m, minimum_m: mh.to_antenna_m, raise_m: Math.max(0, mh.to_antenna_m - l.ends.to.antenna_m) },
      ]
    : null;
  return { performance, availability, combined: o ? { availability_pct: o.combined.availability_pct, note: o.combined.note } : null, heights };
}
