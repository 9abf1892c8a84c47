import { readFileSync } from "node:fs";
import { resolve } from "node:path";
import { crsFromEpsg } from "../geo/crs-from-epsg.ts";
import type { CoverageInput, Study } from "../study/study.ts";
import type { ComputedCoverage } from "./compute-coverage.ts";
import { CoverageError } from "./coverage-error.ts";
import type { MapOverlay } from "./coverage-output-stage.ts";
import { formatDb, type P1812Summary, type ServiceAreaSummary } from "./coverage-result.ts";
import { servedSites } from "./served-sites.ts";
import { parseServiceArea, serviceAreaMask, type ServiceArea } from "./service-area.ts";

/** Grid pixel-centre coordinates of a WGS84 point on a coverage's grid. */
function toPixel(c: ComputedCoverage, lat: number, lon: number): [number, number] {
  const g = c.grid;
  const crs = crsFromEpsg(g.epsg)!;
  const [x, y] = crs.geographic ? [lon, lat] : crs.toCrs(lat, lon);
  return [(x - g.geoTransform[0]) / g.geoTransform[1] - 0.5, (y - g.geoTransform[3]) / g.geoTransform[5] - 0.5];
}

/** Read a coverage entry's service area (null without one). @throws CoverageError (field service_area) */
export function readServiceArea(study: Study, entry: CoverageInput): ServiceArea | null {
  if (!entry.service_area) return null;
  let text: string;
  try {
    text = readFileSync(resolve(study.dir, entry.service_area), "utf8");
  } catch (e) {
    const expected = "a readable GeoJSON or KML file, relative to the study folder";
    throw new CoverageError(`service area ${entry.service_area} could not be read (${(e as NodeJS.ErrnoException).code ?? String(e)}); expected ${expected}`, "service_area", { received: `"${entry.service_area}"`, expected });
  }
  return parseServiceArea(text, entry.service_area);
}

/** The study's other sites, its links and the service area in the coverage grid's pixels. */
export function mapOverlay(study: Study, c: ComputedCoverage, txSite: string, sa: ServiceArea | null): MapOverlay {
  const pos = new Map(study.sites.map((s) => [s.id, toPixel(c, s.lat_deg, s.lon_deg)]));
  return {
    others: study.sites.filter((s) => s.id !== txSite).map((s) => ({ name: s.name, col: pos.get(s.id)![0], row: pos.get(s.id)![1] })),
    links: study.links.map((l) => [...pos.get(l.from.site)!, ...pos.get(l.to.site)!] as [number, number, number, number]),
    areas: sa ? sa.polygons.flatMap((rings) => rings.map((ring) => ring.map(([lon, lat]) => toPixel(c, lat, lon)))) : [],
  };
}

/** The P.1812 summary of a computed coverage: area reliability, served sites, talk-back. */
export function p1812Summary(study: Study, entry: CoverageInput, c: ComputedCoverage, labels: string[]): P1812Summary {
  const q = c.job.p1812!;
  const t = c.tally;
  const thresholds = c.request.thresholds_dbm;
  const others = study.sites.filter((s) => s.id !== entry.site);
  const served = servedSites(c.job, c.grid, c.dem, others, { tx_power_dbm: c.request.tx_power_dbm, talk_back: entry.talk_back }).filter((r) => r.distance_km * 1000 <= c.request.radius_m);
  const summary: P1812Summary = {
    recommendation: "ITU-R P.1812-6",
    time_pct: q.time_pct,
    location_pct: q.location_pct,
    dn: entry.p1812?.dn ?? 45,
    n0: q.n0,
    reliability: thresholds.map((T, j) => ({ label: labels[j], level_dbm: T, area_reliability_pct: t.area_m2 > 0 ? (100 * t.reliability_m2[j]) / t.area_m2 : 0 })),
    probability_of: labels[0] ?? "",
    served_sites: served,
  };
  if (entry.talk_back && thresholds.length) {
    // Reciprocal path with the same antennas and losses: the uplink level is the downlink level
    // shifted by the difference of the transmitter powers, so one direction limits everywhere.
    const upMinusDown = entry.talk_back.tx_power_dbm - c.request.tx_power_dbm - (entry.talk_back.base_threshold_dbm - thresholds[0]);
    summary.talk_back = { tx_power_dbm: entry.talk_back.tx_power_dbm, base_threshold_dbm: entry.talk_back.base_threshold_dbm, limiting: upMinusDown < 0 ? "uplink" : "downlink", by_db: Math.abs(upMinusDown) };
  }
  return summary;
}

/** Coverage share and area reliability inside the service area. */
export function serviceAreaSummary(entry: CoverageInput, c: ComputedCoverage, sa: ServiceArea, labels: string[]): ServiceAreaSummary {
  const g = c.grid;
  const mask = serviceAreaMask(sa, g);
  const values = c.values;
  const prob = c.job.p1812 ? new Float32Array(c.job.p1812.probability) : null;
  const isLevel = c.request.method !== "visibility";
  const nodata = isLevel ? -9999 : 255;
  const thresholds = isLevel ? c.request.thresholds_dbm : [1];
  const at = new Float64Array(thresholds.length);
  let area = 0;
  let rel = 0;
  const W = g.width;
  for (let r = 0; r < g.height; r++) {
    const a = g.cell_area_m2[r];
    for (let col = 0; col < W; col++) {
      const i = r * W + col;
      if (!mask[i]) continue;
      const v = values[i];
      if (v === nodata || v !== v) continue;
      area += a;
      for (let j = 0; j < thresholds.length; j++) if (v >= thresholds[j]) at[j] += a;
      if (prob && prob[i] >= 0) rel += prob[i] * a;
    }
  }
  const pct = (x: number) => (area > 0 ? (100 * x) / area : 0);
  return {
    name: sa.name,
    file: entry.service_area!,
    area_km2: sa.area_km2,
    computed_km2: area / 1e6,
    computed_pct: sa.area_km2 > 0 ? (100 * area) / 1e6 / sa.area_km2 : 0,
    thresholds: thresholds.map((T, j) => ({ label: isLevel ? labels[j] ?? `≥ ${formatDb(T)} dBm` : "visible", pct: pct(at[j]) })),
    area_reliability_pct: prob ? pct(rel) : null,
  };
}
