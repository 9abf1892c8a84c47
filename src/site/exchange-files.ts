import { inVerdict, type LinkResult, type StudyResult } from "../analysis/results.ts";

/**
 * Files practitioners exchange, written beside results.json for each study: the sites and the
 * links as CSV (the columns `ridgeline import` reads back, plus results), and sites and links as
 * GeoJSON (RFC 7946) and KML 2.2 (OGC 07-147r2) for GIS. Numbers are written in full (no
 * rounding), so an import of the CSVs gives the same inputs.
 */

/** Columns of sites.csv, in order (documented in README § Files in and out). */
export const SITE_COLUMNS = ["id", "name", "lat_deg", "lon_deg", "ground_m", "notes"] as const;

/** Input columns of links.csv that `ridgeline import` reads, in order. */
export const LINK_INPUT_COLUMNS = [
  "id",
  "from_site",
  "to_site",
  "radio",
  "radio_name",
  "frequency_ghz",
  "tx_power_dbm",
  "rx_threshold_dbm",
  "threshold_ber",
  "polarization",
  "from_antenna_m",
  "from_gain_dbi",
  "from_feeder_loss_db",
  "to_antenna_m",
  "to_gain_dbi",
  "to_feeder_loss_db",
  "availability_pct",
  "design_status",
  "design_reason",
  "go_mhz",
  "return_mhz",
  "bandwidth_mhz",
  "go_polarization",
  "return_polarization",
] as const;

/** Result columns of links.csv (ignored on import). */
export const LINK_RESULT_COLUMNS = ["distance_m", "received_dbm", "fade_margin_db", "result_availability_pct", "target_met"] as const;

/** A CSV field (RFC 4180): quoted when it holds a comma, quote or line break. */
export function csvField(v: unknown): string {
  if (v === null || v === undefined) return "";
  const s = typeof v === "number" ? (Number.isFinite(v) ? String(v) : "") : String(v);
  return /[",\r\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

const row = (cells: unknown[]) => cells.map(csvField).join(",");

/** sites.csv of a study. */
export function sitesCsv(r: StudyResult): string {
  return [row([...SITE_COLUMNS]), ...r.sites.map((s) => row([s.id, s.name, s.lat_deg, s.lon_deg, s.ground_m, s.notes ?? ""]))].join("\n") + "\n";
}

/** links.csv of a study: the inputs `ridgeline import` reads, then the results. */
export function linksCsv(r: StudyResult): string {
  const defaultTarget = (r.assumptions as { availability_pct?: number }).availability_pct;
  // the frequency plan, as the interference analysis read it (one receiver per direction)
  const rx = (l: LinkResult, d: "go" | "return") => r.interference?.receivers.find((x) => x.link === l.id && x.direction === d);
  const pol = (l: LinkResult, d: "go" | "return") => {
    const p = rx(l, d)?.polarization;
    return p && p !== l.polarization ? p : "";
  };
  const line = (l: LinkResult) =>
    row([
      l.id,
      l.from,
      l.to,
      l.radio,
      l.radio_name,
      l.frequency_ghz,
      l.budget?.tx_power_dbm,
      l.budget?.rx_threshold_dbm,
      l.threshold_ber,
      l.polarization,
      l.ends.from.antenna_m,
      l.ends.from.gain_dbi,
      l.ends.from.feeder_loss_db,
      l.ends.to.antenna_m,
      l.ends.to.gain_dbi,
      l.ends.to.feeder_loss_db,
      l.target_availability_pct !== defaultTarget ? l.target_availability_pct : "",
      l.design_status ?? "",
      l.design_reason ?? "",
      rx(l, "go")?.frequency_mhz,
      rx(l, "return")?.frequency_mhz,
      rx(l, "go")?.bandwidth_mhz,
      pol(l, "go"),
      pol(l, "return"),
      l.distance_m,
      l.received_dbm,
      l.fade_margin_db,
      l.availability_pct,
      l.target_met,
    ]);
  return [row([...LINK_INPUT_COLUMNS, ...LINK_RESULT_COLUMNS]), ...r.links.map(line)].join("\n") + "\n";
}

/** "met", "missed", or the design status of a link kept for the record. */
export const linkVerdict = (l: LinkResult): "met" | "missed" | "alternative" | "rejected" => (!inVerdict(l) ? l.design_status! : l.target_met ? "met" : "missed");

/** Sites (points) and links (lines between their sites) as a GeoJSON FeatureCollection, WGS84. */
export function networkGeoJson(r: StudyResult): string {
  const byId = new Map(r.sites.map((s) => [s.id, s]));
  const features = [
    ...r.sites.map((s) => ({ type: "Feature", id: s.id, geometry: { type: "Point", coordinates: [s.lon_deg, s.lat_deg] }, properties: { kind: "site", id: s.id, name: s.name, ground_m: s.ground_m, ...(s.notes ? { notes: s.notes } : {}) } })),
    ...r.links.map((l) => {
      const a = byId.get(l.from)!;
      const b = byId.get(l.to)!;
      return {
        type: "Feature",
        id: l.id,
        geometry: { type: "LineString", coordinates: [[a.lon_deg, a.lat_deg], [b.lon_deg, b.lat_deg]] },
        properties: { kind: "link", id: l.id, from: l.from, to: l.to, frequency_ghz: l.frequency_ghz, distance_m: l.distance_m, fade_margin_db: l.fade_margin_db ?? null, availability_pct: l.availability_pct ?? null, verdict: linkVerdict(l) },
      };
    }),
  ];
  return `${JSON.stringify({ type: "FeatureCollection", name: r.id, features }, null, 1)}\n`;
}

const xml = (s: unknown) => String(s ?? "").replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;");

/** KML colours are aabbggrr. */
const VERDICT_KML: Record<string, string> = { met: "ff2e7d32", missed: "ff2828c6", alternative: "ff9e9e9e", rejected: "ff9e9e9e" };

/** Sites and links as a KML 2.2 document: a folder of site points, a folder of link lines styled by verdict. */
export function networkKml(r: StudyResult): string {
  const byId = new Map(r.sites.map((s) => [s.id, s]));
  const styles = Object.entries(VERDICT_KML)
    .map(([v, c]) => `<Style id="link-${v}"><LineStyle><color>${c}</color><width>3</width></LineStyle></Style>`)
    .join("\n");
  const sites = r.sites.map((s) => `<Placemark id="site-${xml(s.id)}"><name>${xml(s.name)}</name><ExtendedData><Data name="id"><value>${xml(s.id)}</value></Data><Data name="ground_m"><value>${s.ground_m}</value></Data></ExtendedData><Point><coordinates>${s.lon_deg},${s.lat_deg},0</coordinates></Point></Placemark>`).join("\n");
  const links = r.links
    .map((l) => {
      const a = byId.get(l.from)!;
      const b = byId.get(l.to)!;
      const v = linkVerdict(l);
      return `<Placemark id="link-${xml(l.id)}"><name>${xml(l.id)}</name><description>${xml(`${a.name} → ${b.name}; ${v}`)}</description><styleUrl>#link-${v}</styleUrl><LineString><tessellate>1</tessellate><coordinates>${a.lon_deg},${a.lat_deg},0 ${b.lon_deg},${b.lat_deg},0</coordinates></LineString></Placemark>`;
    })
    .join("\n");
  return `<?xml version="1.0" encoding="UTF-8"?>
<kml xmlns="http://www.opengis.net/kml/2.2">
<Document><name>${xml(r.title)}</name>
${styles}
<Folder><name>Sites</name>
${sites}
</Folder>
<Folder><name>Links</name>
${links}
</Folder>
</Document>
</kml>
`;
}
