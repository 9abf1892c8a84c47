import { InputError, type InputProblem } from "./input-error.ts";
import { parseCsvTable } from "./csv-table.ts";

/**
 * Sites, radios and links read from the files practitioners exchange, as study inputs:
 * - sites CSV: `id,name,lat_deg,lon_deg[,ground_m][,notes]`
 * - links CSV: `id,from_site,to_site,frequency_ghz,tx_power_dbm,rx_threshold_dbm,from_antenna_m,
 *   from_gain_dbi,to_antenna_m,to_gain_dbi` and optionally `radio,radio_name,threshold_ber,
 *   polarization,from_feeder_loss_db,to_feeder_loss_db,availability_pct,design_status,design_reason`
 *   and the frequency plan `go_mhz,return_mhz,bandwidth_mhz[,go_polarization,return_polarization]`
 *   (all three or none in a row) (the links.csv a build writes; its result columns are ignored)
 * - GeoJSON (RFC 7946) Point features and KML 2.2 Point placemarks: sites, id from the
 *   `id` property or the name.
 * Every problem names the file, line, column name, value received and the fix.
 */
export interface ImportedNetwork {
  sites: { id: string; name: string; lat_deg: number; lon_deg: number; ground_m?: number; notes?: string }[];
  radios: { id: string; name?: string; frequency_ghz: number; tx_power_dbm: number; rx_threshold_dbm: number; threshold_ber: string }[];
  links: {
    id: string;
    from: { site: string; antenna_m: number; gain_dbi: number; feeder_loss_db: number };
    to: { site: string; antenna_m: number; gain_dbi: number; feeder_loss_db: number };
    radio: string;
    polarization: "h" | "v";
    availability_pct?: number;
    design_status?: "alternative" | "rejected";
    design_reason?: string;
    frequency_plan?: { go_mhz: number; return_mhz: number; bandwidth_mhz: number; go_polarization?: "h" | "v"; return_polarization?: "h" | "v" };
  }[];
  /** Where each part came from, for comments in the written study. */
  sources: string[];
}

const SITE_REQUIRED = ["id", "name", "lat_deg", "lon_deg"];
const LINK_REQUIRED = ["id", "from_site", "to_site", "frequency_ghz", "tx_power_dbm", "rx_threshold_dbm", "from_antenna_m", "from_gain_dbi", "to_antenna_m", "to_gain_dbi"];

/** Which kind of file this is, from its name and first bytes; null when unknown. */
export function exchangeKind(file: string, text: string): "sites-csv" | "links-csv" | "geojson" | "kml" | null {
  if (/\.(geo)?json$/i.test(file)) return "geojson";
  if (/\.kml$/i.test(file)) return "kml";
  if (/\.csv$/i.test(file)) {
    const first = text.replace(/^\uFEFF/, "").split(/\r?\n/, 1)[0] ?? "";
    if (/(^|,)from_site(,|$)/.test(first)) return "links-csv";
    if (/(^|,)lat_deg(,|$)/.test(first)) return "sites-csv";
  }
  return null;
}

/** Read the given files (name and text) into one network; throws InputError listing every problem. */
export function importNetwork(files: { file: string; text: string }[]): ImportedNetwork {
  const out: ImportedNetwork = { sites: [], radios: [], links: [], sources: [] };
  const problems: InputProblem[] = [];
  const bad = (file: string, line: number | undefined, field: string, received: string, expected: string) => problems.push({ file, line, field, received, expected });
  for (const { file, text } of files) {
    const kind = exchangeKind(file, text);
    if (!kind) {
      bad(file, 1, "", "a file of unknown kind", "a .csv whose header has lat_deg (sites) or from_site (links), a .geojson or a .kml");
      continue;
    }
    out.sources.push(file);
    if (kind === "geojson" || kind === "kml") {
      for (const p of kind === "geojson" ? geoJsonPoints(file, text, bad) : kmlPoints(text)) out.sites.push(p);
      continue;
    }
    const table = parseCsvTable(text);
    if (!table) {
      bad(file, undefined, "", "a quoted field that never ends", 'close every " with another "');
      continue;
    }
    const required = kind === "sites-csv" ? SITE_REQUIRED : LINK_REQUIRED;
    const missing = required.filter((c) => !table.header.includes(c));
    if (missing.length) {
      bad(file, 1, "header", table.header.join(","), `the columns ${missing.join(", ")} as well`);
      continue;
    }
    for (const { line, cells } of table.rows) {
      const num = (col: string, optional = false): number | undefined => {
        const v = cells[col] ?? "";
        if (v === "" && optional) return undefined;
        const n = Number(v);
        if (v === "" || !Number.isFinite(n)) bad(file, line, col, showCell(v), "a number");
        return n;
      };
      if (kind === "sites-csv") {
        out.sites.push({
          id: cells.id,
          name: cells.name,
          lat_deg: num("lat_deg")!,
          lon_deg: num("lon_deg")!,
          ...(cells.ground_m ? { ground_m: num("ground_m", true) } : {}),
          ...(cells.notes ? { notes: cells.notes } : {}),
        });
      } else {
        const f = num("frequency_ghz")!;
        const tx = num("tx_power_dbm")!;
        const th = num("rx_threshold_dbm")!;
        const ber = cells.threshold_ber || "1e-6";
        const radioId = cells.radio || `r${out.radios.length + 1}`;
        const existing = out.radios.find((r) => r.id === radioId);
        if (!existing) out.radios.push({ id: radioId, ...(cells.radio_name ? { name: cells.radio_name } : {}), frequency_ghz: f, tx_power_dbm: tx, rx_threshold_dbm: th, threshold_ber: ber });
        else if (existing.frequency_ghz !== f || existing.tx_power_dbm !== tx || existing.rx_threshold_dbm !== th)
          bad(file, line, "radio", showCell(radioId), `one frequency, power and threshold per radio id (${radioId} was first given ${existing.frequency_ghz} GHz, ${existing.tx_power_dbm} dBm, ${existing.rx_threshold_dbm} dBm); give this row another radio id`);
        const pol = (cells.polarization || "v").toLowerCase();
        if (pol !== "h" && pol !== "v") bad(file, line, "polarization", showCell(cells.polarization), "h or v");
        const status = cells.design_status;
        if (status && status !== "alternative" && status !== "rejected") bad(file, line, "design_status", showCell(status), "alternative, rejected or empty");
        const planCols = ["go_mhz", "return_mhz", "bandwidth_mhz"] as const;
        const given = planCols.filter((c) => cells[c]);
        if (given.length && given.length < 3) bad(file, line, planCols.find((c) => !cells[c])!, "an empty cell", `a number: give go_mhz, return_mhz and bandwidth_mhz together, or none of them`);
        const planPol = (c: "go_polarization" | "return_polarization") => {
          const v = (cells[c] ?? "").toLowerCase();
          if (v && v !== "h" && v !== "v") bad(file, line, c, showCell(cells[c]), "h, v or empty (the link's polarization)");
          return v === "h" || v === "v" ? { [c]: v as "h" | "v" } : {};
        };
        const plan = given.length === 3 ? { frequency_plan: { go_mhz: num("go_mhz")!, return_mhz: num("return_mhz")!, bandwidth_mhz: num("bandwidth_mhz")!, ...planPol("go_polarization"), ...planPol("return_polarization") } } : {};
        out.links.push({
          id: cells.id,
          from: { site: cells.from_site, antenna_m: num("from_antenna_m")!, gain_dbi: num("from_gain_dbi")!, feeder_loss_db: num("from_feeder_loss_db", true) ?? 0 },
          to: { site: cells.to_site, antenna_m: num("to_antenna_m")!, gain_dbi: num("to_gain_dbi")!, feeder_loss_db: num("to_feeder_loss_db", true) ?? 0 },
          radio: radioId,
          polarization: pol === "h" ? "h" : "v",
          ...(cells.availability_pct ? { availability_pct: num("availability_pct", true) } : {}),
          ...(status ? { design_status: status as "alternative" | "rejected", ...(cells.design_reason ? { design_reason: cells.design_reason } : {}) } : {}),
          ...plan,
        });
      }
    }
  }
  if (problems.length) throw new InputError(problems);
  return out;
}

const showCell = (v: string | undefined) => (v === undefined || v === "" ? "an empty cell" : JSON.stringify(v));

type Bad = (file: string, line: number | undefined, field: string, received: string, expected: string) => void;

function geoJsonPoints(file: string, text: string, bad: Bad): ImportedNetwork["sites"] {
  let doc: { features?: { geometry?: { type?: string; coordinates?: number[] }; properties?: Record<string, unknown>; id?: unknown }[] };
  try {
    doc = JSON.parse(text);
  } catch (e) {
    bad(file, undefined, "", "text that is not JSON", `a GeoJSON FeatureCollection (${(e as Error).message})`);
    return [];
  }
  const out: ImportedNetwork["sites"] = [];
  (doc.features ?? []).forEach((f, i) => {
    if (f.geometry?.type !== "Point") return;
    const [lon, lat] = f.geometry.coordinates ?? [];
    const p = f.properties ?? {};
    const name = String(p.name ?? p.id ?? f.id ?? `site ${i + 1}`);
    const id = String(p.id ?? f.id ?? slug(name));
    if (!Number.isFinite(lat) || !Number.isFinite(lon)) bad(file, undefined, `features[${i}].geometry.coordinates`, JSON.stringify(f.geometry.coordinates), "[longitude, latitude] in decimal degrees");
    out.push({ id, name, lat_deg: lat, lon_deg: lon, ...(typeof p.ground_m === "number" ? { ground_m: p.ground_m } : {}) });
  });
  return out;
}

function kmlPoints(text: string): ImportedNetwork["sites"] {
  const out: ImportedNetwork["sites"] = [];
  const unxml = (s: string) => s.replace(/&lt;/g, "<").replace(/&gt;/g, ">").replace(/&quot;/g, '"').replace(/&amp;/g, "&").trim();
  for (const m of text.matchAll(/<Placemark\b[^>]*>([\s\S]*?)<\/Placemark>/g)) {
    const body = m[1];
    const coords = /<Point>[\s\S]*?<coordinates>\s*([^<]+?)\s*<\/coordinates>/.exec(body);
    if (!coords) continue;
    const [lon, lat] = coords[1].split(",").map(Number);
    const name = unxml(/<name>([\s\S]*?)<\/name>/.exec(body)?.[1] ?? `site ${out.length + 1}`);
    const data = (key: string) => new RegExp(`<Data name="${key}">\\s*<value>([\\s\\S]*?)</value>`).exec(body)?.[1];
    const id = data("id");
    const ground = Number(data("ground_m"));
    out.push({ id: id ? unxml(id) : slug(name), name, lat_deg: lat, lon_deg: lon, ...(data("ground_m") !== undefined && Number.isFinite(ground) ? { ground_m: ground } : {}) });
  }
  return out;
}

/** An id from a name: letters, digits, '-', '_' and '.' only. */
const slug = (name: string) => name.trim().replace(/[^A-Za-z0-9_.-]+/g, "-").replace(/^-+|-+$/g, "") || "site";
