import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { computeCoverage, type ComputedCoverage } from "../../src/coverage/compute-coverage.ts";
import { rayCount, sweepRays, type RayVisitor } from "../../src/coverage/radial-sweep.ts";
import { deltaBullingtonLoss } from "../../src/physics/delta-bullington.ts";
import { freeSpaceLossDb } from "../../src/physics/free-space-loss.ts";
import { groundConstants } from "../../src/physics/ground-constants.ts";
import { openGeoTiff } from "../../src/terrain/geotiff.ts";
import { expectClose } from "../helpers/expect-close.ts";
import { runCliInProcess as runCli } from "../helpers/run-cli.ts";
import { cellLatLon, request, writeUtmDem } from "./coverage-fixtures.ts";

// A coverage cell against `ridgeline path --json` for the same geometry (site → cell centre,
// same terrain, antenna and receiver heights, frequency, k, power): received level within
// 0.1 dB. The two sample the terrain differently — the path along the geodesic at the DEM
// spacing, the coverage along its radial once per grid column, ending at the cell — so the
// terrain is made of smooth hills (widths of a kilometre or more) on which that difference is
// small; the cells are chosen so that several have several dB of diffraction.
// And the same cell against the full delta-Bullington method (src/physics, validated on the
// 20 ITU-R SG3 paths) on the very profile the sweep used: 1e-5 dB (rounding only).

const CELL = 30;
const N = 401;
let dir: string;
let demPath: string;
let dem: ReturnType<typeof writeUtmDem>;
let cov: ComputedCoverage;
const SITE: [number, number] = [137.3, 211.6]; // site position in cells (not a cell centre)

/** Smooth hills and a ridge across the middle (m), x, y in metres from the DEM's north-west corner. */
function hills(x: number, y: number): number {
  const g = (cx: number, cy: number, s: number, h: number) => h * Math.exp(-(((x - cx) ** 2 + (y - cy) ** 2) / (s * s)));
  const ridge = 180 * Math.exp(-(((x - 0.45 * y - 5200) / 700) ** 2));
  return 350 + g(3000, 4000, 1500, 120) + g(9000, 3000, 2000, 220) + g(6000, 9500, 1800, 160) + ridge + 0.004 * x;
}

const CELLS: [number, number][] = [
  [300, 212], // east, across the ridge
  [330, 150],
  [280, 330],
  [210, 390],
  [137, 30], // north
  [40, 300],
  [60, 120],
  [250, 60],
  [230, 230],
  [180, 250], // near, before the ridge
];

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), "ridgeline-coverage-path-"));
  demPath = join(dir, "hills.tif");
  dem = writeUtmDem(demPath, N, CELL, (c, r) => hills((c + 0.5) * CELL, (r + 0.5) * CELL));
  const terrain = await openGeoTiff(demPath);
  const [lat, lon] = cellLatLon(dem, SITE[0], SITE[1]);
  cov = await computeCoverage(terrain, request({ site: { lat_deg: lat, lon_deg: lon }, method: "delta-bullington", radius_m: 6200, antenna_m: 30, receiver_m: 1.5, tx_power_dbm: 40 }), { pool: null });
});

let maxPathDiff = 0;
let maxProfileDiff = 0;
afterAll(() => {
  rmSync(dir, { recursive: true, force: true });
  process.stdout.write(`coverage vs path: max |Δ| = ${maxPathDiff.toFixed(4)} dB over ${CELLS.length} cells; vs full method on the sweep's profile: max |Δ| = ${maxProfileDiff.toExponential(2)} dB\n`);
});

/** Grid index of DEM cell (col, row) in the coverage window. */
function windowIndex(col: number, row: number): number {
  const src = cov.grid.source as { col0: number; row0: number };
  return (row - src.row0) * cov.grid.width + (col - src.col0);
}

describe("coverage cell = ridgeline path --json (same geometry) within 0.1 dB", () => {
  it.each(CELLS)("cell (%i, %i)", async (col, row) => {
    const [lat, lon] = cellLatLon(dem, SITE[0], SITE[1]);
    const [tlat, tlon] = cellLatLon(dem, col, row);
    const level = cov.values[windowIndex(col, row)];
    expect(level).not.toBe(-9999);
    const { code, stdout, stderr } = await runCli([
      "path", "--from", `${lat},${lon}`, "--to", `${tlat},${tlon}`, "--terrain", demPath, "--frequency-ghz", "0.9",
      "--from-antenna-m", "30", "--to-antenna-m", "1.5", "--k", "4/3", "--tx-power-dbm", "40", "--json",
    ]);
    expect(code, stderr).toBe(0);
    const link = JSON.parse(stdout);
    expectClose(level, link.received_dbm, { abs: 0.1 }, { col, row, diffraction_db: link.losses_db.diffraction, distance_m: link.distance_m });
    maxPathDiff = Math.max(maxPathDiff, Math.abs(level - link.received_dbm));
  });

  it("the chosen cells include real diffraction (≥ 3 of them above 3 dB)", async () => {
    let shadowed = 0;
    for (const [col, row] of CELLS) {
      const [lat, lon] = cellLatLon(dem, SITE[0], SITE[1]);
      const [tlat, tlon] = cellLatLon(dem, col, row);
      const { stdout } = await runCli(["path", "--from", `${lat},${lon}`, "--to", `${tlat},${tlon}`, "--terrain", demPath, "--frequency-ghz", "0.9", "--from-antenna-m", "30", "--to-antenna-m", "1.5", "--k", "4/3", "--json"]);
      if (JSON.parse(stdout).losses_db.diffraction > 3) shadowed++;
    }
    expect(shadowed).toBeGreaterThanOrEqual(3);
  });
});

describe("coverage cell = full delta-Bullington on the radial profile the sweep used", () => {
  it("every 97th cell inside the radius agrees within 1e-5 dB", () => {
    const g = cov.grid;
    const targets = new Map<number, { d: number[]; h: number[]; dR: number; hR: number }>();
    for (let i = 0; i < g.width * g.height; i += 97) if (cov.values[i] !== -9999) targets.set(i, { d: [], h: [], dR: 0, hR: 0 });
    // Re-walk the sweep, recording each radial's samples up to the cells we check.
    let d: number[] = [];
    let h: number[] = [];
    const recorder: RayVisitor = {
      startRay: () => ((d = [0]), (h = [cov.site_ground_m])),
      sample: (dm, hm) => (d.push(dm), h.push(hm)),
      cell: (index, _row, dm, hm) => {
        const t = targets.get(index);
        if (t) Object.assign(t, { d: [...d], h: [...h], dR: dm, hR: hm });
      },
    };
    sweepRays(cov.job, cov.dem, cov.job.rc, 0, rayCount(cov.job.rc), recorder);
    const f = 0.9;
    const gc = groundConstants("medium-dry-ground", f);
    const hts = cov.site_ground_m + 30;
    let n = 0;
    for (const [i, t] of targets) {
      const ref = deltaBullingtonLoss(
        { d_m: [...t.d, t.dR], h_m: [...t.h, t.hR], hts_m: hts, hrs_m: t.hR + 1.5, frequency_ghz: f, ae_m: (4 / 3) * 6371000 },
        { polarization: "v", epsilon_r: gc.epsilon_r, sigma_s_m: gc.sigma_s_m },
      ).Ld;
      const expected = 40 - freeSpaceLossDb(t.dR, f) - ref - (cov.job.gamma_db_km * t.dR) / 1000;
      expectClose(cov.values[i], expected, { abs: 1e-5, rel: 1e-6 }, { cell: i, samples: t.d.length, d: t.dR });
      maxProfileDiff = Math.max(maxProfileDiff, Math.abs(cov.values[i] - expected));
      n++;
    }
    expect(n).toBeGreaterThan(500);
  });
});
