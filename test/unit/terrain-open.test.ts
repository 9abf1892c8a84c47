import { execFileSync } from "node:child_process";
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { ConstantTerrain } from "../../src/terrain/constant.ts";
import { openGeoTiff } from "../../src/terrain/geotiff.ts";
import { openTerrain, parseTerrainArg } from "../../src/terrain/open-terrain.ts";
import { TerrainError } from "../../src/terrain/terrain-error.ts";
import { writeHgtTile } from "../../src/terrain/write-hgt.ts";

let base: string;
beforeAll(() => {
  base = mkdtempSync(join(tmpdir(), "ridgeline-open-"));
  mkdirSync(join(base, "dem"));
  writeHgtTile(join(base, "dem", "N46E007.hgt"), 46, 7, 3, () => 500);
  writeFileSync(join(base, "dem.xyz"), "0 0 1\n");
  // A GeoTIFF in an unsupported CRS (EPSG:3857) and one without any CRS.
  writeFileSync(join(base, "g.asc"), "ncols 2\nnrows 2\nxllcorner 0\nyllcorner 0\ncellsize 10\n1 2\n3 4\n");
  execFileSync("gdal_translate", ["-q", "-a_srs", "EPSG:3857", join(base, "g.asc"), join(base, "merc.tif")]);
  execFileSync("gdal_translate", ["-q", join(base, "g.asc"), join(base, "nocrs.tif")]);
  execFileSync("gdal_translate", ["-q", "-a_srs", "EPSG:4326", "-a_ullr", "7", "46.1", "7.2", "46", join(base, "g.asc"), join(base, "ok.tiff")]);
  writeFileSync(join(base, "junk.tif"), "not a tiff");
});
afterAll(() => rmSync(base, { recursive: true, force: true }));

describe("parseTerrainArg", () => {
  it.each([
    ["constant:120", { kind: "constant", height_m: 120 }],
    ["constant:0", { kind: "constant", height_m: 0 }],
    ["CONSTANT: -3.5 ", { kind: "constant", height_m: -3.5 }],
    ["dem/", { kind: "file", path: "dem/" }],
    ["dem/N46E007.hgt", { kind: "file", path: "dem/N46E007.hgt" }],
    ["/data/alps.tif", { kind: "file", path: "/data/alps.tif" }],
  ])("%s", (arg, spec) => {
    expect(parseTerrainArg(arg)).toEqual(spec);
  });

  it.each(["constant:", "constant:abc", "constant:1e999", "  "])("rejects %j with a TerrainError", (arg) => {
    expect(() => parseTerrainArg(arg)).toThrow(TerrainError);
  });
});

describe("openTerrain", () => {
  it("opens a folder of tiles relative to baseDir and names it as written", async () => {
    const t = await openTerrain({ kind: "file", path: "dem" }, base);
    expect(t.kind).toBe("hgt");
    expect(t.description).toBe("SRTM 3″ tiles in dem/ (1 tile)");
    expect(t.whyOutside(47.5, 7.5)).toBe("tile N47E007.hgt not found in dem/ (needed for 47.50000, 7.50000); add it or choose another terrain source");
  });

  it("opens a single tile, a GeoTIFF, a constant and a synthetic terrain", async () => {
    expect((await openTerrain({ kind: "file", path: "dem/N46E007.hgt" }, base)).elevation(46.5, 7.5)).toBe(500);
    const g = await openTerrain({ kind: "file", path: join(base, "ok.tiff") }, "/elsewhere");
    expect(g.kind).toBe("geotiff");
    expect(g.description).toMatch(/^GeoTIFF .*ok\.tiff \(EPSG:4326, 2×2, 360″\)$/);
    const c = await openTerrain({ kind: "constant", height_m: 12 }, base);
    expect([c.kind, c.elevation(10, 20), c.resolutionM(0), c.whyOutside(10, 20)]).toEqual(["constant", 12, Infinity, null]);
    const s = await openTerrain({ kind: "synthetic", seed: 3, south_deg: 1, west_deg: 2, north_deg: 1.01, east_deg: 2.01, spacing_arcsec: 3 }, base);
    expect([s.kind, s.synthetic, s.raster?.width]).toEqual(["synthetic", true, 13]);
  });

  it.each([
    [{ kind: "file" as const, path: "missing/" }, /terrain missing not found .*relative to the study file/],
    [{ kind: "file" as const, path: "dem.xyz" }, /unknown file type "\.xyz"; expected a \.hgt tile/],
    [{ kind: "file" as const, path: "merc.tif" }, /EPSG:3857 is not supported; expected EPSG:4326 or a WGS84 UTM zone/],
    [{ kind: "file" as const, path: "nocrs.tif" }, /coordinate reference system is missing/],
    [{ kind: "file" as const, path: "junk.tif" }, /junk\.tif: not a readable TIFF/],
    [{ kind: "constant" as const, height_m: Number.NaN }, /must be a finite number/],
  ])("bad input %# → TerrainError", async (spec, msg) => {
    const p = openTerrain(spec, base);
    await expect(p).rejects.toBeInstanceOf(TerrainError);
    await expect(p).rejects.toThrow(msg);
  });
});

describe("constant terrain", () => {
  const t = new ConstantTerrain(-2);
  it("is flat everywhere, NaN only for invalid points; fingerprint depends on the height", () => {
    const s = t.sample([0, 45, -89.9, 91, Number.NaN], [0, 179.9, -180, 0, 0]);
    expect([...s.h_m]).toEqual([-2, -2, -2, NaN, NaN]);
    expect([s.outside, s.voidFilled]).toEqual([2, 0]);
    expect(t.whyOutside(91, 0)).toMatch(/not a valid WGS84/);
    expect(t.fingerprint()).toBe(new ConstantTerrain(-2).fingerprint());
    expect(t.fingerprint()).not.toBe(new ConstantTerrain(-2.5).fingerprint());
    expect([t.description, t.synthetic]).toEqual(["smooth Earth at -2 m (constant)", false]);
  });
});

describe("GeoTIFF fingerprint", () => {
  it("is the sha256 of the file bytes", async () => {
    const { createHash } = await import("node:crypto");
    const { readFileSync } = await import("node:fs");
    const f = join(base, "ok.tiff");
    expect((await openGeoTiff(f)).fingerprint()).toBe(createHash("sha256").update(readFileSync(f)).digest("hex"));
  });
});
