import { mkdirSync, writeFileSync } from "node:fs";
import { join } from "node:path";

/**
 * The opening of a small test study: metadata, terrain (a YAML mapping body such as
 * "constant_m: 50" or "file: dem.tif") and one 6 GHz radio `r1`. Sites, links and coverage follow.
 */
export function studyHead(title: string, terrain: string, client = "Test client", preparedBy = "Test engineer"): string {
  return `title: ${title}
client: ${client}
prepared_by: ${preparedBy}
revision: A
date: 2026-01-15
terrain:
  ${terrain}
radios:
  - id: r1
    frequency_ghz: 6
    tx_power_dbm: 25
    rx_threshold_dbm: -75
`;
}

/** A small valid study (constant terrain) as YAML text; tests edit it to break it. */
export const TINY_STUDY = `${studyHead("Tiny test study", "constant_m: 50")}sites:
  - id: A
    name: Alpha
    lat_deg: -33.4500
    lon_deg: -70.6600
  - id: B
    name: Bravo
    lat_deg: -33.5000
    lon_deg: -70.6000
links:
  - id: a-b
    from: { site: A, antenna_m: 30, gain_dbi: 34, feeder_loss_db: 1 }
    to: { site: B, antenna_m: 30, gain_dbi: 34, feeder_loss_db: 1 }
    radio: r1
`;

/** Write `study.yaml` (and extra files) into `<root>/<id>/`; returns the study file path. */
export function writeStudy(root: string, id: string, yaml: string, extra: Record<string, string | Buffer> = {}): string {
  const dir = join(root, id);
  mkdirSync(dir, { recursive: true });
  writeFileSync(join(dir, "study.yaml"), yaml);
  for (const [name, content] of Object.entries(extra)) writeFileSync(join(dir, name), content);
  return join(dir, "study.yaml");
}
