import { readdirSync, readFileSync } from "node:fs";
import { ZONE_COASTAL, ZONE_INLAND, ZONE_SEA } from "../../src/physics/itu-path-geometry.ts";

/** One terrain profile of the P.452-18 validation set (test/fixtures/itu/p452/profiles). */
export interface P452Profile {
  d_km: Float64Array;
  h_m: Float64Array;
  clutter_height_m: Float64Array;
  /** zones mapped to the project's (P.1812) codes: file 1 coastal → 3, 2 inland → 4, 3 sea → 1 */
  zone: Uint8Array;
}

const dir = new URL("../fixtures/itu/p452/", import.meta.url);
const ZONE_MAP: Record<string, number> = { "1": ZONE_COASTAL, "2": ZONE_INLAND, "3": ZONE_SEA };

/** Read a validation profile (header row, then d, h, R, zone letter, zone number). */
export function readP452Profile(file: string): P452Profile {
  const rows = readFileSync(new URL(`profiles/${file}`, dir), "utf8").split(/\r?\n/).slice(1).filter((l) => l.trim() !== "").map((l) => l.split(","));
  return {
    d_km: Float64Array.from(rows, (r) => Number(r[0])),
    h_m: Float64Array.from(rows, (r) => Number(r[1])),
    clutter_height_m: Float64Array.from(rows, (r) => Number(r[2])),
    zone: Uint8Array.from(rows, (r) => ZONE_MAP[r[4].trim()] ?? NaN),
  };
}

/**
 * All result rows of all 13 result files, as records keyed by the header names, plus
 * `profile_file`: the profile named after the results file (test_result_X → test_profile_X).
 * The published test_result_b2iseac_land_eqdist_no_clutter.csv names
 * test_profile_b2iseac_eqdist_no_clutter.csv in its `profile` column, but its dtm, dlm, ω
 * (all land) are those of test_profile_b2iseac_land_eqdist_no_clutter.csv; the file name is
 * the one to trust.
 */
export function readP452Cases(): Record<string, string>[] {
  const out: Record<string, string>[] = [];
  for (const file of readdirSync(new URL("results/", dir)).filter((f) => f.endsWith(".csv")).sort()) {
    const lines = readFileSync(new URL(`results/${file}`, dir), "utf8").split(/\r?\n/).filter((l) => l.trim() !== "");
    const header = lines[0].split(",").map((h) => h.trim());
    for (const line of lines.slice(1)) {
      const cells = line.split(",");
      const rec: Record<string, string> = {};
      header.forEach((h, i) => (rec[h] = (cells[i] ?? "").trim()));
      rec.profile_file = file.replace(/^test_result_/, "test_profile_");
      out.push(rec);
    }
  }
  return out;
}
