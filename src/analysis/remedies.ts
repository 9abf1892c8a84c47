import { rainAttenuationAtPercent } from "../physics/rain-path-attenuation.ts";
import type { LinkPerformance } from "./link-performance.ts";
import { formatNumber, formatSmall } from "../format/quantity.ts";

/** One thing wrong with a link and what would fix it. */
export interface Remedy {
  /** What misses its target. */
  issue: string;
  /** What would fix it, with the figure that sizes it. */
  fix: string;
}

/**
 * What would bring a failing link to its targets, sized from its own results: antenna heights
 * from the minimum-height search, the margin a short-fade or rain objective lacks (deep-fade
 * law: 10 dB per decade of outage, ITU-R P.530-16 eq. (13); rain: the attenuation the
 * §2.4.1 scaling law gives at the allowed percentage), and the capacity target's mode.
 * Estimates for a designer to confirm by running the study again.
 */
export function linkRemedies(r: {
  clearance_met: boolean;
  minimum_heights: { from_antenna_m: number; to_antenna_m: number } | null;
  antenna_m: { from: number; to: number };
  search_max_m: number;
  fade_margin_db: number;
  rain_margin_db: number;
  frequency_ghz: number;
  perf: LinkPerformance;
}): Remedy[] {
  const out: Remedy[] = [];
  if (!r.clearance_met) {
    out.push(
      r.minimum_heights
        ? { issue: "clearance short of the criteria", fix: `antennas at ${r.minimum_heights.from_antenna_m} m and ${r.minimum_heights.to_antenna_m} m above ground clear the path (the lowest pair the search found; now ${r.antenna_m.from} m and ${r.antenna_m.to} m), or move a site` }
        : { issue: "clearance short of the criteria", fix: `no pair of antenna heights up to ${r.search_max_m} m clears the path: move a site or add a repeater` },
    );
  }
  if (!(r.fade_margin_db > 0)) {
    out.push({ issue: `median level ${formatNumber(-r.fade_margin_db, 1)} dB below threshold plus allowance`, fix: `find at least ${formatNumber(-r.fade_margin_db, 1)} dB plus the fade margin the objectives need: larger antennas, more power, a more sensitive mode, or a clear path` });
    return out;
  }
  const { performance, availability } = r.perf.objectives;
  if (!performance.met) {
    const allowed = 100 - performance.target_pct;
    const extra = 10 * Math.log10(performance.outage_pct / allowed);
    out.push({
      issue: `short-fade outage ${formatSmall(performance.outage_pct, 3)} % of the worst month against ${formatSmall(allowed, 3)} % allowed`,
      fix: `about ${formatNumber(extra, 1)} dB more flat fade margin (deep fades fall tenfold per 10 dB)${r.perf.diversity ? "" : ", or space diversity"}${r.perf.dispersive ? ", or a radio with a narrower, deeper signature" : ""}`,
    });
  }
  if (!availability.met) {
    const allowed = 100 - availability.target_pct;
    const A001 = r.perf.rain_0_01pct_db;
    const need = A001 === null ? NaN : rainAttenuationAtPercent(A001, allowed, r.frequency_ghz) - r.rain_margin_db;
    out.push({
      issue: `long outage ${formatSmall(availability.outage_pct, 3)} % of the year against ${formatSmall(allowed, 3)} % allowed`,
      fix: Number.isFinite(need) && need > 0 ? `about ${formatNumber(need, 1)} dB more rain fade margin (ITU-R P.530-16 §2.4.1 at ${formatSmall(allowed, 3)} %), a shorter hop, or a lower band` : "more rain fade margin, a shorter hop or a lower band",
    });
  }
  const t = r.perf.adaptive_modulation?.target;
  if (t && !t.met) out.push({ issue: `${t.capacity_there_mbps} Mbit/s available for ${t.availability_pct} % of the year against ${t.capacity_mbps} Mbit/s required`, fix: "more fade margin for the mode that carries the required capacity (larger antennas, more power), or a lower required availability for that capacity" });
  return out;
}
