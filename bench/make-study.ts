// Writes a 200-link benchmark study over a generated 1″ SRTM-format DEM (two tiles).
// The terrain is synthetic: smooth hills and valleys from a fixed formula, not real ground.
import { mkdirSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { mulberry32 } from "../src/terrain/mulberry32.ts";
import { writeHgtTile } from "../src/terrain/write-hgt.ts";

/** Height (m) of the benchmark terrain at a point: rolling hills on a tilted plain. */
export function benchTerrainM(lat: number, lon: number): number {
  return 400 + 120 * (lat - 46) + 180 * Math.sin(23 * lat) * Math.cos(19 * lon) + 60 * Math.sin(71 * lat + 2) * Math.sin(59 * lon);
}

/**
 * Write `<dir>/study.yaml` with `links` links (5–35 km, 6–23 GHz) between `siteCount` sites
 * (default 60; then `coverage`, YAML text of a coverage list, if given), and the
 * DEM tiles N46E007.hgt and N46E008.hgt in `<dir>/dem/`.
 */
export function makeBenchStudy(dir: string, links = 200, options: { interference?: boolean; siteCount?: number; coverage?: string } = {}): string {
  const { siteCount = 60, coverage = "" } = options;
  mkdirSync(join(dir, "dem"), { recursive: true });
  writeHgtTile(join(dir, "dem", "N46E007.hgt"), 46, 7, 1, benchTerrainM);
  writeHgtTile(join(dir, "dem", "N46E008.hgt"), 46, 8, 1, benchTerrainM);
  const rnd = mulberry32(2026);
  const sites = Array.from({ length: siteCount }, (_, i) => ({ id: `S${String(i).padStart(2, "0")}`, lat: 46.1 + 0.8 * rnd(), lon: 7.1 + 1.8 * rnd() }));
  const freqs = [6.175, 7.5, 11.2, 13, 15, 18.7, 23];
  const out: string[] = [];
  let tries = 0;
  while (out.length < links && tries++ < 100_000) {
    const a = sites[Math.floor(rnd() * sites.length)];
    const b = sites[Math.floor(rnd() * sites.length)];
    const dLat = (a.lat - b.lat) * 111_000;
    const dLon = (a.lon - b.lon) * 77_000;
    const d = Math.hypot(dLat, dLon);
    if (a === b || d < 5_000 || d > 35_000) continue;
    const f = freqs[out.length % freqs.length];
    out.push(`  - id: l${String(out.length).padStart(3, "0")}
    from: { site: ${a.id}, antenna_m: ${20 + Math.floor(rnd() * 30)}, gain_dbi: 38, feeder_loss_db: 0.5 }
    to: { site: ${b.id}, antenna_m: ${20 + Math.floor(rnd() * 30)}, gain_dbi: 38, feeder_loss_db: 0.5 }
    radio: r${freqs.indexOf(f)}${options.interference ? `\n    polarization: ${rnd() < 0.5 ? "h" : "v"}\n    frequency_plan: ${benchChannel(f, out.length, sites.indexOf(a) < sites.indexOf(b))}` : ""}`);
  }
  const yaml = `title: Benchmark study (${links} links, generated)
client: Benchmark
prepared_by: bench/make-study.ts
revision: "1"
date: 2026-01-01
terrain:
  file: dem
design:
  wave_solution: false
climate:
  rain_rate_mm_h: 42
  sa_m: 60
radios:
${freqs.map((f, i) => `  - { id: r${i}, frequency_ghz: ${f}, tx_power_dbm: 20, rx_threshold_dbm: -72${options.interference ? ", interference: { co_channel_ci_db: 30, adjacent_ci_db: [{ offset_mhz: 28, ci_db: -3 }, { offset_mhz: 56, ci_db: -30 }], noise_figure_db: 6 }" : ""} }`).join("\n")}
sites:
${sites.map((s) => `  - { id: ${s.id}, name: Site ${s.id}, lat_deg: ${s.lat.toFixed(5)}, lon_deg: ${s.lon.toFixed(5)} }`).join("\n")}
links:
${out.join("\n")}
${options.interference ? "interference:\n  long_term_pct: 20\n" : ""}${coverage}`;
  writeFileSync(join(dir, "study.yaml"), yaml);
  return join(dir, "study.yaml");
}

/**
 * A link's channel for the interference benchmark: one of 8 channel pairs of 28 MHz in the
 * link's band (pairs 28 MHz apart, go and return 300 MHz apart), the lower half sent from the
 * end with the lower site index.
 */
function benchChannel(f_ghz: number, index: number, lowFirst: boolean): string {
  const lo = f_ghz * 1000 + 28 * ((index * 5) % 8);
  const hi = lo + 300;
  return `{ go_mhz: ${lowFirst ? lo : hi}, return_mhz: ${lowFirst ? hi : lo}, bandwidth_mhz: 28 }`;
}
