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
// The band check (band-check.ts) solves a link again with θmax three times the grid rule's
// (up to 30°, and Δz = λ/2 there) when the angular filter absorbed most of the field's power or
// the receiver's field lies in the band's upper half; the wider band is then the link's model,
// held under halving. Measured 2026-12-05 (dB, change under halving): the check widens exactly
// pell-kvtw (8.7° → 26.2°: −0.33 → −0.06), grey-lowf (15° → 30°, Δz λ/2: 2.67 → 0.10) and
// mill-aldr (8.1° → 24.3°: 3.11 → 0.12); the other nine keep the rule's band: pell-grey 0.00,
// harr-aldr −0.01, lowf-oxle 0.00, kvtw-lowf 0.01, mill-harr −0.07, mill-thrn −0.08, mill-cobb
// 0.09, harr-kvtw 0.12, kvtw-grey −0.195. The answer itself still moves with θmax on the widened
// links (pell-kvtw 0.12, 0.73, 3.33 dB at 2.5, 3 and 3.5 times the rule's θmax; DEVELOPERS.md).
// Before the check (same code otherwise) those three moved by −0.33, 2.67 and 3.11 dB.
const study = loadStudy("content/studies/kestrel-vale/study.yaml");
study.design.wave_solution = false;
const terrain = await openStudyTerrain(study);

/** The goal (issue #15's acceptance). */
const GOAL_DB = 0.2;
/** The links whose band the check widens (measured; a change here is a change of model). */
const WIDENED = ["mill-aldr", "grey-lowf", "pell-kvtw"];

describe("wave solution: grid halving (Δz and Δx) on the demo's links", () => {
  it.each(study.links.map((l) => [l.id, l] as const))("%s changes by less than 0.2 dB (issue #15's goal), on the band the check chose", (_id, link) => {
    const { result, figure } = analyzeLink(study, link, terrain);
    const args = [study, figure.profile, result.ends, result.frequency_ghz, link.polarization, result.diffraction_db_by_method ?? {}] as const;
    const coarse = linkWave(...args);
    const g = coarse.wave.grid;
    const fine = linkWave(...args, { grid: { dz_m: g.dz_m / 2, dx_m: g.dx_m / 2, max_angle_deg: g.max_angle_deg } });
    expect(coarse.wave.status).toBe("ok");
    expect(fine.wave.status).toBe("ok");
    expect(coarse.wave.band_check?.widened_from_deg !== null, `${link.id}: band widened from ${coarse.wave.band_check?.widened_from_deg}°`).toBe(WIDENED.includes(link.id));
    // both steps are halved, the range step exactly (the path is a whole number of steps)
    expect(fine.wave.grid.dz_m).toBeCloseTo(g.dz_m / 2, 12);
    expect(fine.wave.grid.dx_m).toBeCloseTo(g.dx_m / 2, 9);
    expect(fine.wave.grid.range_steps).toBe(2 * g.range_steps);
    const diff = fine.wave.excess_loss_db! - coarse.wave.excess_loss_db!;
    expect(Math.abs(diff), `${link.id}: ${coarse.wave.excess_loss_db!.toFixed(3)} dB → ${fine.wave.excess_loss_db!.toFixed(3)} dB`).toBeLessThan(GOAL_DB);
  });
});
