import { mkdirSync, mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import geographiclib from "geographiclib-geodesic";
import { afterAll, describe, expect, it } from "vitest";
import { computeCoverage } from "../../src/coverage/compute-coverage.ts";
import { cellCentreLatLon, planCoverageGrid, type CoverageGrid } from "../../src/coverage/coverage-grid.ts";
import { elevationWindow, latLonMesh } from "../../src/coverage/elevation-window.ts";
import { openHgt } from "../../src/terrain/hgt.ts";
import { mulberry32 } from "../../src/terrain/mulberry32.ts";
import { syntheticTerrain } from "../../src/terrain/synthetic.ts";
import { ConstantTerrain } from "../../src/terrain/constant.ts";
import { makeRasterGrid, RasterTerrain } from "../../src/terrain/raster-terrain.ts";
import { writeHgtTile } from "../../src/terrain/write-hgt.ts";
import { expectClose } from "../helpers/expect-close.ts";
import { analyzeLink } from "../../src/analysis/analyze-link.ts";
import { request } from "./coverage-fixtures.ts";

const { Geodesic } = geographiclib as unknown as typeof import("geographiclib-geodesic");

// The coverage grid's geometry against GeographicLib (WGS84 geodesics, Karney 2013): the
// ground distance and true azimuth the sweep gives each cell, on a UTM grid and on a
// latitude/longitude raster; the exactness of the projected-position mesh; the raster crop.

const dir = mkdtempSync(join(tmpdir(), "ridgeline-coverage-grid-"));
let maxMesh = 0;
afterAll(() => {
  rmSync(dir, { recursive: true, force: true });
  process.stdout.write(`mesh interpolation: max error ${maxMesh.toExponential(2)}°\n`);
});

/** Ground distance (m) and true azimuth (deg) of cell (c, r) from the site, as the sweep forms them. */
function gridPolar(g: CoverageGrid, c: number, r: number): [number, number] {
  const e = (c - g.site_col) * g.east_per_col_m[r];
  const n = (r - g.site_row) * g.north_per_row_m[r];
  const az = ((Math.atan2(e, n) * 180) / Math.PI + g.azimuth_offset_deg + 360) % 360;
  return [Math.hypot(e, n), az];
}

function checkPolar(g: CoverageGrid, site: [number, number], distTol: { abs?: number; rel?: number }, azTol: number, samples = 200): { maxRel: number; maxAz: number } {
  const rnd = mulberry32(17);
  let maxRel = 0;
  let maxAz = 0;
  for (let i = 0; i < samples; i++) {
    const c = Math.floor(rnd() * g.width);
    const r = Math.floor(rnd() * g.height);
    const [lat, lon] = cellCentreLatLon(g, c, r);
    const inv = Geodesic.WGS84.Inverse(site[0], site[1], lat, lon);
    if (inv.s12! < 500) continue;
    const [d, az] = gridPolar(g, c, r);
    expectClose(d, inv.s12!, distTol, { c, r, what: "distance" });
    const dAz = Math.abs(((az - ((inv.azi1! + 360) % 360) + 540) % 360) - 180);
    expect(dAz, `azimuth at ${c},${r}`).toBeLessThan(azTol);
    maxRel = Math.max(maxRel, Math.abs(d - inv.s12!) / inv.s12!);
    maxAz = Math.max(maxAz, dAz);
  }
  return { maxRel, maxAz };
}

describe("UTM grid (terrain without a raster of its own)", () => {
  const site: [number, number] = [46.2, 8.1];
  const { grid } = planCoverageGrid(new ConstantTerrain(0), { lat_deg: site[0], lon_deg: site[1] }, 60_000, 100);

  it("is a UTM grid of the site's zone, aligned to whole cells, holding the circle", () => {
    expect(grid.epsg).toBe(32632);
    expect(grid.geoTransform[0] % 100).toBe(0);
    expect(grid.geoTransform[3] % 100).toBe(0);
    expect(grid.site_col).toBeGreaterThan(600);
    expect(grid.width - grid.site_col).toBeGreaterThan(600);
  });

  it("cell distances within 1e-4 and azimuths within 0.02° of the geodesic", () => {
    const m = checkPolar(grid, site, { rel: 1e-4 }, 0.02);
    expect(m.maxRel).toBeGreaterThan(0); // a real comparison
  });

  it("interpolated cell positions match the projection within 1e-7° (≈ 1 cm; 1/10 000 of a cell)", () => {
    const mesh = latLonMesh(grid);
    const lat = new Float64Array(grid.width);
    const lon = new Float64Array(grid.width);
    const rnd = mulberry32(5);
    for (let k = 0; k < 40; k++) {
      const r = Math.floor(rnd() * grid.height);
      mesh.row(r, lat, lon);
      for (let j = 0; j < 10; j++) {
        const c = Math.floor(rnd() * grid.width);
        const [la, lo] = cellCentreLatLon(grid, c, r);
        expectClose(lat[c], la, { abs: 1e-7 }, { c, r });
        expectClose(lon[c], lo, { abs: 1e-7 }, { c, r });
        maxMesh = Math.max(maxMesh, Math.abs(lat[c] - la), Math.abs(lon[c] - lo));
      }
    }
  });
});

describe("latitude/longitude raster (synthetic terrain): its own grid, cropped", () => {
  const terrain = syntheticTerrain({ seed: 3, south_deg: 45.8, west_deg: 7.0, north_deg: 46.4, east_deg: 7.9 });
  const site: [number, number] = [46.05, 7.41];
  const { grid } = planCoverageGrid(terrain, { lat_deg: site[0], lon_deg: site[1] }, 15_000, 30);

  it("lies on the raster's grid (same spacing, whole-cell offset)", () => {
    const gt = terrain.raster.geoTransform;
    expect(grid.epsg).toBe(4326);
    expect(grid.geoTransform[1]).toBe(gt[1]);
    expect(grid.geoTransform[5]).toBe(gt[5]);
    const off = (grid.geoTransform[0] - gt[0]) / gt[1];
    expect(Math.abs(off - Math.round(off))).toBeLessThan(1e-6);
    expect(grid.source.kind).toBe("raster");
  });

  it("cell distances within 2e-4 and azimuths within 0.1° of the geodesic (mid-latitude metric)", () => {
    checkPolar(grid, site, { rel: 2e-4 }, 0.1);
  });

  it("its elevations are the raster's own samples", () => {
    const dem = elevationWindow(terrain, grid);
    const src = grid.source as { col0: number; row0: number };
    const r = terrain.raster;
    for (const [c, rr] of [[0, 0], [grid.width - 1, grid.height - 1], [37, 211]]) expect(dem[rr * grid.width + c]).toBe(r.data[(rr + src.row0) * r.width + c + src.col0]);
  });

});

describe("latitude/longitude raster of smooth hills: coverage cell = path analysis within 0.1 dB", () => {
  // The same check as path-equivalence.test.ts on a 1″ EPSG:4326 raster, through the analysis
  // `ridgeline path` runs (analyzeLink; the command takes files, not in-memory rasters).
  const S = 45.9;
  const W0 = 7.3;
  const n = 1201;
  const s = 1 / 3600;
  const data = new Float32Array(n * n);
  for (let r = 0; r < n; r++) {
    for (let c = 0; c < n; c++) {
      const y = (n - 1 - r) * 30.9; // metres north of the south edge (approximately)
      const x = c * 21.5;
      const g = (cx: number, cy: number, w: number, h: number) => h * Math.exp(-(((x - cx) ** 2 + (y - cy) ** 2) / (w * w)));
      data[r * n + c] = 400 + g(15000, 17000, 1800, 260) + g(19000, 10000, 2200, 200) + 150 * Math.exp(-(((x + 0.6 * y - 14000) / 900) ** 2));
    }
  }
  const terrain = new RasterTerrain(makeRasterGrid(n, n, [W0 - s / 2, s, 0, S + (n - 1) * s + s / 2, 0, -s], 4326, data), { kind: "geotiff", description: "hills", synthetic: false, label: "hills", fingerprint: "" });
  const site: [number, number] = [S + 0.05, W0 + 0.1];

  it("four cells with and without diffraction", async () => {
    const cov = await computeCoverage(terrain, request({ site: { lat_deg: site[0], lon_deg: site[1] }, method: "delta-bullington", radius_m: 9000, antenna_m: 40, receiver_m: 3 }), { pool: null });
    const g = cov.grid;
    let diffracted = 0;
    for (const [dc, dr] of [[300, -150], [200, -250], [120, 60], [-150, -100]]) {
      const c = Math.round(g.site_col) + dc;
      const r = Math.round(g.site_row) + dr;
      const level = cov.values[r * g.width + c];
      expect(level).not.toBe(-9999);
      const [lat, lon] = cellCentreLatLon(g, c, r);
      const study = pathStudy(site, [lat, lon]);
      const link = analyzeLink(study as never, study.links[0], terrain).result;
      expectClose(level, link.received_dbm!, { abs: 0.1 }, { dc, dr, diffraction: link.losses_db.diffraction });
      if (link.losses_db.diffraction! > 3) diffracted++;
    }
    expect(diffracted).toBeGreaterThanOrEqual(2);
  });
});

describe("folder of .hgt tiles: a UTM grid filled from the tiles", () => {
  it("each cell holds the terrain's bilinear height at its centre", () => {
    const hdir = join(dir, "hgt");
    mkdirSync(hdir);
    writeHgtTile(join(hdir, "N46E007.hgt"), 46, 7, 3, (la, lo) => 800 + 300 * Math.sin(20 * la) * Math.cos(15 * lo));
    const terrain = openHgt(hdir);
    const { grid } = planCoverageGrid(terrain, { lat_deg: 46.5, lon_deg: 7.5 }, 10_000, 90);
    expect(grid.epsg).toBe(32632);
    expect(grid.source.kind).toBe("resample");
    const dem = elevationWindow(terrain, grid);
    const rnd = mulberry32(8);
    for (let k = 0; k < 100; k++) {
      const c = Math.floor(rnd() * grid.width);
      const r = Math.floor(rnd() * grid.height);
      const [lat, lon] = cellCentreLatLon(grid, c, r);
      expectClose(dem[r * grid.width + c], terrain.elevation(lat, lon), { abs: 1e-3 }, { c, r });
    }
  });
});

function pathStudy(from: [number, number], to: [number, number]) {
  return {
    id: "p",
    dir,
    file: "(test)",
    meta: { title: "t", client: "-", prepared_by: "-", revision: "-", date: "1970-01-01" },
    terrain: { constant_m: 0 },
    design: { k_factors: [{ k: 4 / 3, label: "4/3" }], clearance_criteria: [], availability_pct: 99.99, diffraction_method: "delta_bullington" as const, design_allowance_db: 0, structure_notice_height_m: 45, antenna_search: { step_m: 1, max_m: 100 } },
    climate: { pressure_hpa: 1013.25, temperature_c: 15, water_vapour_g_m3: 7.5, dn1: -400, ground: "medium_dry_ground" as const },
    radios: [{ id: "r", frequency_ghz: 0.9, tx_power_dbm: 40, rx_threshold_dbm: -90, threshold_ber: "1e-6" }],
    sites: [
      { id: "A", name: "A", lat_deg: from[0], lon_deg: from[1] },
      { id: "B", name: "B", lat_deg: to[0], lon_deg: to[1] },
    ],
    links: [{ index: 0, id: "l", from: { site: "A", antenna_m: 40, gain_dbi: 0, feeder_loss_db: 0 }, to: { site: "B", antenna_m: 3, gain_dbi: 0, feeder_loss_db: 0 }, radio: "r", polarization: "v" as const }],
    chains: [],
    locate: () => ({ line: 0, col: 0 }),
    file_sha256: "",
  };
}
