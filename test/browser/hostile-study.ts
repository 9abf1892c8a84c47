import { mkdirSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { stringify } from "yaml";

/** Markup a careless page would run: a script element and an attribute-breaking image. */
export const SCRIPT_TEXT = "<script>alert(1)</script>";
export const IMG_TEXT = `"><img src=x onerror=alert(2)>`;

/**
 * Write a small valid study whose free-text fields (title, client, author, summary, site
 * names and notes, radio name, chain name) carry markup and script text, on synthetic terrain.
 * Returns the study id.
 */
export function writeHostileStudy(studiesRoot: string): string {
  const id = "hostile-names";
  const dir = join(studiesRoot, id);
  mkdirSync(dir, { recursive: true });
  const study = {
    title: `Hostile ${SCRIPT_TEXT} study ${IMG_TEXT}`,
    client: `Client ${IMG_TEXT}`,
    prepared_by: `Author ${SCRIPT_TEXT}`,
    revision: `1${IMG_TEXT}`,
    date: "2026-01-15",
    summary: `Summary with ${SCRIPT_TEXT} and ${IMG_TEXT} and a \\ backslash and "quotes".`,
    terrain: { synthetic: { seed: 99, south_deg: 10.0, west_deg: 20.0, north_deg: 10.08, east_deg: 20.1, spacing_arcsec: 3 } },
    design: { structure_notice_height_m: 30 },
    climate: { rain_rate_mm_h: 42 },
    radios: [{ id: "r1", name: `Radio ${SCRIPT_TEXT}`, frequency_ghz: 6.175, tx_power_dbm: 27, rx_threshold_dbm: -78 }],
    sites: [
      { id: "A", name: `Site ${SCRIPT_TEXT}`, lat_deg: 10.01, lon_deg: 20.01, notes: `note ${IMG_TEXT}` },
      { id: "B", name: `Site ${IMG_TEXT}`, lat_deg: 10.07, lon_deg: 20.09 },
      { id: "C", name: "Plain site", lat_deg: 10.02, lon_deg: 20.085 },
    ],
    links: [
      { id: "a-b", from: { site: "A", antenna_m: 40, gain_dbi: 34 }, to: { site: "B", antenna_m: 35, gain_dbi: 34 }, radio: "r1" },
      { id: "b-c", from: { site: "B", antenna_m: 20, gain_dbi: 34 }, to: { site: "C", antenna_m: 20, gain_dbi: 34 }, radio: "r1" },
    ],
    chains: [{ id: "ab-c", name: `Chain ${SCRIPT_TEXT}`, links: ["a-b", "b-c"] }],
  };
  writeFileSync(join(dir, "study.yaml"), stringify(study));
  return id;
}
