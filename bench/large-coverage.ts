// Benchmark: one coverage of radius 150 km at 30 m (a 10 003 × 10 003 grid, ≈ 100 M cells, 79 M
// inside the radius) on a generated Int16 DEM, by the whole `ridgeline coverage` process:
// wall and CPU time, peak RSS (/usr/bin/time -v), tiles. Methods: line of sight and
// delta-Bullington (the level raster is Float32: 4 bytes a cell); then the same
// delta-Bullington map as the coverage of a study built with a cache. It takes minutes, so
// `npm run bench` runs it only when asked: `npm run bench -- --large-coverage`.
// Run alone: node --import tsx bench/large-coverage.ts [visibility|delta-bullington] [--no-study];
// the study build alone (about 1–3 minutes): node --import tsx bench/large-coverage.ts --study-only
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { coverageTileCount } from "../src/coverage/coverage-tiles.ts";
import { crsFromEpsg } from "../src/geo/crs-from-epsg.ts";
import { timed, writeDem } from "./coverage.ts";

const ROOT = fileURLToPath(new URL("..", import.meta.url));
const r3 = (x: number) => Math.round(x * 1000) / 1000;

/** Method flags of the one-off `ridgeline coverage` runs. */
const METHODS: Record<string, string[]> = {
  visibility: ["--method", "visibility"],
  "delta-bullington": ["--method", "delta-bullington", "--tx-power-dbm", "43", "--thresholds-dbm", "-100,-90,-80"],
};

/** The 150 km / 30 m coverage, line of sight and delta-Bullington; figures as plain JSON. */
export async function benchLargeCoverage(options: { radius_km?: number; resolution_m?: number; methods?: string[]; study?: boolean } = {}): Promise<Record<string, unknown>> {
  const radius_km = options.radius_km ?? 150;
  const res = options.resolution_m ?? 30;
  const dir = mkdtempSync(join(tmpdir(), "ridgeline-bench-large-coverage-"));
  try {
    const n = 2 * Math.ceil((radius_km * 1000) / res) + 3;
    const x0 = 500_000 - (n * res) / 2;
    const y0 = 5_000_000 + (n * res) / 2;
    const demPath = join(dir, "dem.tif");
    const methodList = options.methods ?? Object.keys(METHODS);
    const tg = performance.now();
    if (methodList.length) writeDem(demPath, n, res, x0, y0);
    const generate_s = (performance.now() - tg) / 1000;
    const oc = (n - 1) / 2;
    const [lat, lon] = crsFromEpsg(32632)!.fromCrs(x0 + (oc + 0.5) * res, y0 - (oc + 0.5) * res);
    const common = ["--site", `${lat},${lon}`, "--antenna-m", "30", "--receiver-m", "2", "--terrain", demPath, "--radius-km", String(radius_km), "--resolution-m", String(res), "--frequency-ghz", "0.9", "--k", "4/3"];
    const out: Record<string, unknown> = {
      grid: `${n} × ${n} = ${((n * n) / 1e6).toFixed(1)} M cells (UTM 32N, ${res} m), Int16 DEM (generated)`,
      tiles: coverageTileCount(radius_km * 1000, res),
      ...(methodList.length ? { generate_dem_s: r3(generate_s) } : {}),
      target_max_rss_mib: 1536,
    };
    for (const m of methodList) {
      const run = timed(join(ROOT, "bin/ridgeline.js"), ["coverage", ...common, ...METHODS[m], "--out", join(dir, `${m}.tif`)]);
      if (run.status !== 0) throw new Error(`ridgeline coverage --method ${m} failed:\n${run.stderr}`);
      const summary = /Wrote .*?: (.*)\n/.exec(run.stderr)?.[1] ?? "";
      const compute = /compute ([\d.]+) s/.exec(summary);
      const cells = /([\d.]+) M cells inside/.exec(summary);
      out[m] = {
        wall_s: r3(run.wall_s),
        cpu_s: r3(run.cpu_s),
        max_rss_mib: Math.round(run.max_rss_mib),
        compute_s: compute ? Number(compute[1]) : NaN,
        m_cells_inside: cells ? Number(cells[1]) : NaN,
        summary,
      };
      rmSync(join(dir, `${m}.tif`), { force: true });
    }
    // The same map as a study's coverage, built with a cache (the default): the build also
    // keeps the map's cache entry (level raster and the grid's elevations, for a composite)
    // and renders its page.
    if (options.study !== false) {
      rmSync(demPath, { force: true });
      out["study_build_delta_bullington_with_cache"] = benchWideStudyBuild(dir, radius_km, res);
    }
    return out;
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

/**
 * Write the bench's study (the DEM and study.yaml) into `<dir>/studies/wide` and build it with
 * a cache into `<dir>/site`, timed as a whole `ridgeline build` process.
 */
export function benchWideStudyBuild(dir: string, radius_km = 150, res = 30): { wall_s: number; cpu_s: number; max_rss_mib: number } {
  writeWideStudy(join(dir, "studies"), radius_km, res);
  const run = timed(join(ROOT, "bin/ridgeline.js"), ["build", "--studies-dir", join(dir, "studies"), "--out", join(dir, "site"), "--cache-dir", join(dir, "cache")]);
  if (run.status !== 0) throw new Error(`ridgeline build of the ${radius_km} km study failed:\n${run.stderr}`);
  return { wall_s: r3(run.wall_s), cpu_s: r3(run.cpu_s), max_rss_mib: Math.round(run.max_rss_mib) };
}

/**
 * The bench's study in `<studiesDir>/wide`: the generated Int16 DEM (the one-off runs' DEM)
 * and a study.yaml whose one coverage is their delta-Bullington map, with one short link.
 */
export function writeWideStudy(studiesDir: string, radius_km = 150, res = 30): void {
  const n = 2 * Math.ceil((radius_km * 1000) / res) + 3;
  const x0 = 500_000 - (n * res) / 2;
  const y0 = 5_000_000 + (n * res) / 2;
  const oc = (n - 1) / 2;
  const studyDir = join(studiesDir, "wide");
  mkdirSync(studyDir, { recursive: true });
  writeDem(join(studyDir, "dem.tif"), n, res, x0, y0);
  const [lat, lon] = crsFromEpsg(32632)!.fromCrs(x0 + (oc + 0.5) * res, y0 - (oc + 0.5) * res);
  const [latB, lonB] = crsFromEpsg(32632)!.fromCrs(x0 + (oc + Math.round(n / 20) + 0.5) * res, y0 - (oc + Math.round(n / 30) + 0.5) * res);
  writeFileSync(join(studyDir, "study.yaml"), wideStudyYaml(lat, lon, latB, lonB, radius_km, res));
}

/** A study whose one coverage is the bench's map (delta-Bullington), with one short link. */
function wideStudyYaml(lat: number, lon: number, latB: number, lonB: number, radius_km: number, res: number): string {
  return `title: Wide-area coverage (generated terrain, for the benchmark)
client: Benchmark
prepared_by: Benchmark
revision: A
date: 2026-01-15
terrain:
  file: dem.tif
radios:
  - { id: r1, frequency_ghz: 6, tx_power_dbm: 25, rx_threshold_dbm: -75 }
sites:
  - { id: A, name: Centre, lat_deg: ${lat.toFixed(6)}, lon_deg: ${lon.toFixed(6)} }
  - { id: B, name: East, lat_deg: ${latB.toFixed(6)}, lon_deg: ${lonB.toFixed(6)} }
links:
  - { id: a-b, from: { site: A, antenna_m: 30, gain_dbi: 34 }, to: { site: B, antenna_m: 30, gain_dbi: 34 }, radio: r1 }
coverage:
  - { id: wide, site: A, method: delta-bullington, frequency_ghz: 0.9, antenna_m: 30, receiver_m: 2, tx_power_dbm: 43, radius_km: ${radius_km}, resolution_m: ${res}, thresholds: [-100, -90, -80] }
`;
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  // node --import tsx bench/large-coverage.ts [visibility|delta-bullington …] [--no-study] [--study-only]
  const args = process.argv.slice(2);
  const methods = args.includes("--study-only") ? [] : args.filter((a) => !a.startsWith("-"));
  const options = { ...(methods.length || args.includes("--study-only") ? { methods } : {}), study: !args.includes("--no-study") };
  process.stdout.write(`${JSON.stringify(await benchLargeCoverage(options), null, 2)}\n`);
}
