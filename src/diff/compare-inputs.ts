import { createHash } from "node:crypto";
import { readFileSync } from "node:fs";
import { resolve } from "node:path";
import geographiclib from "geographiclib-geodesic";
import { canonicalJson } from "../cache/canonical-json.ts";
import { studyTerrainExtent, terrainSourceKey } from "../cache/terrain-source-key.ts";
import type { Study } from "../study/study.ts";
import { showBeforeAfter, showNumber, unitOf } from "./diff-format.ts";
import type { DiffValue, InputChange, InputChangeKind } from "./study-diff.ts";

// The package is CommonJS; its runtime export is a default object holding the named members.
const { Geodesic } = geographiclib as unknown as typeof import("geographiclib-geodesic");

type Link = Study["links"][number];

/** A scalar for the report: numbers, strings and booleans as they are, anything else as canonical JSON. */
function scalar(v: unknown): DiffValue {
  if (v === undefined || v === null) return null;
  if (typeof v === "number" || typeof v === "string" || typeof v === "boolean") return v;
  return canonicalJson(v);
}

function fileSha(dir: string, file: string | undefined): string | null {
  if (!file) return null;
  try {
    return createHash("sha256").update(readFileSync(resolve(dir, file))).digest("hex");
  } catch {
    return null;
  }
}

/**
 * Compare the inputs of two revisions of one study (either may be null: added or removed).
 * Each changed field is one InputChange naming the links it feeds: a link's own fields feed
 * that link, a site feeds the links that end at it, a radio the links that use it, and the
 * design, climate and terrain sections every link (terrain: those sampling it).
 */
export function compareStudyInputs(before: Study | null, after: Study | null): InputChange[] {
  const out: InputChange[] = [];
  const id = (after ?? before)!.id;
  if (!before || !after) {
    const s = (after ?? before)!;
    const verb = after ? "added" : "removed";
    out.push({ kind: "study", subject: `study ${id}`, field: "", before: before ? id : null, after: after ? id : null, delta: null, unit: "", links: s.links.map((l) => l.id), text: `study ${id} ${verb} (${s.links.length} links)` });
    return out;
  }
  const allLinks = [...new Set([...after.links, ...before.links].map((l) => l.id))];
  const linksWhere = (pred: (l: Link) => boolean) => [...new Set([...after.links.filter(pred), ...before.links.filter(pred)].map((l) => l.id))];
  const add = (kind: InputChangeKind, subject: string, field: string, b: unknown, a: unknown, links: string[], unit = unitOf(field)) => {
    const bv = scalar(b);
    const av = scalar(a);
    const delta = typeof bv === "number" && typeof av === "number" ? av - bv : null;
    const fieldText = field ? ` ${field}` : "";
    out.push({ kind, subject, field, before: bv, after: av, delta, unit, links, text: `${subject}${fieldText}: ${showBeforeAfter(bv, av, unit)}` });
  };
  const fields = (kind: InputChangeKind | ((field: string) => InputChangeKind), subject: string, b: object, a: object, links: string[], prefix = "") => {
    const keys = [...new Set([...Object.keys(b), ...Object.keys(a)])].sort();
    for (const k of keys) {
      const bv = (b as Record<string, unknown>)[k];
      const av = (a as Record<string, unknown>)[k];
      if (canonicalJson(bv) !== canonicalJson(av)) add(typeof kind === "function" ? kind(k) : kind, subject, `${prefix}${k}`, bv, av, links);
    }
  };
  /** Items of a list section matched by id: added, removed, and per-field changes of the rest. */
  const byId = <T extends { id: string }>(section: string, b: T[], a: T[], kindOf: (field: string) => InputChangeKind, linksOf: (id: string) => string[], compare?: (x: T, y: T) => void) => {
    const bm = new Map(b.map((x) => [x.id, x]));
    const am = new Map(a.map((x) => [x.id, x]));
    for (const x of b) if (!am.has(x.id)) out.push({ kind: kindOf(""), subject: `${section} ${x.id}`, field: "", before: x.id, after: null, delta: null, unit: "", links: linksOf(x.id), text: `${section} ${x.id} removed` });
    for (const y of a) {
      const x = bm.get(y.id);
      if (!x) out.push({ kind: kindOf(""), subject: `${section} ${y.id}`, field: "", before: null, after: y.id, delta: null, unit: "", links: linksOf(y.id), text: `${section} ${y.id} added` });
      else if (compare) compare(x, y);
      else fields(kindOf, `${section} ${y.id}`, x, y, linksOf(y.id));
    }
  };

  // Title block.
  fields("meta", "study", before.meta, after.meta, []);

  // Terrain: the section as written, else the bytes of its files.
  const terrainLinks = linksWhere((l) => !l.profile_csv);
  if (canonicalJson(before.terrain) !== canonicalJson(after.terrain)) {
    add("terrain", "terrain", "", before.terrain, after.terrain, terrainLinks, "");
  } else {
    // both over the tiles either revision can reach (a moved site alone changes no tile)
    const extent = [...studyTerrainExtent(before), ...studyTerrainExtent(after)];
    const kb = terrainSourceKey(before.terrain, before.dir, null, extent);
    const ka = terrainSourceKey(after.terrain, after.dir, null, extent);
    if (kb !== ka) out.push({ kind: "terrain", subject: "terrain", field: "contents", before: kb?.slice(0, 12) ?? null, after: ka?.slice(0, 12) ?? null, delta: null, unit: "", links: terrainLinks, text: `terrain: the contents of ${"file" in after.terrain ? after.terrain.file : "the terrain"} changed (sha256 ${kb?.slice(0, 12) ?? "—"} → ${ka?.slice(0, 12) ?? "—"})` });
  }

  // Design and climate: targets are the required availability and clearance criteria.
  const design = (d: Study["design"]) => ({ ...d, k_factors: d.k_factors.map((k) => k.label).join(", "), clearance_criteria: d.clearance_criteria.map((c) => `k ${c.k.label}: ${c.min_f1} F1`).join("; ") });
  const designKind = (f: string): InputChangeKind => (f === "availability_pct" || f === "clearance_criteria" ? "target" : "design");
  fields(designKind, "design", design(before.design), design(after.design), allLinks);
  fields("climate", "climate", before.climate, after.climate, allLinks);
  // The interference section (percentages, external transmitters), as written.
  if (canonicalJson(before.interference ?? null) !== canonicalJson(after.interference ?? null)) {
    fields("interference", "interference", before.interference ?? {}, after.interference ?? {}, allLinks);
  }

  // Radios, sites, links, chains.
  byId("radio", before.radios, after.radios, () => "radio", (r) => linksWhere((l) => l.radio === r));
  byId("site", before.sites, after.sites, () => "site", (s) => linksWhere((l) => l.from.site === s || l.to.site === s), (x, y) => {
    const { lat_deg: la, lon_deg: oa, ...restB } = x;
    const { lat_deg: lb, lon_deg: ob, ...restA } = y;
    const links = linksWhere((l) => l.from.site === y.id || l.to.site === y.id);
    if (la !== lb || oa !== ob) {
      const moved_m = Geodesic.WGS84.Inverse(la, oa, lb, ob).s12 ?? NaN;
      const pos = (lat: number, lon: number) => `${showNumber(lat, 6)}, ${showNumber(lon, 6)}`;
      out.push({ kind: "site-moved", subject: `site ${y.id}`, field: "position", before: pos(la, oa), after: pos(lb, ob), delta: moved_m, unit: "m", links, text: `site ${y.id} moved ${showNumber(moved_m, 1)} m (${pos(la, oa)} → ${pos(lb, ob)})` });
    }
    fields("site", `site ${y.id}`, restB, restA, links);
  });
  byId("link", before.links, after.links, () => "link", (l) => [l], (x, y) => {
    const subject = `link ${y.id}`;
    const linkKind = (f: string): InputChangeKind => (f === "availability_pct" ? "target" : f === "profile_csv" ? "profile" : "link");
    const { index: _i, from: fb, to: tb, ...restB } = x;
    const { index: _j, from: fa, to: ta, ...restA } = y;
    for (const [end, b, a] of [["from", fb, fa], ["to", tb, ta]] as const) {
      const start = out.length;
      fields((f) => (f === "site" ? "link" : "antenna"), subject, b, a, [y.id], `${end}.`);
      for (const c of out.slice(start)) if (c.field === `${end}.antenna_m`) c.text = `${subject}: antenna height at ${a.site} (${end} end) ${showBeforeAfter(b.antenna_m, a.antenna_m, "m")}`;
    }
    fields(linkKind, subject, restB, restA, [y.id]);
    if (x.profile_csv && x.profile_csv === y.profile_csv) {
      const sb = fileSha(before.dir, x.profile_csv);
      const sa = fileSha(after.dir, y.profile_csv);
      if (sb !== sa) out.push({ kind: "profile", subject, field: "profile_csv contents", before: sb?.slice(0, 12) ?? null, after: sa?.slice(0, 12) ?? null, delta: null, unit: "", links: [y.id], text: `${subject}: surveyed profile ${y.profile_csv} changed (sha256 ${sb?.slice(0, 12) ?? "—"} → ${sa?.slice(0, 12) ?? "—"})` });
    }
  });
  byId("chain", before.chains, after.chains, () => "chain", () => [], (x, y) => fields("chain", `chain ${y.id}`, { ...x, links: x.links.join(", ") }, { ...y, links: y.links.join(", ") }, []));
  byId("coverage", before.coverage ?? [], after.coverage ?? [], () => "coverage", () => []);
  return out;
}
