import { buildingEntryLoss, type BuildingClass } from "../physics/building-entry-loss.ts";
import { effectiveEarthRadiusKm, inverseComplementaryNormal } from "../physics/itu-path-geometry.ts";
import { P1812_CLUTTER, p1812LocationSigmaDb, P1812_VALIDITY, type P1812ClutterClass } from "../physics/p1812.ts";
import { TERRESTRIAL_CLUTTER_LOSS_VALIDITY } from "../physics/terrestrial-clutter-loss.ts";
import { metresPerDegree } from "../terrain/metres-per-degree.ts";
import { rangeWarning } from "../analysis/range-warning.ts";
import { PROBABILITY_NODATA, type P1812Job } from "./coverage-job.ts";
import type { CoverageGrid } from "./coverage-grid.ts";
import { landCoverOnGrid, type LandCoverSource } from "./land-cover.ts";

/** One clutter class of a P.1812 coverage: its category and representative height. */
export interface ClutterClass {
  value: number | null;
  name: string;
  category: P1812ClutterClass;
  height_m: number;
}

/** The P.1812-6 inputs of a coverage request (resolved from the study or the command line). */
export interface P1812Request {
  time_pct: number;
  location_pct: number;
  /** σL (dB); null: P.1812-6 §4.8 for the frequency, the cell size and the receiver's clutter */
  sigma_l_db: number | null;
  dn: number;
  n0: number;
  /** clutter classes: the land cover's table, or the one class of the whole area */
  classes: ClutterClass[];
  land_cover: LandCoverSource | null;
  receiver_clutter_loss: "none" | "p2108";
  indoor: { building: BuildingClass } | null;
}

/** Default representative clutter height (m) of a P.1812-6 category. */
export function clutterHeightM(category: P1812ClutterClass): number {
  return P1812_CLUTTER[category].height_m;
}

const SIGMA_Z = 0.841344746068543; // Φ(1)

/**
 * The P.1812 part of a coverage job: class tables, σ per receiver class, the land cover on the
 * grid, and what the report says about them (assumptions in client words, range warnings).
 * @throws CoverageError for a land cover that does not cover the radius or holds an unlisted value
 */
export function p1812Job(
  q: P1812Request,
  o: { grid: CoverageGrid; site: { lat_deg: number; lon_deg: number }; frequency_ghz: number; receiver_m: number; resolution_m: number; polarization: "h" | "v" },
  warnings: string[],
  assumptions: string[],
): P1812Job {
  const f = o.frequency_ghz;
  const clutter_m = Float64Array.from(q.classes, (c) => c.height_m);
  const sea = Uint8Array.from(q.classes, (c) => (c.category === "water" ? 1 : 0));
  let bel50 = 0;
  let belSigma = 0;
  if (q.indoor) {
    bel50 = buildingEntryLoss(f, 50, q.indoor.building, 0); // P.2109-1 eq. (1), median
    belSigma = (buildingEntryLoss(f, 100 * SIGMA_Z, q.indoor.building, 0) - buildingEntryLoss(f, 100 * (1 - SIGMA_Z), q.indoor.building, 0)) / 2;
  }
  const wa = Math.max(o.resolution_m, 1);
  const sigma_db = Float64Array.from(q.classes, (c) => {
    const sL = q.sigma_l_db ?? p1812LocationSigmaDb(f, o.receiver_m, c.height_m, wa); // P.1812-6 §4.8
    return Math.sqrt(sL * sL + belSigma * belSigma);
  });
  // the open class outside the raster (cells beyond the radius are never receivers)
  let fallback = q.classes.findIndex((c) => c.category === "open");
  if (fallback < 0) fallback = 0;
  const classes = q.land_cover ? landCoverOnGrid(q.land_cover, o.grid, fallback) : null;
  const g = o.grid;
  const siteIndex = Math.round(g.site_row) * g.width + Math.round(g.site_col);
  const site_class = classes ? classes[Math.min(classes.length - 1, Math.max(0, siteIndex))] : 0;
  const cells = g.width * g.height;
  const probability = new SharedArrayBuffer(cells * 4);
  new Float32Array(probability).fill(PROBABILITY_NODATA);

  const V = P1812_VALIDITY;
  push(warnings, rangeWarning(V.recommendation, "frequency", f, V.frequency_ghz, "GHz"));
  if (q.receiver_clutter_loss === "p2108") push(warnings, rangeWarning("ITU-R P.2108-1 §3.2 terrestrial clutter loss", "frequency", f, TERRESTRIAL_CLUTTER_LOSS_VALIDITY.frequency_ghz, "GHz"));
  const table = q.classes.map((c) => `${c.name}${c.value !== null ? ` (value ${c.value})` : ""}: ${c.category.replace("_", " ")}, ${c.height_m} m`).join("; ");
  const sigmaText =
    q.sigma_l_db !== null
      ? `${q.sigma_l_db} dB as set for this study`
      : `from ITU-R P.1812-6 §4.8 for ${(f * 1000).toPrecision(4)} MHz, ${wa} m cells and the receiver's height against its clutter (${[...new Set(q.classes.map((c, i) => `${c.name} ${(q.indoor ? Math.sqrt(Math.max(0, sigma_db[i] ** 2 - belSigma ** 2)) : sigma_db[i]).toFixed(1)} dB`))].join(", ")})`;
  assumptions.push(
    `Predicted with ITU-R P.1812-6 (the point-to-area method for 30 MHz–6 GHz): each cell's level is the one exceeded for ${q.time_pct} % of the time at ${q.location_pct} % of locations, taking line of sight, diffraction over the terrain and clutter, tropospheric scatter and ducting into account.`,
    q.land_cover
      ? `Ground cover from ${q.land_cover.label}: ${table}. Clutter heights are added to the terrain between the two ends; water counts as sea for the radio climate, all land as inland.`
      : `Ground cover: one class for the whole area (${table}); the radio climate is inland.`,
    `Location variability: the level at locations within a cell spreads about its median with a standard deviation ${sigmaText}${q.indoor ? `, combined with the spread of the building entry loss` : ""}. The location probability of a cell is the share of its locations reaching the threshold.`,
    `Radio climate: ΔN = ${q.dn} N-units/km (effective Earth radius ${effectiveEarthRadiusKm(q.dn).toFixed(0)} km), N0 = ${q.n0} N-units.`,
  );
  if (q.indoor) assumptions.push(`Receivers are indoors: building entry loss of ITU-R P.2109-1 for ${q.indoor.building.replace("-", " ")} buildings at ${(f * 1000).toPrecision(4)} MHz, horizontal incidence: median ${bel50.toFixed(1)} dB, spread ${belSigma.toFixed(1)} dB.`);
  if (q.receiver_clutter_loss === "p2108") assumptions.push("Receivers stand in urban or suburban clutter: the terrestrial clutter loss of ITU-R P.2108-1 §3.2 (median for the cell's distance) is added and its spread joins the location variability.");
  const mPerDeg = metresPerDegree(o.site.lat_deg)[0];
  assumptions.push("The latitude that sets the radio climate of each path is taken at the path's midpoint; coastal land is not told apart from inland.");
  return {
    time_pct: q.time_pct,
    location_pct: q.location_pct,
    loc_factor: -inverseComplementaryNormal(q.location_pct / 100), // P.1812-6 eq. (69): Lloc = −I(pL/100)·σL
    ae_m: effectiveEarthRadiusKm(q.dn) * 1000,
    n0: q.n0,
    polarization: o.polarization,
    site_lat_deg: o.site.lat_deg,
    m_per_deg_lat: mPerDeg,
    clutter_m,
    sea,
    sigma_db,
    classes: classes ? (classes.buffer as SharedArrayBuffer) : null,
    default_class: 0,
    site_class,
    extra_median_db: bel50,
    p2108: q.receiver_clutter_loss === "p2108",
    probability,
  };
}

function push(list: string[], w: string | null): void {
  if (w && !list.includes(w)) list.push(w);
}
