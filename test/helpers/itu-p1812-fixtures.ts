import { readdirSync, readFileSync } from "node:fs";

/** One terrain profile of the P.1812-6 validation set (test/fixtures/itu/p1812/profiles). */
export interface P1812Profile {
  d_km: Float64Array;
  h_m: Float64Array;
  clutter_code: Uint8Array;
  clutter_height_m: Float64Array;
  zone: Uint8Array;
  /** Tx/Rx coordinates from the profile's header (deg; more digits than the results print) */
  tx_lat_deg: number;
  tx_lon_deg: number;
  rx_lat_deg: number;
  rx_lon_deg: number;
}

/** One validation case: its profile file and the named values of its results file. */
export interface P1812Case {
  name: string;
  profile: string;
  values: Map<string, number>;
}

const dir = new URL("../fixtures/itu/p1812/", import.meta.url);

/** Read a validation profile: the rows between "{Begin of Profile}" and the next "{". */
export function readP1812Profile(file: string): P1812Profile {
  const lines = readFileSync(new URL(`profiles/${file}`, dir), "utf8").split(/\r?\n/);
  const start = lines.findIndex((l) => l.startsWith("{Begin of Profile}"));
  const rows: number[][] = [];
  for (let i = start + 1; i < lines.length; i++) {
    const l = lines[i];
    if (l.startsWith("{")) break;
    const c = l.split(",");
    if (!/^[0-9.]+$/.test(c[0])) continue;
    rows.push(c.slice(0, 5).map(Number));
  }
  const header = (label: string) => Number(lines.find((l) => l.startsWith(label))?.split(",")[1]);
  return {
    tx_lat_deg: header("Tx LAT:"),
    tx_lon_deg: header("Tx LON:"),
    rx_lat_deg: header("Rx LAT:"),
    rx_lon_deg: header("Rx LON:"),
    d_km: Float64Array.from(rows, (r) => r[0]),
    h_m: Float64Array.from(rows, (r) => r[1]),
    clutter_code: Uint8Array.from(rows, (r) => r[2]),
    clutter_height_m: Float64Array.from(rows, (r) => r[3]),
    zone: Uint8Array.from(rows, (r) => r[4]),
  };
}

/** All 36 result files; values keyed by the label before the first comma, trimmed. */
export function readP1812Cases(): P1812Case[] {
  const files = readdirSync(new URL("results/", dir)).filter((f) => f.endsWith(".csv")).sort();
  return files.map((file) => {
    const values = new Map<string, number>();
    for (const line of readFileSync(new URL(`results/${file}`, dir), "utf8").split(/\r?\n/)) {
      const c = line.split(",");
      if (c.length < 4 || c[0].startsWith("#")) continue;
      const key = c[0].trim();
      const v = Number(c[3]);
      // the results print hst/hsr twice (eq. 85/86, then 90a/90b): keep both by reference
      const k = values.has(key) ? `${key} ${c[1].trim()}` : key;
      if (c[3].trim() !== "" && Number.isFinite(v)) values.set(k, v);
    }
    return { name: file.replace(/\.csv$/, ""), profile: `${file.replace(/_\d\.csv$/, "")}.csv`, values };
  });
}
