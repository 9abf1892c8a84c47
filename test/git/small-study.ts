// A small study for the git, cache and check tests: three links over a 3″ SRTM-format tile
// written by writeHgtTile. The ground is invented (a smooth north–south ridge on a plain over
// open ocean at S42W033), so nothing here describes a real place.
import { mkdirSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { geodesicPath } from "../../src/geo/geodesic-path.ts";
import { writeHgtTile } from "../../src/terrain/write-hgt.ts";

/** Ground (m) of the test tile: a 60 m ridge along lon −32.5° on a 100 m plain, times `scale`. */
export const ridgeM = (scale = 1) => (_lat: number, lon: number): number => 100 + scale * 60 * Math.exp(-(((lon + 32.5) / 0.01) ** 2));

export const SITES = {
  A: [-41.5, -32.56],
  B: [-41.5, -32.44],
  C: [-41.45, -32.45],
} as const;

/** study.yaml of the small study; `antennaAB` is the height of the a-b link's antenna at A. */
export function smallStudyYaml(options: { antennaAB?: number; availability?: number } = {}): string {
  return `title: Small ridge study
client: Test client
prepared_by: Test engineer
revision: A
date: 2026-02-01
terrain:
  file: dem
design:
  availability_pct: ${options.availability ?? 99.9}
climate:
  rain_rate_mm_h: 30
  sa_m: 40
radios:
  - { id: r7, frequency_ghz: 7.5, tx_power_dbm: 25, rx_threshold_dbm: -78 }
sites:
  - { id: A, name: Alpha, lat_deg: ${SITES.A[0]}, lon_deg: ${SITES.A[1]} }
  - { id: B, name: Bravo, lat_deg: ${SITES.B[0]}, lon_deg: ${SITES.B[1]} }
  - { id: C, name: Charlie, lat_deg: ${SITES.C[0]}, lon_deg: ${SITES.C[1]} }
links:
  - id: a-b
    from: { site: A, antenna_m: ${options.antennaAB ?? 10}, gain_dbi: 36, feeder_loss_db: 1 }
    to: { site: B, antenna_m: 10, gain_dbi: 36, feeder_loss_db: 1 }
    radio: r7
  - id: a-c
    from: { site: A, antenna_m: 30, gain_dbi: 36, feeder_loss_db: 1 }
    to: { site: C, antenna_m: 30, gain_dbi: 36, feeder_loss_db: 1 }
    radio: r7
  - id: b-c
    from: { site: B, antenna_m: 20, gain_dbi: 36, feeder_loss_db: 1 }
    to: { site: C, antenna_m: 20, gain_dbi: 36, feeder_loss_db: 1 }
    radio: r7
    profile_csv: b-c.csv
`;
}

/** The surveyed profile of b-c: the tile's ground every 100 m along the geodesic, plus `bump_m` mid-path. */
export function bcProfileCsv(bump_m = 0): string {
  const g = geodesicPath(SITES.B[0], SITES.B[1], SITES.C[0], SITES.C[1], 100);
  const f = ridgeM();
  const rows = Array.from(g.d_m, (d, i) => `${d.toFixed(2)},${(f(g.lat_deg[i], g.lon_deg[i]) + (i === g.d_m.length >> 1 ? bump_m : 0)).toFixed(2)}`);
  return `distance_m,elevation_m\n${rows.join("\n")}\n`;
}

/** Write the tile S42W033.hgt (3″) with the ridge scaled by `scale`. */
export function writeSmallTile(studyDir: string, scale = 1): void {
  mkdirSync(join(studyDir, "dem"), { recursive: true });
  writeHgtTile(join(studyDir, "dem", "S42W033.hgt"), -42, -33, 3, ridgeM(scale));
}

/** Write the whole small study into `<root>/<id>/`; returns the study folder. */
export function writeSmallStudy(root: string, id = "ridge", options: { antennaAB?: number; availability?: number } = {}): string {
  const dir = join(root, id);
  mkdirSync(dir, { recursive: true });
  writeFileSync(join(dir, "study.yaml"), smallStudyYaml(options));
  writeFileSync(join(dir, "b-c.csv"), bcProfileCsv());
  writeSmallTile(dir);
  return dir;
}
