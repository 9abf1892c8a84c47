import { execFileSync } from "node:child_process";
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { crsFromEpsg } from "../../src/geo/crs-from-epsg.ts";
import { openGeoTiff } from "../../src/terrain/geotiff.ts";
import { openHgt } from "../../src/terrain/hgt.ts";
import { mulberry32 } from "../../src/terrain/mulberry32.ts";
import type { Terrain } from "../../src/terrain/terrain.ts";
import { writeHgtTile } from "../../src/terrain/write-hgt.ts";
import { expectClose } from "../helpers/expect-close.ts";
import { gdal, gdalBilinearAt, gdalPixelValues, gdalTransform, pool } from "./terrain-gdal-cli.ts";

// Reference: GDAL 3.6 command-line tools (gdal-bin) reading the same files:
//  - georeferencing and size: `gdalinfo -json`;
//  - values at pixel centres: `gdallocationinfo -valonly -wgs84` (nearest pixel; GDAL 3.6
//    has no `-r bilinear` — that option arrived in GDAL 3.10);
//  - bilinear values: `gdalwarp -r bilinear` onto one output pixel centred on the point
//    (see terrain-gdal-cli.ts), i.e. GDAL's warp kernel at unit scale;
//  - lat/lon → UTM: `gdaltransform` (PROJ).
// Tolerance 1e-3 m on heights, 1e-3 m on UTM coordinates.
const TOL_H = { abs: 1e-3 };
const N_RANDOM = 50;

interface Case {
  name: string;
  file: string;
  epsg: number;
  open: () => Promise<Terrain>;
  /** rasters whose outer half pixel GDAL and we both treat as data (not HGT tiles, whose edges are shared with neighbours) */
  edges: boolean;
  /** extra pixel-centre coordinates [col, row] to check, e.g. next to nodata */
  extra?: [number, number][];
}

interface Info {
  w: number;
  h: number;
  gt: number[];
}

let dir: string;
const cases: Case[] = [];
const infos = new Map<string, Info>();
const terrains = new Map<string, Terrain>();
const maxErr: Record<string, number> = {};

/** Rough test surface (m): long waves plus terms that change from one sample to the next. */
function surface(lat: number, lon: number): number {
  return (
    1200 +
    500 * Math.sin(2 * Math.PI * 2.3 * lat) * Math.cos(2 * Math.PI * 1.7 * lon) +
    35 * Math.sin(4700 * lat + 1.3) * Math.cos(3900 * lon) +
    15 * Math.sin(17000 * (lat + lon))
  );
}

/** ESRI ASCII grid written here, converted to GeoTIFF by gdal_translate (so GDAL writes every file we read). */
function ascToTiff(name: string, w: number, h: number, xll: number, yll: number, cell: number, value: (r: number, c: number) => number, args: string[]): string {
  const lines = [`ncols ${w}`, `nrows ${h}`, `xllcorner ${xll}`, `yllcorner ${yll}`, `cellsize ${cell}`, "NODATA_value -9999"];
  for (let r = 0; r < h; r++) lines.push(Array.from({ length: w }, (_, c) => value(r, c).toFixed(3)).join(" "));
  const asc = join(dir, `${name}.asc`);
  writeFileSync(asc, lines.join("\n") + "\n");
  const tif = join(dir, `${name}.tif`);
  execFileSync("gdal_translate", ["-q", ...args, asc, tif]);
  return tif;
}

const NODATA_C = (r: number, c: number): boolean => (r >= 40 && r < 44 && c >= 60 && c < 63) || (r === 100 && c === 20);

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), "ridgeline-terrain-gdal-"));
  const rnd = mulberry32(11);

  const hgt3 = join(dir, "N46E007.hgt");
  writeHgtTile(hgt3, 46, 7, 3, surface);
  cases.push({ name: "HGT 3″ N46E007 (file)", file: hgt3, epsg: 4326, edges: false, open: async () => openHgt(hgt3) });

  const south = join(dir, "dem-south");
  mkdirSync(south);
  const hgt1 = join(south, "S34W071.hgt");
  writeHgtTile(hgt1, -34, -71, 1, surface);
  cases.push({ name: "HGT 1″ S34W071 (folder)", file: hgt1, epsg: 4326, edges: false, open: async () => openHgt(south) });

  const tifC = ascToTiff("geo-int16", 240, 180, 7.2, 46.3, 0.001, (r, c) => (NODATA_C(r, c) ? -9999 : Math.round(surface(46.48 - r * 0.001, 7.2 + c * 0.001) + 20 * rnd())), [
    "-ot", "Int16", "-a_srs", "EPSG:4326", "-a_nodata", "-9999",
  ]);
  cases.push({
    name: "GeoTIFF EPSG:4326 Int16 with nodata",
    file: tifC,
    epsg: 4326,
    edges: true,
    open: () => openGeoTiff(tifC),
    // around the 4×3 nodata block (rows 40–43, cols 60–62) and the lone nodata pixel (100, 20)
    extra: [[59.4, 39.3], [61.5, 39.8], [59.6, 41.7], [62.2, 44.6], [63.7, 42.5], [19.7, 99.6], [20.4, 100.2], [20, 100], [61, 41], [60.5, 42.5]],
  });

  const tifD = ascToTiff("utm32n", 200, 160, 360000, 5140000, 25, (r, c) => surface(46.4 + r * 1e-4, 7.2 + c * 1.3e-4) + 3 * rnd(), [
    "-ot", "Float32", "-a_srs", "EPSG:32632", "-co", "TILED=YES", "-co", "BLOCKXSIZE=64", "-co", "BLOCKYSIZE=64", "-co", "COMPRESS=DEFLATE", "-co", "PREDICTOR=3",
  ]);
  cases.push({ name: "GeoTIFF UTM 32N Float32 tiled+deflate", file: tifD, epsg: 32632, edges: true, open: () => openGeoTiff(tifD) });

  const tifE = ascToTiff("utm19s-point", 150, 120, 300000, 6200000, 30, (r, c) => surface(-34.2 + r * 1e-4, -71.1 + c * 1.1e-4) + 3 * rnd(), [
    "-ot", "Float32", "-a_srs", "EPSG:32719", "-mo", "AREA_OR_POINT=Point",
  ]);
  cases.push({ name: "GeoTIFF UTM 19S Float32 PixelIsPoint", file: tifE, epsg: 32719, edges: true, open: () => openGeoTiff(tifE) });

  for (const c of cases) {
    const j = JSON.parse(await gdal("gdalinfo", ["-json", c.file]));
    infos.set(c.name, { w: j.size[0], h: j.size[1], gt: j.geoTransform });
    terrains.set(c.name, await c.open());
  }
});

afterAll(() => {
  console.info("terrain vs GDAL, max |error| (m):", JSON.stringify(maxErr, null, 1));
  if (dir) rmSync(dir, { recursive: true, force: true });
});

function record(key: string, err: number): void {
  maxErr[key] = Math.max(maxErr[key] ?? 0, Math.abs(err));
}

/** WGS84 lat/lon of pixel-centre coordinates (col, row) on GDAL's grid of case c (our inverse projection for UTM). */
function latLonOf(c: Case, col: number, row: number): { lat: number; lon: number } {
  const { gt } = infos.get(c.name)!;
  const x = gt[0] + (col + 0.5) * gt[1];
  const y = gt[3] + (row + 0.5) * gt[5];
  const [lat, lon] = crsFromEpsg(c.epsg)!.fromCrs(x, y);
  return { lat, lon };
}

/** GDAL's bilinear value at a lat/lon: projected by gdaltransform when the raster is UTM. */
async function gdalBilinear(c: Case, pts: { lat: number; lon: number }[]): Promise<number[]> {
  const { gt } = infos.get(c.name)!;
  const xy = c.epsg === 4326 ? pts.map((p) => [p.lon, p.lat] as [number, number]) : await gdalTransform(c.epsg, pts);
  return pool(xy, 4, ([x, y]) => gdalBilinearAt(c.file, x, y, gt[1], gt[5]));
}

const NAMES = [
  "HGT 3″ N46E007 (file)",
  "HGT 1″ S34W071 (folder)",
  "GeoTIFF EPSG:4326 Int16 with nodata",
  "GeoTIFF UTM 32N Float32 tiled+deflate",
  "GeoTIFF UTM 19S Float32 PixelIsPoint",
];

describe.each(NAMES)("%s against GDAL", (name) => {
  const theCase = (): Case => cases.find((c) => c.name === name)!;

  it("raster geotransform equals gdalinfo's (single-raster sources)", () => {
    const c = theCase();
    const t = terrains.get(name)!;
    if (name.includes("(folder)")) {
      expect(t.raster).toBeUndefined();
      return;
    }
    const { w, h, gt } = infos.get(name)!;
    const r = t.raster!;
    expect([r.width, r.height, r.epsg]).toEqual([w, h, c.epsg]);
    for (let i = 0; i < 6; i++) {
      expectClose(r.geoTransform[i], gt[i], { abs: 1e-9 * Math.max(1, Math.abs(gt[i])) }, { raster: name, geoTransformIndex: i });
      record(`${name} geoTransform`, (r.geoTransform[i] - gt[i]) / Math.max(1, Math.abs(gt[i])));
    }
  });

  it(`equals gdallocationinfo at ${N_RANDOM} random pixel centres`, async () => {
    const c = theCase();
    const { w, h } = infos.get(name)!;
    const rnd = mulberry32(name.length * 101);
    const cells = Array.from({ length: N_RANDOM }, () => [Math.floor(rnd() * w), Math.floor(rnd() * h)]);
    const pts = cells.map(([col, row]) => latLonOf(c, col, row));
    const ref = await gdalPixelValues(c.file, pts);
    const t = terrains.get(name)!;
    pts.forEach((p, i) => {
      const ours = t.elevation(p.lat, p.lon);
      expectClose(ours, ref[i], TOL_H, { raster: name, pixel: cells[i], ...p });
      record(`${name} pixel centres`, ours - ref[i]);
    });
  });

  it(`bilinear elevation() equals gdalwarp -r bilinear at ${N_RANDOM} random points (+ edges, nodata)`, async () => {
    const c = theCase();
    const { w, h } = infos.get(name)!;
    const rnd = mulberry32(name.length * 7 + 3);
    // Pixel-centre coordinates: anywhere between the first and last sample centres…
    const cr: [number, number][] = Array.from({ length: N_RANDOM }, () => [rnd() * (w - 1), rnd() * (h - 1)]);
    // …plus the outer half pixel on each side, where both clamp to the edge sample.
    if (c.edges) cr.push([-0.4, h * 0.3], [w - 0.6, h * 0.55], [w * 0.4, -0.3], [w * 0.7, h - 0.55], [-0.45, -0.45]);
    cr.push(...(c.extra ?? []));
    const pts = cr.map(([col, row]) => latLonOf(c, col, row));
    const ref = await gdalBilinear(c, pts);
    const t = terrains.get(name)!;
    const batch = t.sample(Float64Array.from(pts, (p) => p.lat), Float64Array.from(pts, (p) => p.lon)).h_m;
    pts.forEach((p, i) => {
      const ours = t.elevation(p.lat, p.lon);
      expectClose(ours, ref[i], TOL_H, { raster: name, colRow: cr[i], ...p });
      expect(batch[i]).toBe(ours);
      if (!Number.isNaN(ref[i])) record(`${name} bilinear`, ours - ref[i]);
    });
    if (c.extra) expect(ref.some(Number.isNaN)).toBe(true); // the nodata pixel itself is NaN in both
  });

  it("gives NaN outside the data, and whyOutside says why", () => {
    const c = theCase();
    const { w, h } = infos.get(name)!;
    const t = terrains.get(name)!;
    for (const [col, row] of [[-3, h / 2], [w + 2, h / 2], [w / 2, -3], [w / 2, h + 2]]) {
      const p = latLonOf(c, col, row);
      expect(t.elevation(p.lat, p.lon)).toBeNaN();
      const why = t.whyOutside(p.lat, p.lon);
      expect(why).toMatch(name.startsWith("HGT") ? /\b[NS]\d\d[EW]\d{3}\.hgt\b/ : /outside .* which covers/);
    }
    const mid = latLonOf(c, w / 2, h / 2);
    expect(t.whyOutside(mid.lat, mid.lon)).toBeNull();
  });
});

describe("UTM projection against gdaltransform (PROJ)", () => {
  it.each([32632, 32719])(`EPSG:%i toCrs within 1 mm at ${N_RANDOM} points, fromCrs inverts it`, async (epsg) => {
    const crs = crsFromEpsg(epsg)!;
    const rnd = mulberry32(epsg);
    const zone = epsg % 100;
    const cm = -183 + 6 * zone; // central meridian (deg)
    const pts = Array.from({ length: N_RANDOM }, () => ({ lat: (epsg > 32700 ? -1 : 1) * (1 + 79 * rnd()), lon: cm - 3 + 6 * rnd() }));
    const ref = await gdalTransform(epsg, pts);
    pts.forEach((p, i) => {
      const [x, y] = crs.toCrs(p.lat, p.lon);
      expectClose(x, ref[i][0], { abs: 1e-3 }, { epsg, ...p, axis: "x" });
      expectClose(y, ref[i][1], { abs: 1e-3 }, { epsg, ...p, axis: "y" });
      record(`EPSG:${epsg} toCrs`, Math.hypot(x - ref[i][0], y - ref[i][1]));
      const [lat, lon] = crs.fromCrs(x, y);
      expectClose(lat, p.lat, { abs: 1e-9 }, { epsg, ...p, axis: "lat" });
      expectClose(lon, p.lon, { abs: 1e-9 }, { epsg, ...p, axis: "lon" });
    });
  });
});
