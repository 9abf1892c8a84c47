/** An axis-aligned box in SVG pixels. */
export interface Box {
  x: number;
  y: number;
  w: number;
  h: number;
}

/** Rough advance width (px) of text in DejaVu Sans at `size_px` (about 0.6 em a character). */
export function textWidthPx(text: string, size_px: number): number {
  return Array.from(text).length * size_px * 0.6;
}

/** True when two boxes overlap (touching edges do not count). */
export function overlaps(a: Box, b: Box): boolean {
  return a.x < b.x + b.w && b.x < a.x + a.w && a.y < b.y + b.h && b.y < a.y + a.h;
}

/** A line drawn in the figure, as pixel points in increasing x (a profile, a ray). */
export type Polyline = readonly (readonly [number, number])[];

/**
 * True when the polyline passes through the box: its y range over the box's x interval
 * (vertices inside it and the line interpolated at both edges) meets the box's y range.
 */
export function crossesPolyline(b: Box, line: Polyline): boolean {
  const x0 = b.x;
  const x1 = b.x + b.w;
  let lo = Infinity;
  let hi = -Infinity;
  const take = (y: number) => ((lo = Math.min(lo, y)), (hi = Math.max(hi, y)));
  for (let i = 0; i < line.length; i++) {
    const [x, y] = line[i];
    if (x >= x0 && x <= x1) take(y);
    if (i > 0) {
      const [xa, ya] = line[i - 1];
      for (const xe of [x0, x1]) if (xa < xe && x > xe) take(ya + ((y - ya) * (xe - xa)) / (x - xa));
    }
  }
  return lo <= b.y + b.h && hi >= b.y;
}

/**
 * Greedy label placement: the first candidate box that stays inside `frame` and clears every
 * box in `taken` and every line in `lines`; failing that, the first that clears the boxes;
 * the first candidate when none does. Returns the index of the candidate. Does not modify `taken`.
 */
export function placeLabel(candidates: Box[], taken: readonly Box[], frame: Box, lines: readonly Polyline[] = []): number {
  const inside = (b: Box) => b.x >= frame.x && b.y >= frame.y && b.x + b.w <= frame.x + frame.w && b.y + b.h <= frame.y + frame.h;
  const free = (b: Box) => inside(b) && !taken.some((t) => overlaps(b, t));
  const k = candidates.findIndex((b) => free(b) && !lines.some((l) => crossesPolyline(b, l)));
  if (k >= 0) return k;
  const i = candidates.findIndex(free);
  if (i >= 0) return i;
  const j = candidates.findIndex(inside);
  return j >= 0 ? j : 0;
}
