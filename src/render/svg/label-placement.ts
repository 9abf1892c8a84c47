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
 * The x values never decrease along a polyline, so only the vertices from the first at or
 * right of the box's left edge to the first right of its right edge can count: a binary
 * search finds the first (a profile has hundreds of vertices, a label box spans a few tens).
 */
export function crossesPolyline(b: Box, line: Polyline): boolean {
  const x0 = b.x;
  const x1 = b.x + b.w;
  let lo = Infinity;
  let hi = -Infinity;
  const n = line.length;
  // first vertex with x ≥ x0: every earlier vertex and edge lies left of the box
  let a = 0;
  let z = n;
  while (a < z) {
    const mid = (a + z) >> 1;
    if (line[mid][0] < x0) a = mid + 1;
    else z = mid;
  }
  for (let i = a; i < n; i++) {
    const x = line[i][0];
    const y = line[i][1];
    if (x >= x0 && x <= x1) ((lo = Math.min(lo, y)), (hi = Math.max(hi, y)));
    if (i > 0) {
      const xa = line[i - 1][0];
      const ya = line[i - 1][1];
      if (xa < x0 && x > x0) {
        const ye = ya + ((y - ya) * (x0 - xa)) / (x - xa);
        ((lo = Math.min(lo, ye)), (hi = Math.max(hi, ye)));
      }
      if (xa < x1 && x > x1) {
        const ye = ya + ((y - ya) * (x1 - xa)) / (x - xa);
        ((lo = Math.min(lo, ye)), (hi = Math.max(hi, ye)));
      }
    }
    if (x > x1) break; // later edges start right of the box
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
