import type { CoverageRequest } from "../../src/coverage/coverage-request.ts";
import { writeGeoTiff } from "../../src/geo/geotiff-writer.ts";
import { crsFromEpsg } from "../../src/geo/crs-from-epsg.ts";
import { mulberry32 } from "../../src/terrain/mulberry32.ts";
import { FractalNoise } from "../../src/terrain/value-noise.ts";

/** A north-up UTM zone 32N GeoTIFF DEM of n×n cells of `cell` m, heights from fn(col, row). */
export function writeUtmDem(path: string, n: number, cell: number, fn: (col: number, row: number) => number, origin: [number, number] = [400000, 5010000]): { x0: number; y0: number; n: number; cell: number } {
  const data = new Float32Array(n * n);
  for (let r = 0; r < n; r++) for (let c = 0; c < n; c++) data[r * n + c] = fn(c, r);
  writeGeoTiff(path, { width: n, height: n, data, geoTransform: [origin[0], cell, 0, origin[1], 0, -cell], epsg: 32632, nodata: -9999 });
  return { x0: origin[0], y0: origin[1], n, cell };
}

/** Rough seeded terrain: large valleys and ridges plus fine detail (m), u, v in [0, 1]. */
export function roughTerrain(seed: number): (u: number, v: number) => number {
  const rnd = mulberry32(seed);
  const big = new FractalNoise(3, 4, 0.5, rnd);
  const detail = new FractalNoise(16, 3, 0.5, rnd);
  return (u, v) => 300 + 700 * big.at(u, v) + 80 * detail.at(u, v);
}

/** WGS84 [lat, lon] of the centre of cell (col, row) of a DEM made by writeUtmDem. */
export function cellLatLon(dem: { x0: number; y0: number; cell: number }, col: number, row: number): [number, number] {
  return crsFromEpsg(32632)!.fromCrs(dem.x0 + (col + 0.5) * dem.cell, dem.y0 - (row + 0.5) * dem.cell);
}

/** A coverage request with everyday defaults; override what a test varies. */
export function request(over: Partial<CoverageRequest> & Pick<CoverageRequest, "site" | "method">): CoverageRequest {
  return {
    antenna_m: 30,
    receiver_m: 1.5,
    radius_m: 5000,
    resolution_m: 30,
    frequency_ghz: 0.9,
    k: 4 / 3,
    clearance_f1: 0,
    tx_power_dbm: 40,
    tx_losses_db: 0,
    gain_dbi: 0,
    rx_gain_dbi: 0,
    rx_losses_db: 0,
    thresholds_dbm: [],
    polarization: "v",
    ground: "medium-dry-ground",
    atmosphere: { pressure_hpa: 1013.25, temperature_c: 15, water_vapour_g_m3: 7.5 },
    hata: { environment: "urban", city_size: "small-medium" },
    ...over,
  };
}

