import { execFileSync } from "node:child_process";
import { closeSync, fstatSync, mkdtempSync, openSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fromArrayBuffer } from "geotiff";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { openGeoTiff } from "../../src/terrain/geotiff.ts";
import { bandLayout, decodeBands, INT16_NODATA, readBandFloat32, readBandInt16, waitForBands } from "../../src/terrain/tiff-band-reader.ts";
import { readTiffDirectory } from "../../src/terrain/tiff-directory.ts";

// The fast GeoTIFF reader (tiff-directory.ts, tiff-band-reader.ts) against geotiff.js, an
// independent reader, on files written by GDAL's gdal_translate in each layout the fast path
// takes: strips/tiles, none/Deflate, predictors 1/2/3, UInt16/Int16/Int32/Float32, little-
// and big-endian. Exact equality (same samples, nodata → NaN in both).

let dir: string;
const W = 157;
const H = 93;

interface Layout {
  name: string;
  type: string;
  args: string[];
  /** the fast path takes it (otherwise openGeoTiff falls back to geotiff.js) */
  fast: boolean;
}

const LAYOUTS: Layout[] = [
  { name: "int16-strips", type: "Int16", args: [], fast: true },
  { name: "int16-strips-be", type: "Int16", args: ["-co", "ENDIANNESS=BIG"], fast: true },
  { name: "int16-deflate-pred2", type: "Int16", args: ["-co", "COMPRESS=DEFLATE", "-co", "PREDICTOR=2", "-co", "BLOCKYSIZE=7"], fast: true },
  { name: "uint16-tiled", type: "UInt16", args: ["-co", "TILED=YES", "-co", "BLOCKXSIZE=32", "-co", "BLOCKYSIZE=16"], fast: true },
  { name: "int32-deflate", type: "Int32", args: ["-co", "COMPRESS=DEFLATE"], fast: true },
  { name: "float32-tiled-deflate-pred3", type: "Float32", args: ["-co", "TILED=YES", "-co", "BLOCKXSIZE=64", "-co", "BLOCKYSIZE=32", "-co", "COMPRESS=DEFLATE", "-co", "PREDICTOR=3"], fast: true },
  // GDAL 3.6 reads this one differently from geotiff.js (which recovers the values written): left to geotiff.js
  { name: "float32-be-deflate-pred3", type: "Float32", args: ["-co", "ENDIANNESS=BIG", "-co", "COMPRESS=DEFLATE", "-co", "PREDICTOR=3"], fast: false },
  { name: "int16-lzw", type: "Int16", args: ["-co", "COMPRESS=LZW"], fast: false },
];

const value = (r: number, c: number) => (r === 11 && c === 40) || (r === 50 && c < 3) ? -9999 : Math.round(300 + 200 * Math.sin(r / 9) * Math.cos(c / 13) + ((r * 31 + c * 17) % 23)) + (c % 4) * 0.25;

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), "ridgeline-fast-tiff-"));
  const lines = [`ncols ${W}`, `nrows ${H}`, "xllcorner 350000", "yllcorner 5100000", "cellsize 30", "NODATA_value -9999"];
  for (let r = 0; r < H; r++) lines.push(Array.from({ length: W }, (_, c) => String(value(r, c))).join(" "));
  writeFileSync(join(dir, "src.asc"), `${lines.join("\n")}\n`);
  for (const l of LAYOUTS) {
    execFileSync("gdal_translate", ["-q", "-ot", l.type, "-a_srs", "EPSG:32632", "-a_nodata", "-9999", ...l.args, join(dir, "src.asc"), join(dir, `${l.name}.tif`)]);
  }
});

afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** Band 1 by geotiff.js, nodata → NaN (UInt16: GDAL clamps the nodata −9999 to 0). */
async function reference(path: string): Promise<Float32Array> {
  const bytes = readFileSync(path);
  const tiff = await fromArrayBuffer(bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength) as ArrayBuffer);
  const image = await tiff.getImage(0);
  const band = (await image.readRasters({ samples: [0], interleave: false }))[0] as unknown as ArrayLike<number>;
  const nd = image.getGDALNoData();
  return Float32Array.from(band, (v) => (v === nd ? NaN : v));
}

/** The GDAL_NODATA gdal_translate writes: −9999, clamped to 0 for UInt16. */
const nodataOf = (l: Layout) => (l.type === "UInt16" ? 0 : -9999);

function open(path: string) {
  const fd = openSync(path, "r");
  const d = readTiffDirectory(fd, fstatSync(fd).size)!;
  return { fd, layout: bandLayout(d) };
}

describe("fast GeoTIFF band reader", () => {
  for (const l of LAYOUTS) {
    it(`${l.name}: band 1 equals geotiff.js${l.fast ? "" : " (through the fallback)"}`, async () => {
      const path = join(dir, `${l.name}.tif`);
      const ref = await reference(path);
      const { fd, layout } = open(path);
      try {
        expect(layout !== null).toBe(l.fast);
        if (layout) expect(readBandFloat32(fd, layout, nodataOf(l))).toEqual(ref);
      } finally {
        closeSync(fd);
      }
      const t = await openGeoTiff(path);
      expect(t.raster.data).toEqual(ref);
      expect([t.raster.width, t.raster.height]).toEqual([W, H]);
      expect(t.raster.geoTransform).toEqual([350000, 30, 0, 5100000 + H * 30, 0, -30]);
    });
  }

  it("a window equals the same pixels of the whole band, for strips and tiles, read alone or in shared bands", async () => {
    for (const name of ["int16-deflate-pred2", "uint16-tiled", "float32-tiled-deflate-pred3"]) {
      const path = join(dir, `${name}.tif`);
      const whole = await reference(path);
      const { fd, layout } = open(path);
      try {
        for (const w of [{ col0: 5, row0: 3, width: 100, height: 70 }, { col0: 0, row0: 0, width: W, height: H }, { col0: 150, row0: 90, width: 7, height: 3 }]) {
          const expected = new Float32Array(w.width * w.height);
          for (let r = 0; r < w.height; r++) expected.set(whole.subarray((w.row0 + r) * W + w.col0, (w.row0 + r) * W + w.col0 + w.width), r * w.width);
          const nodata = nodataOf(LAYOUTS.find((l) => l.name === name)!);
          expect(readBandFloat32(fd, layout!, nodata, w), `${name} ${JSON.stringify(w)}`).toEqual(expected);
          const out = new Float32Array(new SharedArrayBuffer(w.width * w.height * 4));
          const ctrl = new Int32Array(new SharedArrayBuffer(12));
          const src = { path, layout: layout!, nodata };
          decodeBands(fd, src, w, out, ctrl);
          expect(waitForBands(src, w, ctrl)).toBe(true);
          expect(out).toEqual(expected);
        }
      } finally {
        closeSync(fd);
      }
    }
  });

  it("Int16 bands read as Int16 windows: the same values, nodata as −32768, alone or in shared bands", async () => {
    for (const name of ["int16-strips", "int16-strips-be", "int16-deflate-pred2"]) {
      const path = join(dir, `${name}.tif`);
      const whole = await reference(path);
      const { fd, layout } = open(path);
      try {
        for (const w of [{ col0: 5, row0: 3, width: 100, height: 70 }, { col0: 0, row0: 0, width: W, height: H }, { col0: 150, row0: 90, width: 7, height: 3 }]) {
          const expected = new Int16Array(w.width * w.height);
          for (let r = 0; r < w.height; r++) {
            for (let c = 0; c < w.width; c++) {
              const v = whole[(w.row0 + r) * W + w.col0 + c];
              expected[r * w.width + c] = Number.isNaN(v) ? INT16_NODATA : v;
            }
          }
          expect(readBandInt16(fd, layout!, -9999, w), `${name} ${JSON.stringify(w)}`).toEqual(expected);
          const out = new Int16Array(new SharedArrayBuffer(w.width * w.height * 2));
          const ctrl = new Int32Array(new SharedArrayBuffer(12));
          const src = { path, layout: layout!, nodata: -9999 };
          decodeBands(fd, src, w, out, ctrl);
          expect(waitForBands(src, w, ctrl)).toBe(true);
          expect(out).toEqual(expected);
        }
        expect(Array.from(readBandInt16(fd, layout!, -9999)).filter((v) => v === INT16_NODATA).length).toBe(4); // the four nodata pixels of the source
      } finally {
        closeSync(fd);
      }
      const lazy = (await openGeoTiff(path, { deferPixels: true })) as unknown as { readWindow(w: object, share: undefined, int16: boolean): Float32Array | Int16Array };
      expect(lazy.readWindow({ col0: 0, row0: 0, width: W, height: H }, undefined, true)).toBeInstanceOf(Int16Array);
    }
    const { fd, layout } = open(join(dir, "float32-tiled-deflate-pred3.tif"));
    try {
      expect(() => readBandInt16(fd, layout!, null)).toThrow(/f32/);
    } finally {
      closeSync(fd);
    }
  });

  it("deferred pixels: elevations and windows equal those of the decoded band", async () => {
    const path = join(dir, "float32-tiled-deflate-pred3.tif");
    const eager = await openGeoTiff(path);
    const lazy = await openGeoTiff(path, { deferPixels: true });
    const r = eager.raster;
    for (const [c, rr] of [[0.2, 0.3], [-0.4, 5], [W - 0.6, H - 0.6], [40.5, 11.2], [39.7, 10.6], [1.5, 50.1], [78.25, 46.75], [W - 1, 0]]) {
      const [lat, lon] = r.fromCrs(r.geoTransform[0] + (c + 0.5) * 30, r.geoTransform[3] - (rr + 0.5) * 30);
      expect(Object.is(lazy.elevation(lat, lon), eager.elevation(lat, lon)) || lazy.elevation(lat, lon) === eager.elevation(lat, lon), `at pixel ${c}, ${rr}`).toBe(true);
    }
    const w = { col0: 10, row0: 20, width: 50, height: 40 };
    const fromLazy = (lazy as unknown as { readWindow(w: object): Float32Array }).readWindow(w);
    const fromEager = (eager as unknown as { readWindow(w: object): Float32Array }).readWindow(w);
    expect(fromLazy).toEqual(fromEager);
    expect(lazy.raster.data).toEqual(r.data);
  });
});
