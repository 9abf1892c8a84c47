import { execFileSync } from "node:child_process";
import { mkdirSync, symlinkSync, writeFileSync } from "node:fs";
import { join } from "node:path";

/**
 * The fuzzer's grammar and mutations for the link-performance and interference parts of a
 * study (used by generate.ts): radio signatures, adaptive-modulation modes, XPD/XPIC, C/I
 * and ATPC; link diversity, co-channel dual polarisation, capacity targets, performance
 * objectives and frequency plans; end losses, antenna patterns (F.699, F.1245, tabulated
 * envelope CSVs); design performance_pct, worst_month_k and design allowance; and the
 * study's interference section with external transmitters.
 */

export interface FeatureDoc {
  [k: string]: unknown;
}

/** What a feature mutation edits: the document and the files beside study.yaml. */
export interface FeatureDraft {
  doc: FeatureDoc;
  files: Map<string, (dir: string) => void>;
}

type Rng = () => number;
const pick = <T>(r: Rng, xs: readonly T[]): T => xs[Math.floor(r() * xs.length)];
const int = (r: Rng, lo: number, hi: number) => lo + Math.floor(r() * (hi - lo + 1));

const ENVELOPE_HEADER = "angle_deg,h_copolar_db,h_crosspolar_db,v_copolar_db,v_crosspolar_db";

/** A valid envelope CSV: attenuation rising with angle, cross-polar below co-polar. */
export function envelopeCsv(r: Rng): string {
  const rows = [ENVELOPE_HEADER, "# fuzz envelope"];
  const angles = [0, 1, 2, 5, 10, 20, 45, 90, 135, 180];
  const top = int(r, 30, 70);
  for (const a of angles) {
    const co = Math.min(top, (a * a) / 4);
    const x = Math.max(co, int(r, 25, 35));
    rows.push(`${a},${co.toFixed(2)},${x.toFixed(2)},${co.toFixed(2)},${x.toFixed(2)}`);
  }
  return rows.join("\n") + "\n";
}

const signature = (r: Rng) => ({ width_mhz: int(r, 10, 60), depth_minimum_phase_db: int(r, 5, 25), depth_non_minimum_phase_db: int(r, 5, 25), reference_delay_ns: 6.3 });

const MODE_NAMES = ["QPSK", "16-QAM", "64-QAM", "256-QAM", "1024-QAM", "4096-QAM"];

function modes(r: Rng, threshold: number): FeatureDoc[] {
  const n = int(r, 1, 5);
  return Array.from({ length: n }, (_, i) => ({
    name: MODE_NAMES[i],
    capacity_mbps: 50 * (i + 1),
    rx_threshold_dbm: threshold + 6 * i,
    ...(r() < 0.2 ? { signature: signature(r) } : {}),
  }));
}

/** Adds the link-performance and interference fields to a valid study (kept valid). */
/**
 * A go/return channel pair for link `i` in the band of a carrier of `fMhz`: channels a few
 * per cent from the carrier (the loader refuses one more than 20 % away), go and return apart
 * by at least the bandwidth.
 */
function bandPlan(fMhz: number, i: number, bw: number): FeatureDoc {
  const go = fMhz + (i % 5) * Math.min(bw, 0.01 * fMhz);
  return { go_mhz: go, return_mhz: go + Math.max(bw, 0.06 * fMhz), bandwidth_mhz: bw };
}

export function addFeatures(d: FeatureDraft, r: Rng): void {
  const doc = d.doc;
  const radios = doc.radios as FeatureDoc[];
  const links = doc.links as FeatureDoc[];
  const sites = doc.sites as FeatureDoc[];
  const radio = radios[0];
  const fMhz = (radio.frequency_ghz as number) * 1000;
  if (r() < 0.5) radio.signature = signature(r);
  if (r() < 0.4) radio.modes = modes(r, radio.rx_threshold_dbm as number);
  if (r() < 0.3) Object.assign(radio, { xpd_db: int(r, 20, 40), xpif_db: int(r, 0, 20), co_channel_ci_db: int(r, 15, 30) });
  if (r() < 0.3) radio.atpc_range_db = int(r, 0, 30);
  const design: FeatureDoc = {};
  if (r() < 0.3) design.performance_pct = pick(r, [99.99, 99.995, 99.999, 99.9]);
  if (r() < 0.3) design.worst_month_k = { enabled: r() < 0.8, min_f1: pick(r, [0, 0.3, -0.5, 1]) };
  if (r() < 0.3) design.design_allowance_db = int(r, 0, 10);
  if (Object.keys(design).length) doc.design = design;
  const envelope = r() < 0.3;
  if (envelope) d.files.set("env.csv", (dir) => writeFileSync(join(dir, "env.csv"), envelopeCsv(r)));
  links.forEach((l, i) => {
    for (const end of [l.from, l.to] as FeatureDoc[]) {
      if (r() < 0.3) Object.assign(end, { radome_loss_db: 0.5, wet_radome_loss_db: int(r, 0, 3), connector_loss_db: 0.2 });
      if (r() < 0.2) Object.assign(end, { waveguide_m: int(r, 0, 80), waveguide_loss_db_per_100m: 5.8 });
      if (r() < 0.4) end.pattern = envelope && r() < 0.6 ? { envelope_csv: "env.csv" } : pick(r, ["f699", "f1245"]);
      if (r() < 0.2) end.xpd_db = int(r, 20, 40);
    }
    if (r() < 0.2) l.diversity = r() < 0.5 ? { space: { spacing_m: int(r, 3, 20), ...(r() < 0.5 ? { gain_dbi: int(r, 10, 40) } : {}) } } : { frequency: { spacing_mhz: pick(r, [28, 56, 500]) } };
    if (r() < 0.15) {
      l.co_channel_dual_polarised = true;
      radio.xpd_db ??= int(r, 20, 40);
      radio.co_channel_ci_db ??= int(r, 15, 30);
    }
    if (radio.modes && r() < 0.5) {
      const m = radio.modes as FeatureDoc[];
      l.capacity_target = r() < 0.5 ? { capacity_mbps: m[m.length - 1].capacity_mbps, availability_pct: 99.9 } : { mode: m[0].name, availability_pct: 99.99 };
    }
    if (r() < 0.2) l.performance_pct = 99.995;
    const bw = pick(r, [7, 14, 28, 56]);
    l.frequency_plan = { ...bandPlan(fMhz, i, bw), ...(r() < 0.3 ? { go_polarization: pick(r, ["h", "v"]) } : {}) };
  });
  if (r() < 0.6) {
    radio.interference = {
      co_channel_ci_db: int(r, 15, 35),
      ...(r() < 0.5 ? { adjacent_ci_db: [{ offset_mhz: 28, ci_db: -2 }, { offset_mhz: 56, ci_db: -30 }] } : { nfd_db: [{ offset_mhz: 14, nfd_db: 30 }, { offset_mhz: 28, nfd_db: 50 }] }),
      threshold_degradation_db: 1,
      noise_figure_db: int(r, 3, 8),
    };
    const external = r() < 0.5
      ? [{ id: "ext1", site: sites[sites.length - 1].id, antenna_m: 30, gain_dbi: 35, ...(r() < 0.5 ? { toward_site: sites[0].id } : { azimuth_deg: int(r, 0, 359) }), frequency_mhz: fMhz, bandwidth_mhz: 28, polarization: pick(r, ["h", "v"]), tx_power_dbm: 20, ...(envelope && r() < 0.5 ? { pattern: { envelope_csv: "env.csv" } } : {}) }]
      : [];
    doc.interference = { long_term_pct: 20, ...(r() < 0.3 ? { short_term_pct: 0.01 } : {}), external };
  }
}

const EXTREME = [0, -0, 1e-9, 1e-6, -1, 1e308, -1e308, 5e-324, 1e6, 0.5, 100, Number.NaN, Infinity, -Infinity, 9007199254740993];
const EDGE = [0, 1e-9, 0.001, 0.1, 1, 5, 20, 40, 50, 60, 70, 80, 100, 1000, 5000, 10_000, 100_000, 1e6, 99.9999999, 99.000001, 0.0010001];
/** Schema ranges of the feature numbers by key: [low, high, low exclusive, high exclusive]. */
const RANGES: Record<string, [number, number, boolean?, boolean?]> = {
  width_mhz: [0.01, 1000], depth_minimum_phase_db: [0, 80], depth_non_minimum_phase_db: [0, 80], reference_delay_ns: [0.01, 100],
  capacity_mbps: [0.001, 100_000], rx_threshold_dbm: [-150, 0], xpd_db: [0, 60], xpif_db: [0, 40], atpc_range_db: [0, 60],
  spacing_m: [0.1, 100], gain_dbi: [-10, 70], spacing_mhz: [0.001, 5000], availability_pct: [0, 100, true, true], performance_pct: [0, 100, true, true],
  go_mhz: [30, 1e6], return_mhz: [30, 1e6], bandwidth_mhz: [0.001, 10_000], frequency_mhz: [30, 1e6],
  radome_loss_db: [0, 10], wet_radome_loss_db: [0, 20], connector_loss_db: [0, 10], waveguide_m: [0, 1000], waveguide_loss_db_per_100m: [0, 200],
  min_f1: [-1, 1], design_allowance_db: [0, 30], ci_db: [-100, 100], nfd_db: [0, 150], threshold_degradation_db: [0, 10, true], noise_figure_db: [0, 30],
  long_term_pct: [0.001, 50], short_term_pct: [0.001, 50], antenna_m: [0, 1000], elevation_deg: [-90, 90], azimuth_deg: [0, 360, false, true],
  tx_power_dbm: [-30, 80], feeder_loss_db: [0, 50], co_channel_ci_db: [0, 60],
};

/** Values at the edges of a range, inside it. */
function edges([lo, hi, loOpen, hiOpen]: [number, number, boolean?, boolean?]): number[] {
  const span = hi - lo;
  return [loOpen ? (lo === 0 ? 5e-324 : lo + span * 1e-12) : lo, lo + span * 1e-6, lo + span / 2, hi - span * 1e-6, hiOpen ? hi - span * 1e-12 : hi];
}

const HOSTILE_TEXT = ["<script>alert(1)</script>", "a\u0000b", "\ud800", "x".repeat(300), "line\nbreak", "", " ", "../../etc/passwd", "\u202Eevil"];

/** Number fields of the features, as paths; the mutation gives one an extreme value. */
function featureNumberPaths(doc: FeatureDoc): (string | number)[][] {
  const out: (string | number)[][] = [];
  const walk = (v: unknown, path: (string | number)[]) => {
    if (Array.isArray(v)) v.forEach((x, i) => walk(x, [...path, i]));
    else if (v && typeof v === "object") for (const [k, x] of Object.entries(v)) walk(x, [...path, k]);
    else if (typeof v === "number") out.push(path);
  };
  const radios = doc.radios as FeatureDoc[] | undefined;
  radios?.forEach((rd, i) => {
    for (const k of ["signature", "modes", "xpd_db", "xpif_db", "co_channel_ci_db", "atpc_range_db", "interference"]) if (rd[k] !== undefined) walk(rd[k], ["radios", i, k]);
  });
  (doc.links as FeatureDoc[] | undefined)?.forEach((l, i) => {
    for (const k of ["diversity", "capacity_target", "performance_pct", "frequency_plan"]) if (l[k] !== undefined) walk(l[k], ["links", i, k]);
    for (const end of ["from", "to"]) {
      const e = l[end] as FeatureDoc | undefined;
      for (const k of ["radome_loss_db", "wet_radome_loss_db", "connector_loss_db", "waveguide_m", "waveguide_loss_db_per_100m", "xpd_db"]) if (e && e[k] !== undefined) out.push(["links", i, end, k]);
    }
  });
  if (doc.design) walk(doc.design, ["design"]);
  if (doc.interference) walk(doc.interference, ["interference"]);
  return out;
}

function setAt(doc: FeatureDoc, path: (string | number)[], value: unknown): void {
  let o = doc as Record<string | number, unknown>;
  for (const p of path.slice(0, -1)) o = o[p] as Record<string | number, unknown>;
  o[path[path.length - 1]] = value;
}

/** Hostile envelope CSV texts and files. */
const BAD_ENVELOPES: Record<string, string | ((dir: string) => void)> = {
  "no-header": "0,1,2,3,4\n180,1,2,3,4\n",
  "wrong-header": "angle,co,x\n0,1,2\n180,1,2\n",
  "short-span": `${ENVELOPE_HEADER}\n0,0,30,0,30\n90,40,40,40,40\n`,
  "not-rising": `${ENVELOPE_HEADER}\n0,0,30,0,30\n10,10,30,10,30\n5,10,30,10,30\n180,50,50,50,50\n`,
  negative: `${ENVELOPE_HEADER}\n0,0,30,0,30\n180,-50,-50,-50,-50\n`,
  nan: `${ENVELOPE_HEADER}\n0,NaN,30,0,30\n90,Infinity,1e308,1e308,1e308\n180,50,50,50,50\n`,
  huge: `${ENVELOPE_HEADER}\n0,0,30,0,30\n180,1e308,1e308,1e308,1e308\n`,
  "huge-cell": `${ENVELOPE_HEADER}\n0,0,30,0,30\n${"9".repeat(400)},1,1,1,1\n180,50,50,50,50\n`,
  "one-row": `${ENVELOPE_HEADER}\n0,0,0,0,0\n`,
  "two-rows": `${ENVELOPE_HEADER}\n0,0,0,0,0\n180,0,0,0,0\n`,
  "many-rows": `${ENVELOPE_HEADER}\n${Array.from({ length: 200_001 }, (_, i) => `${((i * 180) / 200_000).toFixed(6)},1,2,3,4`).join("\n")}\n`,
  binary: "\u0000\u0001\u00ff\ufffe,,,,\n",
  empty: "",
  "crlf-ok": `${ENVELOPE_HEADER}\r\n0,0,30,0,30\r\n180,50,50,50,50\r\n`,
  tiny: `${ENVELOPE_HEADER}\n0,0,30,0,30\n1e-300,0,30,0,30\n180,50,50,50,50\n`,
  fifo: (dir) => execFileSync("mkfifo", [join(dir, "env.csv")]),
  "dev-zero": (dir) => symlinkSync("/dev/zero", join(dir, "env.csv")),
  "link-out": (dir) => symlinkSync("/etc/passwd", join(dir, "env.csv")),
  dir: (dir) => mkdirSync(join(dir, "env.csv")),
  missing: () => {},
};

/** The mutations of the feature fields: each edits a draft (after addFeatures). */
export const FEATURE_MUTATIONS: Record<string, (d: FeatureDraft, r: Rng) => void> = {
  "feature-number"(d, r) {
    const paths = featureNumberPaths(d.doc);
    if (!paths.length) throw new Error("no feature numbers");
    setAt(d.doc, pick(r, paths), pick(r, EXTREME));
  },
  "feature-edge"(d, r) {
    // values at or near the edges of the schema's ranges, so that more cases reach the analysis
    const paths = featureNumberPaths(d.doc);
    if (!paths.length) throw new Error("no feature numbers");
    for (let i = int(r, 1, 3); i > 0; i--) {
      const path = pick(r, paths);
      const range = RANGES[String(path[path.length - 1])];
      setAt(d.doc, path, range ? pick(r, edges(range)) : pick(r, EDGE));
    }
  },
  envelope(d, r) {
    const links = d.doc.links as FeatureDoc[];
    const kind = pick(r, [...Object.keys(BAD_ENVELOPES), "traversal", "absolute", "nul-path"]);
    const file = kind === "traversal" ? "../../../../etc/passwd" : kind === "absolute" ? "/etc/passwd" : kind === "nul-path" ? "env\u0000.csv" : "env.csv";
    (links[0][pick(r, ["from", "to"])] as FeatureDoc).pattern = { envelope_csv: file };
    const bad = BAD_ENVELOPES[kind];
    if (typeof bad === "string") d.files.set("env.csv", (dir) => writeFileSync(join(dir, "env.csv"), bad));
    else if (bad) d.files.set("env.csv", bad);
    if (r() < 0.5 && d.doc.interference === undefined) {
      // ask for interference so the envelope is used, not only checked
      const radios = d.doc.radios as FeatureDoc[];
      for (const rd of radios) rd.interference = { co_channel_ci_db: 30, noise_figure_db: 5 };
      const carrierMhz = (l: FeatureDoc) => ((radios.find((rd) => rd.id === l.radio)?.frequency_ghz as number) || 6) * 1000;
      links.forEach((l, i) => (l.frequency_plan ??= bandPlan(carrierMhz(l), i, 28)));
      d.doc.interference = {};
    }
  },
  modes(d, r) {
    const radio = (d.doc.radios as FeatureDoc[])[0];
    const links = d.doc.links as FeatureDoc[];
    const kind = pick(r, ["unordered", "empty", "hostile-name", "same-threshold", "unknown-target-mode", "target-without-modes", "target-both", "target-neither", "huge-list", "duplicate-name", "hostile-target-mode"]);
    const m = modes(r, (radio.rx_threshold_dbm as number) || -80);
    if (kind === "unordered") radio.modes = [...m, { name: "QPSK-low", capacity_mbps: 10, rx_threshold_dbm: -100 }];
    if (kind === "empty") radio.modes = [];
    if (kind === "hostile-name") radio.modes = m.map((x, i) => (i === 0 ? { ...x, name: pick(r, HOSTILE_TEXT) } : x));
    if (kind === "same-threshold") radio.modes = [...m, { ...m[m.length - 1] }];
    if (kind === "duplicate-name") radio.modes = [...m, { ...m[m.length - 1], name: m[0].name, capacity_mbps: 9000, rx_threshold_dbm: -1 }];
    if (kind === "huge-list") radio.modes = Array.from({ length: 5000 }, (_, i) => ({ name: `M${i}`, capacity_mbps: i + 1, rx_threshold_dbm: -140 + i * 0.02 }));
    if (kind.startsWith("target") || kind.endsWith("target-mode")) {
      if (kind !== "target-without-modes") radio.modes = m;
      else delete radio.modes;
    }
    const target = (t: FeatureDoc) => (links[0].capacity_target = t);
    if (kind === "unknown-target-mode") target({ mode: "NOPE", availability_pct: 99.9 });
    if (kind === "hostile-target-mode") target({ mode: pick(r, HOSTILE_TEXT), availability_pct: 99.9 });
    if (kind === "target-without-modes") target({ capacity_mbps: 100, availability_pct: 99.9 });
    if (kind === "target-both") target({ capacity_mbps: 1e9, mode: m[0].name, availability_pct: 99.9 });
    if (kind === "target-neither") target({ availability_pct: 99.9 });
  },
  "frequency-plan"(d, r) {
    const links = d.doc.links as FeatureDoc[];
    const kind = pick(r, ["overlap", "far-from-radio", "tiny-bandwidth", "huge-bandwidth", "same-channel-all", "missing-with-interference", "radio-without-protection", "both-adjacent-and-nfd", "offsets-not-rising"]);
    const radio = (d.doc.radios as FeatureDoc[])[0];
    const fMhz = (radio.frequency_ghz as number) * 1000 || 6000;
    const plan = () => (links[0].frequency_plan ??= bandPlan(fMhz, 0, 28)) as FeatureDoc;
    if (kind === "overlap") Object.assign(plan(), { return_mhz: (plan().go_mhz as number) + 1 });
    if (kind === "far-from-radio") Object.assign(plan(), { go_mhz: pick(r, [1e-6, 1, 1e6]), return_mhz: pick(r, [2, 999_999]) });
    if (kind === "tiny-bandwidth") Object.assign(plan(), { bandwidth_mhz: pick(r, [1e-12, 5e-324, 1e-6]) });
    if (kind === "huge-bandwidth") Object.assign(plan(), { bandwidth_mhz: 10_000, go_mhz: fMhz, return_mhz: fMhz + 20_000 });
    if (kind === "same-channel-all") links.forEach((l) => (l.frequency_plan = bandPlan(fMhz, 0, 28)));
    if (kind === "missing-with-interference") {
      d.doc.interference ??= {};
      delete links[0].frequency_plan;
    }
    if (kind === "radio-without-protection") {
      d.doc.interference ??= {};
      links.forEach((l, i) => (l.frequency_plan ??= bandPlan(fMhz, i, 28)));
      delete radio.interference;
    }
    if (kind === "both-adjacent-and-nfd") radio.interference = { co_channel_ci_db: 30, noise_figure_db: 5, adjacent_ci_db: [{ offset_mhz: 28, ci_db: 0 }], nfd_db: [{ offset_mhz: 28, nfd_db: 30 }] };
    if (kind === "offsets-not-rising") radio.interference = { co_channel_ci_db: 30, noise_figure_db: 5, adjacent_ci_db: [{ offset_mhz: 56, ci_db: 0 }, { offset_mhz: 28, ci_db: -30 }, { offset_mhz: 5e-324, ci_db: 0 }] };
  },
  external(d, r) {
    const radio = (d.doc.radios as FeatureDoc[])[0];
    const links = d.doc.links as FeatureDoc[];
    const sites = d.doc.sites as FeatureDoc[];
    const fMhz = (radio.frequency_ghz as number) * 1000 || 6000;
    radio.interference ??= { co_channel_ci_db: 30, noise_figure_db: 5 };
    links.forEach((l, i) => (l.frequency_plan ??= bandPlan(fMhz, i, 28)));
    const base: FeatureDoc = { id: "ext", site: sites[0].id, antenna_m: 30, gain_dbi: 35, toward_site: sites[1]?.id, frequency_mhz: fMhz, bandwidth_mhz: 28, polarization: "v", tx_power_dbm: 30 };
    const kind = pick(r, ["missing-site", "toward-self", "no-pointing", "hostile-id", "long-id", "duplicate-id", "co-sited", "far-site", "many", "zenith", "extreme-power", "toward-missing", "both-pointings"]);
    const ext: FeatureDoc[] = [base];
    if (kind === "missing-site") base.site = "NOPE";
    if (kind === "toward-self") base.toward_site = base.site;
    if (kind === "toward-missing") base.toward_site = "NOPE";
    if (kind === "no-pointing") delete base.toward_site;
    if (kind === "both-pointings") base.azimuth_deg = 359.999999;
    if (kind === "hostile-id") base.id = pick(r, ["x\" onmouseover=\"alert(1)", "a<b", "CON", "..", "a.", "", "a/b"]);
    if (kind === "long-id") base.id = "e".repeat(pick(r, [65, 300, 100_000]));
    if (kind === "duplicate-id") ext.push({ ...base }, { ...base, id: "EXT" });
    if (kind === "co-sited") Object.assign(base, { site: links[0] ? (links[0].to as FeatureDoc).site : sites[1]?.id, toward_site: links[0] ? (links[0].from as FeatureDoc).site : sites[0].id });
    if (kind === "far-site") {
      sites.push({ id: "FAREXT", name: "Far transmitter", lat_deg: -(sites[0].lat_deg as number), lon_deg: sites[0].lon_deg });
      base.site = "FAREXT";
    }
    if (kind === "many") for (let i = 0; i < 200; i++) ext.push({ ...base, id: `x${i}` });
    if (kind === "zenith") Object.assign(base, { elevation_deg: pick(r, [90, -90]), toward_site: undefined, azimuth_deg: 0 });
    if (kind === "extreme-power") Object.assign(base, { tx_power_dbm: pick(r, [80, -30]), gain_dbi: pick(r, [70, -10]), frequency_mhz: pick(r, [1e-9, 1e6]), bandwidth_mhz: pick(r, [1e-9, 10_000]) });
    for (const e of ext) for (const [k, v] of Object.entries(e)) if (v === undefined) delete e[k];
    d.doc.interference = { ...((d.doc.interference as FeatureDoc) ?? {}), external: ext, ...(r() < 0.3 ? { long_term_pct: pick(r, [0.001, 50, 1e-9, 51]), short_term_pct: pick(r, [0.001, 50, 0]) } : {}) };
  },
  diversity(d, r) {
    const l = (d.doc.links as FeatureDoc[])[0];
    l.diversity = pick(r, [
      { space: { spacing_m: pick(r, [1e-9, 0.001, 100, 1000]) } },
      { space: { spacing_m: 10, gain_dbi: pick(r, [-10, 70, 1e308]) } },
      { frequency: { spacing_mhz: pick(r, [1e-9, 5000, 1e6]) } },
      { space: { spacing_m: 10 }, frequency: { spacing_mhz: 28 } },
      {},
    ]);
    if (r() < 0.5) l.co_channel_dual_polarised = true;
    if (r() < 0.5) (l.to as FeatureDoc).antenna_m = pick(r, [0, 1, 1000]);
  },
  "worst-month"(d, r) {
    d.doc.design = { ...((d.doc.design as FeatureDoc) ?? {}), worst_month_k: pick(r, [{ enabled: true, min_f1: pick(r, [-1, 1, 0]) }, { enabled: "yes" }, {}, { min_f1: 5 }, null]), performance_pct: pick(r, [1e-9, 99.9999999999, 50, 100]) };
  },
};
