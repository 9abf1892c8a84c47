import { copyFileSync, existsSync, mkdirSync, readFileSync, renameSync, writeFileSync } from "node:fs";
import { dirname, isAbsolute, join, relative, resolve } from "node:path";
import { isMap, isSeq, parseDocument, type Document } from "yaml";
import { importNetwork, type ImportedNetwork } from "../../study/import-network.ts";
import { loadStudy } from "../../study/load-study.ts";
import { studyTemplate } from "../../study/study-template.ts";
import { parseArgs, UsageError } from "../args.ts";

export const IMPORT_USAGE = `Usage: ridgeline import FILE… --study ID [--like STUDY.yaml] [--studies-dir DIR] [--force]

Reads sites and links from the files practitioners exchange and writes a new study,
<studies-dir>/<ID>/study.yaml, with comments saying where each part came from:
  sites CSV   id,name,lat_deg,lon_deg[,ground_m][,notes]
  links CSV   id,from_site,to_site,frequency_ghz,tx_power_dbm,rx_threshold_dbm,from_antenna_m,
              from_gain_dbi,to_antenna_m,to_gain_dbi [,radio,radio_name,threshold_ber,polarization,
              from_feeder_loss_db,to_feeder_loss_db,availability_pct,design_status,design_reason,
              go_mhz,return_mhz,bandwidth_mhz,go_polarization,return_polarization]
  GeoJSON     Point features (sites; id and name from the properties)
  KML         Point placemarks (sites; name, and id from ExtendedData when present)
A build writes sites.csv, links.csv, network.geojson and network.kml beside results.json in
these formats. Everything else (title, terrain, design, climate, document control) comes from
--like (an existing study.yaml) or from the commented template of \`ridgeline new\`; with
--like, radios and links whose ids match keep the keys the files lack (interference
requirements, modes, diversity, capacity target, antenna patterns, per-end losses …).`;

/** `ridgeline import …`: see IMPORT_USAGE. Exit 0 on success, 2 on bad input (nothing written over). */
export async function importCommand(argv: string[]): Promise<number> {
  if (argv.includes("--help")) {
    process.stdout.write(`${IMPORT_USAGE}\n`);
    return 0;
  }
  const a = parseArgs(argv, { values: ["study", "like", "studies-dir"], flags: ["force"] });
  const id = a.values.get("study")?.[0];
  if (!id) throw new UsageError(`--study is required.\n${IMPORT_USAGE}`);
  if (!/^[A-Za-z0-9][A-Za-z0-9_.-]*$/.test(id)) throw new UsageError(`--study "${id}": use letters, digits, '-', '_' or '.'.`);
  if (!a.positional.length) throw new UsageError(`give at least one file to import.\n${IMPORT_USAGE}`);
  const files = a.positional.map((f) => {
    if (!existsSync(f)) throw new UsageError(`${f}: no such file.`);
    return { file: f, text: readFileSync(f, "utf8") };
  });
  const net = importNetwork(files);
  const dir = resolve(a.values.get("studies-dir")?.[0] ?? "content/studies", id);
  const target = join(dir, "study.yaml");
  if (existsSync(target) && !a.flags.has("force")) throw new UsageError(`${target} already exists; give --force to replace it, or another --study id.`);
  const like = a.values.get("like")?.[0];
  const base = like ? readFileSync(like, "utf8") : studyTemplate({ id, date: new Date().toISOString().slice(0, 10) });
  const likeDir = like ? dirname(resolve(like)) : null;
  const copies = new Set<string>();
  const doc = studyDocument(base, net, { likeDir, newDir: dir, copies });
  mkdirSync(dir, { recursive: true });
  // a study reads its inputs from its own folder: the files the --like study names inside its
  // folder (antenna envelopes, profiles, land cover, service areas) are copied beside the new one
  for (const rel of copies) {
    mkdirSync(dirname(join(dir, rel)), { recursive: true });
    copyFileSync(resolve(likeDir!, rel), join(dir, rel));
  }
  const tmp = `${target}.importing`;
  writeFileSync(tmp, doc.toString({ lineWidth: 0 }));
  try {
    loadStudy(tmp); // the written study must load as any other: same schema, same messages
  } catch (e) {
    renameSync(tmp, join(dir, "study.yaml.rejected")); // kept for the user to inspect; no study.yaml written
    throw e;
  }
  renameSync(tmp, target);
  process.stderr.write(`Wrote ${target}: ${net.sites.length} sites, ${net.radios.length} radios, ${net.links.length} links.\n`);
  return 0;
}

/**
 * The base study (text, comments kept) with its sites, radios and links replaced by the
 * imported ones; chains and coverage entries that name a missing link or site are dropped, and
 * a relative terrain file is made relative to the new study's folder.
 */
export function studyDocument(base: string, net: ImportedNetwork, o: { likeDir: string | null; newDir: string; copies?: Set<string> }): Document {
  const doc = parseDocument(base);
  const copies = o.copies ?? new Set<string>();
  if (o.likeDir) net = withLikeKeys(net, doc.toJS() as Record<string, unknown>, o.likeDir, o.newDir, copies);
  const from = net.sources.map((s) => s.split(/[\\/]/).pop()).join(", ") + (o.likeDir ? "; keys the files lack from the --like study, where radio and link ids match" : "");
  const put = (key: string, value: unknown, what: string) => {
    doc.set(key, doc.createNode(value));
    const node = doc.get(key, true) as { commentBefore?: string } | undefined;
    if (node) node.commentBefore = ` ${what} imported by \`ridgeline import\` from ${from}`;
  };
  if (net.sites.length) put("sites", net.sites, "Sites");
  if (net.radios.length) put("radios", net.radios, "Radios");
  if (net.links.length || net.sites.length) put("links", net.links, "Links");
  const linkIds = new Set(net.links.map((l) => l.id));
  const siteIds = new Set(net.sites.map((s) => s.id));
  const keep = (key: string, ok: (item: Record<string, unknown>) => boolean) => {
    const seq = doc.get(key, true);
    if (!isSeq(seq)) return;
    seq.items = seq.items.filter((it) => ok((isMap(it) ? it.toJSON() : it) as Record<string, unknown>));
  };
  keep("chains", (c) => Array.isArray(c.links) && c.links.every((l) => linkIds.has(String(l))));
  keep("coverage", (c) => siteIds.has(String(c.site)));
  if (o.likeDir) {
    const likeDir = o.likeDir;
    const coverage = doc.get("coverage", true);
    if (isSeq(coverage))
      coverage.items.forEach((_it, i) => {
        for (const path of [["coverage", i, "p1812", "land_cover", "file"], ["coverage", i, "service_area"]]) {
          const f = doc.getIn(path);
          if (typeof f !== "string") continue;
          const moved = keepOrRebase(f, likeDir, o.newDir, copies);
          if (moved !== f) doc.setIn(path, moved);
        }
      });
  }
  const file = doc.getIn(["terrain", "file"]);
  if (o.likeDir && typeof file === "string" && !isAbsolute(file)) doc.setIn(["terrain", "file"], relative(o.newDir, resolve(o.likeDir, file)) || ".");
  return doc;
}

type Obj = Record<string, unknown>;

/**
 * A relative input path of the --like study: kept as written, and recorded in `copies`, when it
 * lies inside that study's folder (the command copies it beside the new study, where the loader
 * looks for inputs); otherwise made relative to the new folder (the loader then says whether it
 * may be read from there).
 */
function keepOrRebase(f: string, likeDir: string, newDir: string, copies: Set<string>): string {
  if (isAbsolute(f)) return f;
  const rel = relative(likeDir, resolve(likeDir, f));
  if (rel && !rel.startsWith("..") && !isAbsolute(rel)) {
    copies.add(rel);
    return f;
  }
  return relative(newDir, resolve(likeDir, f));
}
const isObj = (v: unknown): v is Obj => typeof v === "object" && v !== null && !Array.isArray(v);

/** Link and radio keys the exchange files carry; everything else comes from --like. */
const LINK_CSV_KEYS = new Set(["id", "from", "to", "radio", "polarization", "availability_pct", "design_status", "design_reason"]);
const RADIO_CSV_KEYS = new Set(["id", "name", "frequency_ghz", "tx_power_dbm", "rx_threshold_dbm", "threshold_ber"]);

/**
 * The imported radios and links completed from the --like study where their ids match: a
 * radio keeps the like study's interference requirements, modes, signature …; a link its
 * frequency_plan (unless the CSV gave one), diversity, capacity target, dual-polarised flag,
 * performance target and profile; an end whose site is unchanged its pattern, XPD and
 * per-end losses. What the files say wins. Files inside the --like study's folder are copied
 * beside the new study (keepOrRebase); others are named relative to the new folder.
 */
function withLikeKeys(net: ImportedNetwork, like: Obj, likeDir: string, newDir: string, copies: Set<string>): ImportedNetwork {
  const byId = (key: string) => new Map((Array.isArray(like[key]) ? (like[key] as unknown[]) : []).filter(isObj).map((x) => [String(x.id), x]));
  const likeRadios = byId("radios");
  const likeLinks = byId("links");
  const rebase = (f: unknown) => (typeof f === "string" ? keepOrRebase(f, likeDir, newDir, copies) : f);
  const rest = (o: Obj, skip: Set<string>) => Object.fromEntries(Object.entries(o).filter(([k]) => !skip.has(k)));
  const end = (mine: ImportedNetwork["links"][number]["from"], theirs: unknown) => {
    if (!isObj(theirs) || theirs.site !== mine.site) return mine;
    const extra = rest(theirs, new Set(["site", "antenna_m", "gain_dbi", "feeder_loss_db"]));
    if (isObj(extra.pattern) && "envelope_csv" in extra.pattern) extra.pattern = { ...extra.pattern, envelope_csv: rebase(extra.pattern.envelope_csv) };
    return { ...extra, ...mine };
  };
  return {
    ...net,
    radios: net.radios.map((r) => {
      const l = likeRadios.get(r.id);
      return l ? { ...rest(l, RADIO_CSV_KEYS), ...r } : r;
    }),
    links: net.links.map((k) => {
      const l = likeLinks.get(k.id);
      if (!l) return k;
      const extra = rest(l, LINK_CSV_KEYS);
      if ("profile_csv" in extra) extra.profile_csv = rebase(extra.profile_csv);
      return { ...extra, ...k, from: end(k.from, l.from), to: end(k.to, l.to) };
    }),
  };
}
