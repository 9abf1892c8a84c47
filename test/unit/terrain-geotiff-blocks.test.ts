import { execFileSync } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import fc from "fast-check";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { crsFromEpsg } from "../../src/geo/crs-from-epsg.ts";
import { openGeoTiff } from "../../src/terrain/geotiff.ts";
import { INT16_NODATA } from "../../src/terrain/tiff-band-reader.ts";

// A large study DEM is read in blocks (openGeoTiff's `blocks`, band-blocks.ts) instead of being
// decoded whole: elevations and profiles must be those of the decoded band bit for bit —
// across block edges, in the raster's outer half pixel, next to nodata, outside it — with
// only a block or two kept, on the layouts GDAL writes (strips, Deflate strips of a few rows,
// tiles). The decoded band is the reference; terrain-gdal.test.ts holds it to gdalwarp.

let dir: string;
const W = 157;
const H = 93;
const X0 = 350_000;
const Y0 = 5_100_000 + H * 30;
const value = (r: number, c: number) => ((r === 11 && c === 40) || (r === 50 && c < 3) || (r > 80 && c > 150) ? -9999 : Math.round(300 + 200 * Math.sin(r / 9) * Math.cos(c / 13) + ((r * 31 + c * 17) % 23)));

/** `blocks`: profiles always read in blocks; otherwise (Deflate strips) the band is decoded whole once blocks have read its worth. */
const LAYOUTS: { name: string; type: string; args: string[]; blocks: boolean }[] = [
  { name: "int16-strips", type: "Int16", args: [], blocks: true },
  { name: "float32-strips-of-5", type: "Float32", args: ["-co", "BLOCKYSIZE=5"], blocks: true },
  { name: "int32-strips", type: "Int32", args: [], blocks: true },
  { name: "float32-tiled", type: "Float32", args: ["-co", "TILED=YES", "-co", "BLOCKXSIZE=32", "-co", "BLOCKYSIZE=16"], blocks: true },
  { name: "int16-deflate-tiled", type: "Int16", args: ["-co", "TILED=YES", "-co", "BLOCKXSIZE=16", "-co", "BLOCKYSIZE=16", "-co", "COMPRESS=DEFLATE"], blocks: true },
  { name: "int16-deflate-strips-of-7", type: "Int16", args: ["-co", "COMPRESS=DEFLATE", "-co", "PREDICTOR=2", "-co", "BLOCKYSIZE=7"], blocks: false },
];

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), "ridgeline-tiff-blocks-"));
  const lines = [`ncols ${W}`, `nrows ${H}`, `xllcorner ${X0}`, "yllcorner 5100000", "cellsize 30", "NODATA_value -9999"];
  for (let r = 0; r < H; r++) lines.push(Array.from({ length: W }, (_, c) => String(value(r, c))).join(" "));
  writeFileSync(join(dir, "src.asc"), `${lines.join("\n")}\n`);
  for (const l of LAYOUTS) execFileSync("gdal_translate", ["-q", "-ot", l.type, "-a_srs", "EPSG:32632", "-a_nodata", "-9999", ...l.args, join(dir, "src.asc"), join(dir, `${l.name}.tif`)]);
});

afterAll(() => rmSync(dir, { recursive: true, force: true }));

const utm = crsFromEpsg(32632)!;
/** Latitude/longitude of pixel-centre coordinates (col, row) of the test raster. */
const at = (col: number, row: number) => utm.fromCrs(X0 + (col + 0.5) * 30, Y0 - (row + 0.5) * 30);

describe("GeoTIFF read in blocks: the decoded band's elevations, bit for bit", () => {
  for (const l of LAYOUTS) {
    it(l.name, async () => {
      const path = join(dir, `${l.name}.tif`);
      const whole = await openGeoTiff(path);
      // one 32×16 tile, or a strip block, kept: every other block is read again
      const blocks = await openGeoTiff(path, { blocks: { minPixels: 1, maxBytes: 1 } });
      const points = fc.sample(fc.tuple(fc.double({ min: -1.5, max: W + 0.5, noNaN: true }), fc.double({ min: -1.5, max: H + 0.5, noNaN: true })), { numRuns: 3000, seed: 17 });
      // the outer half pixel, block edges and the pixels around nodata, exactly
      for (const c of [-0.5, -0.25, 0, 31, 31.5, 32, W - 1, W - 0.75, W - 0.5]) for (const r of [-0.5, 0, 6.5, 7, 15.5, 16, 49.5, 50.2, H - 1, H - 0.5]) points.push([c, r]);
      for (const [c, r] of [[40, 11], [40.4, 11.6], [39.6, 10.5], [1, 50], [3.5, 50.5], [151, 81], [150.5, 80.5]]) points.push([c, r]);
      const lat = points.map(([c, r]) => at(c, r)[0]);
      const lon = points.map(([c, r]) => at(c, r)[1]);
      // single elevations read blocks in every layout (a fresh terrain: nothing decoded yet)
      const single = await openGeoTiff(path, { blocks: { minPixels: 1, maxBytes: 1 } });
      for (let i = 0; i < points.length; i += 3) expect(Object.is(single.elevation(lat[i], lon[i]), whole.elevation(lat[i], lon[i])), `elevation at ${points[i]}`).toBe(true);
      expect((single as unknown as { pixelsInMemory: boolean }).pixelsInMemory).toBe(false);
      let got = blocks.sample(lat, lon);
      expect((blocks as unknown as { pixelsInMemory: boolean }).pixelsInMemory).toBe(false); // nothing decoded whole
      const want = whole.sample(lat, lon);
      for (let i = 0; i < points.length; i++) expect(Object.is(got.h_m[i], want.h_m[i]), `sample at (col, row) ${points[i]}: ${got.h_m[i]} vs ${want.h_m[i]}`).toBe(true);
      // the blocks have read far more than the band (one kept): Deflate strips are decoded whole now
      got = blocks.sample(lat, lon);
      expect(got.outside).toBe(want.outside);
      expect(want.outside).toBeGreaterThan(100); // outside the raster and on nodata: NaN in both
      for (let i = 0; i < points.length; i++) {
        expect(Object.is(got.h_m[i], want.h_m[i]), `sample at (col, row) ${points[i]}: ${got.h_m[i]} vs ${want.h_m[i]}`).toBe(true);
        if (i % 7 === 0) expect(Object.is(blocks.elevation(lat[i], lon[i]), whole.elevation(lat[i], lon[i])), `elevation at ${points[i]}`).toBe(true);
      }
      expect(blocks.whyOutside(...at(-3, 5))).toBe(whole.whyOutside(...at(-3, 5)));
      expect((blocks as unknown as { pixelsInMemory: boolean }).pixelsInMemory).toBe(!l.blocks);
    });
  }

  for (const name of ["int16-strips", "int16-deflate-strips-of-7"]) {
    it(`a coverage grid's window is read from the file, as Int16 from an Int16 band, letting a decoded band go (${name})`, async () => {
      const t = (await openGeoTiff(join(dir, `${name}.tif`), { blocks: { minPixels: 1, maxBytes: 1 } })) as unknown as { readWindow(w: object, share: undefined, int16: boolean): Float32Array | Int16Array; pixelsInMemory: boolean; elevation(lat: number, lon: number): number; sample(lat: number[], lon: number[]): { h_m: Float64Array } };
      const across = Array.from({ length: 4 * H }, (_, i) => at((i * 37) % W, i / 4)); // every row: the band's worth of blocks at least
      for (let k = 0; k < 2; k++) t.sample(across.map((p) => p[0]), across.map((p) => p[1])); // Deflate strips: decoded whole for the second
      expect(t.pixelsInMemory).toBe(name.includes("deflate"));
      const h = t.sample([at(40.3, 12.6)[0]], [at(40.3, 12.6)[1]]).h_m[0];
      t.readWindow({ col0: 0, row0: 0, width: 3, height: 3 }, undefined, false); // (a Float32 one too)
      const w = t.readWindow({ col0: 38, row0: 10, width: 4, height: 3 }, undefined, true);
      expect(w).toBeInstanceOf(Int16Array);
      expect(Array.from(w)).toEqual([10, 11, 12].flatMap((r) => [38, 39, 40, 41].map((c) => (value(r, c) === -9999 ? INT16_NODATA : value(r, c)))));
      expect(t.pixelsInMemory).toBe(false); // not decoded, or let go
      expect(Object.is(t.elevation(...at(40.3, 12.6)), h)).toBe(true); // and decoded again (or read in blocks) when asked
    });
  }

  it("a band smaller than minPixels is decoded whole when opened, as before", async () => {
    const t = (await openGeoTiff(join(dir, "int16-strips.tif"), { blocks: { minPixels: W * H + 1, maxBytes: 1 << 20 } })) as unknown as { pixelsInMemory: boolean };
    expect(t.pixelsInMemory).toBe(true);
  });
});
