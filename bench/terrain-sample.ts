// Benchmark: Terrain.sample() on 10⁵ points for each kind of source. Prints JSON.
// Run: node --import tsx bench/terrain-sample.ts
import { mkdtempSync, rmSync } from "node:fs";
import { cpus, tmpdir } from "node:os";
import { join } from "node:path";
import { openHgt } from "../src/terrain/hgt.ts";
import { mulberry32 } from "../src/terrain/mulberry32.ts";
import { makeRasterGrid, RasterTerrain } from "../src/terrain/raster-terrain.ts";
import { syntheticTerrain } from "../src/terrain/synthetic.ts";
import type { Terrain } from "../src/terrain/terrain.ts";
import { writeHgtTile } from "../src/terrain/write-hgt.ts";

const N = 100_000;
const REPEATS = 5;

function points(pattern: "profile" | "random", s: number, w: number, n: number, e: number): [Float64Array, Float64Array] {
  const lat = new Float64Array(N);
  const lon = new Float64Array(N);
  const rnd = mulberry32(1);
  for (let i = 0; i < N; i++) {
    const f = i / (N - 1);
    lat[i] = pattern === "profile" ? s + (n - s) * f : s + (n - s) * rnd();
    lon[i] = pattern === "profile" ? w + (e - w) * f : w + (e - w) * rnd();
  }
  return [lat, lon];
}

function time(t: Terrain, lat: Float64Array, lon: Float64Array): number {
  t.sample(lat, lon); // warm-up (loads tiles, JIT)
  let best = Infinity;
  for (let k = 0; k < REPEATS; k++) {
    const t0 = performance.now();
    t.sample(lat, lon);
    best = Math.min(best, performance.now() - t0);
  }
  return best;
}

const dir = mkdtempSync(join(tmpdir(), "ridgeline-bench-"));
try {
  const t0 = performance.now();
  writeHgtTile(join(dir, "N46E007.hgt"), 46, 7, 1, (lat, lon) => 1000 + 500 * Math.sin(9 * lat) * Math.cos(7 * lon));
  const writeMs = performance.now() - t0;
  const hgt = openHgt(dir);
  const tr = performance.now();
  hgt.elevation(46.5, 7.5); // first use reads the tile
  const readMs = performance.now() - tr;
  const t1 = performance.now();
  const synth = syntheticTerrain({ seed: 7, south_deg: 46.3, west_deg: 7.1, north_deg: 46.5, east_deg: 7.4 });
  const synthMs = performance.now() - t1;
  const utmGrid = makeRasterGrid(2000, 2000, [350000, 25, 0, 5200000, 0, -25], 32632, Float32Array.from({ length: 4e6 }, (_, i) => (i % 997) * 1.5));
  const utm = new RasterTerrain(utmGrid, { kind: "geotiff", description: "UTM grid", synthetic: false, label: "utm", fingerprint: "" });
  const [ulat0, ulon0] = utmGrid.fromCrs(351000, 5151000);
  const [ulat1, ulon1] = utmGrid.fromCrs(399000, 5199000);

  const cases: [string, Terrain, number, number, number, number][] = [
    ["hgt 1″ (one tile)", hgt, 46.01, 7.01, 46.99, 7.99],
    ["synthetic 1″ EPSG:4326 raster", synth, 46.31, 7.11, 46.49, 7.39],
    ["raster in UTM 32N (projected per point)", utm, ulat0, ulon0, ulat1, ulon1],
  ];
  const results = [];
  for (const [source, t, s, w, n, e] of cases) {
    for (const pattern of ["profile", "random"] as const) {
      const [lat, lon] = points(pattern, s, w, n, e);
      const ms = time(t, lat, lon);
      results.push({ source, pattern, points: N, ms: +ms.toFixed(2), ns_per_point: +((ms * 1e6) / N).toFixed(1) });
    }
  }
  console.log(
    JSON.stringify(
      {
        benchmark: "terrain-sample",
        date: new Date().toISOString(),
        node: process.version,
        cpu: cpus()[0]?.model ?? "unknown",
        setup_ms: { write_hgt_1arcsec_tile: +writeMs.toFixed(0), read_hgt_1arcsec_tile: +readMs.toFixed(0), synthetic_0_2x0_3_deg_1arcsec: +synthMs.toFixed(0) },
        results,
      },
      null,
      2,
    ),
  );
} finally {
  rmSync(dir, { recursive: true, force: true });
}
