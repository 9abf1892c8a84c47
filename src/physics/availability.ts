/** Bound a percentage to [0, 100]; NaN stays NaN. */
function clampPct(x: number): number {
  return Number.isNaN(x) ? NaN : Math.min(100, Math.max(0, x));
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
