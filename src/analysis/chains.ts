import { chainAvailabilityPct } from "../physics/availability.ts";
import type { Study } from "../study/study.ts";
import { DEFAULT_PERFORMANCE_PCT } from "./link-performance.ts";
import type { LinkResult } from "./results.ts";

export interface ChainResult {
  id: string;
  name: string;
  links: string[];
  /** Availability objective: long outages (rain, rain depolarisation) of the hops added per year (%). */
  availability_pct: number | null;
  target_availability_pct: number;
  availability_met: boolean;
  /** Performance objective: short-fade outages of the hops added per worst month (%). */
  performance_pct: number | null;
  target_performance_pct: number;
  performance_met: boolean;
  /** Every mechanism of every hop per year: the combined figure, for comparison (%). */
  combined_availability_pct: number | null;
  /** Both objectives met. */
  target_met: boolean;
}

/** Both objectives of each hop chain: hops in tandem, outages added (common practice). */
export function chainResults(study: Study, links: LinkResult[]): ChainResult[] {
  return study.chains.map((c) => {
    const hops = c.links.map((id) => links.find((l) => l.id === id));
    const sum = (get: (h: LinkResult) => number | null | undefined): number | null => {
      const v = hops.map((h) => (h ? get(h) : undefined));
      return v.every((a): a is number => typeof a === "number") ? chainAvailabilityPct(v) : null;
    };
    const availability_pct = sum((h) => h.availability_pct);
    const performance_pct = sum((h) => h.performance_pct);
    const combined_availability_pct = sum((h) => (h.objectives ? h.objectives.combined.availability_pct : undefined));
    const target = study.design.availability_pct;
    const perfTarget = study.design.performance_pct ?? DEFAULT_PERFORMANCE_PCT;
    const availability_met = availability_pct !== null && availability_pct >= target;
    const performance_met = performance_pct !== null && performance_pct >= perfTarget;
    return {
      id: c.id,
      name: c.name ?? c.id,
      links: c.links,
      availability_pct,
      target_availability_pct: target,
      availability_met,
      performance_pct,
      target_performance_pct: perfTarget,
      performance_met,
      combined_availability_pct,
      target_met: availability_met && performance_met,
    };
  });
}
