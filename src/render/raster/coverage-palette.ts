/** Ramp from weak to strong signal: pale yellow, greens, blue (chosen for this report). */
const RAMP = ["#f3d96b", "#9ccb5c", "#3fa36a", "#1f7a83", "#27457f"];

/**
 * Fill colours ("#rrggbb") for n ascending thresholds, weakest first, sampled evenly along a
 * fixed ramp (linear in RGB between its stops).
 */
export function thresholdColors(n: number): string[] {
  if (n <= 0) return [];
  if (n === 1) return [RAMP[2]];
  return Array.from({ length: n }, (_, i) => rampAt(i / (n - 1)));
}

/** Colour of visible cells on a visibility map. */
export const VISIBLE_COLOR = "#3fa36a";

function rampAt(t: number): string {
  const x = t * (RAMP.length - 1);
  const i = Math.min(RAMP.length - 2, Math.floor(x));
  const f = x - i;
  const a = hexRgb(RAMP[i]);
  const b = hexRgb(RAMP[i + 1]);
  return `#${a.map((v, k) => Math.round(v + (b[k] - v) * f).toString(16).padStart(2, "0")).join("")}`;
}

/** "#rrggbb" → [r, g, b] (0–255). */
export function hexRgb(hex: string): [number, number, number] {
  const h = hex.replace("#", "");
  return [parseInt(h.slice(0, 2), 16), parseInt(h.slice(2, 4), 16), parseInt(h.slice(4, 6), 16)];
}
