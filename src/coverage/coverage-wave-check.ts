import { EARTH_RADIUS_M } from "../physics/constants.ts";
import { freeSpaceLossDb } from "../physics/free-space-loss.ts";
import { ZONE_INLAND, ZONE_SEA } from "../physics/itu-path-geometry.ts";
import { p1812Loss } from "../physics/p1812.ts";
import { parabolicEquationField } from "../physics/parabolic-equation/split-step.ts";
import { rayProfile, type RayProfile } from "./cell-profile.ts";
import { LEVEL_NODATA, type CoverageJob } from "./coverage-job.ts";
import { elevationAt, type Elevations } from "./elevation-window.ts";
import { patternLoss } from "./level-visitors.ts";
import { dnOf } from "./served-sites.ts";

/** Radials of the check when a coverage does not say (equally spaced from north). */
export const WAVE_CHECK_DEFAULT_RADIALS = 8;

/**
 * How the wave solution is run along a radial (see coverageWaveCheck): the source's beamwidth
 * asked for, the grid's largest angle, and the figure grid the values are read from (columns
 * along the radial, rows up the height range; the rows are kept finer than half the solver's
 * vertical step for the radii and reliefs of ordinary coverages).
 */
export const WAVE_CHECK_GRID = { beamwidth_deg: 30, max_angle_deg: 10, columns: 40, rows: 2048 } as const;

/**
 * Work limit of one radial (transform points × range steps): 25 million, a few seconds on one
 * core — a tenth of a link's limit, since a coverage has several radials; a 150 km radial at
 * UHF needs about half of it. A radial above it is refused with the reason in its row.
 */
export const WAVE_CHECK_WORK_LIMIT_CELL_STEPS = 25e6;

/** One radial of the check. Losses are basic transmission losses (dB); differences are method − wave. */
export interface WaveCheckRadial {
  /** true azimuth of the radial (°, clockwise from north) */
  azimuth_deg: number;
  /** length of the radial as computed (km) */
  length_km: number;
  status: "ok" | "refused";
  /** why the wave solution was not computed, or why some points were left out; "" when neither */
  reason: string;
  /** points compared */
  points: number;
  mean_db: number | null;
  rms_db: number | null;
  max_abs_db: number | null;
  /** distance of the largest |difference| (km) */
  max_at_km: number | null;
  /** the compared points: distance (km), wave solution and method losses (dB) */
  d_km: number[];
  wave_db: number[];
  method_db: number[];
}

/** The check of one coverage as results.json carries it. */
export interface WaveCheck {
  /** what is compared, in a sentence for the report */
  compared: string;
  /** how the wave solution was run, in a sentence */
  solver: string;
  radials: WaveCheckRadial[];
  /** over every compared point of every radial (dB; null when none) */
  overall: WaveCheckStats;
  /** the same, split where the method's loss is within CLEAR_PATH_DB of free space (a clear path) and where it is not (diffraction) */
  clear: WaveCheckStats;
  diffraction: WaveCheckStats;
}

/** Statistics of method − wave differences over a set of points (dB; null when there are none). */
export interface WaveCheckStats {
  points: number;
  mean_db: number | null;
  rms_db: number | null;
  max_abs_db: number | null;
}

/** A point counts as a clear path when the method's loss is within this of free space (dB). */
export const CLEAR_PATH_DB = 1;

/** The method's comparable loss for a receiver at sample i of a radial (dB), NaN where it has none. */
type MethodLoss = (ray: RayProfile, i: number) => number;

/**
 * An independent check of a coverage map: the wave solution (split-step parabolic equation,
 * src/physics/parabolic-equation/) along `radials` radials from the site, equally spaced in true
 * azimuth from north, beside the coverage method's basic transmission loss on the same radials.
 *
 * Each radial is the sweep's own (rayProfile: the samples and cells the method used). The wave
 * solution is marched once along it, over the same terrain samples, with the coverage's
 * frequency, antenna and receiver heights, effective Earth radius (P.1812: from ΔN), ground
 * constants and polarisation, from a broad Gaussian source (WAVE_CHECK_GRID). Its field is read
 * at the receiver height above the local ground at WAVE_CHECK_GRID.columns distances (from a
 * tenth of the radius out), rows interpolated in dB, and each point compared with the cell of
 * the radial nearest in distance (within three quarters of a cell). The wave value is
 * Lb = Lbf(r) − F, F the field relative to free space with the source's own pattern at the
 * direct ray's angle taken out (exp(−4·ln2·δ²/θ²) in power, the Gaussian aperture's pattern;
 * common practice); points more than half a beamwidth off the source's aim are left out, as are
 * points under the solver's first cell above the ground.
 *
 * Like for like: delta-Bullington, the map's level turned back into loss without the antenna
 * pattern and gases (Lbf + Ld of ITU-R P.526-15 §4.5); P.1812, the Recommendation's Lbd (free
 * space and delta-Bullington diffraction for the coverage's time percentage, P.1812-6 §4.2-4.6
 * through `p1812Loss`) for the bare terrain of the same profile (clutter heights 0, 50 % of
 * locations, the coverage's ΔN) — not the map's level, which adds clutter, location
 * variability and building or clutter losses, nor the troposcatter and ducting terms of the
 * blend, which the wave solution does not model; Hata, the map's empirical loss (an urban median:
 * differences there are the clutter the wave solution does not see).
 * @returns null for a visibility coverage (no level to compare) or radials = 0
 */
export function coverageWaveCheck(job: CoverageJob, dem: Elevations, values: Float32Array | Uint8Array, radials: number): WaveCheck | null {
  if (job.method === "visibility" || !(radials > 0)) return null;
  const ae_m = job.p1812 ? job.p1812.ae_m : job.ae_m;
  const k = ae_m / EARTH_RADIUS_M;
  const { methodLoss, compared } = methodOf(job, dem, values as Float32Array);
  const rows: WaveCheckRadial[] = [];
  let frameSlope = 0;
  for (let j = 0; j < radials; j++) {
    const r = checkRadial(job, dem, (360 * j) / radials, k, methodLoss);
    rows.push(r.row);
    if (r.frameSlope > 0 && !(frameSlope > 0)) frameSlope = r.frameSlope;
  }
  const diffs = rows.flatMap((r) => r.method_db.map((m, i) => m - r.wave_db[i]));
  const clearAt = rows.flatMap((r) => r.method_db.map((m, i) => m - freeSpaceLossDb(r.d_km[i] * 1000, job.frequency_ghz) < CLEAR_PATH_DB));
  const statsOf = (d: number[]): WaveCheckStats => {
    const s = differenceStats(d);
    return { points: d.length, mean_db: s.mean, rms_db: s.rms, max_abs_db: s.maxAbs };
  };
  const polar = (job.p1812 ? job.p1812.polarization : job.ground.vertical ? "v" : "h") === "v" ? "vertical" : "horizontal";
  return {
    compared,
    solver: `Split-step parabolic equation marched along each radial over the coverage's own terrain samples: ${polar} polarisation, ground εr = ${round(job.ground.epsilon_r, 1)}, σ = ${round(job.ground.sigma_s_m, 4)} S/m, effective Earth radius ${round(ae_m / 1000, 0)} km, grid up to ${WAVE_CHECK_GRID.max_angle_deg}°, read at ${round(job.receiver_m, 1)} m above the ground from a tenth of the radius out; the source's pattern at each point's angle is taken out. Two things make the differences. The method's simplification: the coverage methods take a hill as one or a few edges and leave out the attenuation of a field that follows a smooth convex surface, which the wave solution carries (it is held to ITU-R P.526 §3 over the smooth Earth); behind broad convex hills at UHF their loss is lower by tens of dB for that reason (measured behind a 240 m convex slope at 458.5 MHz, 2 km out: delta-Bullington about 36 dB, Deygout 48 dB, the wave solution's excess loss 52–74 dB; the rounded-obstacle loss of ITU-R P.526 §4 for that hill is higher still). The solver's grid: where the terrain is steeper than its terrain-following frame (slopes above ${frameSlope > 0 ? round(frameSlope * 100, 1) : "a few"} %) it is a staircase that converges slowly, which on that slope moved the wave solution's loss by up to 15 dB over seven grids (52–67 dB vertical, 59–74 dB horizontal polarisation), less than the methods' difference. Large differences in the diffraction rows are a flag to look at that radial, not a verdict on the map.`,
    radials: rows,
    overall: statsOf(diffs),
    clear: statsOf(diffs.filter((_, i) => clearAt[i])),
    diffraction: statsOf(diffs.filter((_, i) => !clearAt[i])),
  };
}

function round(v: number, digits: number): string {
  return String(Math.round(v * 10 ** digits) / 10 ** digits);
}

/** What the method's loss is at a cell of a radial, and that in words. */
function methodOf(job: CoverageJob, dem: Elevations, level: Float32Array): { methodLoss: MethodLoss; compared: string } {
  const base = job.eirp_dbm + job.rx_net_gain_db;
  const usePattern = job.pattern.horizontal !== null || job.pattern.vertical !== null;
  const hts = job.site_ground_m + job.antenna_m;
  const invTwoAe = job.ae_m === Infinity ? 0 : 1 / (2 * job.ae_m);
  // the map's value at the grid cell nearest to the sample (owned by this radial or a neighbour,
  // whose profile is within half a cell of this one), turned back into loss
  const fromMap = (gases: boolean): MethodLoss => (ray, i) => {
    const idx = ray.nearest[i];
    const v = level[idx];
    const h = elevationAt(dem, idx);
    if (!(v === v) || v === LEVEL_NODATA || !(h === h)) return NaN;
    const col = idx % job.width;
    const row = (idx - col) / job.width;
    const east = (col - job.site_col) * job.east_per_col_m[row];
    const north = (row - job.site_row) * job.north_per_row_m[row];
    const d = Math.max(Math.hypot(east, north), 0.5 * Math.min(Math.abs(job.east_per_col_m[row]), Math.abs(job.north_per_row_m[row])));
    let L = base - v;
    if (usePattern) L -= patternLoss(job, d, h + job.receiver_m - hts, invTwoAe, east, north);
    if (gases) L -= (job.gamma_db_km * d) / 1000;
    return L;
  };
  if (job.method === "delta-bullington") {
    return { methodLoss: fromMap(true), compared: "Basic transmission loss along each radial: the wave solution beside the map's delta-Bullington loss (free space plus ITU-R P.526-15 §4.5 diffraction; the antenna pattern and gaseous absorption taken out), cell by cell. Differences are the method's loss minus the wave solution's." };
  }
  if (job.method === "hata") {
    return { methodLoss: fromMap(false), compared: "Basic transmission loss along each radial: the wave solution over the bare terrain beside the map's Hata loss, an empirical median for built-up areas: differences include the clutter losses the wave solution does not model. Differences are the method's loss minus the wave solution's." };
  }
  const q = job.p1812!;
  const classes = q.classes ? new Uint8Array(q.classes) : null;
  const clsAt = (i: number) => (classes ? classes[i] : q.default_class);
  // the Recommendation on this radial's own samples, the receiver at sample i
  const methodLoss: MethodLoss = (ray, i) => {
    if (i < 1) return NaN;
    const n = i + 2;
    const d_km = new Float64Array(n);
    const h_m = new Float64Array(n);
    const zone = new Uint8Array(n);
    h_m[0] = job.site_ground_m;
    zone[0] = q.sea[q.site_class] ? ZONE_SEA : ZONE_INLAND;
    for (let j = 0; j <= i; j++) {
      d_km[j + 1] = ray.d_m[j] / 1000;
      h_m[j + 1] = ray.h_m[j];
      zone[j + 1] = q.sea[clsAt(ray.nearest[j])] ? ZONE_SEA : ZONE_INLAND;
    }
    const north = ray.cells.length ? (ray.cells[ray.cells.length - 1].north_m * ray.d_m[i]) / ray.cells[ray.cells.length - 1].d_m : 0;
    const r = p1812Loss({
      frequency_ghz: job.frequency_ghz,
      time_pct: q.time_pct,
      location_pct: 50,
      sigma_l_db: 0,
      d_km,
      h_m,
      clutter_height_m: new Float64Array(n),
      zone,
      htg_m: job.antenna_m,
      hrg_m: job.receiver_m,
      polarization: q.polarization,
      phi_path_deg: q.site_lat_deg + (0.5 * north) / q.m_per_deg_lat,
      dn: dnOf(q.ae_m),
      n0: q.n0,
    });
    return r.blend.Lbd;
  };
  return {
    methodLoss,
    compared: `Basic transmission loss along each radial: the wave solution beside the line-of-sight and diffraction part of ITU-R P.1812-6 (Lbd: free space plus delta-Bullington diffraction for ${q.time_pct} % of the time) on the bare terrain of the same profile (clutter heights 0, 50 % of locations). Not the map's level, which adds clutter, location variability and any building or clutter loss, nor the troposcatter and anomalous-propagation terms of the Recommendation's blend, which the wave solution does not model. Differences are the method's loss minus the wave solution's.`,
  };
}

/**
 * The sweep's radial along true azimuth az_deg: the one that owns the farthest cell in that
 * direction which the sweep visits (inside the grid and the radius, not beyond nodata), searched
 * inwards from the radius in steps of a cell, then of a fiftieth of the radius.
 */
function radialToward(job: CoverageJob, dem: Elevations, az_deg: number): RayProfile | null {
  const rs = Math.min(job.height - 1, Math.max(0, Math.round(job.site_row)));
  const EX = job.east_per_col_m[rs];
  const NY = job.north_per_row_m[rs];
  const cell = Math.max(Math.abs(EX), Math.abs(NY));
  const a = ((az_deg - job.azimuth_offset_deg) * Math.PI) / 180;
  let tries = 0;
  for (let r = job.radius_m - 0.5 * cell; r > cell; r -= tries < 3 ? cell : job.radius_m / 50) {
    const col = Math.round(job.site_col + (r * Math.sin(a)) / EX);
    const row = Math.round(job.site_row + (r * Math.cos(a)) / NY);
    if (col < 0 || row < 0 || col >= job.width || row >= job.height) continue;
    const e = (col - job.site_col) * job.east_per_col_m[row];
    const n = (row - job.site_row) * job.north_per_row_m[row];
    if (Math.hypot(e, n) > job.radius_m) continue;
    tries++;
    const ray = rayProfile(job, dem, col, row, { searchAll: false });
    if (ray) return ray;
  }
  return null;
}

/** One radial of the check, and the largest slope the solver's terrain-following frame took (0 when not computed). */
function checkRadial(job: CoverageJob, dem: Elevations, az: number, k: number, methodLoss: MethodLoss): { row: WaveCheckRadial; frameSlope: number } {
  const out: WaveCheckRadial = { azimuth_deg: az, length_km: 0, status: "ok", reason: "", points: 0, mean_db: null, rms_db: null, max_abs_db: null, max_at_km: null, d_km: [], wave_db: [], method_db: [] };
  const cellM = Math.max(Math.abs(job.east_per_col_m[0]), Math.abs(job.north_per_row_m[0]));
  const ray = radialToward(job, dem, az);
  // the radial as the method saw it: the site's ground and the samples out to the radius
  const d_m: number[] = [0];
  const ground_m: number[] = [job.site_ground_m];
  let last = -1;
  if (ray) while (last + 1 < ray.d_m.length && ray.d_m[last + 1] <= job.radius_m) last++;
  if (!ray || last < 2) return { row: { ...out, status: "refused", reason: "no terrain along this radial" }, frameSlope: 0 };
  for (let i = 0; i <= last; i++) if (ray.d_m[i] > d_m[d_m.length - 1]) d_m.push(ray.d_m[i]), ground_m.push(ray.h_m[i]);
  const end = d_m[d_m.length - 1];
  const spacing = end / last;
  out.length_km = end / 1000;
  const pe = parabolicEquationField({
    d_m,
    ground_m,
    frequency_ghz: job.frequency_ghz,
    tx_antenna_m: job.antenna_m,
    rx_antenna_m: job.receiver_m,
    polarization: job.p1812 ? job.p1812.polarization : job.ground.vertical ? "v" : "h",
    ground: { kind: "impedance", epsilon_r: job.ground.epsilon_r, sigma_s_m: job.ground.sigma_s_m },
    refractivity: { kind: "k-factor", k },
    beamwidth_deg: WAVE_CHECK_GRID.beamwidth_deg,
    figure: { columns: WAVE_CHECK_GRID.columns, rows: WAVE_CHECK_GRID.rows },
    grid: { max_angle_deg: WAVE_CHECK_GRID.max_angle_deg },
    work_limit_cell_steps: WAVE_CHECK_WORK_LIMIT_CELL_STEPS,
  });
  if (pe.status !== "ok" || !pe.field) return { row: { ...out, status: "refused", reason: pe.reason || "the wave solution gave no field" }, frameSlope: 0 };
  const f = pe.field;
  const zT = job.site_ground_m + job.antenna_m;
  const ae = k * EARTH_RADIUS_M;
  const aim = (pe.aim_deg * Math.PI) / 180;
  const bw = (pe.beamwidth_used_deg * Math.PI) / 180;
  const d0 = Math.max(0.1 * end, 2 * cellM);
  let offBeam = 0;
  let underCell = 0;
  let si = 0;
  for (let c = 0; c < f.x_m.length; c++) {
    const x = f.x_m[c];
    if (x < d0) continue;
    while (si < last && Math.abs(ray.d_m[si + 1] - x) <= Math.abs(ray.d_m[si] - x)) si++;
    if (Math.abs(ray.d_m[si] - x) > spacing) continue;
    const z = f.ground_m[c] + job.receiver_m;
    const t = (z - f.z0_m) / f.dz_m;
    const r0 = Math.floor(t);
    const a0 = f.f_db[c * f.rows + r0];
    const a1 = f.f_db[c * f.rows + r0 + 1];
    if (!(r0 >= 0 && r0 + 1 < f.rows && Number.isFinite(a0) && Number.isFinite(a1))) {
      underCell++;
      continue;
    }
    const F = a0 + (t - r0) * (a1 - a0);
    const delta = Math.atan((z - zT) / x - x / (2 * ae)) - aim;
    if (Math.abs(delta) > 0.5 * bw) {
      offBeam++;
      continue;
    }
    const pattern = 10 * Math.log10(Math.exp((-4 * Math.LN2 * delta * delta) / (bw * bw))); // Gaussian aperture pattern (common practice)
    const wave = freeSpaceLossDb(Math.hypot(x, z - zT), job.frequency_ghz) - (F - pattern);
    const method = methodLoss(ray, si);
    if (!Number.isFinite(method) || !Number.isFinite(wave)) continue;
    out.d_km.push(ray.d_m[si] / 1000);
    out.wave_db.push(wave);
    out.method_db.push(method);
  }
  const diffs = out.method_db.map((m, i) => m - out.wave_db[i]);
  const s = differenceStats(diffs);
  const notes: string[] = [];
  if (end < 0.95 * job.radius_m - 1.5 * cellM) notes.push(`the coverage's radial ends at ${round(end / 1000, 1)} km (edge of the terrain, or no data beyond)`);
  if (pe.angle_limit_exceeded) notes.push(`the radial needs angles up to ${round(pe.grid.geometry_angle_deg, 1)}°, beyond the parabolic approximation's limit`);
  if (offBeam) notes.push(`${offBeam} point${offBeam > 1 ? "s" : ""} steeper than the source's beam left out`);
  if (underCell) notes.push(`${underCell} point${underCell > 1 ? "s" : ""} below the solver's first cell above the ground left out`);
  return { row: { ...out, reason: notes.join("; "), points: diffs.length, mean_db: s.mean, rms_db: s.rms, max_abs_db: s.maxAbs, max_at_km: s.at >= 0 ? out.d_km[s.at] : null }, frameSlope: pe.grid.max_frame_slope };
}

function differenceStats(d: number[]): { mean: number | null; rms: number | null; maxAbs: number | null; at: number } {
  if (d.length === 0) return { mean: null, rms: null, maxAbs: null, at: -1 };
  let sum = 0;
  let sq = 0;
  let at = 0;
  for (let i = 0; i < d.length; i++) {
    sum += d[i];
    sq += d[i] * d[i];
    if (Math.abs(d[i]) > Math.abs(d[at])) at = i;
  }
  return { mean: sum / d.length, rms: Math.sqrt(sq / d.length), maxAbs: Math.abs(d[at]), at };
}
