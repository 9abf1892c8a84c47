import fc from "fast-check";
import { line } from "d3-shape";
import { describe, expect, it } from "vitest";
import { polylinePath } from "../../src/render/svg/polyline-path.ts";

// polylinePath must write what d3-shape's line().digits(1) writes (the profile plot's paths
// were drawn with d3 before; the site must stay byte-identical). Reference: d3-shape 3.2.1.
const d3Path = (xs: number[], ys: number[]) => line<number>().x((i) => xs[i]).y((i) => ys[i]).digits(1)(xs.map((_, i) => i));

describe("polylinePath", () => {
  it.each([
    [[], []],
    [[1.25], [2.35]],
    [[0, 100.04, 200.05], [-0.05, 1e-7, 12345.678]],
    [[0, NaN, 3], [1, 2, Infinity]],
  ])("%j, %j: the same string as d3's line().digits(1)", (xs, ys) => expect(polylinePath(xs, ys)).toBe(d3Path(xs, ys)));

  it("property: the same string as d3 for any coordinates", () => {
    const coord = fc.double({ min: -1e6, max: 1e6, noNaN: true });
    fc.assert(
      fc.property(fc.array(fc.tuple(coord, coord), { maxLength: 40 }), (pts) => {
        const xs = pts.map((p) => p[0]);
        const ys = pts.map((p) => p[1]);
        expect(polylinePath(xs, ys)).toBe(d3Path(xs, ys));
      }),
    );
  });
});
