import { crsFromEpsg } from "../geo/crs-from-epsg.ts";
import { normalCdf } from "../physics/normal-distribution.ts";
import { ZONE_INLAND, ZONE_SEA } from "../physics/itu-path-geometry.ts";
import { p1812Loss } from "../physics/p1812.ts";
import { cellProfile } from "./cell-profile.ts";
import type { CoverageGrid } from "./coverage-grid.ts";
import type { CoverageJob } from "./coverage-job.ts";
import type { Elevations } from "./elevation-window.ts";
import { patternLoss } from "./level-visitors.ts";
import { receiverLocationStats } from "./p1812-visitor.ts";

/** One study site inside a P.1812 coverage's radius, as the served-sites table lists it. */
export interface ServedSite {
  site: string;
  name: string;
  distance_km: number;
  /** median received level (dBm): 50 % of locations, p % of time */
  median_dbm: number;
  /** level at the coverage's location percentage (dBm) */
  level_at_pl_dbm: number;
  /** probability that the level at a location there meets the first threshold (%) */
  location_probability_pct: number;
  /** median level − first threshold (dB) */
  margin_db: number;
  /** the coverage with the strongest median level at this site (filled across a study's coverages) */
  best_server: string | null;
  /** talk-back: uplink median level at the base (dBm) and the direction with the smaller margin */
  uplink_dbm?: number;
  uplink_margin_db?: number;
  limiting?: "downlink" | "uplink";
}

/**
 * Per study site inside the radius: the P.1812-6 level by the full-profile function
 * (`p1812Loss`, src/physics/p1812.ts) on exactly the radial profile the coverage sweep uses for
 * the site's cell (cell-profile.ts), with the same clutter, zones, location term and extra
 * losses as the raster (p1812-visitor.ts) — so the table and the map agree, and the map is
 * checked against the physics function (test/coverage/p1812-coverage.test.ts).
 * @param job the coverage's job (P.1812 part filled), dem its elevations
 * @param sites the study's sites (the transmitting site is left out by the caller)
 * @param talkBack the outstation's power and the base's threshold, when the coverage has them
 */
export function servedSites(
  job: CoverageJob,
  grid: Pick<CoverageGrid, "epsg" | "geoTransform">,
  dem: Elevations,
  sites: { id: string; name: string; lat_deg: number; lon_deg: number }[],
  o: { tx_power_dbm: number; talk_back?: { tx_power_dbm: number; base_threshold_dbm: number } },
): ServedSite[] {
  const q = job.p1812!;
  const crs = crsFromEpsg(grid.epsg)!;
  const [x0, dx, , y0, , dy] = grid.geoTransform;
  const classes = q.classes ? new Uint8Array(q.classes) : null;
  const clsAt = (i: number) => (classes ? classes[i] : q.default_class);
  const T0 = job.thresholds_dbm.length ? job.thresholds_dbm[0] : NaN;
  const out: ServedSite[] = [];
  for (const s of sites) {
    const [x, y] = crs.geographic ? [s.lon_deg, s.lat_deg] : crs.toCrs(s.lat_deg, s.lon_deg);
    const col = Math.round((x - x0) / dx - 0.5);
    const row = Math.round((y - y0) / dy - 0.5);
    if (col < 0 || row < 0 || col >= job.width || row >= job.height) continue;
    const prof = cellProfile(job, dem, col, row);
    if (!prof || prof.d_m.length < 1 || !(prof.cell.h_m === prof.cell.h_m)) continue;
    const n = prof.d_m.length + 2;
    const d_km = new Float64Array(n);
    const h_m = new Float64Array(n);
    const R = new Float64Array(n);
    const zone = new Uint8Array(n);
    const siteCls = q.site_class;
    h_m[0] = job.site_ground_m;
    zone[0] = q.sea[siteCls] ? ZONE_SEA : ZONE_INLAND;
    for (let i = 0; i < prof.d_m.length; i++) {
      const c = clsAt(prof.nearest[i]);
      d_km[i + 1] = prof.d_m[i] / 1000;
      h_m[i + 1] = prof.h_m[i];
      R[i + 1] = q.clutter_m[c];
      zone[i + 1] = q.sea[c] ? ZONE_SEA : ZONE_INLAND;
    }
    const rc = clsAt(prof.cell.index);
    const rxSea = q.sea[rc] === 1;
    d_km[n - 1] = prof.cell.d_m / 1000;
    h_m[n - 1] = prof.cell.h_m;
    zone[n - 1] = rxSea ? ZONE_SEA : ZONE_INLAND;
    const stats = { extra_db: 0, sigma_db: 0 };
    receiverLocationStats(q, job.frequency_ghz, rc, prof.cell.d_m, stats);
    const { extra_db: extra, sigma_db: sigma } = stats;
    const r = p1812Loss({
      frequency_ghz: job.frequency_ghz,
      time_pct: q.time_pct,
      location_pct: q.location_pct,
      sigma_l_db: sigma,
      d_km,
      h_m,
      clutter_height_m: R,
      zone,
      htg_m: job.antenna_m,
      hrg_m: job.receiver_m,
      polarization: q.polarization,
      phi_path_deg: q.site_lat_deg + (0.5 * prof.cell.north_m) / q.m_per_deg_lat,
      dn: dnOf(q.ae_m),
      n0: q.n0,
    });
    let top = job.eirp_dbm + job.rx_net_gain_db - extra;
    if (job.pattern.horizontal !== null || job.pattern.vertical !== null) top -= patternLoss(job, prof.cell.d_m, prof.cell.h_m + job.receiver_m - (job.site_ground_m + job.antenna_m), 1 / (2 * q.ae_m), prof.cell.east_m, prof.cell.north_m);
    const Lbc = r.blend.Lbc;
    const median = top - Math.max(r.Lb0p, Lbc);
    const ceiling = top - r.Lb0p;
    const P = T0 > ceiling ? 0 : sigma > 0 ? normalCdf((top - Lbc - T0) / sigma) : top - Lbc >= T0 ? 1 : 0;
    const row_: ServedSite = {
      site: s.id,
      name: s.name,
      distance_km: prof.cell.d_m / 1000,
      median_dbm: median,
      level_at_pl_dbm: top - r.Lb,
      location_probability_pct: 100 * P,
      margin_db: median - T0,
      best_server: null,
    };
    if (o.talk_back) {
      const up = median - o.tx_power_dbm + o.talk_back.tx_power_dbm; // reciprocal path, same antennas and losses
      row_.uplink_dbm = up;
      row_.uplink_margin_db = up - o.talk_back.base_threshold_dbm;
      row_.limiting = row_.uplink_margin_db < row_.margin_db ? "uplink" : "downlink";
    }
    out.push(row_);
  }
  return out;
}

/** ΔN back from ae = 6371·157/(157 − ΔN) km (P.1812-6 eq. (6), (7a)). */
export function dnOf(ae_m: number): number {
  return 157 - (157 * 6371e3) / ae_m;
}
