import { execFileSync } from "node:child_process";
import { mkdtempSync, readdirSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { writeGeoTiff, type GeoTiffRaster } from "../../src/geo/geotiff-writer.ts";
import { mulberry32 } from "../../src/terrain/mulberry32.ts";
import { expectClose } from "../helpers/expect-close.ts";

// Reference: GDAL 3.6 reading the files we write — `gdalinfo -json` for size, georeferencing,
// CRS, type, nodata, description and unit, `gdallocationinfo -valonly` for pixel values.

const dir = mkdtempSync(join(tmpdir(), "ridgeline-geotiff-writer-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function gdalinfo(path: string): any {
  return JSON.parse(execFileSync("gdalinfo", ["-json", path]).toString());
}

/** Pixel values at (col, row) pairs, one gdallocationinfo call. */
function gdalValues(path: string, pts: [number, number][]): number[] {
  const out = execFileSync("gdallocationinfo", ["-valonly", path], { input: pts.map(([c, r]) => `${c} ${r}`).join("\n") }).toString();
  return out.trim().split(/\s+/).map(Number);
}

const cases: { name: string; raster: GeoTiffRaster; epsgText: string; type: string }[] = (() => {
  const rnd = mulberry32(3);
  const W = 257;
  const H = 131;
  const f32 = new Float32Array(W * H).map((_, i) => (i % 11 === 0 ? -9999 : -140 + 100 * rnd()));
  const u8 = new Uint8Array(W * H).map((_, i) => (i % 13 === 0 ? 255 : rnd() < 0.5 ? 1 : 0));
  const i16 = new Int16Array(W * H).map(() => Math.round(-400 + 5000 * rnd()));
  return [
    { name: "float32 received level, UTM 32N, uncompressed", epsgText: '"EPSG",32632', type: "Float32", raster: { width: W, height: H, data: f32, geoTransform: [412000, 30, 0, 5_030_000, 0, -30], epsg: 32632, nodata: -9999, description: "received level", unit: "dBm" } },
    { name: "uint8 visibility, EPSG:4326, deflate", epsgText: '"EPSG",4326', type: "Byte", raster: { width: W, height: H, data: u8, geoTransform: [7.25, 1 / 3600, 0, 46.5, 0, -1 / 3600], epsg: 4326, nodata: 255, compression: "deflate" } },
    { name: "int16 heights, UTM 33S, deflate", epsgText: '"EPSG",32733', type: "Int16", raster: { width: W, height: H, data: i16, geoTransform: [300000, 90, 0, 8_000_000, 0, -90], epsg: 32733, nodata: -32768, compression: "deflate" } },
  ];
})();

describe("GeoTIFF writer: GDAL reads what we write", () => {
  it.each(cases)("$name", ({ raster, epsgText, type }) => {
    const path = join(dir, `${type}.tif`);
    writeGeoTiff(path, raster);
    const info = gdalinfo(path);
    expect(info.size).toEqual([raster.width, raster.height]);
    info.geoTransform.forEach((v: number, i: number) => expectClose(v, raster.geoTransform[i], { abs: 1e-12, rel: 1e-15 }, `geoTransform[${i}]`));
    expect(info.coordinateSystem.wkt).toContain(epsgText);
    expect(info.metadata[""].AREA_OR_POINT).toBe("Area");
    const band = info.bands[0];
    expect(band.type).toBe(type);
    expect(band.noDataValue).toBe(raster.nodata);
    if (raster.description) expect(band.description).toBe(raster.description);
    if (raster.unit) expect(band.unit).toBe(raster.unit);
    const rnd = mulberry32(9);
    const pts: [number, number][] = [[0, 0], [raster.width - 1, raster.height - 1], [raster.width - 1, 0], [0, raster.height - 1]];
    for (let i = 0; i < 60; i++) pts.push([Math.floor(rnd() * raster.width), Math.floor(rnd() * raster.height)]);
    const got = gdalValues(path, pts);
    // gdallocationinfo prints 15 significant digits: float32 values compare to 1e-12 relative
    pts.forEach(([c, r], i) => expectClose(got[i], raster.data[r * raster.width + c], { abs: 0, rel: 1e-12 }, `pixel ${c},${r}`));
  });

  it.each(["none", "deflate"] as const)("fillStrip completes each strip in a copy (%s): GDAL reads the completed rows, the array is unchanged", (compression) => {
    // 4099 columns of bytes: 255 rows per strip of at most 1 MiB, so 600 rows make three strips, the last one short
    const W = 4099;
    const H = 600;
    const rnd = mulberry32(17);
    const data = new Uint8Array(W * H).map(() => (rnd() < 0.5 ? 1 : 0));
    const before = data.slice();
    const seen: [number, number][] = [];
    const path = join(dir, `fill-strip-${compression}.tif`);
    writeGeoTiff(path, {
      width: W,
      height: H,
      data,
      geoTransform: [412000, 30, 0, 5_030_000, 0, -30],
      epsg: 32632,
      nodata: 255,
      compression,
      fillStrip: (strip, row0, row1) => {
        seen.push([row0, row1]);
        expect(strip.length).toBe((row1 - row0) * W);
        for (let r = row0; r < row1; r++) strip.fill(100 + (r % 50), (r - row0) * W, (r - row0) * W + 3); // the first three cells of each row
      },
    });
    expect(seen).toEqual([[0, 255], [255, 510], [510, 600]]);
    expect(Buffer.compare(Buffer.from(data), Buffer.from(before))).toBe(0);
    const pts: [number, number][] = [];
    for (const r of [0, 1, 254, 255, 256, 509, 510, 511, 599]) pts.push([0, r], [2, r], [3, r], [W - 1, r]);
    const got = gdalValues(path, pts);
    pts.forEach(([c, r], i) => expect(got[i], `pixel ${c},${r}`).toBe(c < 3 ? 100 + (r % 50) : data[r * W + c]));
  });

  it("replaces a file already there; a failed write leaves that file as it was and nothing beside it", () => {
    const path = join(dir, "again.tif");
    writeGeoTiff(path, cases[0].raster);
    const first = readFileSync(path);
    writeGeoTiff(path, cases[2].raster);
    expect(gdalinfo(path).bands[0].type).toBe("Int16");
    const second = readFileSync(path);
    expect(Buffer.compare(first, second)).not.toBe(0);
    // fails half-way, its partial file already open beside the target
    const failing: GeoTiffRaster = {
      ...cases[1].raster,
      fillStrip: () => {
        throw new Error("disk full");
      },
    };
    expect(() => writeGeoTiff(path, failing)).toThrow("disk full");
    expect(Buffer.compare(readFileSync(path), second)).toBe(0);
    expect(readdirSync(dir).filter((f) => f.startsWith("again.tif."))).toEqual([]);
  });

  it("a failed write leaves no file under the target name", () => {
    const path = join(dir, "bad.tif");
    expect(() => writeGeoTiff(path, { ...cases[0].raster, width: 10 })).toThrow(RangeError);
    expect(() => execFileSync("gdalinfo", [path], { stdio: "ignore" })).toThrow();
  });
});
