// A study for the job-queue tests: 44 links between 12 sites and two delta-Bullington
// coverages, over a 3″ SRTM-format tile written by writeHgtTile. The ground is invented
// (rolling hills from a fixed formula at S44W031, open ocean), so nothing here is a real place.
import { mkdirSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { writeHgtTile } from "../../src/terrain/write-hgt.ts";

/** Synthetic ground (m): hills on a plain. */
export const hillsM = (lat: number, lon: number): number => 200 + 90 * Math.sin(40 * lat) * Math.cos(33 * lon) + 35 * Math.sin(97 * lat + 1) * Math.sin(83 * lon);

/** Write `<root>/<id>/study.yaml` and its tile `<root>/<id>/dem/S44W031.hgt`; returns the study folder. */
export function writeQueueStudy(root: string, id = "queue-study", options: { radiusKm?: number } = {}): string {
  const dir = join(root, id);
  mkdirSync(join(dir, "dem"), { recursive: true });
  writeHgtTile(join(dir, "dem", "S44W031.hgt"), -44, -31, 3, hillsM);
  const sites = Array.from({ length: 12 }, (_, i) => ({ id: `S${i}`, lat: -43.9 + 0.07 * (i % 4) + 0.013 * i, lon: -30.9 + 0.11 * Math.floor(i / 4) + 0.009 * i }));
  const links: string[] = [];
  for (let a = 0; a < sites.length && links.length < 44; a++) {
    for (let b = a + 1; b < sites.length && links.length < 44; b++) {
      links.push(`  - id: l${String(links.length).padStart(2, "0")}
    from: { site: ${sites[a].id}, antenna_m: ${15 + ((a * 7 + b) % 20)}, gain_dbi: 34, feeder_loss_db: 1 }
    to: { site: ${sites[b].id}, antenna_m: ${15 + ((a + b * 3) % 20)}, gain_dbi: 34, feeder_loss_db: 1 }
    radio: ${links.length % 2 ? "r7" : "r13"}`);
    }
  }
  const radius = options.radiusKm ?? 3;
  const coverage = (cid: string, site: string, h: number) => `  - id: ${cid}
    site: ${site}
    method: delta-bullington
    frequency_ghz: 0.4585
    antenna_m: ${h}
    gain_dbi: 6
    tx_power_dbm: 37
    tx_losses_db: 2
    receiver_m: 3
    receiver_gain_dbi: 6
    radius_km: ${radius}
    thresholds: [-95, -85, -75]`;
  writeFileSync(
    join(dir, "study.yaml"),
    `title: Queue test study (synthetic terrain)
client: Test client
prepared_by: Test engineer
revision: A
date: 2026-03-01
terrain:
  file: dem
design:
  wave_solution: false # the distribution is under test here; the wave solution's bytes are compared in bundle-equivalence
climate:
  rain_rate_mm_h: 35
  sa_m: 40
radios:
  - { id: r7, frequency_ghz: 7.5, tx_power_dbm: 25, rx_threshold_dbm: -78 }
  - { id: r13, frequency_ghz: 13, tx_power_dbm: 22, rx_threshold_dbm: -75 }
sites:
${sites.map((s) => `  - { id: ${s.id}, name: Site ${s.id}, lat_deg: ${s.lat.toFixed(5)}, lon_deg: ${s.lon.toFixed(5)} }`).join("\n")}
links:
${links.join("\n")}
coverage:
${coverage("cov-a", "S0", 30)}
${coverage("cov-b", "S5", 25)}
`,
  );
  return dir;
}
