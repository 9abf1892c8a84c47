import { describe, expect, it } from "vitest";
import { mulberry32 } from "../../src/terrain/mulberry32.ts";
import { syntheticTerrain } from "../../src/terrain/synthetic.ts";
import { TerrainError } from "../../src/terrain/terrain-error.ts";
import { expectClose } from "../helpers/expect-close.ts";

const box = { south_deg: 46.4, west_deg: 7.1, north_deg: 46.5, east_deg: 7.25 };

describe("synthetic terrain", () => {
  const a = syntheticTerrain({ seed: 7, ...box });

  it("says clearly that it is synthetic", () => {
    expect(a.description).toBe("synthetic (seed 7) — not real terrain");
    expect([a.kind, a.synthetic]).toEqual(["synthetic", true]);
  });

  it("is identical for the same seed, different for another seed", () => {
    const b = syntheticTerrain({ seed: 7, ...box });
    const c = syntheticTerrain({ seed: 8, ...box });
    let same = 0;
    for (let i = 0; i < a.raster.data.length; i++) if (Object.is(a.raster.data[i], b.raster.data[i])) same++;
    expect(same).toBe(a.raster.data.length);
    expect(b.fingerprint()).toBe(a.fingerprint());
    let differing = 0;
    for (let i = 0; i < a.raster.data.length; i++) if (a.raster.data[i] !== c.raster.data[i]) differing++;
    expect(differing / a.raster.data.length).toBeGreaterThan(0.99);
    expect(c.fingerprint()).not.toBe(a.fingerprint());
  });

  it("has nodes on 1″ from the box corners and a GDAL-style geotransform", () => {
    const r = a.raster;
    expect([r.width, r.height, r.epsg]).toEqual([541, 361, 4326]); // 0.15° and 0.1° at 1″, plus one
    const s = 1 / 3600;
    expectClose(r.geoTransform[0], 7.1 - s / 2, { abs: 1e-12 }, "x0");
    expectClose(r.geoTransform[3], 46.5 + s / 2, { abs: 1e-12 }, "y0");
    // corners are sample centres (to rounding of the inverse geotransform)
    expectClose(a.elevation(46.5, 7.1), r.data[0], { abs: 1e-6 }, "NW corner");
    expectClose(a.elevation(46.4, 7.25), r.data[r.data.length - 1], { abs: 1e-6 }, "SE corner");
    expectClose(a.resolutionM(46.45), 111_150 / 3600, { abs: 1 }, "≈ 30.9 m N–S at 1″");
  });

  it("looks like a valley with ridges: a few hundred to ~2500 m, low along the axis, no NaN", () => {
    const d = a.raster.data;
    let lo = Infinity;
    let hi = -Infinity;
    for (const h of d) (lo = Math.min(lo, h)), (hi = Math.max(hi, h));
    expect(Number.isFinite(lo) && Number.isFinite(hi)).toBe(true);
    expect(lo).toBeGreaterThan(100);
    expect(hi).toBeLessThan(3000);
    expect(hi - lo).toBeGreaterThan(300);
    // middle row: the lowest point is nearer the centre than the edges, which are higher
    const { width, height } = a.raster;
    const row = d.subarray(Math.floor(height / 2) * width, Math.floor(height / 2 + 1) * width);
    const iMin = row.indexOf(Math.min(...row));
    expect(iMin / width).toBeGreaterThan(0.15);
    expect(iMin / width).toBeLessThan(0.85);
    expect(Math.min(row[0], row[width - 1])).toBeGreaterThan(row[iMin] + 200);
  });

  it("is NaN outside the box (beyond the half-pixel border) and names the extent", () => {
    expect(a.elevation(46.6, 7.2)).toBeNaN();
    expect(a.whyOutside(46.6, 7.2)).toMatch(/outside the synthetic terrain \(seed 7\), which covers lat 46\.399861…46\.500139, lon 7\.099861…7\.250139; use a DEM/);
    expect(a.whyOutside(46.45, 7.2)).toBeNull();
  });

  it.each([
    [{ seed: 1.5, ...box }, /seed must be a whole number/],
    [{ seed: 1, ...box, north_deg: 46.3 }, /south < north/],
    [{ seed: 1, ...box, east_deg: 7 }, /west < east/],
    [{ seed: 1, ...box, spacing_arcsec: 0 }, /spacing must be a positive/],
    [{ seed: 1, south_deg: 0, west_deg: 0, north_deg: 5, east_deg: 5 }, /too large .* shrink the box or raise spacing_arcsec/],
  ])("rejects bad parameters (%#)", (params, msg) => {
    expect(() => syntheticTerrain(params)).toThrow(TerrainError);
    expect(() => syntheticTerrain(params)).toThrow(msg);
  });
});

describe("mulberry32", () => {
  it("is deterministic, in [0, 1), and seed-dependent", () => {
    const a = mulberry32(42);
    const b = mulberry32(42);
    const xs = Array.from({ length: 1000 }, () => a());
    expect(Array.from({ length: 1000 }, () => b())).toEqual(xs);
    expect(xs.every((x) => x >= 0 && x < 1)).toBe(true);
    const mean = xs.reduce((s, x) => s + x, 0) / xs.length;
    expectClose(mean, 0.5, { abs: 0.05 }, "mean of 1000 uniforms (σ ≈ 0.009)");
    expect(mulberry32(43)()).not.toBe(xs[0]);
  });
});
