import type { Study } from "../study/study.ts";
import type { LinkFigureData } from "./analyze-link.ts";
import { linkWave } from "./link-wave.ts";
import type { LinkProfile } from "./link-profile.ts";
import type { LinkEndResult, LinkResult } from "./results.ts";

/**
 * What a link's wave solution is computed from: linkWave's arguments beside the study. Plain
 * data (typed arrays in the profile), so it can be posted to a worker thread (wave-pool.ts).
 */
export interface LinkWaveJob {
  profile: LinkProfile;
  ends: { from: LinkEndResult; to: LinkEndResult };
  frequency_ghz: number;
  polarization: "h" | "v";
  byMethod: Record<string, number>;
}

/** A link's wave solution as linkWave returns it. */
export type LinkWaveOutcome = ReturnType<typeof linkWave>;

/** Solve a link's wave job: linkWave with the study's settings, wherever it runs (this thread or a wave-pool thread). */
export function solveLinkWave(study: Study, job: LinkWaveJob): LinkWaveOutcome {
  return linkWave(study, job.profile, job.ends, job.frequency_ghz, job.polarization, job.byMethod);
}

/**
 * Put a link's wave solution into its result and figure data: the result's `wave` entry, its
 * warnings after the link's others, the figure's field. The same whether the solution was
 * computed here or on a thread, so the result's keys and warnings come in the same order.
 */
export function applyLinkWave(result: LinkResult, figure: LinkFigureData, w: LinkWaveOutcome): void {
  result.wave = w.wave;
  result.warnings.push(...w.warnings);
  if (w.figure) figure.wave = w.figure;
}
