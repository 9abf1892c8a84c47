import { closeSync, mkdtempSync, openSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { writeGeoTiff } from "../../src/geo/geotiff-writer.ts";
import { openGeoTiff } from "../../src/terrain/geotiff.ts";
import { bandLayout, INT16_NODATA, readBandFloat32, readBandFloat32AsInt16 } from "../../src/terrain/tiff-band-reader.ts";
import { readTiffDirectory } from "../../src/terrain/tiff-directory.ts";

// A Float32 DEM whose samples are all whole metres (what `gdal_translate -ot Float32` makes of
// an Int16 DEM) is read for a coverage grid as Int16: the project's own invariant is that the
// elevations are the same numbers readBandFloat32 gives (nodata, NaN or the file's value, as
// INT16_NODATA), and that one sample that is not a whole metre in −32767…32767 keeps the whole
// window Float32. Reference values: the Float32 arrays the test writes.

const W = 37;
const H = 23;
let dir: string;

function write(name: string, f: (c: number, r: number) => number, nodata: number | null): string {
  const data = new Float32Array(W * H);
  for (let r = 0; r < H; r++) for (let c = 0; c < W; c++) data[r * W + c] = f(c, r);
  const path = join(dir, name);
  writeGeoTiff(path, { width: W, height: H, data, geoTransform: [400000, 30, 0, 5010000, 0, -30], epsg: 32632, nodata: nodata ?? -9999 }); // (-9999 occurs in no case without nodata)
  return path;
}

const whole = (c: number, r: number) => Math.round(300 + 40 * Math.sin(c * 0.3) * Math.cos(r * 0.2)) - (c === 5 && r === 7 ? 1000 : 0);

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), "ridgeline-f32-whole-"));
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe("a Float32 DEM of whole metres read as Int16", () => {
  const cases: [string, (c: number, r: number) => number, number | null, boolean][] = [
    ["whole metres, no nodata", whole, null, true],
    ["whole metres, nodata −9999 in a hole", (c, r) => (c >= 10 && c < 13 && r === 4 ? -9999 : whole(c, r)), -9999, true],
    ["whole metres, NaN samples", (c, r) => (c === 30 && r > 15 ? NaN : whole(c, r)), null, true],
    ["below sea level and the Int16 range's ends", (c, r) => (c === 0 ? -32767 : c === 1 ? 32767 : -whole(c, r)), null, true],
    ["one sample of half a metre", (c, r) => (c === 30 && r === 20 ? 250.5 : whole(c, r)), null, false],
    ["one sample of −32768 that is not nodata", (c, r) => (c === 3 && r === 3 ? -32768 : whole(c, r)), -9999, false],
    ["one sample above 32767", (c, r) => (c === 20 && r === 2 ? 40000 : whole(c, r)), null, false],
  ];
  for (const [name, f, nodata, asInt16] of cases) {
    it(`${name}: ${asInt16 ? "Int16 with the same values" : "left as Float32"}`, async () => {
      const path = write(`${name.replace(/\W+/g, "-")}.tif`, f, nodata);
      const fd = openSync(path, "r");
      try {
        const layout = bandLayout(readTiffDirectory(fd, readFileSync(path).length)!)!;
        const window = { col0: 2, row0: 1, width: W - 4, height: H - 2 };
        const ref = readBandFloat32(fd, layout, nodata, window);
        const got = readBandFloat32AsInt16(fd, layout, nodata, window);
        if (!asInt16) {
          expect(got).toBeNull();
        } else {
          expect(got).not.toBeNull();
          expect(Array.from(got!, (v) => (v === INT16_NODATA ? NaN : v))).toEqual(Array.from(ref));
        }
      } finally {
        closeSync(fd);
      }
      // and through the terrain, as the coverage grid reads its window
      const t = (await openGeoTiff(path, { deferPixels: true })) as unknown as { readWindow(w: object, share: undefined, int16: boolean): Float32Array | Int16Array };
      const arr = t.readWindow({ col0: 0, row0: 0, width: W, height: H }, undefined, true);
      expect(arr instanceof Int16Array).toBe(asInt16);
    });
  }
});
