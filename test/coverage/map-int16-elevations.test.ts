import { describe, expect, it } from "vitest";
import { coverageMapData } from "../../src/render/raster/coverage-map-data.ts";
import { INT16_NODATA } from "../../src/terrain/tiff-band-reader.ts";

// The page map of a coverage shades the grid's elevations as they were read: Int16 (from an
// Int16 DEM, or a large study DEM read from the file) or Float32. The output stage once made a
// Float32 copy of an Int16 grid for it (400 MB for a 150 km map at 30 m); it now samples the
// Int16 grid itself, which must draw the same map, nodata included.

describe("coverage page map from Int16 elevations", () => {
  it("is the map drawn from the same elevations as Float32 (nodata as NaN), byte for byte", async () => {
    const W = 1301; // more cells than map pixels: the map samples the grid
    const H = 977;
    const f32 = new Float32Array(W * H);
    const i16 = new Int16Array(W * H);
    const values = new Float32Array(W * H);
    for (let r = 0; r < H; r++) {
      for (let c = 0; c < W; c++) {
        const nodata = (r > 300 && r < 420 && c > 200 && c < 330) || c === 7;
        const h = Math.round(400 + 300 * Math.sin(r / 70) * Math.cos(c / 55) + ((r * 7 + c * 3) % 11));
        f32[r * W + c] = nodata ? NaN : h;
        i16[r * W + c] = nodata ? INT16_NODATA : h;
        values[r * W + c] = -60 - Math.hypot(r - H / 2, c - W / 2) / 10;
      }
    }
    const input = { title: "t", values, width: W, height: H, cell_m: [30, 30] as [number, number], style: { thresholds: [-100, -90, -80], colors: ["#112233", "#445566", "#778899"], nodata: -9999 }, legend: [], sites: [{ name: "A", col: W / 2, row: H / 2 }], crs_note: "UTM" };
    const fromInt16 = await coverageMapData({ ...input, dem: i16 });
    const fromFloat32 = await coverageMapData({ ...input, dem: f32 });
    expect(fromInt16).toEqual(fromFloat32);
    // and the nodata patch is drawn as such: −32768 read as a height would shade differently
    const asHeights = await coverageMapData({ ...input, dem: Float32Array.from(i16) });
    expect(asHeights.image_href).not.toBe(fromFloat32.image_href);
  });
});
