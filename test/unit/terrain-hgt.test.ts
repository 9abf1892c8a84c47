import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { openHgt } from "../../src/terrain/hgt.ts";
import { hgtTileName, parseHgtTileName } from "../../src/terrain/hgt-tile-name.ts";
import { TerrainError } from "../../src/terrain/terrain-error.ts";
import { writeHgtTile } from "../../src/terrain/write-hgt.ts";
import { expectClose } from "../helpers/expect-close.ts";

const dir = mkdtempSync(join(tmpdir(), "ridgeline-hgt-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

// A global plane with whole-metre values on every 3″ sample, so bilinear interpolation
// reproduces it exactly (to rounding) anywhere and across tile seams.
const plane = (lat: number, lon: number): number => 1200 * (lat - 46) + 2400 * (lon - 7);
const dem = join(dir, "dem");
mkdirSync(dem);
writeHgtTile(join(dem, "N46E007.hgt"), 46, 7, 3, plane);
writeHgtTile(join(dem, "N46E008.hgt"), 46, 8, 3, plane);

describe("SRTM tile names", () => {
  it.each([
    [46, 7, "N46E007.hgt"],
    [-34, -71, "S34W071.hgt"],
    [0, 0, "N00E000.hgt"],
    [-1, -1, "S01W001.hgt"],
    [59, 179, "N59E179.hgt"],
    [-60, -180, "S60W180.hgt"],
  ])("(%i, %i) ↔ %s", (lat, lon, name) => {
    expect(hgtTileName(lat, lon)).toBe(name);
    expect(parseHgtTileName(name)).toEqual({ lat_deg: lat, lon_deg: lon });
    expect(parseHgtTileName(name.toLowerCase())).toEqual({ lat_deg: lat, lon_deg: lon });
  });

  it.each(["N46E007.tif", "N46E07.hgt", "X46E007.hgt", "N95E007.hgt", "N46E181.hgt"])("rejects %s", (name) => {
    expect(parseHgtTileName(name)).toBeNull();
  });
});

describe("openHgt on a folder of two 3″ tiles", () => {
  const t = openHgt(dem, { label: "dem/" });

  it("describes itself and is not synthetic", () => {
    expect(t.description).toBe("SRTM 3″ tiles in dem/ (2 tiles)");
    expect([t.kind, t.synthetic, t.raster]).toEqual(["hgt", false, undefined]);
  });

  it.each([
    [46.5, 7.5],
    [46.123456, 7.987654],
    [46.0001, 8.9999],
    [46.7, 8.0], // on the seam: column shared by both tiles
    [46.7, 7.9999999],
    [46.7, 8.0000001],
    [47.0, 7.3], // north edge: tile N47E007 absent, taken from N46E007's first row
    [46.0, 9.0], // SE corner of the pair, on the edge of the absent N46E009
  ])("reproduces the plane at (%f, %f)", (lat, lon) => {
    expectClose(t.elevation(lat, lon), plane(lat, lon), { abs: 1e-6 }, { lat, lon });
  });

  it("sample() matches elevation() point by point and counts points outside", () => {
    const lat = [46.2, 47.5, 46.9, Number.NaN, 46.1];
    const lon = [7.1, 7.2, 8.6, 7.0, 9.5];
    const s = t.sample(lat, lon);
    expect(s.outside).toBe(3);
    expect(s.voidFilled).toBe(0);
    lat.forEach((la, i) => expect(s.h_m[i]).toEqual(t.elevation(la, lon[i])));
    expect(s.h_m[1]).toBeNaN();
  });

  it("whyOutside names the missing tile and the folder", () => {
    expect(t.whyOutside(47.5, 7.25)).toBe("tile N47E007.hgt not found in dem/ (needed for 47.50000, 7.25000); add it or choose another terrain source");
    expect(t.whyOutside(-0.5, -0.5)).toMatch(/^tile S01W001\.hgt not found/);
    expect(t.whyOutside(46.5, 7.5)).toBeNull();
    expect(t.whyOutside(95, 7)).toMatch(/not a valid WGS84/);
  });

  it("resolutionM is the coarser WGS84 spacing of 3″ (E–W at the equator: a·π/180/1200)", () => {
    // a·π/180 = 111 319.4908 m per degree of longitude on the WGS84 equator (a = 6 378 137 m).
    expectClose(t.resolutionM(0), (6378137 * Math.PI) / 180 / 1200, { abs: 1e-6 }, "equator");
    // At 60°, N–S spacing is the coarser: 111 412.24 m per degree of latitude on WGS84
    // (meridian radius of curvature; value from memory of the standard table, to 0.01 m).
    expectClose(t.resolutionM(60), 111412.24 / 1200, { abs: 0.01 }, "lat 60");
  });

  it("gives the same heights with a one-tile cache while alternating tiles", () => {
    const small = openHgt(dem, { cacheTiles: 1 });
    const lat = Array.from({ length: 30 }, (_, i) => 46.05 + (i % 17) * 0.05);
    const lon = Array.from({ length: 30 }, (_, i) => (i % 2 ? 7.3 : 8.7) + (i % 5) * 0.01);
    expect(small.sample(lat, lon).h_m).toEqual(t.sample(lat, lon).h_m);
  });

  it("samples 10⁵ points along a line across both tiles, none outside", () => {
    const n = 100_000;
    const lat = new Float64Array(n);
    const lon = new Float64Array(n);
    for (let i = 0; i < n; i++) (lat[i] = 46.01 + (0.98 * i) / n), (lon[i] = 7.01 + (1.98 * i) / n);
    t.sample(lat, lon); // load tiles
    const s = t.sample(lat, lon);
    expect(s.outside).toBe(0); // speed: bench/terrain-sample.ts (no timed assertions in tests)
  });
});

describe("openHgt on single files", () => {
  it("opens one 3″ tile, exposes it as an EPSG:4326 raster and says where else to look", () => {
    const t = openHgt(join(dem, "N46E008.hgt"), { label: "dem/N46E008.hgt" });
    expect(t.description).toBe("SRTM 3″ tile dem/N46E008.hgt");
    const r = t.raster!;
    expect([r.width, r.height, r.epsg]).toEqual([1201, 1201, 4326]);
    // corner of the first pixel half a sample NW of the tile's NW sample (as GDAL's SRTMHGT driver)
    expect(r.geoTransform).toEqual([8 - 0.5 / 1200, 1 / 1200, 0, 47 + 0.5 / 1200, 0, -1 / 1200]);
    expect(r.data[0]).toBe(plane(47, 8));
    expect(t.elevation(46.5, 7.5)).toBeNaN();
    expect(t.whyOutside(46.5, 7.5)).toMatch(/outside the single tile dem\/N46E008\.hgt; put N46E007\.hgt beside it/);
  });

  it("fingerprint is stable and changes when a tile's bytes change", () => {
    const d2 = join(dir, "fp");
    mkdirSync(d2);
    writeHgtTile(join(d2, "N46E007.hgt"), 46, 7, 3, plane);
    const a = openHgt(d2).fingerprint();
    expect(openHgt(d2).fingerprint()).toBe(a);
    expect(a).toMatch(/^[0-9a-f]{64}$/);
    const bytes = readFileSync(join(d2, "N46E007.hgt"));
    bytes[1001] ^= 1;
    writeFileSync(join(d2, "N46E007.hgt"), bytes);
    expect(openHgt(d2).fingerprint()).not.toBe(a);
  });
});

describe("openHgt errors are TerrainErrors that say what, where and how to fix", () => {
  const bad = join(dir, "bad");
  mkdirSync(bad);
  writeFileSync(join(bad, "N46E007.hgt"), Buffer.alloc(1000));
  writeFileSync(join(bad, "tile.hgt"), Buffer.alloc(1201 * 1201 * 2));
  const empty = join(dir, "empty");
  mkdirSync(empty);

  it.each([
    [join(bad, "N46E007.hgt"), /has 1000 bytes; expected 25934402 .* or 2884802 .*replace it/],
    [bad, /has 1000 bytes/],
    [join(bad, "tile.hgt"), /name it after its south-west corner, like N46E007\.hgt/],
    [empty, /holds no SRTM tiles named like N46E007\.hgt; add/],
    [join(dir, "nowhere"), /not found \(ENOENT\); check the path/],
  ])("%s", (path, message) => {
    let err: unknown;
    try {
      openHgt(path);
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(TerrainError);
    expect((err as TerrainError).message).toMatch(message);
    expect((err as TerrainError).detail.hint).toBeTruthy();
  });

  it("rejects a cache size below 1", () => {
    expect(() => openHgt(dem, { cacheTiles: 0 })).toThrow(TerrainError);
  });
});
