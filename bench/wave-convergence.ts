// Grid halving of the wave solution on the demo's links, for whoever tunes the grid rule
// (src/physics/parabolic-equation/pe-grid.ts): each link on a grid and on Δz/2, Δx/2 with θmax
// held, as test/reference/parabolic-equation-convergence.test.ts does, printed as a table with
// the CPU time of the first grid's solution. Not part of `npm run bench` (a minute on the default
// grids, several with wide angles). Without options each link's band is the one the band check
// chose (linkWave); with --max-angle or --refine the grid is given and not checked.
// Run: `node --import tsx bench/wave-convergence.ts [options]`
//   --max-angle DEG             θmax on every link (its own Δz = λ/(2 sin θmax), the frame's slope
//                               limit with it), or id=DEG,id=DEG for some links only
//   --refine A/B                the first grid's Δz divided by A and Δx by B (default 1/1)
//   --links id,id               only these links
import { analyzeLink } from "../src/analysis/analyze-link.ts";
import { openStudyTerrain } from "../src/analysis/analyze-study.ts";
import { linkWave } from "../src/analysis/link-wave.ts";
import { loadStudy } from "../src/study/load-study.ts";

const args = process.argv.slice(2);
const option = (name: string): string | undefined => {
  const i = args.indexOf(name);
  return i >= 0 ? args[i + 1] : undefined;
};
const angleArg = option("--max-angle");
const angleFor = (id: string): number | undefined => {
  if (angleArg === undefined) return undefined;
  if (!angleArg.includes("=")) return Number(angleArg);
  const hit = angleArg.split(",").find((s) => s.split("=")[0] === id);
  return hit ? Number(hit.split("=")[1]) : undefined;
};
const [refineZ, refineX] = (option("--refine") ?? "1/1").split("/").map(Number);
const only = option("--links")?.split(",");

const study = loadStudy("content/studies/kestrel-vale/study.yaml");
study.design.wave_solution = false;
const terrain = await openStudyTerrain(study);
const cpu = (f: () => void): number => {
  const c0 = process.cpuUsage();
  f();
  const c = process.cpuUsage(c0);
  return (c.user + c.system) / 1e6;
};
// "rule θ°": the grid rule's θmax when the band check (band-check.ts) widened it, else "-"
console.log("link        GHz    θmax°  rule θ°    Δz m   Δx m  heights  steps   first dB  halved dB  change dB  CPU s");
for (const link of study.links) {
  if (only && !only.includes(link.id)) continue;
  const { result, figure } = analyzeLink(study, link, terrain);
  const solve = (grid?: { dz_m?: number; dx_m?: number; max_angle_deg?: number }) =>
    linkWave(study, figure.profile, result.ends, result.frequency_ghz, link.polarization, result.diffraction_db_by_method ?? {}, grid ? { grid } : {});
  const angle = angleFor(link.id);
  // the grid the rule (or --max-angle) gives, refined by --refine; the CPU time is the solution's on that grid
  let first!: ReturnType<typeof solve>;
  let seconds = cpu(() => {
    first = solve(angle === undefined ? undefined : { max_angle_deg: angle });
  });
  if (refineZ !== 1 || refineX !== 1) {
    const g0 = first.wave.grid;
    seconds = cpu(() => {
      first = solve({ dz_m: g0.dz_m / refineZ, dx_m: g0.dx_m / refineX, max_angle_deg: g0.max_angle_deg });
    });
  }
  const g = first.wave.grid;
  const halved = solve({ dz_m: g.dz_m / 2, dx_m: g.dx_m / 2, max_angle_deg: g.max_angle_deg });
  const a = first.wave.excess_loss_db;
  const b = halved.wave.excess_loss_db;
  const f = (v: number | null, w: number) => (v === null ? "refused" : v.toFixed(2)).padStart(w);
  console.log(
    `${link.id.padEnd(10)} ${result.frequency_ghz.toFixed(2).padStart(5)} ${g.max_angle_deg.toFixed(2).padStart(8)} ${(first.wave.band_check?.widened_from_deg?.toFixed(2) ?? "-").padStart(8)} ${g.dz_m.toFixed(3).padStart(7)} ${g.dx_m.toFixed(1).padStart(6)} ${String(g.fft_points).padStart(8)} ${String(g.range_steps).padStart(6)} ${f(a, 10)} ${f(b, 10)} ${f(a !== null && b !== null ? b - a : null, 10)} ${seconds.toFixed(2).padStart(6)}`,
  );
}
