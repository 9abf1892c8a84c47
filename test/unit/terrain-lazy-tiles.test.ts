import * as realFs from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";

// Issue 17 §5: a folder of 100 one-degree HGT tiles is read lazily, the terrain's content key
// included. Reads are counted (every readFileSync of a .hgt file, by path), not timed.
const reads = new Map<string, number>();
vi.mock("node:fs", async (importOriginal) => {
  const fs = await importOriginal<typeof import("node:fs")>();
  const readFileSync = ((path: realFs.PathOrFileDescriptor, ...rest: unknown[]) => {
    if (typeof path === "string" && path.endsWith(".hgt")) reads.set(path, (reads.get(path) ?? 0) + 1);
    return (fs.readFileSync as (...a: unknown[]) => unknown)(path, ...rest);
  }) as typeof fs.readFileSync;
  return { ...fs, readFileSync, default: { ...fs, readFileSync } };
});

const { analyzeStudies } = await import("../../src/analysis/analyze-study.ts");
const { loadStudies } = await import("../../src/analysis/load-all.ts");
const { ResultCache } = await import("../../src/cache/result-cache.ts");
const { studyTerrainKey } = await import("../../src/cache/terrain-source-key.ts");
const { terrainExtent, tilesInExtent } = await import("../../src/cache/terrain-extent.ts");
const { writeHgtTile } = await import("../../src/terrain/write-hgt.ts");
const { hgtTileName } = await import("../../src/terrain/hgt-tile-name.ts");
const { fitMapProjection, mapHeightFor } = await import("../../src/render/svg/map-projection.ts");
const { benchTerrainM, makeBenchStudy } = await import("../../bench/make-study.ts");

const TILE_BYTES = 1201 * 1201 * 2; // a 3″ tile
let dir: string;
let studyFile: string;
const dem = () => join(dir, "study", "dem");
const tileNames = (m: Map<string, number>) => [...m.keys()].map((p) => p.slice(p.lastIndexOf("/") + 1)).sort();

beforeAll(() => {
  dir = realFs.mkdtempSync(join(tmpdir(), "ridgeline-lazy-tiles-"));
  realFs.mkdirSync(dem(), { recursive: true });
  // 100 tiles N40–N49 × E000–E009: the two the study lies on hold the bench terrain; the other
  // 98 are sparse files of the right size (zeros: valid heights of 0 m), cheap to make.
  for (let lat = 40; lat < 50; lat++)
    for (let lon = 0; lon < 10; lon++) {
      const f = join(dem(), hgtTileName(lat, lon));
      if (lat === 46 && (lon === 7 || lon === 8)) writeHgtTile(f, lat, lon, 3, benchTerrainM);
      else realFs.writeFileSync(f, ""), realFs.truncateSync(f, TILE_BYTES);
    }
  // the bench's 200-link study (sites in N46E007 and N46E008) over this folder
  makeBenchStudy(join(dir, "gen"), 200);
  studyFile = join(dir, "study", "study.yaml");
  realFs.writeFileSync(studyFile, realFs.readFileSync(join(dir, "gen", "study.yaml")));
});
afterAll(() => realFs.rmSync(dir, { recursive: true, force: true }));

const study = () => loadStudies([studyFile])[0];

describe("a folder of 100 HGT tiles, a 200-link study between 2 of them", () => {
  it("regression: a first build reads only the 2 tiles the study touches (the content key hashed all 100)", async () => {
    for (const cache of [null, new ResultCache(join(dir, "cache"))]) {
      reads.clear();
      const [s] = await analyzeStudies(loadStudies([studyFile]), { cache });
      expect(s.result.links).toHaveLength(200);
      expect(tileNames(reads)).toEqual(["N46E007.hgt", "N46E008.hgt"]);
      // results.json names the tiles its inputs hash covers
      expect(s.result.terrain.tiles_used).toEqual(["N46E007.hgt", "N46E008.hgt"]);
    }
  });

  it("the content key changes with a touched tile and not with an untouched one", () => {
    const before = studyTerrainKey(study());
    const untouched = join(dem(), "N41E002.hgt");
    realFs.writeFileSync(untouched, Buffer.alloc(TILE_BYTES, 7)); // other bytes, same size
    expect(studyTerrainKey(study())).toBe(before);
    const touched = join(dem(), "N46E008.hgt");
    const original = realFs.readFileSync(touched);
    const changed = Buffer.from(original);
    changed.writeInt16BE(changed.readInt16BE(1000) + 1, 1000);
    realFs.writeFileSync(touched, changed);
    expect(studyTerrainKey(study())).not.toBe(before);
    realFs.writeFileSync(touched, original);
    expect(studyTerrainKey(study())).toBe(before);
    // a tile added or removed anywhere changes the key: the folder's tile count is in the
    // terrain's description, and a tile's size sets the resolution profiles are sampled at
    realFs.writeFileSync(join(dem(), "N49E011.hgt"), ""), realFs.truncateSync(join(dem(), "N49E011.hgt"), TILE_BYTES);
    expect(studyTerrainKey(study())).not.toBe(before);
    realFs.rmSync(join(dem(), "N49E011.hgt"));
    expect(studyTerrainKey(study())).toBe(before);
  });
});

describe("terrainExtent", () => {
  it("covers the sites' box and each coverage's square, with tiles met at their edges", () => {
    const boxes = terrainExtent([{ lat_deg: 46.1, lon_deg: 7.1 }, { lat_deg: 46.9, lon_deg: 8.9 }], [{ lat_deg: 46.5, lon_deg: 7.5, radius_km: 100 }]);
    const tiles = tilesInExtent(boxes);
    expect(tilesInExtent([boxes[0]])).toEqual(new Set(["46,7", "46,8"]));
    // 150 km around 46.5 N 7.5 E: 1.35° of latitude, 2.01° of longitude (at 47.85 N), and the
    // 0.05° margin: 45.10–47.90 N, 5.44–9.56 E
    expect(tiles).toEqual(new Set([45, 46, 47].flatMap((lat) => [5, 6, 7, 8, 9].map((lon) => `${lat},${lon}`))));
    // a box ending on a whole degree meets the tile beyond that edge too
    expect(tilesInExtent([{ lat_min: 45.5, lat_max: 46, lon_min: 7.2, lon_max: 7.4 }])).toEqual(new Set(["45,7", "46,7"]));
    // across 180°
    expect(tilesInExtent(terrainExtent([{ lat_deg: -17.5, lon_deg: 179.9 }, { lat_deg: -17.5, lon_deg: -179.9 }], []))).toEqual(new Set(["-18,179", "-18,-180"]));
  });

  // The overview map's relief reads its whole frame, which the sites' box does not hold: the
  // map remembers it under a key over its own frame's tiles (study-map.ts frameExtent). This
  // checks the reason for that: the frame reaches well beyond the sites' box.
  it("the overview map's frame reaches beyond the sites' box (so the map keys its own tiles)", () => {
    const sites = [{ lat_deg: 46.1, lon_deg: 7.1 }, { lat_deg: 46.9, lon_deg: 8.9 }];
    const H = mapHeightFor(sites, 880, 56, [440, 720]);
    const p = fitMapProjection(sites, 880, H, 56);
    const [lon, lat] = p.invert!([0, 0]) as [number, number];
    const [box] = terrainExtent(sites, []);
    expect(lat > box.lat_max || lon < box.lon_min).toBe(true);
  });
});
