import geographiclib from "geographiclib-geodesic";
import { describe, expect, it } from "vitest";
import { computeCoverage } from "../../src/coverage/compute-coverage.ts";
import { hataLoss } from "../../src/physics/hata.ts";
import { ConstantTerrain } from "../../src/terrain/constant.ts";
import { crsFromEpsg } from "../../src/geo/crs-from-epsg.ts";
import { expectClose } from "../helpers/expect-close.ts";
import { request } from "./coverage-fixtures.ts";

const { Geodesic } = geographiclib as unknown as typeof import("geographiclib-geodesic");

// Hata coverage cells against the formula's published points:
// - Okumura–Hata, urban, small-medium city, 900 MHz, hb = 30 m, hm = 1.5 m, d = 1 km: 126.4 dB,
//   the value quoted throughout the trade (common practice; from memory — M. Hata, IEEE Trans.
//   Veh. Technol. VT-29(3), 1980, §III gives the formula, not this number);
// - COST-231 Hata, urban, medium city (Cm = 0), 1800 MHz, same heights, 1 km: 136.20 dB, the
//   formula of COST Action 231 Final Report (1999) §4.4.1 evaluated by hand (from memory of the
//   formula; see test/reference/hata.test.ts);
// - the distance slope of both, 44.9 − 6.55·log10(hb) dB per decade (Hata 1980, §III).
// The cells are placed so their centres lie 1 km and 10 km (geodesic, GeographicLib) from the
// site; the coverage's grid distance differs from that by < 0.5 m.

const UTM = crsFromEpsg(32632)!;
const RES = 100;

/** Site and the lat/lon of cell centres exactly 1 km and 10 km east of it. */
function geometry(): { site: [number, number]; near: [number, number]; far: [number, number] } {
  // a cell centre of the 100 m UTM grid (origins at whole multiples of 100 m)
  const [clat, clon] = UTM.fromCrs(430_050, 5_020_050);
  const s = Geodesic.WGS84.Direct(clat, clon, 270, 1000);
  const site: [number, number] = [s.lat2!, s.lon2!];
  // the far cell: the cell whose centre lies nearest 10 km along the same line (its exact
  // geodesic distance is measured where it is used)
  const f = Geodesic.WGS84.Direct(site[0], site[1], s.azi2!, 10_000);
  const [fx, fy] = UTM.toCrs(f.lat2!, f.lon2!);
  const far = UTM.fromCrs(Math.floor(fx / RES) * RES + RES / 2, Math.floor(fy / RES) * RES + RES / 2);
  return { site, near: [clat, clon], far };
}

/** Coverage level (dBm) at the cell whose centre is at lat/lon. */
function levelAt(values: ArrayLike<number>, grid: { geoTransform: number[]; width: number }, lat: number, lon: number): number {
  const [x, y] = UTM.toCrs(lat, lon);
  const c = Math.floor((x - grid.geoTransform[0]) / grid.geoTransform[1]);
  const r = Math.floor((y - grid.geoTransform[3]) / grid.geoTransform[5]);
  return values[r * grid.width + c];
}

describe("Hata coverage at the formula's published points", () => {
  const g = geometry();
  const cases = [
    { name: "Okumura–Hata urban 900 MHz", f_ghz: 0.9, published_db: 126.4, tol: 0.05 },
    { name: "COST-231 Hata urban 1800 MHz", f_ghz: 1.8, published_db: 136.2, tol: 0.01 },
  ];
  it.each(cases)("$name, hb 30 m, hm 1.5 m, 1 km: $published_db dB", async ({ f_ghz, published_db, tol }) => {
    const cov = await computeCoverage(
      new ConstantTerrain(100),
      request({ site: { lat_deg: g.site[0], lon_deg: g.site[1] }, method: "hata", frequency_ghz: f_ghz, antenna_m: 30, receiver_m: 1.5, radius_m: 12_000, resolution_m: RES, tx_power_dbm: 0 }),
      { pool: null },
    );
    expect(cov.grid.epsg).toBe(32632);
    const near = -levelAt(cov.values, cov.grid, ...g.near);
    expectClose(near, published_db, { abs: tol }, { f_ghz, d_km: 1 });
    process.stdout.write(`hata ${f_ghz} GHz: cell at 1 km ${near.toFixed(4)} dB (published ${published_db})\n`);
    // the cell 10 km out equals the formula at its geodesic distance, and the slope is Hata's
    const inv = Geodesic.WGS84.Inverse(g.site[0], g.site[1], ...g.far);
    const far = -levelAt(cov.values, cov.grid, ...g.far);
    const formula = hataLoss({ frequency_mhz: f_ghz * 1000, base_m: 30, mobile_m: 1.5, distance_km: inv.s12! / 1000, environment: "urban", city_size: "small-medium" }).loss_db;
    expectClose(far, formula, { abs: 0.01 }, { f_ghz, d_km: inv.s12! / 1000 });
    expectClose((far - near) / Math.log10(inv.s12! / 1000), 44.9 - 6.55 * Math.log10(30), { abs: 0.02 }, "slope per decade");
  });

  it("warns where the formula is extrapolated (inside 1 km, beyond 20 km, outside its frequency range)", async () => {
    const cov = await computeCoverage(
      new ConstantTerrain(0),
      request({ site: { lat_deg: g.site[0], lon_deg: g.site[1] }, method: "hata", frequency_ghz: 2.4, radius_m: 25_000, resolution_m: 200 }),
      { pool: null },
    );
    const text = cov.warnings.join("\n");
    expect(text).toMatch(/within 1 km/);
    expect(text).toMatch(/beyond 20 km/);
    expect(text).toMatch(/frequency 2400 MHz is outside the validity range 1500–2000 MHz/);
  });
});
