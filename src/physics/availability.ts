/**
 * How Ridgeline combines outage contributions into availability (for reports and warnings).
 *
 * Link: unavailability = multipath outage % + rain outage %. ITU-R P.530-16 (section
 * "Prediction of total outage") apportions clear-air (multipath) outage mainly to error
 * performance and rain outage to unavailability; adding both into one figure is a common-practice
 * simplification that is conservative, more so because the multipath percentage is for the
 * average worst month while the rain percentage is for an average year.
 * Chain: hops in tandem add their unavailabilities (default, common practice); the product
 * of availabilities is exact when the hops fail independently.
 */
export const AVAILABILITY_METHOD = {
  link: "sum of multipath (worst month) and rain (average year) outage percentages — common practice",
  chain_default: "sum",
} as const;

/** Bound a percentage to [0, 100]; NaN stays NaN. */
function clampPct(x: number): number {
  return Number.isNaN(x) ? NaN : Math.min(100, Math.max(0, x));
}

/**
 * Unavailability (%) of one link: U = p_multipath + p_rain, bounded to [0, 100].
 * Reference: common practice; ITU-R P.530-16 "Prediction of total outage" for the split
 * between performance and availability.
 * @param parts.multipath_outage_pct multipath outage, average worst month (%)
 * @param parts.rain_outage_pct rain outage, average year (%)
 */
export function linkUnavailabilityPct(parts: { multipath_outage_pct: number; rain_outage_pct: number }): number {
  const { multipath_outage_pct, rain_outage_pct } = parts;
  if (!(multipath_outage_pct >= 0) || !(rain_outage_pct >= 0)) return NaN;
  return clampPct(multipath_outage_pct + rain_outage_pct);
}

/**
 * Availability (%) of one link: 100 − {@link linkUnavailabilityPct}.
 * @param parts.multipath_outage_pct multipath outage (%)
 * @param parts.rain_outage_pct rain outage (%)
 */
export function linkAvailabilityPct(parts: { multipath_outage_pct: number; rain_outage_pct: number }): number {
  return 100 - linkUnavailabilityPct(parts);
}

/**
 * Availability (%) of hops in tandem by adding their unavailabilities:
 * A = 100 − Σ (100 − A_i), bounded to [0, 100]. A conservative first-order form
 * (the union bound), common practice for apportioning availability along a route.
 * @param availabilities_pct availability of each hop (%)
 */
export function chainAvailabilitySumPct(availabilities_pct: readonly number[]): number {
  let U = 0;
  for (const a of availabilities_pct) {
    if (!(a >= 0 && a <= 100)) return NaN;
    U += 100 - a;
  }
  return clampPct(100 - U);
}

/**
 * Availability (%) of hops in tandem when they fail independently:
 * A = 100 · Π (A_i / 100). Always ≥ {@link chainAvailabilitySumPct}; the two differ by
 * second-order terms (≈ Σ_i<j U_i·U_j / 100).
 * @param availabilities_pct availability of each hop (%)
 */
export function chainAvailabilityProductPct(availabilities_pct: readonly number[]): number {
  let P = 1;
  for (const a of availabilities_pct) {
    if (!(a >= 0 && a <= 100)) return NaN;
    P *= a / 100;
  }
  return 100 * P;
}

/**
 * Availability (%) of hops in tandem; `method` "sum" (default, conservative common
 * practice) or "product" (exact for independent hops). An empty chain is 100 %.
 * @param availabilities_pct availability of each hop (%)
 * @param options.method combination rule
 */
export function chainAvailabilityPct(
  availabilities_pct: readonly number[],
  options: { method?: "sum" | "product" } = {},
): number {
  return (options.method ?? "sum") === "product"
    ? chainAvailabilityProductPct(availabilities_pct)
    : chainAvailabilitySumPct(availabilities_pct);
}
