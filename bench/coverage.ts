// Benchmark: coverage over a 100 km radius at 30 m (≈ 44 M cells) on a generated 1″-class DEM.
// - visibility: whole process `bin/ridgeline.js coverage …`, run as the installed command is,
//   beside `gdal_viewshed` on the same DEM, same observer, heights and k, timed alternately in
//   the same run (median of runs); all of it on the Int16 DEM and on the same relief as a
//   Float32 DEM of fractional metres, alternating within each round (GDAL first in every other
//   round). Two configurations per DEM
//   type, each with the same malloc settings for both tools (the README quotes the worse and
//   the better): both as installed; both with glibc's huge-page tunable
//   (GLIBC_TUNABLES=glibc.malloc.hugetlb=1, transparent huge pages for large allocations).
//   Like for like: each tool writes one uncompressed single-band Byte GeoTIFF (1 visible,
//   0 not, 255 outside the radius) and nothing else; the load average is recorded beside the
//   figures, and CPU time (user + system) beside wall time;
// - delta-Bullington: whole process; cells per second of the compute phase and of the process;
// - peak RSS of each child process (/usr/bin/time -v).
// Run alone: node --import tsx bench/coverage.ts  (npm run bench runs it through bench/run.ts)
import { spawnSync } from "node:child_process";
import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import { availableParallelism, loadavg, tmpdir } from "node:os";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";
import { writeGeoTiff } from "../src/geo/geotiff-writer.ts";
import { crsFromEpsg } from "../src/geo/crs-from-epsg.ts";
import { mulberry32 } from "../src/terrain/mulberry32.ts";
import { FractalNoise } from "../src/terrain/value-noise.ts";

const ROOT = fileURLToPath(new URL("..", import.meta.url));

export interface CoverageBenchOptions {
  radius_km?: number;
  resolution_m?: number;
  /** timed runs of each visibility process (median reported) */
  runs?: number;
  /** "p1812": only the P.1812 coverage (`npm run bench -- --part coverage_p1812`) */
  only?: "p1812";
  /** only the visibility comparison (no delta-Bullington or P.1812 run) */
  visibilityOnly?: boolean;
}

interface ProcessRun {
  wall_s: number;
  /** user + system CPU time of the child (s): less sensitive than wall time to other load on the machine */
  cpu_s: number;
  max_rss_mib: number;
  status: number | null;
  stderr: string;
}

/** Run a command under /usr/bin/time -v: wall time and peak resident set size of the child. */
export function timed(cmd: string, args: string[], env: NodeJS.ProcessEnv = process.env): ProcessRun {
  const t0 = performance.now();
  const r = spawnSync("/usr/bin/time", ["-v", cmd, ...args], { encoding: "utf8", cwd: ROOT, maxBuffer: 1 << 26, env });
  const wall_s = (performance.now() - t0) / 1000;
  const rss = /Maximum resident set size \(kbytes\): (\d+)/.exec(r.stderr);
  const user = /User time \(seconds\): ([\d.]+)/.exec(r.stderr);
  const sys = /System time \(seconds\): ([\d.]+)/.exec(r.stderr);
  const cpu_s = user && sys ? Number(user[1]) + Number(sys[1]) : NaN;
  return { wall_s, cpu_s, max_rss_mib: rss ? Number(rss[1]) / 1024 : NaN, status: r.status, stderr: r.stderr };
}

const median = (v: number[]) => [...v].sort((a, b) => a - b)[Math.floor(v.length / 2)];
const r3 = (x: number) => Math.round(x * 1000) / 1000;

/**
 * A 1″-class (30 m) DEM in UTM zone 32N around 45°N covering the coverage square: Int16 metres
 * of seeded fractal relief (value noise on a 240 m lattice, interpolated) plus 30 m detail.
 * The "1° × 1.5°" cannot hold a 100 km radius (1° of latitude is 111 km), so the DEM is
 * the 200 km square the radius needs.
 */
export function writeDem(path: string, n: number, cell: number, x0: number, y0: number, type: "int16" | "float32" = "int16"): void {
  const rnd = mulberry32(2024);
  const relief = new FractalNoise(6, 6, 0.55, rnd);
  const detail = new FractalNoise(64, 2, 0.5, rnd);
  const step = 8;
  const m = Math.ceil(n / step) + 2;
  const coarse = new Float32Array(m * m);
  for (let j = 0; j < m; j++) for (let i = 0; i < m; i++) coarse[j * m + i] = 200 + 1800 * relief.at(i / (m - 1), j / (m - 1)) ** 1.6 + 40 * detail.at(i / (m - 1), j / (m - 1));
  const data = type === "int16" ? new Int16Array(n * n) : new Float32Array(n * n);
  for (let r = 0; r < n; r++) {
    const y = r / step;
    const j = Math.floor(y);
    const fy = y - j;
    for (let c = 0; c < n; c++) {
      const x = c / step;
      const i = Math.floor(x);
      const fx = x - i;
      const a = coarse[j * m + i] * (1 - fx) + coarse[j * m + i + 1] * fx;
      const b = coarse[(j + 1) * m + i] * (1 - fx) + coarse[(j + 1) * m + i + 1] * fx;
      const fine = 6 * Math.sin(c * 0.9 + 1.7 * Math.sin(r * 0.37)) + 4 * Math.cos(r * 1.3 + c * 0.21);
      const h = a + (b - a) * fy + fine;
      data[r * n + c] = type === "int16" ? Math.round(h) : h; // Float32: the same relief, not rounded to whole metres
    }
  }
  writeGeoTiff(path, { width: n, height: n, data, geoTransform: [x0, cell, 0, y0, 0, -cell], epsg: 32632, nodata: -32768 });
}

/** Share of cells both rasters compute (neither 255) on which they agree. */
function agreement(ours: string, theirs: string, dir: string): number {
  const a = new Uint8Array(readRaw(ours, join(dir, "a.bin")));
  const b = new Uint8Array(readRaw(theirs, join(dir, "b.bin")));
  let both = 0;
  let same = 0;
  for (let i = 0; i < Math.min(a.length, b.length); i++) {
    if (a[i] === 255 || b[i] === 255) continue;
    both++;
    if (a[i] === b[i]) same++;
  }
  return both ? same / both : NaN;
}

/** A raster's bytes on a common grid: gdal_translate onto the DEM's full extent. */
function readRaw(tif: string, bin: string): Buffer {
  spawnSync("gdal_translate", ["-q", "-of", "ENVI", "-projwin", ...PROJWIN.map(String), "-a_nodata", "255", tif, bin]);
  return readFileSync(bin);
}
let PROJWIN: number[] = [];

/** The coverage benchmark; returns its figures as plain JSON. */
export async function benchCoverage(options: CoverageBenchOptions = {}): Promise<Record<string, unknown>> {
  const radius_km = options.radius_km ?? 100;
  const res = options.resolution_m ?? 30;
  const runs = options.runs ?? 5;
  const dir = mkdtempSync(join(tmpdir(), "ridgeline-bench-coverage-"));
  try {
    const n = 2 * Math.ceil((radius_km * 1000) / res) + 3;
    const x0 = 500_000 - (n * res) / 2;
    const y0 = 5_000_000 + (n * res) / 2;
    PROJWIN = [x0, y0, x0 + n * res, y0 - n * res];
    const demPath = join(dir, "dem.tif");
    const tg = performance.now();
    writeDem(demPath, n, res, x0, y0);
    const generate_s = (performance.now() - tg) / 1000;
    // observer on the centre cell's centre (gdal_viewshed places it there too)
    const oc = (n - 1) / 2;
    const X = x0 + (oc + 0.5) * res;
    const Y = y0 - (oc + 0.5) * res;
    const [lat, lon] = crsFromEpsg(32632)!.fromCrs(X, Y);
    const common = ["--site", `${lat},${lon}`, "--antenna-m", "30", "--receiver-m", "2", "--terrain", demPath, "--radius-km", String(radius_km), "--resolution-m", String(res), "--frequency-ghz", "0.9", "--k", "4/3"];
    if (options.only === "p1812") {
      const p18 = p1812Run(common, dir, { ...process.env, PATH: `${dirname(process.execPath)}:${process.env.PATH ?? ""}` });
      return { dem: { cells: n * n, size: `${n} × ${n}`, cell_m: res, crs: "EPSG:32632", type: "Int16 GeoTIFF", generate_s: r3(generate_s) }, radius_km, grid_cells: n * n, threads: availableParallelism(), p1812: p18.figures, peak_rss_target_mib: 1024, peak_rss_target_met: p18.run.max_rss_mib <= 1024 };
    }
    const oursVis = join(dir, "ours.tif");
    const gdalVis = join(dir, "gdal.tif");
    // The same relief as Float32, not rounded to whole metres: a Float32 DEM of whole metres
    // (gdal_translate -ot Float32 of the Int16 one) would be read as Int16 (elevation-window.ts),
    // so this one measures the Float32 path; gdal_viewshed reads either type.
    const demF32 = join(dir, "dem-float32.tif");
    writeDem(demF32, n, res, x0, y0, "float32");
    const tuned = { ...process.env, GLIBC_TUNABLES: ["glibc.malloc.hugetlb=1", process.env.GLIBC_TUNABLES].filter(Boolean).join(":") };
    // the command as installed (npm links bin/ridgeline.js; its first line starts node), with node from this run first on the PATH
    const path = { ...process.env, PATH: `${dirname(process.execPath)}:${process.env.PATH ?? ""}` };
    const dems = { int16: demPath, float32: demF32 };
    const runsOf = {
      int16: { ours: [] as ProcessRun[], gdal: [] as ProcessRun[], oursTuned: [] as ProcessRun[], gdalTuned: [] as ProcessRun[] },
      float32: { ours: [] as ProcessRun[], gdal: [] as ProcessRun[], oursTuned: [] as ProcessRun[], gdalTuned: [] as ProcessRun[] },
    };
    const pathTuned = { ...path, GLIBC_TUNABLES: tuned.GLIBC_TUNABLES };
    const loadBefore = loadavg().map((x) => Math.round(x * 100) / 100);
    const gdalArgsFor = (dem: string) => ["-q", "-ox", String(X), "-oy", String(Y), "-oz", "30", "-tz", "2", "-md", String(radius_km * 1000), "-cc", String(1 / (4 / 3)), "-vv", "1", "-iv", "0", "-ov", "255", dem, gdalVis];
    // Whole processes, alternating ours / GDAL, as installed and both with the tunable, Int16 then
    // Float32, in each round; GDAL first in every other round. The order matters with the tunable:
    // a process faulting huge pages just after another freed memory often gets them warm, and
    // after a run in 4 kB pages often cold (DEVELOPERS.md, coverage: the first write to fresh memory).
    for (let k = 0; k < runs; k++) {
      for (const type of ["int16", "float32"] as const) {
        const r = runsOf[type];
        const common = ["--site", `${lat},${lon}`, "--antenna-m", "30", "--receiver-m", "2", "--terrain", dems[type], "--radius-km", String(radius_km), "--resolution-m", String(res), "--frequency-ghz", "0.9", "--k", "4/3"];
        const configurations = [
          { mine: r.ours, theirs: r.gdal, oursEnv: path, gdalEnv: process.env },
          { mine: r.oursTuned, theirs: r.gdalTuned, oursEnv: pathTuned, gdalEnv: tuned },
        ];
        for (const c of configurations) {
          const ours = () => c.mine.push(timed(join(ROOT, "bin/ridgeline.js"), ["coverage", ...common, "--method", "visibility", "--out", oursVis], c.oursEnv));
          const gdal = () => c.theirs.push(timed("gdal_viewshed", gdalArgsFor(dems[type]), c.gdalEnv));
          if (k % 2 === 0) {
            ours();
            gdal();
          } else {
            gdal();
            ours();
          }
        }
        for (const x of [r.ours[k], r.gdal[k], r.oursTuned[k], r.gdalTuned[k]]) if (x.status !== 0) throw new Error(`benchmark process failed:\n${x.stderr}`);
      }
    }
    const { ours, gdal, gdalTuned } = runsOf.int16;
    const visOurs = median(ours.map((r) => r.wall_s));
    const visGdal = median(gdal.map((r) => r.wall_s));
    const agree = agreement(oursVis, gdalVis, dir); // the last pair written: Float32
    const byType = (type: "int16" | "float32") => {
      const r = runsOf[type];
      const o = median(r.ours.map((x) => x.wall_s));
      const g = median(r.gdal.map((x) => x.wall_s));
      const ot = median(r.oursTuned.map((x) => x.wall_s));
      const gt = median(r.gdalTuned.map((x) => x.wall_s));
      const oc = median(r.ours.map((x) => x.cpu_s));
      const gc = median(r.gdal.map((x) => x.cpu_s));
      const worst = Math.max(o / g, ot / gt);
      return {
        ridgeline_median_s: r3(o),
        gdal_viewshed_median_s: r3(g),
        ridgeline_hugetlb_median_s: r3(ot),
        gdal_viewshed_hugetlb_median_s: r3(gt),
        ridgeline_cpu_median_s: r3(oc),
        gdal_viewshed_cpu_median_s: r3(gc),
        ridgeline_wall_s: r.ours.map((x) => r3(x.wall_s)),
        gdal_viewshed_wall_s: r.gdal.map((x) => r3(x.wall_s)),
        ridgeline_hugetlb_wall_s: r.oursTuned.map((x) => r3(x.wall_s)),
        gdal_viewshed_hugetlb_wall_s: r.gdalTuned.map((x) => r3(x.wall_s)),
        /** wall-time ratio, both as installed (the same malloc settings) */
        ratio: r3(o / g),
        /** both with glibc's huge-page tunable (the same malloc settings: both with huge pages) */
        ratio_same_malloc: r3(ot / gt),
        /** CPU-time ratio, both as installed (we use two threads, GDAL one) */
        ratio_cpu: r3(oc / gc),
        /** the worse and the better of the two wall-time ratios above */
        ratio_worst: r3(worst),
        ratio_best: r3(Math.min(o / g, ot / gt)),
        target_ratio: 1.0,
        target_met: worst <= 1.0,
      };
    };
    const ratios = { int16: byType("int16"), float32: byType("float32") };
    const visLoad = { before: loadBefore, after: loadavg().map((x) => Math.round(x * 100) / 100), cores: availableParallelism() };
    if (options.visibilityOnly) {
      return { radius_km, grid_cells: n * n, threads: availableParallelism(), load_average_1_5_15_min: visLoad, visibility_ratios_by_dem_type: ratios, cells_agreeing_with_gdal_pct: r3(100 * agreement(oursVis, gdalVis, dir)) };
    }

    const db = timed(join(ROOT, "bin/ridgeline.js"), ["coverage", ...common, "--method", "delta-bullington", "--tx-power-dbm", "43", "--thresholds-dbm", "-100,-90,-80", "--out", join(dir, "db.tif")], path);
    if (db.status !== 0) throw new Error(`benchmark process failed:\n${db.stderr}`);
    const p18 = p1812Run(common, dir, path);
    const summary = /(\d+\.\d+) M cells inside .*compute (\d+\.\d+) s on (\d+) thread/.exec(db.stderr);
    const cells = summary ? Number(summary[1]) * 1e6 : NaN;
    const compute_s = summary ? Number(summary[2]) : NaN;
    const visSummary = /read terrain (\d+\.\d+) s, grid elevations (\d+\.\d+) s, compute (\d+\.\d+) s on (\d+) thread.*write (\d+\.\d+) s/.exec(ours[ours.length - 1].stderr);
    return {
      dem: { cells: n * n, size: `${n} × ${n}`, cell_m: res, crs: "EPSG:32632", type: "Int16 GeoTIFF", generate_s: r3(generate_s) },
      radius_km,
      grid_cells: n * n,
      threads: availableParallelism(),
      visibility_ratios_by_dem_type: ratios,
      /** the machine's load average (1, 5, 15 min) before and after the visibility rounds */
      visibility_load_average: visLoad,
      visibility: {
        ridgeline_wall_s: ours.map((r) => r3(r.wall_s)),
        gdal_viewshed_wall_s: gdal.map((r) => r3(r.wall_s)),
        ridgeline_cpu_s: ours.map((r) => r3(r.cpu_s)),
        gdal_viewshed_cpu_s: gdal.map((r) => r3(r.cpu_s)),
        ridgeline_median_s: r3(visOurs),
        gdal_viewshed_median_s: r3(visGdal),
        ratio: r3(visOurs / visGdal),
        // the target (wall ratio ≤ 1.0 on both DEM types) is judged in visibility_ratios_by_dem_type
        target_ratio: 1.0,
        target_met: visOurs / visGdal <= 1.0,
        gdal_viewshed_hugetlb_wall_s: gdalTuned.map((r) => r3(r.wall_s)),
        /** against gdal_viewshed run with the same glibc tunable as ridgeline (for comparison; not the target) */
        ratio_to_gdal_hugetlb: r3(visOurs / median(gdalTuned.map((r) => r.wall_s))),
        ridgeline_phases_s: visSummary ? { read_terrain: Number(visSummary[1]), grid_elevations: Number(visSummary[2]), compute: Number(visSummary[3]), write: Number(visSummary[5]) } : null,
        ridgeline_max_rss_mib: Math.round(Math.max(...ours.map((r) => r.max_rss_mib))),
        gdal_viewshed_max_rss_mib: Math.round(Math.max(...gdal.map((r) => r.max_rss_mib))),
        /** on the Float32 DEM (the last pair of rasters written) */
        cells_agreeing_with_gdal_pct: r3(100 * agree),
      },
      delta_bullington: {
        cells_in_radius: cells,
        compute_s,
        wall_s: r3(db.wall_s),
        cells_per_s_compute: Math.round(cells / compute_s),
        cells_per_s_process: Math.round(cells / db.wall_s),
        target_cells_per_s: 1e6,
        target_met: cells / compute_s >= 1e6,
        max_rss_mib: Math.round(db.max_rss_mib),
      },
      p1812: p18.figures,
      peak_rss_target_mib: 1024,
      peak_rss_target_met: Math.max(db.max_rss_mib, p18.run.max_rss_mib, ...ours.map((r) => r.max_rss_mib)) <= 1024,
    };
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

/**
 * ITU-R P.1812-6 on the bench's grid and site (UHF, 50 % time, 50 % locations, open clutter):
 * cells per second of the compute phase (wall) and per CPU-second of the whole process (user +
 * system, less sensitive to other load on the machine).
 */
function p1812Run(common: string[], dir: string, path: NodeJS.ProcessEnv) {
  const run = timed(join(ROOT, "bin/ridgeline.js"), ["coverage", ...common.map((a, i, arr) => (arr[i - 1] === "--frequency-ghz" ? "0.46" : a)), "--method", "p1812", "--time-pct", "50", "--tx-power-dbm", "43", "--thresholds-dbm", "-100,-90,-80", "--out", join(dir, "p1812.tif")], path);
  if (run.status !== 0) throw new Error(`benchmark process failed:\n${run.stderr}`);
  const m = /(\d+\.\d+) M cells inside .*compute (\d+\.\d+) s on (\d+) thread/.exec(run.stderr);
  const cells = m ? Number(m[1]) * 1e6 : NaN;
  const compute_s = m ? Number(m[2]) : NaN;
  return {
    run,
    figures: {
      cells_in_radius: cells,
      compute_s,
      threads: m ? Number(m[3]) : NaN,
      wall_s: r3(run.wall_s),
      cpu_s: r3(run.cpu_s),
      cells_per_s_compute: Math.round(cells / compute_s),
      cells_per_s_process: Math.round(cells / run.wall_s),
      cells_per_cpu_s: Math.round(cells / run.cpu_s),
      target_cells_per_s: 1e6,
      target_met: cells / compute_s >= 1e6,
      max_rss_mib: Math.round(run.max_rss_mib),
    },
  };
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  const report = { date: new Date().toISOString(), node: process.version, coverage: await benchCoverage() };
  process.stdout.write(`${JSON.stringify(report, null, 2)}\n`);
}
