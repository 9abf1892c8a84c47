import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { computeCoverage, type ComputedCoverage } from "../../src/coverage/compute-coverage.ts";
import { coverageWaveCheck } from "../../src/coverage/coverage-wave-check.ts";
import { freeSpaceLossDb } from "../../src/physics/free-space-loss.ts";
import { wavelengthM } from "../../src/physics/constants.ts";
import { sphericalEarthDiffractionLoss } from "../../src/physics/spherical-earth-diffraction.ts";
import { openGeoTiff } from "../../src/terrain/geotiff.ts";
import { expectClose } from "../helpers/expect-close.ts";
import { cellLatLon, request, writeUtmDem } from "./coverage-fixtures.ts";

// The coverage check along radials (src/coverage/coverage-wave-check.ts) compares like with
// like: on a flat, smooth radial both the wave solution it reads and the method's loss it
// takes from the map must equal the smooth spherical-Earth diffraction of ITU-R P.526-15 §3
// (sphericalEarthDiffractionLoss) plus free-space loss (ITU-R P.525-4) well beyond the
// horizon, within the 1.5 dB the wave solution's own validation uses there
// (test/reference/parabolic-equation.test.ts). 20 m antennas, k = 4/3: the radio horizon is
// 36.9 km, so points from 50 km out are well beyond it.
const dir = mkdtempSync(join(tmpdir(), "ridgeline-wave-check-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
const N = 580;
const CELL = 250;
let flat: ComputedCoverage;

beforeAll(async () => {
  const dem = writeUtmDem(join(dir, "flat.tif"), N, CELL, () => 100);
  const site = cellLatLon(dem, N / 2, N / 2);
  const req = request({ site: { lat_deg: site[0], lon_deg: site[1] }, method: "delta-bullington", radius_m: 70000, resolution_m: CELL, frequency_ghz: 1, antenna_m: 20, receiver_m: 20, polarization: "h", thresholds_dbm: [-100] });
  flat = await computeCoverage(await openGeoTiff(join(dir, "flat.tif")), req);
}, 120_000);

describe("coverage wave check: a flat smooth radial against ITU-R P.526-15 §3 spherical-Earth diffraction", () => {
  // measured: the wave solution 0.4-0.7 dB below the reference, the method 0.00 dB from it
  it("wave solution within 1.5 dB of free space + Ldsph beyond the horizon, the method within 0.05 dB, their difference within 1.5 dB", () => {
    const check = coverageWaveCheck(flat.job, flat.dem, flat.values, 2)!;
    expect(check.radials.map((r) => r.azimuth_deg)).toEqual([0, 180]);
    const g = flat.job.ground;
    let compared = 0;
    for (const r of check.radials) {
      expect(r.status).toBe("ok");
      expect(r.points).toBeGreaterThan(20);
      r.d_km.forEach((d, i) => {
        if (d < 50) return;
        const ref = freeSpaceLossDb(d * 1000, 1) + sphericalEarthDiffractionLoss(d * 1000, 20, 20, (4 / 3) * 6371000, wavelengthM(1), { polarization: "h", epsilon_r: g.epsilon_r, sigma_s_m: g.sigma_s_m }).Ldsph;
        expectClose(r.wave_db[i], ref, { abs: 1.5 }, { what: "wave", az: r.azimuth_deg, d_km: d });
        // the map's level turned back into loss (antenna pattern and gases out) is delta-Bullington's
        // Lbf + Ld, which on a smooth Earth is Ldsph itself: Float32 rounding only
        expectClose(r.method_db[i], ref, { abs: 0.05 }, { what: "method", az: r.azimuth_deg, d_km: d });
        expectClose(r.method_db[i] - r.wave_db[i], 0, { abs: 1.5 }, { what: "difference", az: r.azimuth_deg, d_km: d });
        compared++;
      });
    }
    expect(compared).toBeGreaterThan(20);
  });

  it("a visibility coverage has no level to compare, and 0 radials turns the check off", async () => {
    expect(coverageWaveCheck({ ...flat.job, method: "visibility" }, flat.dem, flat.values, 8)).toBeNull();
    expect(coverageWaveCheck(flat.job, flat.dem, flat.values, 0)).toBeNull();
  });
});
