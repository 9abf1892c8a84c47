import { chainAvailabilityPct } from "../physics/availability.ts";
import type { Study } from "../study/study.ts";
import type { LinkResult } from "./results.ts";

export interface ChainResult {
  id: string;
  name: string;
  links: string[];
  availability_pct: number | null;
  target_availability_pct: number;
  target_met: boolean;
}

/** Availability of each hop chain: hops in tandem, unavailabilities added (common practice). */
export function chainResults(study: Study, links: LinkResult[]): ChainResult[] {
  return study.chains.map((c) => {
    const hops = c.links.map((id) => links.find((l) => l.id === id));
    const av = hops.map((h) => h?.availability_pct);
    const ok = av.every((a): a is number => typeof a === "number");
    const availability_pct = ok ? chainAvailabilityPct(av) : null;
    const target = study.design.availability_pct;
    return { id: c.id, name: c.name ?? c.id, links: c.links, availability_pct, target_availability_pct: target, target_met: availability_pct !== null && availability_pct >= target };
  });
}
