import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { GradientNoise, RotatedFractalNoise, thermalErosion } from "../../src/terrain/gradient-noise.ts";
import { mulberry32 } from "../../src/terrain/mulberry32.ts";
import { ValueNoise } from "../../src/terrain/value-noise.ts";

// The demo terrain's generators (issue 18 §10): gradient noise turned off the grid, ridged
// octaves, thermal erosion, and a bicubic lattice for the landform, so the hillshade shows
// ridges and valleys rather than blocks along the lattice lines.

describe("GradientNoise", () => {
  const g = new GradientNoise(8, mulberry32(3));
  it("is zero at every lattice node and periodic", () => {
    for (const [x, y] of [[0, 0], [3, 5], [7, 1]]) expect(Math.abs(g.at(x, y))).toBeLessThan(1e-12);
    fc.assert(fc.property(fc.double({ min: 0, max: 8, noNaN: true }), fc.double({ min: 0, max: 8, noNaN: true }), (x, y) => Math.abs(g.at(x, y) - g.at(x + 8, y - 16)) < 1e-9));
  });
  it("stays within ±1 (a unit gradient reaches at most √2/2 from a cell's nodes' blend)", () => {
    fc.assert(fc.property(fc.double({ min: -50, max: 50, noNaN: true }), fc.double({ min: -50, max: 50, noNaN: true }), (x, y) => Math.abs(g.at(x, y)) <= 1));
  });
  it("the rotated fractal and ridged sums stay in [0, 1] and repeat for the same seed", () => {
    const a = new RotatedFractalNoise(5, 4, 0.5, mulberry32(9));
    const b = new RotatedFractalNoise(5, 4, 0.5, mulberry32(9));
    fc.assert(
      fc.property(fc.double({ min: 0, max: 1, noNaN: true }), fc.double({ min: 0, max: 1, noNaN: true }), (u, v) => {
        const r = a.ridged(u, v);
        const s = a.at(u, v);
        return r >= 0 && r <= 1 && s >= 0 && s <= 1 && r === b.ridged(u, v) && s === b.at(u, v);
      }),
    );
  });
});

describe("regression: the demo hillshade showed grid-aligned blocks (ValueNoise.cubicAt)", () => {
  it("passes through the lattice values and keeps a slope across lattice lines (the fade blend has none)", () => {
    const n = new ValueNoise(4, mulberry32(5));
    for (const [u, v] of [[0.25, 0.5], [0.5, 0.75]]) expect(n.cubicAt(u, v)).toBeCloseTo(n.at(u, v), 12);
    const h = 1e-4;
    const slope = (f: (u: number) => number) => Math.abs(f(0.5 + h) - f(0.5 - h)) / (2 * h);
    let fadeFlat = 0;
    let cubicFlat = 0;
    for (let k = 0; k < 20; k++) {
      const v = 0.03 + k * 0.047;
      if (slope((u) => n.at(u, v)) < 1e-3) fadeFlat++;
      if (slope((u) => n.cubicAt(u, v)) < 1e-3) cubicFlat++;
    }
    expect(fadeFlat).toBe(20);
    expect(cubicFlat).toBeLessThan(3);
  });
});

describe("thermalErosion", () => {
  it("conserves volume and lowers the steepest drop", () => {
    const w = 5;
    const h = new Float32Array(25).fill(100);
    h[12] = 200;
    const before = h.reduce((a, b) => a + b, 0);
    thermalErosion(h, w, 5, { talus_m: 10, rate: 0.5, passes: 3 });
    expect(h.reduce((a, b) => a + b, 0)).toBeCloseTo(before, 3);
    expect(h[12]).toBeLessThan(200);
  });
});
