/**
 * SVG path data of a polyline through (xs[i], ys[i]), coordinates rounded to 0.1 px: the same
 * string as d3-shape's `line().digits(1)` with the linear curve over points that are all
 * defined ("M x,y" then "L x,y" for each further point; a single point closes with "Z"), made
 * without d3's per-point accessor calls and tagged-template appends, which were a fifth of
 * drawing a path profile. Null for no points, as d3 gives. `test/unit/polyline-path.test.ts`
 * compares the two.
 */
export function polylinePath(xs: ArrayLike<number>, ys: ArrayLike<number>): string | null {
  const n = Math.min(xs.length, ys.length);
  if (n === 0) return null;
  let out = "M" + Math.round(xs[0] * 10) / 10 + "," + Math.round(ys[0] * 10) / 10;
  for (let i = 1; i < n; i++) out += "L" + Math.round(xs[i] * 10) / 10 + "," + Math.round(ys[i] * 10) / 10;
  return n === 1 ? out + "Z" : out;
}
