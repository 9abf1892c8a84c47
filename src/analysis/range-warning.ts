/**
 * A warning when `value` lies outside the method's stated range, naming the method, the
 * quantity and the range; null when inside. Never silent extrapolation.
 */
export function rangeWarning(method: string, quantity: string, value: number, range: readonly [number, number], unit: string): string | null {
  if (!Number.isFinite(value) || (value >= range[0] && value <= range[1])) return null;
  const fmt = (x: number) => (Math.abs(x) >= 100 || Number.isInteger(x) ? x.toFixed(0) : x.toPrecision(3));
  return `${method}: ${quantity} ${fmt(value)} ${unit} is outside the method's range ${fmt(range[0])}–${fmt(range[1])} ${unit}; the result is an extrapolation.`;
}
