import { bullingtonLoss } from "../physics/bullington.ts";
import { EARTH_RADIUS_M } from "../physics/constants.ts";
import { deltaBullingtonLoss } from "../physics/delta-bullington.ts";
import { deygoutLoss } from "../physics/deygout.ts";
import { DIFFRACTION_VALIDITY } from "../physics/diffraction-validity.ts";
import { epsteinPetersonLoss } from "../physics/epstein-peterson.ts";
import { dryPressureFromTotalHpa, gasPathAttenuation, gasSpecificAttenuation, GAS_P676_VALIDITY } from "../physics/gas-attenuation.ts";
import { groundConstants, type GroundClass } from "../physics/ground-constants.ts";
import { singleKnifeEdgeLoss } from "../physics/knife-edge-path.ts";
import type { DiffractionPath } from "../physics/profile.ts";
import type { Study } from "../study/study.ts";
import { endLosses } from "./end-losses.ts";
import type { LinkProfile } from "./link-profile.ts";
import { linkPerformance } from "./link-performance.ts";
import { linkRemedies } from "./remedies.ts";
import { linkReflection, type HeightGainCurve } from "./link-reflection.ts";
import { rangeWarning } from "./range-warning.ts";
import type { LinkResult } from "./results.ts";

type LinkInput = Study["links"][number];
type RadioInput = Study["radios"][number];

/** Diffraction methods in report order. */
export const DIFFRACTION_METHODS = ["knife_edge", "deygout", "epstein_peterson", "bullington", "delta_bullington"] as const;
export type DiffractionMethod = (typeof DIFFRACTION_METHODS)[number];

/** Profile heights with obstructions added (new array). */
export function obstructedHeights(profile: LinkProfile): Float64Array {
  const h = new Float64Array(profile.d_m.length);
  for (let i = 0; i < h.length; i++) h[i] = profile.terrain_m[i] + profile.obstruction_m[i];
  return h;
}

/** Diffraction loss (dB) over the profile by every method. */
export function diffractionByMethod(path: DiffractionPath, options: { polarization: "h" | "v"; epsilon_r: number; sigma_s_m: number; omega: number }): Record<DiffractionMethod, number> {
  return {
    knife_edge: singleKnifeEdgeLoss(path).loss_db,
    deygout: deygoutLoss(path).loss_db,
    epstein_peterson: epsteinPetersonLoss(path).loss_db,
    bullington: bullingtonLoss(path).Lbull,
    delta_bullington: deltaBullingtonLoss(path, options).Ld,
  };
}

/**
 * Add losses, the link budget and availability to a link's geometry result.
 * Diffraction at the first k of the design set (the median k); gases by P.676 over the path
 * length; the outage against the performance and availability objectives by
 * link-performance.ts (P.530-16 §2.3, §2.4.1, §4, §6.2).
 */
export function linkLosses(study: Study, link: LinkInput, radio: RadioInput, base: LinkResult, profile: LinkProfile): { result: LinkResult; height_gain: HeightGainCurve } {
  const warnings = [...base.warnings];
  const warn = (w: string | null) => {
    if (w && !warnings.includes(w)) warnings.push(w);
  };
  const f = radio.frequency_ghz;
  const D = profile.d_m[profile.d_m.length - 1];
  const d_km = D / 1000;
  const { from, to } = base.ends;
  const k0 = study.design.k_factors[0];
  const ground = groundConstants(study.climate.ground.replace(/_/g, "-") as GroundClass, f);
  const omega = study.climate.ground === "sea_water" || study.climate.ground === "fresh_water" ? 1 : 0;
  const path: DiffractionPath = { d_m: profile.d_m, h_m: obstructedHeights(profile), hts_m: from.antenna_amsl_m, hrs_m: to.antenna_amsl_m, frequency_ghz: f, ae_m: k0.k * EARTH_RADIUS_M };
  const byMethod = diffractionByMethod(path, { polarization: link.polarization, epsilon_r: ground.epsilon_r, sigma_s_m: ground.sigma_s_m, omega });
  const method = study.design.diffraction_method;
  const diffraction = byMethod[method];
  const validity = DIFFRACTION_VALIDITY[method === "knife_edge" ? "single_knife_edge" : method];
  warn(rangeWarning(`Diffraction, ${validity.source}`, "frequency", f, [validity.frequency_ghz.min, validity.frequency_ghz.max], "GHz"));
  warn(rangeWarning(`Diffraction, ${validity.source}`, "path length", d_km, [validity.distance_m.min / 1000, validity.distance_m.max / 1000], "km"));

  // Gases: P.676 Annex 1 at the study's atmosphere, specific attenuation times path length.
  const T_k = study.climate.temperature_c + 273.15;
  const gas = gasSpecificAttenuation({
    frequency_ghz: f,
    pressure_dry_hpa: dryPressureFromTotalHpa(study.climate.pressure_hpa, T_k, study.climate.water_vapour_g_m3),
    temperature_k: T_k,
    water_vapour_density_g_m3: study.climate.water_vapour_g_m3,
  });
  const gases = gasPathAttenuation(gas.gamma_db_km, D);
  warn(rangeWarning(GAS_P676_VALIDITY.method, "frequency", f, GAS_P676_VALIDITY.frequency_ghz, "GHz"));

  // Budget: fixed losses itemised per end (feeder, connectors, waveguide run, dry radome).
  const tx = endLosses(link.from);
  const rx = endLosses(link.to);
  const eirp_dbm = radio.tx_power_dbm - tx.total_db + from.gain_dbi;
  const received_dbm = eirp_dbm - base.losses_db.free_space - diffraction - gases + to.gain_dbi - rx.total_db;
  const fade_margin_db = received_dbm - radio.rx_threshold_dbm - study.design.design_allowance_db;
  const rain_margin_db = fade_margin_db - tx.wet_radome_db - rx.wet_radome_db;

  // Outage against the two objectives (performance per worst month, availability per year).
  const midLat = (study.sites.find((s) => s.id === base.from)!.lat_deg + study.sites.find((s) => s.id === base.to)!.lat_deg) / 2;
  const perf = linkPerformance(study, link, radio, { distance_m: D, he_m: from.antenna_amsl_m, hr_m: to.antenna_amsl_m, mid_lat_deg: midLat, fade_margin_db, rain_margin_db, received_dbm, rx_gain_dbi: to.gain_dbi });
  for (const w of perf.warnings) warn(w);
  const rain001 = perf.rain_0_01pct_db;
  const availability_pct = perf.objectives.availability.achieved_pct;
  const target = perf.objectives.availability.target_pct;
  if (fade_margin_db <= 0) warnings.push(`The median received level is ${(-fade_margin_db).toFixed(1)} dB short of the threshold plus the design allowance: the link does not close.`);
  const capacityMet = perf.adaptive_modulation?.target?.met ?? true;
  const target_met = base.clearance_met && fade_margin_db > 0 && perf.objectives.performance.met && perf.objectives.availability.met && capacityMet;
  const { reflection, height_gain } = linkReflection(study, profile, base.ends, f, link.polarization);
  const result: LinkResult = {
    ...base,
    losses_db: { free_space: base.losses_db.free_space, diffraction, gases, rain_0_01pct: rain001 },
    diffraction_method: method,
    diffraction_db_by_method: byMethod,
    budget: {
      tx_power_dbm: radio.tx_power_dbm,
      tx_feeder_loss_db: tx.feeder_db,
      tx_connector_loss_db: tx.connector_db,
      tx_waveguide_loss_db: tx.waveguide_db,
      tx_radome_loss_db: tx.radome_db,
      tx_gain_dbi: from.gain_dbi,
      eirp_dbm,
      free_space_db: base.losses_db.free_space,
      diffraction_db: diffraction,
      gases_db: gases,
      rx_gain_dbi: to.gain_dbi,
      rx_radome_loss_db: rx.radome_db,
      rx_waveguide_loss_db: rx.waveguide_db,
      rx_connector_loss_db: rx.connector_db,
      rx_feeder_loss_db: rx.feeder_db,
      received_dbm,
      rx_threshold_dbm: radio.rx_threshold_dbm,
      design_allowance_db: study.design.design_allowance_db,
      fade_margin_db,
      wet_radome_loss_db: tx.wet_radome_db + rx.wet_radome_db,
      rain_fade_margin_db: rain_margin_db,
      atpc_range_db: radio.atpc_range_db ?? null,
    },
    availability: perf.availability,
    objectives: perf.objectives,
    dispersive: perf.dispersive,
    diversity: perf.diversity,
    xpd: perf.xpd,
    adaptive_modulation: perf.adaptive_modulation,
    remedies: target_met
      ? []
      : linkRemedies({ clearance_met: base.clearance_met, minimum_heights: base.minimum_heights, antenna_m: { from: from.antenna_m, to: to.antenna_m }, search_max_m: study.design.antenna_search.max_m, fade_margin_db, rain_margin_db, frequency_ghz: f, perf }),
    reflection,
    received_dbm,
    fade_margin_db,
    availability_pct,
    target_availability_pct: target,
    performance_pct: perf.objectives.performance.achieved_pct,
    target_performance_pct: perf.objectives.performance.target_pct,
    target_met,
    warnings,
  };
  return { result, height_gain };
}
