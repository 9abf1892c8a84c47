import { formatValue } from "../format/quantity.ts";

/**
 * A warning when `value` lies outside the method's stated range, naming the method, the
 * quantity and the range; null when inside. Never silent extrapolation.
 */
export function rangeWarning(method: string, quantity: string, value: number, range: readonly [number, number], unit: string): string | null {
  if (!Number.isFinite(value) || (value >= range[0] && value <= range[1])) return null;
  return `${method}: ${quantity} ${formatValue(value, unit)} is outside the method's range ${formatValue(range[0], "")}–${formatValue(range[1], "")} ${unit}; the result is an extrapolation.`;
}
