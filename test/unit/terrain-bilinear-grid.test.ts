import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { bilinearGrid } from "../../src/terrain/bilinear-grid.ts";
import { makeRasterGrid, RasterTerrain } from "../../src/terrain/raster-terrain.ts";
import { expectClose } from "../helpers/expect-close.ts";

const W = 5;
const H = 4;
const planeGrid = (a: number, b: number, c: number): Float32Array => Float32Array.from({ length: W * H }, (_, i) => a + b * (i % W) + c * Math.floor(i / W));
const col = fc.double({ min: -0.5, max: W - 0.5, noNaN: true });
const row = fc.double({ min: -0.5, max: H - 0.5, noNaN: true });

describe("bilinearGrid", () => {
  it("reproduces a plane between sample centres (bilinear is exact for planes)", () => {
    const g = planeGrid(100, 3, -7);
    fc.assert(
      fc.property(fc.double({ min: 0, max: W - 1, noNaN: true }), fc.double({ min: 0, max: H - 1, noNaN: true }), (c, r) => {
        expectClose(bilinearGrid(g, W, H, c, r), 100 + 3 * c - 7 * r, { abs: 1e-9 }, { c, r });
      }),
    );
  });

  it("stays within the four surrounding samples and equals a sample at its centre", () => {
    fc.assert(
      fc.property(fc.array(fc.double({ min: -500, max: 5000, noNaN: true }), { minLength: W * H, maxLength: W * H }), col, row, (vals, c, r) => {
        const g = Float64Array.from(vals);
        const h = bilinearGrid(g, W, H, c, r);
        const cc = Math.min(Math.max(c, 0), W - 1);
        const rr = Math.min(Math.max(r, 0), H - 1);
        const near = [Math.floor(cc), Math.ceil(cc)].flatMap((x) => [Math.floor(rr), Math.ceil(rr)].map((y) => g[y * W + x]));
        return h >= Math.min(...near) - 1e-9 && h <= Math.max(...near) + 1e-9 && bilinearGrid(g, W, H, Math.round(cc), Math.round(rr)) === g[Math.round(rr) * W + Math.round(cc)];
      }),
    );
  });

  it("is NaN outside the pixel-corner extent and for NaN coordinates", () => {
    const g = planeGrid(1, 1, 1);
    for (const [c, r] of [[-0.51, 1], [W - 0.49, 1], [1, -0.6], [1, H], [Number.NaN, 1], [1, Number.NaN]]) expect(bilinearGrid(g, W, H, c, r)).toBeNaN();
    expect(bilinearGrid(g, W, H, -0.5, -0.5)).toBe(1); // corner of the extent: clamped to the first sample
  });

  it("treats NaN as nodata: NaN inside a nodata pixel, renormalised next to one", () => {
    const g = planeGrid(0, 10, 0); // 0 10 20 30 40 on each row
    g[1 * W + 2] = NaN; // pixel (col 2, row 1)
    expect(bilinearGrid(g, W, H, 2.2, 1.3)).toBeNaN();
    // (1.6, 1.6): nearest (2, 2) valid; neighbour (2, 1) dropped, weights renormalised
    const w = { a: 0.4 * 0.4, b: 0.6 * 0.4, c: 0.4 * 0.6, d: 0.6 * 0.6 }; // (1,1) (2,1) (1,2) (2,2)
    expectClose(bilinearGrid(g, W, H, 1.6, 1.6), (10 * w.a + 10 * w.c + 20 * w.d) / (w.a + w.c + w.d), { abs: 1e-9 }, "renormalised");
  });

  it("handles single-row and single-column grids", () => {
    expectClose(bilinearGrid([5, 7, 9], 3, 1, 1.5, 0.2), 8, { abs: 1e-12 }, "1 row");
    expectClose(bilinearGrid([5, 7, 9], 1, 3, 0, 0.25), 5.5, { abs: 1e-12 }, "1 column");
  });
});

describe("RasterTerrain on a UTM grid", () => {
  // 4×3 grid, 100 m cells, upper-left corner at (500 000, 5 000 300) in UTM 32N.
  const data = Float32Array.from({ length: 12 }, (_, i) => i);
  const raster = makeRasterGrid(4, 3, [500000, 100, 0, 5000300, 0, -100], 32632, data);
  const t = new RasterTerrain(raster, { kind: "geotiff", description: "test", synthetic: false, label: "t.tif", fingerprint: "x" });

  it("samples at projected coordinates and never mutates the inputs", () => {
    const [lat, lon] = raster.fromCrs(500150, 5000150); // centre of pixel (col 1, row 1) → value 5
    expectClose(t.elevation(lat, lon), 5, { abs: 1e-6 }, "pixel centre");
    const la = [lat, lat, 0];
    const lo = [lon, lon, 0];
    const s = t.sample(la, lo);
    expect([s.h_m[0], s.h_m[1]]).toEqual([t.elevation(lat, lon), t.elevation(lat, lon)]);
    expect([s.outside, s.voidFilled]).toEqual([1, 0]);
    expect([la, lo]).toEqual([[lat, lat, 0], [lon, lon, 0]]);
    expect(t.resolutionM(45)).toBe(100);
    expect(t.whyOutside(0, 0)).toMatch(/x 500000…500400 m, y 5000000…5000300 m in EPSG:32632 \(WGS84 \/ UTM zone 32N\)/);
  });

  it("rejects a rotated geotransform", () => {
    expect(() => new RasterTerrain({ ...raster, geoTransform: [0, 1, 0.1, 0, 0, -1] }, { kind: "geotiff", description: "", synthetic: false, label: "r.tif", fingerprint: "" })).toThrow(/rotated or sheared/);
  });
});
