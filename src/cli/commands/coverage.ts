import { readFileSync, statSync } from "node:fs";
import { availableParallelism } from "node:os";
import { isAbsolute, relative, resolve } from "node:path";
import { setFlagsFromString } from "node:v8";
import { runInNewContext } from "node:vm";
import type { TerrainSpec } from "../../terrain/open-terrain.ts";
import type { Terrain } from "../../terrain/terrain.ts";
import { latLonArg, numberArg, parseArgs, UsageError } from "../args.ts";

export const COVERAGE_USAGE = `Usage: ridgeline coverage --site LAT,LON --antenna-m H --receiver-m H --terrain PATH|constant:M
         --radius-km R --resolution-m X --frequency-ghz F --method visibility|delta-bullington|hata|p1812
         [--clearance-f1 F] [--k K] [--tx-power-dbm P] [--gain-dbi G] [--thresholds-dbm A,B,…]
         [--time-pct P] [--location-pct PL] [--clutter open|suburban|urban|dense_urban|water] [--dn N] [--n0 N]
         [--pattern CSV] [--azimuth-deg A] [--threads N] [--json] --out FILE.tif
  Writes one GeoTIFF on the terrain raster's own grid (a single GeoTIFF/.hgt/synthetic DEM, cropped
  to the radius) or on a UTM grid of X m: float32 received level (dBm, nodata −9999) or, for
  visibility, uint8 1 = visible, 0 = not (nodata 255).
  --pattern: CSV "azimuth_deg,attenuation_db" from 0 to 360 (relative to --azimuth-deg).
  --threads: worker threads (default: all cores; 0 computes in the main thread).
  p1812 (ITU-R P.1812-6, 0.03–6 GHz): --time-pct 1–50 (default 50), --location-pct 1–99 (default 50),
  one clutter category for the area (default open), ΔN (default 45) and N0 (default 325).`;

const METHODS = ["visibility", "delta-bullington", "hata", "p1812"] as const;
const CLUTTER = ["water", "open", "suburban", "urban", "dense_urban"] as const;

/** `ridgeline coverage …`: one coverage raster without a study file. Exit 0 on success, 2 on bad input. */
export async function coverageCommand(argv: string[]): Promise<number> {
  mark("command");
  if (argv.includes("--help")) {
    process.stdout.write(`${COVERAGE_USAGE}\n`);
    return 0;
  }
  const a = parseArgs(argv, {
    values: ["site", "antenna-m", "receiver-m", "terrain", "radius-km", "resolution-m", "frequency-ghz", "method", "clearance-f1", "k", "tx-power-dbm", "gain-dbi", "thresholds-dbm", "pattern", "azimuth-deg", "threads", "out", "time-pct", "location-pct", "clutter", "dn", "n0"],
    flags: ["json"],
  });
  const v = (n: string) => a.values.get(n)?.[0];
  if (a.positional.length) throw new UsageError(`unexpected argument "${a.positional[0]}".\n${COVERAGE_USAGE}`);
  for (const req of ["site", "antenna-m", "receiver-m", "terrain", "radius-km", "resolution-m", "frequency-ghz", "method", "out"]) {
    if (v(req) === undefined) throw new UsageError(`--${req} is required.\n${COVERAGE_USAGE}`);
  }
  const method = v("method") as (typeof METHODS)[number];
  if (!METHODS.includes(method)) throw new UsageError(`--method: received "${v("method")}"; expected one of ${METHODS.join(", ")}.`);
  const [lat, lon] = latLonArg("site", v("site"));
  const num = (name: string, dflt: number | undefined, ok: (x: number) => boolean, what: string) => (v(name) === undefined ? dflt! : numberArg(name, v(name), ok, what));
  const radius_km = num("radius-km", undefined, (x) => x > 0 && x <= 500, "a radius above 0 and up to 500 km");
  const resolution_m = num("resolution-m", undefined, (x) => x > 0, "a cell size above 0 m");
  const kText = (v("k") ?? "4/3").trim();
  const k = kText === "inf" ? Infinity : /^\d+(\.\d+)?\/\d+(\.\d+)?$/.test(kText) ? Number(kText.split("/")[0]) / Number(kText.split("/")[1]) : Number(kText);
  if (!(k > 0)) throw new UsageError(`--k: received "${v("k")}"; expected a positive number, a fraction such as 4/3, or inf.`);
  const thresholds = (v("thresholds-dbm") ?? "").split(",").filter((s) => s.trim() !== "").map((s) => {
    const x = Number(s);
    if (!Number.isFinite(x)) throw new UsageError(`--thresholds-dbm: received "${v("thresholds-dbm")}"; expected levels in dBm separated by commas, e.g. -100,-90,-80.`);
    return x;
  });
  const threads = num("threads", undefined as unknown as number, (x) => Number.isInteger(x) && x >= 0 && x <= 256, "a whole number of threads from 0 to 256");
  const out = resolve(v("out")!);

  const pattern = v("pattern") === undefined ? undefined : { azimuth_deg: num("azimuth-deg", 0, (x) => x >= 0 && x < 360, "an azimuth from 0 to below 360°"), horizontal: readPatternCsv(v("pattern")!) };
  // Threads load their code while this thread loads its modules and reads the terrain; small
  // requests stay in this thread.
  const estimate = ((2 * radius_km * 1000) / resolution_m) ** 2;
  const nThreads = threads ?? (estimate < 2e6 ? 0 : availableParallelism());
  const [{ CoveragePool }, { lineOfSightOnly, fillLineOfSightRaster }] = await Promise.all([import("../../coverage/coverage-pool.ts"), import("../../coverage/horizon-sweep.ts")]);
  const clearance_f1 = num("clearance-f1", 0, (x) => x >= 0 && x <= 5, "a fraction of the first Fresnel radius from 0 to 5");
  // (the line-of-sight sweep is warmed up once the terrain's header tells the elevations' type)
  const pool = nThreads > 0 ? CoveragePool.start(nThreads) : null;
  if (TIMINGS) void pool?.whenReady().then(() => mark("threads ready"));
  // Heavy modules load only for this command (nothing below may throw before the try that closes the pool, but a failing import).
  const [{ prepareCoverage, runCoverage }, { CoverageError }, { parseTerrainArg, openTerrain }, { TerrainError }, { writeGeoTiff }, { coverageResult }, { crsFromEpsg }] = await Promise.all([
    import("../../coverage/compute-coverage.ts"),
    import("../../coverage/coverage-error.ts"),
    import("../../terrain/open-terrain.ts"),
    import("../../terrain/terrain-error.ts"),
    import("../../geo/geotiff-writer.ts"),
    import("../../coverage/coverage-result.ts"),
    import("../../geo/crs-from-epsg.ts"),
  ]).catch(async (e) => {
    await pool?.close();
    throw e;
  });
  const { openGeoTiff } = await import("../../terrain/geotiff.ts").catch(async (e) => {
    await pool?.close();
    throw e;
  });
  mark("imports");
  const request = {
    site: { lat_deg: lat, lon_deg: lon },
    method,
    antenna_m: num("antenna-m", undefined, Number.isFinite, "a height above ground (m)"),
    receiver_m: num("receiver-m", undefined, Number.isFinite, "a height above ground (m)"),
    radius_m: radius_km * 1000,
    resolution_m,
    frequency_ghz: num("frequency-ghz", undefined, (x) => x > 0 && x <= 1000, "a frequency in GHz above 0 and up to 1000"),
    k,
    clearance_f1,
    tx_power_dbm: num("tx-power-dbm", 0, Number.isFinite, "a power in dBm"),
    tx_losses_db: 0,
    gain_dbi: num("gain-dbi", 0, Number.isFinite, "a gain in dBi"),
    rx_gain_dbi: 0,
    rx_losses_db: 0,
    pattern,
    thresholds_dbm: thresholds,
    polarization: "v" as const,
    ground: "medium-dry-ground" as const,
    atmosphere: { pressure_hpa: 1013.25, temperature_c: 15, water_vapour_g_m3: 7.5 },
    hata: { environment: "urban" as const, city_size: "small-medium" as const },
  };
  if (method === "p1812") {
    const clutter = (v("clutter") ?? "open") as (typeof CLUTTER)[number];
    if (!CLUTTER.includes(clutter)) throw new UsageError(`--clutter: received "${v("clutter")}"; expected one of ${CLUTTER.join(", ")}.`);
    const { clutterHeightM } = await import("../../coverage/p1812-setup.ts");
    (request as typeof request & { p1812?: unknown }).p1812 = {
      time_pct: num("time-pct", 50, Number.isFinite, "a percentage of time from 1 to 50 %"),
      location_pct: num("location-pct", 50, Number.isFinite, "a percentage of locations from 1 to 99 %"),
      sigma_l_db: null,
      dn: num("dn", 45, Number.isFinite, "a lapse rate ΔN above 0 and below 157 N-units/km"),
      n0: num("n0", 325, (x) => x >= 250 && x <= 400, "a surface refractivity N0 from 250 to 400 N-units"),
      classes: [{ value: null, name: clutter.replace("_", " "), category: clutter, height_m: clutterHeightM(clutter) }],
      land_cover: null,
      receiver_clutter_loss: "none",
      indoor: null,
    };
  }
  const names = {
    time_pct: "--time-pct",
    location_pct: "--location-pct",
    dn: "--dn",
    radius_m: "--radius-km",
    resolution_m: "--resolution-m",
    frequency_ghz: "--frequency-ghz",
    antenna_m: "--antenna-m",
    receiver_m: "--receiver-m",
    thresholds_dbm: "--thresholds-dbm",
    k: "--k",
    clearance_f1: "--clearance-f1",
    site: "--site",
  };
  try {
    let prepared;
    let open_s = 0;
    let inMemory = true;
    try {
      // The terrain is only needed to fill the grid's elevations; it is let go before the
      // result is allocated, so its raster and the result are not in memory together.
      const tOpen = performance.now();
      const terrain = await openCoverageTerrain(parseTerrainArg(v("terrain")!), openTerrain, openGeoTiff);
      open_s = (performance.now() - tOpen) / 1000;
      mark("terrain opened");
      if (lineOfSightOnly(method, clearance_f1)) pool?.warmUp((terrain as { windowsInt16?: boolean }).windowsInt16 ? "int16" : "float32");
      // a GeoTIFF read window by window holds no pixels: nothing for a collection to free
      inMemory = (terrain as { pixelsInMemory?: boolean }).pixelsInMemory !== false;
      if (inMemory) collectGarbage(); // the reader's file bytes and decoding buffers
      // only the raster is written: the elevations outside the radius are not needed
      prepared = prepareCoverage(terrain, request, { names, patternField: "--pattern", shareDecode: pool ? (...a) => pool.shareDecode(...a) : undefined, elevationsInsideRadiusOnly: true, tileTableWhileReading: pool });
      mark("grid elevations");
    } catch (e) {
      if (e instanceof TerrainError) throw new UsageError(`--terrain: ${e.message}`);
      if (e instanceof CoverageError) throw new UsageError(e.field.startsWith("--") || e.message.startsWith("--") ? e.message : `--${e.field.replace(/_/g, "-")}: ${e.message}`);
      throw e;
    }
    if (inMemory) collectGarbage(); // the terrain's own raster, now copied into the grid
    // the bar draws only on a terminal: elsewhere its module (cli-progress) is not loaded
    const progress = process.stderr.isTTY ? (await import("../progress.ts")).progressReporter("coverage") : { update() {}, stop() {} };
    let computed;
    try {
      // only the file is wanted: the cells outside the radius are set to nodata as it is written
      computed = await runCoverage(prepared, { pool, onProgress: (phase, d, t) => phase === "compute" && progress.update(d, t), outsideOnWrite: true });
    } finally {
      progress.stop();
    }
    mark("computed");
    const g = computed.grid;
    const isLevel = method !== "visibility";
    const t0 = performance.now();
    writeGeoTiff(out, {
      width: g.width,
      height: g.height,
      data: computed.values,
      geoTransform: g.geoTransform,
      epsg: g.epsg,
      nodata: isLevel ? -9999 : 255,
      description: isLevel ? "received level" : "radio line of sight (1 visible, 0 not)",
      unit: isLevel ? "dBm" : "",
      ...(computed.outside_pending ? { fillStrip: (strip: Uint8Array, row0: number, row1: number) => fillLineOfSightRaster(strip, computed.job, 255, row0, row1) } : {}),
    });
    const write_s = (performance.now() - t0) / 1000;
    mark("written");
    const result = coverageResult("coverage", [`${lat},${lon}`], computed, { geotiff: out });
    for (const w of computed.warnings) process.stderr.write(`warning: ${w}\n`);
    process.stderr.write(
      `Wrote ${out}: ${g.width}×${g.height} cells, ${crsFromEpsg(g.epsg)?.name}; ${(computed.tally.cells / 1e6).toFixed(2)} M cells inside ${radius_km} km ` +
        `(read terrain ${open_s.toFixed(2)} s, grid elevations ${computed.timing.terrain_s.toFixed(2)} s, compute ${computed.timing.compute_s.toFixed(2)} s on ${computed.timing.threads} thread${computed.timing.threads === 1 ? "" : "s"}, write ${write_s.toFixed(2)} s)` +
        `${result.thresholds.length ? `; ${result.thresholds.map((t) => `${t.label} ${t.pct.toFixed(1)} %`).join(", ")}` : ""}.\n`,
    );
    if (a.flags.has("json")) process.stdout.write(`${JSON.stringify(result, null, 2)}\n`);
    return 0;
  } finally {
    await pool?.close();
  }
}

/** RIDGELINE_TIMINGS=1: print milestones (seconds since the process started) to stderr. */
const TIMINGS = process.env.RIDGELINE_TIMINGS === "1";
function mark(what: string): void {
  if (TIMINGS) process.stderr.write(`[timing] ${(performance.now() / 1000).toFixed(3)} s ${what} (epoch ${((performance.timeOrigin + performance.now()) / 1000).toFixed(3)})\n`);
}

/**
 * Open the terrain as `openTerrain` does, except that a single GeoTIFF file is opened with
 * its pixels deferred: the coverage reads only the window it needs, once, straight into the
 * grid's shared buffer (see elevation-window.ts), instead of decoding the whole band and
 * copying the window out of it. Paths that are not a .tif/.tiff file go to `openTerrain`
 * (which also words every error about a missing or unknown path).
 */
async function openCoverageTerrain(
  spec: TerrainSpec,
  openTerrain: (spec: TerrainSpec, baseDir: string) => Promise<Terrain>,
  openGeoTiff: (path: string, options: { label?: string; deferPixels?: boolean }) => Promise<Terrain>,
): Promise<Terrain> {
  const base = process.cwd();
  if (spec.kind === "file" && /\.tiff?$/i.test(spec.path)) {
    const path = isAbsolute(spec.path) ? spec.path : resolve(base, spec.path);
    const label = isAbsolute(spec.path) ? spec.path : relative(base, path) || spec.path;
    let isFile = false;
    try {
      isFile = statSync(path).isFile();
    } catch {
      // missing: openTerrain says so
    }
    if (isFile) return openGeoTiff(path, { label, deferPixels: true });
  }
  return openTerrain(spec, base);
}

/**
 * Run a full garbage collection now. Large typed arrays are freed by the collector, which the
 * engine does not hurry for memory held outside its heap; here the terrain reader's buffers
 * (file bytes, decoded band) and then the terrain's raster would otherwise stay resident while
 * the result is allocated, raising the peak memory by their size. Best effort: without the
 * V8 hook this does nothing.
 */
function collectGarbage(): void {
  try {
    setFlagsFromString("--expose-gc");
    (runInNewContext("gc") as () => void)();
  } catch {
    // not available: leave it to the engine
  }
}

/** A horizontal pattern from a CSV of azimuth_deg,attenuation_db (header optional). */
function readPatternCsv(path: string): [number, number][] {
  let text: string;
  try {
    text = readFileSync(path, "utf8");
  } catch (e) {
    throw new UsageError(`--pattern: ${path} could not be read (${(e as NodeJS.ErrnoException).code ?? (e as Error).message}); give a CSV of azimuth_deg,attenuation_db.`);
  }
  const rows: [number, number][] = [];
  text.split(/\r?\n/).forEach((line, i) => {
    const t = line.trim();
    if (t === "" || t.startsWith("#") || (i === 0 && /[a-z]/i.test(t))) return;
    const [a, b] = t.split(",").map(Number);
    if (!Number.isFinite(a) || !Number.isFinite(b)) throw new UsageError(`--pattern: ${path}:${i + 1}: received "${t}"; expected azimuth_deg,attenuation_db.`);
    rows.push([a, b]);
  });
  return rows;
}
