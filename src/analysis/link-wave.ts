import { EARTH_RADIUS_M, wavelengthM } from "../physics/constants.ts";
import { freeSpaceLossDb } from "../physics/free-space-loss.ts";
import { groundConstants, type GroundClass } from "../physics/ground-constants.ts";
import { beamwidthFromGainDeg } from "../physics/parabolic-equation/aperture-source.ts";
import { PE_WIDENING_WORK_LIMIT_CELL_STEPS, widenedBand, type BandCheck } from "../physics/parabolic-equation/band-check.ts";
import type { RefractivityModel } from "../physics/parabolic-equation/modified-refractivity.ts";
import { PE_MAX_ANGLE_DEG } from "../physics/parabolic-equation/pe-grid.ts";
import { parabolicEquationField, type PeField } from "../physics/parabolic-equation/split-step.ts";
import type { Study } from "../study/study.ts";
import { obstructedHeights } from "./link-losses.ts";
import type { LinkProfile } from "./link-profile.ts";
import type { LinkEndResult } from "./results.ts";

/** The wave solution of a link as results.json carries it (dB, m, °). */
export interface WaveResult {
  method: string;
  status: "ok" | "refused";
  /** why the solution was not computed; "" when it was */
  reason: string;
  k_label: string;
  /** loss at the receiving antenna relative to free space (dB); null when not computed */
  excess_loss_db: number | null;
  /** free-space loss plus excess_loss_db (dB); gases and rain not included; null when not computed */
  basic_transmission_loss_db: number | null;
  /** each diffraction method's loss minus the wave solution's excess loss (dB); empty when not computed */
  difference_db_by_method: Record<string, number>;
  /** transmitting antenna's 3 dB beamwidth as used (°), its aim above the horizontal (°) */
  beamwidth_deg: number;
  aim_deg: number;
  grid: { dz_m: number; dx_m: number; max_angle_deg: number; geometry_angle_deg: number; fft_points: number; range_steps: number; height_m: number; memory_mib: number };
  /** the band check on the grid rule's band (band-check.ts): the share of the field's power the
   * angular filter absorbed, the share of the receiver's spectrum in the band's upper half, and
   * the rule's θmax (°) when the link was solved again with a wider band (null when not; always
   * null with a given grid, which is not widened); the receiver's share is null when the field
   * there is too short to measure; null when not computed */
  band_check: { absorbed_share: number; receiver_upper_share: number | null; widened_from_deg: number | null } | null;
}

/** What the page's field figure is drawn from. */
export interface WaveFigureData {
  field: PeField;
  /** height-gain curve at the receiving end from the wave solution (m above ground, dB) */
  height_gain: { rx_antenna_m: Float64Array; relative_db: Float64Array };
  tx_amsl_m: number;
  rx_amsl_m: number;
  ae_m: number;
  lambda_m: number;
}

/** Field figure resolution kept per link (columns × rows); the PNG is interpolated from it. */
export const WAVE_FIGURE_SIZE = { columns: 480, rows: 200 } as const;

export interface LinkWaveOptions {
  memory_limit_bytes?: number;
  grid?: { dz_m?: number; dx_m?: number; max_angle_deg?: number };
  refractivity?: RefractivityModel;
  height_gain?: { half_range_m: number; step_m: number };
}

/**
 * The wave solution over a link's profile (parabolic equation, src/physics/parabolic-equation):
 * transmitter at the `from` end with a Gaussian beam of its gain's beamwidth aimed at the
 * receiver, the study's ground class (ITU-R P.527 classes through groundConstants) for the
 * link's polarisation, the first design k (or the given refractivity), obstructions as
 * ground. Compared with each diffraction method's loss.
 */
export function linkWave(
  study: Study,
  profile: LinkProfile,
  ends: { from: LinkEndResult; to: LinkEndResult },
  frequency_ghz: number,
  polarization: "h" | "v",
  byMethod: Record<string, number>,
  options: LinkWaveOptions = {},
): { wave: WaveResult; figure: WaveFigureData | null; warnings: string[] } {
  const warnings: string[] = [];
  const k0 = study.design.k_factors[0];
  const g = groundConstants(study.climate.ground.replace(/_/g, "-") as GroundClass, frequency_ghz);
  const n = profile.d_m.length;
  const D = profile.d_m[n - 1];
  const ground_m = obstructedHeights(profile);
  const beam = beamwidthFromGainDeg(ends.from.gain_dbi);
  const refractivity = options.refractivity ?? { kind: "k-factor", k: k0.k };
  const input: Parameters<typeof parabolicEquationField>[0] = {
    d_m: profile.d_m,
    ground_m,
    frequency_ghz,
    tx_antenna_m: ends.from.antenna_amsl_m - ground_m[0],
    rx_antenna_m: ends.to.antenna_amsl_m - ground_m[n - 1],
    polarization,
    ground: { kind: "impedance", epsilon_r: g.epsilon_r, sigma_s_m: g.sigma_s_m },
    refractivity,
    beamwidth_deg: beam,
    figure: WAVE_FIGURE_SIZE,
    height_gain: options.height_gain ?? { half_range_m: 15, step_m: 0.1 },
    grid: options.grid,
    memory_limit_bytes: options.memory_limit_bytes,
  };
  let r = parabolicEquationField(input);
  // the band check (band-check.ts): when the answer on the grid rule's band depends on the
  // band's edge, the link is solved again with a wider band, within a work limit of its own;
  // a given grid is the caller's model and is left as it is
  const check = r.band_check;
  let widened_from_deg: number | null = null;
  /** what the check measured, for a warning */
  const shares = (c: BandCheck) => {
    const rx = Number.isFinite(c.receiver_upper_share) ? `${(100 * c.receiver_upper_share).toFixed(1)} %` : "an unmeasured share";
    return `the angular filter absorbed ${(100 * c.absorbed_share).toFixed(0)} % of the field's power, and ${rx} of the receiver's field lies in the band's upper half`;
  };
  if (!options.grid && r.status === "ok" && check?.too_narrow) {
    const narrowDeg = r.grid.max_angle_deg;
    const wide = widenedBand(narrowDeg, wavelengthM(frequency_ghz));
    const w = parabolicEquationField({ ...input, grid: wide, work_limit_cell_steps: PE_WIDENING_WORK_LIMIT_CELL_STEPS });
    if (w.status === "ok") {
      r = w;
      widened_from_deg = narrowDeg;
      if (w.band_check?.too_narrow) {
        warnings.push(`Wave solution: the answer depends on the edge of the model's band of angles even when widened from ${narrowDeg.toFixed(1)}° to ${w.grid.max_angle_deg.toFixed(1)}° (${shares(w.band_check)}); it is indicative only.`);
      }
    } else {
      const why = shares(check);
      warnings.push(`Wave solution: the answer depends on the edge of the model's band of angles (θmax ${narrowDeg.toFixed(1)}°: ${why}), and the wider band (${wide.max_angle_deg.toFixed(1)}°) was not computed: ${w.reason}; the answer shown is the narrow band's, indicative only.`);
    }
  }
  const fsl = freeSpaceLossDb(D, frequency_ghz);
  const ok = r.status === "ok";
  if (r.status === "refused") warnings.push(`Wave solution not computed: ${r.reason}.`);
  else if (r.status === "bad-input") warnings.push(`Wave solution not computed: ${r.reason}.`);
  if (r.angle_limit_exceeded) {
    warnings.push(`Wave solution: the path needs propagation angles up to ${r.grid.geometry_angle_deg.toFixed(1)}°, beyond the ${PE_MAX_ANGLE_DEG}° limit of the wide-angle parabolic approximation; its result there is indicative only.`);
  }
  const difference: Record<string, number> = {};
  // a refused solution has no values: null and no differences, never NaN (which results would
  // turn into "could not be computed" warnings on top of the refusal's own warning)
  if (ok) for (const [m, v] of Object.entries(byMethod)) difference[m] = v - r.excess_loss_db;
  const grid = r.grid;
  const wave: WaveResult = {
    method: "split-step parabolic equation (wide-angle, impedance ground, terrain-following frame with a staircase on steep ground)",
    status: ok ? "ok" : "refused",
    reason: r.reason,
    k_label: options.refractivity ? "profile" : k0.label,
    excess_loss_db: ok ? r.excess_loss_db : null,
    basic_transmission_loss_db: ok ? fsl + r.excess_loss_db : null,
    difference_db_by_method: difference,
    beamwidth_deg: r.beamwidth_used_deg,
    aim_deg: r.aim_deg,
    grid: {
      dz_m: grid.dz_m,
      dx_m: grid.dx_m,
      max_angle_deg: grid.max_angle_deg,
      geometry_angle_deg: grid.geometry_angle_deg,
      fft_points: 2 * grid.n,
      range_steps: grid.steps,
      height_m: grid.n * grid.dz_m,
      memory_mib: grid.memory_bytes / 1048576,
    },
    band_check: check && ok ? { absorbed_share: check.absorbed_share, receiver_upper_share: Number.isFinite(check.receiver_upper_share) ? check.receiver_upper_share : null, widened_from_deg } : null,
  };
  const ae_m = refractivity.kind === "k-factor" ? refractivity.k * EARTH_RADIUS_M : Infinity;
  const figure = ok && r.field && r.height_gain ? { field: r.field, height_gain: r.height_gain, tx_amsl_m: ends.from.antenna_amsl_m, rx_amsl_m: ends.to.antenna_amsl_m, ae_m, lambda_m: 0.299792458 / frequency_ghz } : null;
  return { wave, figure, warnings };
}
