import { createHash } from "node:crypto";
import { resolve } from "node:path";
import geographiclib from "geographiclib-geodesic";
import { canonicalJson } from "../cache/canonical-json.ts";
import { toolIdentity } from "../cache/cache-keys.ts";
import type { ResultCache } from "../cache/result-cache.ts";
import { geodesicPath } from "../geo/geodesic-path.ts";
import { EARTH_RADIUS_M } from "../physics/constants.ts";
import { freeSpaceLossDb } from "../physics/free-space-loss.ts";
import { elevationDeg, offAxisAngle, type OffAxis } from "../physics/off-axis-angle.ts";
import type { TabulatedEnvelope } from "../physics/tabulated-envelope.ts";
import { powerSumDbm, thermalNoiseDbm, thresholdDegradationDb } from "../physics/threshold-degradation.ts";
import type { ReceiverProtectionInput } from "../study/interference-schema.ts";
import type { Study } from "../study/study.ts";
import type { Terrain } from "../terrain/terrain.ts";
import { antennaEnvelope, couplingGainDb, type AntennaEnvelope } from "./interference-antenna.ts";
import { interferencePathLossModel, type InterferencePath, type InterferencePathLossModel } from "./interference-path-loss.ts";
import { F1245_VALIDITY, F699_VALIDITY } from "../physics/fixed-antenna-patterns.ts";
import { P452_VALIDITY } from "../physics/p452.ts";
import type { InterferenceEntry, InterferenceReceiver, InterferenceResult } from "./interference-result.ts";
import type { LinkResult, SiteResult } from "./results.ts";

const { Geodesic } = geographiclib as unknown as typeof import("geographiclib-geodesic");

/** Effective Earth radius for antenna pointing (k = 4/3, median refraction; common practice). */
const AE_POINTING_M = (4 / 3) * EARTH_RADIUS_M;
/** Largest number of profile samples of an interference path (a coarser step on long paths). */
export const INTERFERENCE_PROFILE_MAX_SAMPLES = 400;
/**
 * A pair is left out when even free space with 20 dB of enhancement (more than the
 * focusing and ducting gains of P.452 at 0.001 %) puts the interference 30 dB under the
 * receiver's noise (it would add under 0.005 dB) and meets the C/I criterion.
 */
const BOUND_ENHANCEMENT_DB = 20;
const BOUND_BELOW_NOISE_DB = 30;

/** An antenna that transmits or receives in the analysis. */
interface Station {
  site: string;
  lat_deg: number;
  lon_deg: number;
  amsl_m: number;
  gain_dbi: number;
  feeder_loss_db: number;
  boresight_az_deg: number;
  boresight_el_deg: number;
  envelope: AntennaEnvelope;
}

interface Transmitter {
  id: string;
  link: string | null;
  station: Station;
  frequency_mhz: number;
  bandwidth_mhz: number;
  polarization: "h" | "v";
  power_dbm: number;
}

interface Receiver {
  id: string;
  link: string;
  direction: "go" | "return";
  station: Station;
  /** the wanted transmitter's id */
  wanted: string;
  from_site: string;
  frequency_mhz: number;
  bandwidth_mhz: number;
  polarization: "h" | "v";
  protection: ReceiverProtectionInput;
  carrier_dbm: number | null;
  threshold_dbm: number;
  fade_margin_db: number | null;
  short_term_pct: number;
}

export interface InterferenceOptions {
  /** site results (ground heights) in study order */
  sites: SiteResult[];
  /** the study's terrain, opened on first use (only for paths the cache lacks) */
  openTerrain: () => Promise<Terrain>;
  cache?: ResultCache | null;
  /** the terrain's content key (for the path cache keys) */
  terrainKey: string;
  /** the path loss model (default: the study's, interferencePathLossModel) */
  model?: InterferencePathLossModel;
  /** compute every pair in frequency range, without the free-space bound (for tests) */
  noBound?: boolean;
}

/**
 * Net filter discrimination (dB) of a receiver at a centre-frequency offset, or null when the
 * offset lies beyond its adjacent-channel range. Linear in offset between the given points,
 * from 0 dB at 0 MHz. Without a table, only overlapping channels count, at 0 dB (conservative).
 */
export function filterDiscriminationDb(p: ReceiverProtectionInput, offset_mhz: number, bw_tx_mhz: number, bw_rx_mhz: number): number | null {
  const pts: [number, number][] = p.nfd_db
    ? p.nfd_db.map((r) => [r.offset_mhz, r.nfd_db])
    : p.adjacent_ci_db
      ? p.adjacent_ci_db.map((r) => [r.offset_mhz, p.co_channel_ci_db - r.ci_db])
      : [];
  const df = Math.abs(offset_mhz);
  if (!pts.length) return df < (bw_tx_mhz + bw_rx_mhz) / 2 ? 0 : null;
  if (df > pts[pts.length - 1][0]) return null;
  let x0 = 0;
  let y0 = 0;
  for (const [x1, y1] of pts) {
    if (df <= x1) return y0 + ((df - x0) / (x1 - x0)) * (y1 - y0);
    x0 = x1;
    y0 = y1;
  }
  return y0;
}

const sha256 = (s: string) => createHash("sha256").update(s).digest("hex");

/** Absolute paths of the envelope CSV files the study's interference analysis reads. */
export function interferenceInputFiles(study: Study): string[] {
  const files = new Set<string>();
  const add = (p: unknown) => {
    if (p && typeof p === "object" && "envelope_csv" in p) files.add(resolve(study.dir, (p as { envelope_csv: string }).envelope_csv));
  };
  for (const l of study.links) {
    add(l.from.pattern);
    add(l.to.pattern);
  }
  for (const x of study.interference?.external ?? []) add(x.pattern);
  return [...files].sort();
}

/**
 * Interference between the study's links (and its external transmitters): every transmitter
 * into every receiver within its adjacent-channel range. For each pair: off-axis angles from
 * the geometry (WGS84 geodesics; elevations over a k = 4/3 Earth), antenna discrimination
 * from the ends' envelopes, polarisation, net filter discrimination, the path's basic
 * transmission loss at the long-term (20 %, common practice) and short-term (the receiving
 * link's outage budget) percentages; then C/I per entry and, per receiver, the aggregate
 * threshold degradation and the fade margin left. Path losses are kept in the cache.
 */
export async function analyzeInterference(study: Study, links: LinkResult[], options: InterferenceOptions): Promise<InterferenceResult> {
  const section = study.interference!;
  const model = options.model ?? interferencePathLossModel(study);
  const siteById = new Map(options.sites.map((s) => [s.id, s]));
  const envelopes = new Map<string, TabulatedEnvelope>();
  const resultById = new Map(links.map((l) => [l.id, l]));
  const transmitters: Transmitter[] = [];
  const receivers: Receiver[] = [];

  // --- Stations of the study's links ---
  for (const link of study.links) {
    const fp = link.frequency_plan;
    const lr = resultById.get(link.id);
    if (!fp || !lr) continue;
    const radio = study.radios.find((r) => r.id === link.radio)!;
    const elFrom = elevationDeg(lr.ends.from.antenna_amsl_m, lr.ends.to.antenna_amsl_m, lr.distance_m, AE_POINTING_M);
    const elTo = elevationDeg(lr.ends.to.antenna_amsl_m, lr.ends.from.antenna_amsl_m, lr.distance_m, AE_POINTING_M);
    const station = (end: "from" | "to"): Station => {
      const e = link[end];
      const site = siteById.get(e.site)!;
      return {
        site: e.site,
        lat_deg: site.lat_deg,
        lon_deg: site.lon_deg,
        amsl_m: lr.ends[end].antenna_amsl_m,
        gain_dbi: e.gain_dbi,
        feeder_loss_db: e.feeder_loss_db,
        boresight_az_deg: end === "from" ? lr.azimuth_from_deg : lr.azimuth_to_deg,
        boresight_el_deg: end === "from" ? elFrom : elTo,
        envelope: antennaEnvelope(study, e.pattern, e.gain_dbi, e.xpd_db, envelopes),
      };
    };
    const from = station("from");
    const to = station("to");
    const polGo = fp.go_polarization ?? link.polarization;
    const polRet = fp.return_polarization ?? link.polarization;
    transmitters.push({ id: `${link.id} go`, link: link.id, station: from, frequency_mhz: fp.go_mhz, bandwidth_mhz: fp.bandwidth_mhz, polarization: polGo, power_dbm: radio.tx_power_dbm });
    transmitters.push({ id: `${link.id} return`, link: link.id, station: to, frequency_mhz: fp.return_mhz, bandwidth_mhz: fp.bandwidth_mhz, polarization: polRet, power_dbm: radio.tx_power_dbm });
    const target = lr.target_availability_pct ?? link.availability_pct ?? study.design.availability_pct;
    const common = {
      link: link.id,
      bandwidth_mhz: fp.bandwidth_mhz,
      protection: radio.interference!,
      carrier_dbm: lr.received_dbm ?? null, // reciprocal: both directions have the same gains, feeders and path
      threshold_dbm: radio.rx_threshold_dbm,
      fade_margin_db: lr.fade_margin_db ?? null,
      short_term_pct: section.short_term_pct ?? Math.max(Math.round((100 - target) * 1e9) / 1e9, 1e-3),
    };
    receivers.push({ ...common, id: `${link.id} go`, direction: "go", station: to, wanted: `${link.id} go`, from_site: link.from.site, frequency_mhz: fp.go_mhz, polarization: polGo });
    receivers.push({ ...common, id: `${link.id} return`, direction: "return", station: from, wanted: `${link.id} return`, from_site: link.to.site, frequency_mhz: fp.return_mhz, polarization: polRet });
  }
  // --- External transmitters ---
  for (const x of section.external) {
    const site = siteById.get(x.site)!;
    const amsl = site.ground_m + x.antenna_m;
    let az = x.azimuth_deg ?? 0;
    let el = x.elevation_deg ?? 0;
    if (x.toward_site) {
      // toward the other site at the same height above its ground, unless told otherwise
      const t = siteById.get(x.toward_site)!;
      const g = geodesicPath(site.lat_deg, site.lon_deg, t.lat_deg, t.lon_deg, Infinity);
      if (x.azimuth_deg === undefined) az = g.azimuth_from_deg;
      if (x.elevation_deg === undefined) el = elevationDeg(amsl, t.ground_m + x.antenna_m, g.distance_m, AE_POINTING_M);
    }
    transmitters.push({
      id: `external ${x.id}`,
      link: null,
      station: { site: x.site, lat_deg: site.lat_deg, lon_deg: site.lon_deg, amsl_m: amsl, gain_dbi: x.gain_dbi, feeder_loss_db: x.feeder_loss_db, boresight_az_deg: az, boresight_el_deg: el, envelope: antennaEnvelope(study, x.pattern, x.gain_dbi, x.xpd_db, envelopes) },
      frequency_mhz: x.frequency_mhz,
      bandwidth_mhz: x.bandwidth_mhz,
      polarization: x.polarization,
      power_dbm: x.tx_power_dbm,
    });
  }

  // --- Ranges of the methods: said once per frequency, never silent ---
  const warnings: string[] = [];
  const warn = (w: string) => {
    if (!warnings.includes(w)) warnings.push(w);
  };
  for (const t of transmitters) {
    const f = t.frequency_mhz / 1000;
    if (f < P452_VALIDITY.frequency_ghz[0] || f > P452_VALIDITY.frequency_ghz[1]) warn(`Interference from ${t.id} at ${t.frequency_mhz} MHz: outside ITU-R P.452-18's ${P452_VALIDITY.frequency_ghz[0]}–${P452_VALIDITY.frequency_ghz[1]} GHz, its path losses cannot be computed; the receivers it reaches are shown as not meeting their limits.`);
  }
  for (const link of study.links) {
    const fp = link.frequency_plan;
    if (!fp) continue;
    for (const end of ["from", "to"] as const) {
      const pat = link[end].pattern ?? "f699";
      if (typeof pat !== "string") continue;
      const v = pat === "f699" ? F699_VALIDITY : F1245_VALIDITY;
      for (const f of [fp.go_mhz / 1000, fp.return_mhz / 1000]) {
        if (f < v.frequency_ghz[0] || f > v.frequency_ghz[1]) warn(`Link ${link.id}, ${end} antenna: ${v.method} covers ${v.frequency_ghz[0]}–${v.frequency_ghz[1]} GHz, not ${f} GHz; its discrimination cannot be computed. Give a tabulated envelope (envelope_csv).`);
      }
    }
  }
  if (section.short_term_pct === undefined && receivers.some((r) => r.short_term_pct === 1e-3)) {
    warn("A receiving link's outage budget is below 0.001 % of time, the least ITU-R P.452-18 covers: its short-term interference is taken at 0.001 %.");
  }

  // --- Geometry between sites, once per pair ---
  const geo = new Map<string, { d: number; az12: number; az21: number }>();
  const geometry = (a: Station, b: Station) => {
    const k = `${a.site}\0${b.site}`;
    let g = geo.get(k);
    if (!g) {
      const inv = Geodesic.WGS84.Inverse(a.lat_deg, a.lon_deg, b.lat_deg, b.lon_deg);
      g = { d: inv.s12 ?? NaN, az12: ((inv.azi1 ?? NaN) + 360) % 360, az21: ((inv.azi2 ?? NaN) + 540) % 360 };
      geo.set(k, g);
    }
    return g;
  };

  // --- Pairs within the adjacent-channel range; the free-space bound; path-loss requests ---
  interface Pending {
    rx: Receiver;
    tx: Transmitter;
    nfd: number;
    sameSite: boolean;
    d: number;
    offTx: OffAxis | null;
    offRx: OffAxis | null;
    txAtt: { co_db: number; cross_db: number } | null;
    rxAtt: { co_db: number; cross_db: number } | null;
    coupling: number;
    key: string;
    path: InterferencePath | null;
  }
  const pending: Pending[] = [];
  let inRange = 0;
  let belowBound = 0;
  const climateKey = canonicalJson([toolIdentity(), options.terrainKey, study.climate, model.method]);
  for (const rx of receivers) {
    const f_ghz = rx.frequency_mhz / 1000;
    const noise = thermalNoiseDbm(rx.bandwidth_mhz * 1e6, rx.protection.noise_figure_db);
    for (const tx of transmitters) {
      if (tx.id === rx.wanted) continue;
      const nfd = filterDiscriminationDb(rx.protection, tx.frequency_mhz - rx.frequency_mhz, tx.bandwidth_mhz, rx.bandwidth_mhz);
      if (nfd === null) continue;
      inRange++;
      // one site, or two sites at one place (a path of under 1 m has no far-field loss)
      const sameSite = tx.station.site === rx.station.site || geometry(tx.station, rx.station).d < 1;
      if (sameSite) {
        pending.push({ rx, tx, nfd, sameSite, d: 0, offTx: null, offRx: null, txAtt: null, rxAtt: null, coupling: NaN, key: "", path: null });
        continue;
      }
      const g = geometry(tx.station, rx.station);
      const offTx = offAxisAngle(tx.station.boresight_az_deg, tx.station.boresight_el_deg, g.az12, elevationDeg(tx.station.amsl_m, rx.station.amsl_m, g.d, AE_POINTING_M));
      const offRx = offAxisAngle(rx.station.boresight_az_deg, rx.station.boresight_el_deg, g.az21, elevationDeg(rx.station.amsl_m, tx.station.amsl_m, g.d, AE_POINTING_M));
      const txAtt = tx.station.envelope.attenuation(offTx, tx.frequency_mhz / 1000);
      const rxAtt = rx.station.envelope.attenuation(offRx, f_ghz);
      const coupling = couplingGainDb(tx.station.gain_dbi, txAtt, rx.station.gain_dbi, rxAtt, tx.polarization === rx.polarization);
      const base = tx.power_dbm - tx.station.feeder_loss_db + coupling - rx.station.feeder_loss_db - nfd;
      const bound = base - freeSpaceLossDb(g.d, tx.frequency_mhz / 1000) + BOUND_ENHANCEMENT_DB;
      if (!options.noBound && bound < noise - BOUND_BELOW_NOISE_DB && rx.threshold_dbm - bound >= rx.protection.co_channel_ci_db) {
        belowBound++;
        continue;
      }
      const path: InterferencePath = {
        d_m: new Float64Array(0),
        h_m: new Float64Array(0),
        hts_m: tx.station.amsl_m,
        hrs_m: rx.station.amsl_m,
        frequency_ghz: tx.frequency_mhz / 1000,
        polarization: tx.polarization,
        gt_dbi: tx.station.gain_dbi - txAtt.co_db,
        gr_dbi: rx.station.gain_dbi - rxAtt.co_db,
        tx_lat_deg: tx.station.lat_deg,
        tx_lon_deg: tx.station.lon_deg,
        rx_lat_deg: rx.station.lat_deg,
        rx_lon_deg: rx.station.lon_deg,
      };
      const key = sha256(canonicalJson([climateKey, tx.station.lat_deg, tx.station.lon_deg, path.hts_m, rx.station.lat_deg, rx.station.lon_deg, path.hrs_m, path.frequency_ghz, path.polarization, Math.round(path.gt_dbi * 100), Math.round(path.gr_dbi * 100), section.long_term_pct, rx.short_term_pct]));
      pending.push({ rx, tx, nfd, sameSite, d: g.d, offTx, offRx, txAtt, rxAtt, coupling, key, path });
    }
  }

  // --- Path losses: from the study's stored set, the rest computed over the terrain ---
  const cache = options.cache ?? null;
  const storeKey = cache ? sha256(`interference-paths-v1\0${study.file}`) : "";
  const stored = new Map<string, [number, number]>();
  if (cache) {
    const s = cache.get<{ keys: string[]; lt: number[]; st: number[] }>("interference-paths", storeKey);
    if (s && Array.isArray(s.keys)) s.keys.forEach((k, i) => stored.set(k, [s.lt[i], s.st[i]]));
  }
  const losses = new Map<string, [number, number]>();
  let terrain: Terrain | null = null;
  const profiles = new Map<string, { d_m: Float64Array; h_m: Float64Array }>();
  for (const p of pending) {
    if (!p.path || losses.has(p.key)) continue;
    const hit = stored.get(p.key);
    if (hit) {
      losses.set(p.key, hit);
      continue;
    }
    terrain ??= await options.openTerrain();
    const pk = `${p.tx.station.site}\0${p.rx.station.site}`;
    let prof = profiles.get(pk);
    if (!prof) {
      const t = p.tx.station;
      const r = p.rx.station;
      const native = terrain.resolutionM((t.lat_deg + r.lat_deg) / 2);
      const step = Math.max(Number.isFinite(native) ? native : 50, p.d / (INTERFERENCE_PROFILE_MAX_SAMPLES - 1));
      const g = geodesicPath(t.lat_deg, t.lon_deg, r.lat_deg, r.lon_deg, step);
      const s = terrain.sample(g.lat_deg, g.lon_deg);
      const h_m = Float64Array.from(s.h_m);
      // a site's surveyed ground replaces the terrain's at the ends
      h_m[0] = siteById.get(t.site)!.ground_m;
      h_m[h_m.length - 1] = siteById.get(r.site)!.ground_m;
      prof = { d_m: g.d_m, h_m };
      profiles.set(pk, prof);
    }
    const path = { ...p.path, d_m: prof.d_m, h_m: prof.h_m };
    const lt = model.loss(path, section.long_term_pct);
    const st = model.time_dependent ? model.loss(path, p.rx.short_term_pct) : lt;
    losses.set(p.key, [lt, st]);
  }
  if (cache && [...losses.keys()].some((k) => !stored.has(k))) {
    const keys = [...losses.keys()];
    cache.put("interference-paths", storeKey, { keys, lt: keys.map((k) => losses.get(k)![0]), st: keys.map((k) => losses.get(k)![1]) });
  }

  // --- Entries and receivers ---
  const entries: InterferenceEntry[] = [];
  const byReceiver = new Map<string, InterferenceEntry[]>();
  const effective = new Map<string, { lt: number[]; st: number[] }>();
  /** interferers whose level could not be computed, by receiver */
  const uncomputed = new Map<string, number>();
  for (const p of pending) {
    const { rx, tx } = p;
    const required_ci_db = rx.protection.co_channel_ci_db - p.nfd;
    const [lt, st] = p.path ? losses.get(p.key)! : [NaN, NaN];
    const base = tx.power_dbm - tx.station.feeder_loss_db + p.coupling - rx.station.feeder_loss_db;
    // outside a pattern's or P.452's range (warned above) a level is NaN: not available, and
    // the receiver cannot be shown to meet its limits
    const Ilt = p.sameSite ? null : finiteOrNull(base - lt);
    const Ist = p.sameSite ? null : finiteOrNull(base - st);
    if (!p.sameSite && (Ilt === null || Ist === null)) uncomputed.set(rx.id, (uncomputed.get(rx.id) ?? 0) + 1);
    const ciThr = Ilt === null ? null : rx.threshold_dbm - Ilt;
    const e: InterferenceEntry = {
      receiver: rx.id,
      receiver_link: rx.link,
      receiver_site: rx.station.site,
      transmitter: tx.id,
      transmitter_link: tx.link,
      transmitter_site: tx.station.site,
      frequency_offset_mhz: tx.frequency_mhz - rx.frequency_mhz,
      co_polar: tx.polarization === rx.polarization,
      same_site: p.sameSite,
      distance_m: p.sameSite ? null : p.d,
      tx_off_axis_deg: p.offTx?.theta_deg ?? null,
      tx_off_axis_azimuth_deg: p.offTx?.azimuth_deg ?? null,
      tx_off_axis_elevation_deg: p.offTx?.elevation_deg ?? null,
      rx_off_axis_deg: p.offRx?.theta_deg ?? null,
      rx_off_axis_azimuth_deg: p.offRx?.azimuth_deg ?? null,
      rx_off_axis_elevation_deg: p.offRx?.elevation_deg ?? null,
      tx_discrimination_db: finiteOrNull(p.txAtt?.co_db),
      rx_discrimination_db: finiteOrNull(p.rxAtt?.co_db),
      polarization_discrimination_db: p.txAtt && p.rxAtt ? finiteOrNull(tx.station.gain_dbi - p.txAtt.co_db + rx.station.gain_dbi - p.rxAtt.co_db - p.coupling) : null,
      filter_discrimination_db: p.nfd,
      path_loss_long_term_db: p.sameSite ? null : finiteOrNull(lt),
      path_loss_short_term_db: p.sameSite ? null : finiteOrNull(st),
      interference_long_term_dbm: Ilt,
      interference_short_term_dbm: Ist,
      ci_median_db: Ilt === null || rx.carrier_dbm === null ? null : rx.carrier_dbm - Ilt,
      ci_at_threshold_db: ciThr,
      required_ci_db,
      ci_margin_db: ciThr === null ? null : ciThr - required_ci_db,
      met: ciThr !== null && ciThr >= required_ci_db,
    };
    entries.push(e);
    let list = byReceiver.get(rx.id);
    if (!list) byReceiver.set(rx.id, (list = []));
    list.push(e);
    if (Ilt !== null && Ist !== null) {
      let eff = effective.get(rx.id);
      if (!eff) effective.set(rx.id, (eff = { lt: [], st: [] }));
      eff.lt.push(Ilt - p.nfd);
      eff.st.push(Ist - p.nfd);
    }
  }
  const receiverResults: InterferenceReceiver[] = receivers.map((rx) => {
    const list = byReceiver.get(rx.id) ?? [];
    const eff = effective.get(rx.id);
    const noise = thermalNoiseDbm(rx.bandwidth_mhz * 1e6, rx.protection.noise_figure_db);
    const unknown = uncomputed.get(rx.id) ?? 0;
    // with an interferer not computed, the sums (and what follows from them) are not available
    const Ilt = eff && !unknown ? finiteOrNull(powerSumDbm(eff.lt)) : null;
    const Ist = eff && !unknown ? finiteOrNull(powerSumDbm(eff.st)) : null;
    const tdLt = unknown ? null : Ilt === null ? 0 : finiteOrNull(thresholdDegradationDb(Ilt, noise));
    const tdSt = unknown ? null : Ist === null ? 0 : finiteOrNull(thresholdDegradationDb(Ist, noise));
    const allowed = rx.protection.threshold_degradation_db;
    const fmLeft = rx.fade_margin_db === null || tdLt === null ? null : rx.fade_margin_db - tdLt;
    const fmLeftSt = rx.fade_margin_db === null || tdSt === null ? null : rx.fade_margin_db - tdSt;
    const reasons: string[] = [];
    if (unknown) reasons.push(`The interference from ${unknown} interferer${unknown > 1 ? "s" : ""} is not available (a frequency outside an antenna pattern's or the path-loss method's range; see the warnings): the receiver cannot be shown to meet its limits.`);
    const missed = list.filter((e) => !e.met);
    for (const e of missed.filter((x) => x.same_site)) reasons.push(`${e.transmitter} transmits at ${e.receiver_site} ${Math.abs(e.frequency_offset_mhz)} MHz from this receiver's channel: a site's transmit and receive channels must be apart (high/low plan); coupling between antennas on one site is not computed.`);
    const ciMissed = missed.filter((x) => !x.same_site && x.ci_margin_db !== null);
    if (ciMissed.length) {
      const worst = ciMissed.reduce((a, b) => ((b.ci_margin_db ?? Infinity) < (a.ci_margin_db ?? Infinity) ? b : a));
      reasons.push(`C/I at the threshold below the requirement from ${ciMissed.length} interferer${ciMissed.length > 1 ? "s" : ""} (worst: ${worst.transmitter}, ${Math.abs(worst.ci_margin_db!).toFixed(1)} dB short).`);
    }
    if (tdLt !== null && tdLt > allowed) reasons.push(`Long-term threshold degradation ${tdLt.toFixed(2)} dB exceeds the ${allowed} dB allowed.`);
    // a link that does not close without interference fails on its own (its link verdict)
    if (rx.fade_margin_db !== null && rx.fade_margin_db > 0 && fmLeftSt !== null && fmLeftSt <= 0) reasons.push(`Short-term interference (${rx.short_term_pct} % of time) degrades the threshold by ${tdSt!.toFixed(1)} dB, more than the ${rx.fade_margin_db!.toFixed(1)} dB fade margin.`);
    const margins = list.map((e) => e.ci_margin_db).filter((m): m is number => m !== null && Number.isFinite(m));
    return {
      id: rx.id,
      link: rx.link,
      direction: rx.direction,
      site: rx.station.site,
      from_site: rx.from_site,
      frequency_mhz: rx.frequency_mhz,
      bandwidth_mhz: rx.bandwidth_mhz,
      polarization: rx.polarization,
      noise_dbm: noise,
      carrier_dbm: rx.carrier_dbm,
      threshold_dbm: rx.threshold_dbm,
      fade_margin_db: rx.fade_margin_db,
      short_term_pct: rx.short_term_pct,
      required_co_channel_ci_db: rx.protection.co_channel_ci_db,
      allowed_degradation_db: allowed,
      entries: list.length,
      worst_ci_margin_db: margins.length ? Math.min(...margins) : null,
      interference_long_term_dbm: Ilt,
      interference_short_term_dbm: Ist,
      threshold_degradation_long_term_db: tdLt,
      threshold_degradation_short_term_db: tdSt,
      fade_margin_left_db: fmLeft,
      fade_margin_left_short_term_db: fmLeftSt,
      met: reasons.length === 0,
      reasons,
    };
  });
  const worstFirst = (a: number | null, b: number | null) => (a ?? -Infinity) - (b ?? -Infinity);
  entries.sort((a, b) => Number(a.met) - Number(b.met) || worstFirst(a.ci_margin_db, b.ci_margin_db) || a.receiver.localeCompare(b.receiver) || a.transmitter.localeCompare(b.transmitter));
  receiverResults.sort((a, b) => Number(a.met) - Number(b.met) || (b.threshold_degradation_long_term_db ?? Infinity) - (a.threshold_degradation_long_term_db ?? Infinity) || a.id.localeCompare(b.id));
  const receivers_met = receiverResults.filter((r) => r.met).length;
  return {
    long_term_pct: section.long_term_pct,
    short_term_pct: section.short_term_pct ?? null,
    path_loss_method: model.method,
    receivers: receiverResults,
    entries,
    paths: { in_frequency_range: inRange, computed: losses.size, below_bound: belowBound },
    receivers_total: receiverResults.length,
    receivers_met,
    met: receivers_met === receiverResults.length,
    warnings,
  };
}

/** A finite number, else null (shown as not available). */
function finiteOrNull(x: number | null | undefined): number | null {
  return typeof x === "number" && Number.isFinite(x) ? x : null;
}
