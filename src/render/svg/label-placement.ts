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

/**
 * Greedy label placement: the first candidate box that stays inside `frame` and clears every
 * box in `taken`; the first candidate when none does. Returns the index of the candidate.
 * Does not modify `taken`.
 */
export function placeLabel(candidates: Box[], taken: readonly Box[], frame: Box): number {
  const inside = (b: Box) => b.x >= frame.x && b.y >= frame.y && b.x + b.w <= frame.x + frame.w && b.y + b.h <= frame.y + frame.h;
  const i = candidates.findIndex((b) => inside(b) && !taken.some((t) => overlaps(b, t)));
  if (i >= 0) return i;
  const j = candidates.findIndex(inside);
  return j >= 0 ? j : 0;
}
