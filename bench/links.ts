// Benchmark: compute a 200-link study over a 1″ DEM — geometry only, and everything
// (profiles, clearance, all five diffraction methods, gases, rain, multipath, reflection,
// minimum heights). Returns figures in seconds; bench/run.ts prints them.
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { analyzeStudy, openStudyTerrain } from "../src/analysis/analyze-study.ts";
import { pathClearance } from "../src/analysis/clearance.ts";
import { terrainProfile } from "../src/analysis/link-profile.ts";
import { EARTH_RADIUS_M, wavelengthM } from "../src/physics/constants.ts";
import { loadStudy } from "../src/study/load-study.ts";
import { makeBenchStudy } from "./make-study.ts";

export async function benchLinks(): Promise<Record<string, number | string>> {
  const dir = mkdtempSync(join(tmpdir(), "ridgeline-bench-links-"));
  try {
    const file = makeBenchStudy(join(dir, "bench-200"), 200);
    // Geometry only: load, open terrain, sample profiles, clearance at each k.
    const g0 = performance.now();
    const study = loadStudy(file);
    const terrain = await openStudyTerrain(study);
    for (const link of study.links) {
      const a = study.sites.find((s) => s.id === link.from.site)!;
      const b = study.sites.find((s) => s.id === link.to.site)!;
      const { profile } = terrainProfile([a.lat_deg, a.lon_deg], [b.lat_deg, b.lon_deg], terrain);
      const n = profile.d_m.length;
      const radio = study.radios.find((r) => r.id === link.radio)!;
      for (const k of study.design.k_factors) {
        pathClearance({ d_m: profile.d_m, terrain_m: profile.terrain_m, hts_m: profile.terrain_m[0] + link.from.antenna_m, hrs_m: profile.terrain_m[n - 1] + link.to.antenna_m, lambda_m: wavelengthM(radio.frequency_ghz), ae_m: k.k * EARTH_RADIUS_M });
      }
    }
    const geometry_s = (performance.now() - g0) / 1000;
    // Everything, cold (new study object, terrain reopened), then warm.
    const times: number[] = [];
    let samples = 0;
    for (let i = 0; i < 3; i++) {
      const t0 = performance.now();
      const s = loadStudy(file);
      const r = await analyzeStudy(s, { cache: null });
      times.push((performance.now() - t0) / 1000);
      samples = r.result.links.reduce((n, l) => n + l.profile.samples, 0);
    }
    return {
      links: 200,
      dem: "1″ SRTM-format tiles (generated, 2 tiles)",
      profile_samples_total: samples,
      geometry_s: round(geometry_s),
      all_methods_first_s: round(times[0]),
      all_methods_best_s: round(Math.min(...times)),
    };
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

const round = (x: number) => Math.round(x * 1000) / 1000;
