// Benchmark: the wave solution (parabolic equation). The demo study's links, each solved as a
// build solves it (analyzeLink with the wave solution, minus the same link without it), and
// 50 km links at 18 GHz: one across the demo's synthetic terrain, one over the sea. Times in
// seconds (best of 3 after one warm-up run of the JIT on the first link), wall and CPU (user +
// system of this process: on a loaded machine the wall time includes waiting for a core, the
// CPU time does not); bench/run.ts prints them. Only this part: `npm run bench -- --part wave`.
// Then what the links' wave solutions add to a cold build as a user sees it: whole
// `ridgeline build --no-cache` processes of the demo's links (benchWaveBuild).
import { cpSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { availableParallelism, loadavg, tmpdir } from "node:os";
import { join } from "node:path";
import { analyzeLink } from "../src/analysis/analyze-link.ts";
import { openStudyTerrain } from "../src/analysis/analyze-study.ts";
import { linkWave } from "../src/analysis/link-wave.ts";
import { loadStudy } from "../src/study/load-study.ts";
import type { Study } from "../src/study/study.ts";
import { timedBuild } from "./large-study.ts";

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
  return { ...out, ...benchWaveBuild() };
}

const median = (xs: number[]): number => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];
const r2 = (x: number) => Math.round(x * 100) / 100;

/**
 * What the demo's links' wave solutions add to a cold build: whole `ridgeline build --no-cache`
 * processes, with `design.wave_solution: false` ("off") and with it on. Two studies:
 * - the demo's links alone (its coverage maps left out): off, on with `--threads 0` (every
 *   wave solution in the main thread: "one_thread") and on by default (the wave threads, one
 *   per core: "threads");
 * - the whole demo (with its coverage maps, computed while the threads solve the links' waves):
 *   off and on, both by default.
 * Each study's builds run in turn, `rounds` times, the order rotated each round; medians.
 * Added time = median(on) − median(off): of the whole process (wall), of its CPU (all threads),
 * and of the build's own compute phase (its summary line; rendering, which draws the wave
 * figures, comes after it).
 */
export function benchWaveBuild(rounds = 3): Record<string, number | string> {
  const dir = mkdtempSync(join(tmpdir(), "ridgeline-bench-wave-"));
  try {
    const yaml = readFileSync("content/studies/kestrel-vale/study.yaml", "utf8");
    const off = (y: string) => y.replace(/^design:\n/m, "design:\n  wave_solution: false\n");
    const linksOnly = yaml.slice(0, yaml.search(/^coverage:/m)); // coverage is the last section
    const studies = { links_on: linksOnly, links_off: off(linksOnly), demo_on: yaml, demo_off: off(yaml) };
    for (const [name, text] of Object.entries(studies)) {
      cpSync("content/studies/kestrel-vale", join(dir, name, "kestrel-vale"), { recursive: true });
      writeFileSync(join(dir, name, "kestrel-vale", "study.yaml"), text);
    }
    const out: Record<string, number | string> = { build_rounds: rounds, build_cores: availableParallelism() };
    const load_before = loadavg().map(r2);
    const series = (prefix: string, configs: Record<string, [keyof typeof studies, string[]]>, added: string[]) => {
      const names = Object.keys(configs);
      const runs: Record<string, ReturnType<typeof timedBuild>[]> = Object.fromEntries(names.map((n) => [n, []]));
      for (let r = 0; r < rounds; r++) {
        for (let k = 0; k < names.length; k++) {
          const name = names[(k + r) % names.length];
          const [study, extra] = configs[name];
          runs[name].push(timedBuild(["--studies-dir", join(dir, study), "--out", join(dir, `site-${prefix}-${name}`), "--no-cache", ...extra]));
        }
      }
      const m = (name: string, f: keyof ReturnType<typeof timedBuild>) => median(runs[name].map((x) => x[f]));
      for (const name of names) out[`${prefix}_build_${name}_wall_cpu_compute_s`] = `${m(name, "wall_s")} / ${m(name, "cpu_s")} / ${m(name, "compute_s")}`;
      for (const name of added) out[`${prefix}_wave_added_${name}_wall_cpu_compute_s`] = `${r2(m(name, "wall_s") - m("off", "wall_s"))} / ${r2(m(name, "cpu_s") - m("off", "cpu_s"))} / ${r2(m(name, "compute_s") - m("off", "compute_s"))}`;
    };
    series("links_only", { off: ["links_off", []], one_thread: ["links_on", ["--threads", "0"]], threads: ["links_on", []] }, ["one_thread", "threads"]);
    series("demo", { off: ["demo_off", []], on: ["demo_on", []] }, ["on"]);
    out.build_load_average_before_after = `${load_before.join(" ")} / ${loadavg().map(r2).join(" ")}`;
    return out;
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}
