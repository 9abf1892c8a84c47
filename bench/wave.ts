// Benchmark: the wave solution (parabolic equation). The demo study's links, each solved as a
// build solves it (analyzeLink with the wave solution, minus the same link without it), and
// 50 km links at 18 GHz: one across the demo's synthetic terrain, one over the sea. Times in
// seconds (best of 3 after one warm-up run of the JIT on the first link), wall and CPU (user +
// system of this process: on a loaded machine the wall time includes waiting for a core, the
// CPU time does not); bench/run.ts prints them. Only this part: `npm run bench -- --part wave`.
import { analyzeLink } from "../src/analysis/analyze-link.ts";
import { openStudyTerrain } from "../src/analysis/analyze-study.ts";
import { linkWave } from "../src/analysis/link-wave.ts";
import { loadStudy } from "../src/study/load-study.ts";
import type { Study } from "../src/study/study.ts";

/** Wall and CPU seconds of f, the best of n runs each. */
function best(n: number, f: () => void): { wall: number; cpu: number } {
  let wall = Infinity;
  let cpu = Infinity;
  for (let i = 0; i < n; i++) {
    const t0 = performance.now();
    const c0 = process.cpuUsage();
    f();
    const c = process.cpuUsage(c0);
    wall = Math.min(wall, (performance.now() - t0) / 1000);
    cpu = Math.min(cpu, (c.user + c.system) / 1e6);
  }
  return { wall, cpu };
}

export async function benchWave(): Promise<Record<string, number | string>> {
  const study = loadStudy("content/studies/kestrel-vale/study.yaml");
  study.design.wave_solution = false;
  const terrain = await openStudyTerrain(study);
  const prepared = study.links.map((link) => ({ link, ...analyzeLink(study, link, terrain) }));
  const solve = (s: Study, p: (typeof prepared)[number]) => linkWave(s, p.figure.profile, p.result.ends, p.result.frequency_ghz, p.link.polarization, p.result.diffraction_db_by_method ?? {});
  const first = best(1, () => {
    for (const p of prepared) solve(study, p);
  });
  const demo = best(3, () => {
    for (const p of prepared) solve(study, p);
  });
  // 50 km, 18 GHz, 38 dBi dishes on 30 m masts: across the synthetic terrain (SW to NE corner) and over the sea
  const long = (terrainSpec: Study["terrain"]): Study => ({
    ...study,
    terrain: terrainSpec,
    radios: [{ id: "r18", frequency_ghz: 18, tx_power_dbm: 18, rx_threshold_dbm: -72, threshold_ber: "1e-6" }],
    sites: [
      { id: "A", name: "A", lat_deg: -41.28, lon_deg: -32.53 },
      { id: "B", name: "B", lat_deg: -40.97, lon_deg: -32.12 },
    ],
    links: [{ index: 0, id: "long", from: { site: "A", antenna_m: 30, gain_dbi: 38, feeder_loss_db: 0 }, to: { site: "B", antenna_m: 30, gain_dbi: 38, feeder_loss_db: 0 }, radio: "r18", polarization: "v" }],
  });
  const out: Record<string, number | string> = { demo_links: prepared.length, demo_first_run_s: first.wall, demo_first_run_cpu_s: first.cpu, demo_best_of_3_s: demo.wall, demo_best_of_3_cpu_s: demo.cpu };
  for (const [name, spec] of [
    ["land", study.terrain],
    ["sea", { constant_m: 0 }],
  ] as const) {
    const s = long(spec as Study["terrain"]);
    const t = await openStudyTerrain(s);
    const p = { link: s.links[0], ...analyzeLink(s, s.links[0], t) };
    let grid = "";
    const secs = best(3, () => {
      const w = solve(s, p);
      grid = `${w.wave.grid.fft_points} heights × ${w.wave.grid.range_steps} steps`;
    });
    out[`link_50km_18ghz_${name}_s`] = secs.wall;
    out[`link_50km_18ghz_${name}_cpu_s`] = secs.cpu;
    out[`link_50km_18ghz_${name}_grid`] = `${(p.result.distance_m / 1000).toFixed(1)} km, ${grid}`;
  }
  return out;
}
