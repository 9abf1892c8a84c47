import { annualPercentFromWorstMonth, worstMonthToAnnualDeltaGDb } from "../physics/worst-month-to-annual.ts";
import { formatSmall } from "../format/quantity.ts";
import { linkAvailabilityPct } from "../physics/availability.ts";
import { bullingtonLoss } from "../physics/bullington.ts";
import { EARTH_RADIUS_M } from "../physics/constants.ts";
import { deltaBullingtonLoss } from "../physics/delta-bullington.ts";
import { deygoutLoss } from "../physics/deygout.ts";
import { DIFFRACTION_VALIDITY } from "../physics/diffraction-validity.ts";
import { epsteinPetersonLoss } from "../physics/epstein-peterson.ts";
import { dryPressureFromTotalHpa, gasPathAttenuation, gasSpecificAttenuation, GAS_P676_VALIDITY } from "../physics/gas-attenuation.ts";
import { groundConstants, type GroundClass } from "../physics/ground-constants.ts";
import { singleKnifeEdgeLoss } from "../physics/knife-edge-path.ts";
import { multipathOutagePercent, MULTIPATH_P530_VALIDITY } from "../physics/multipath-fading.ts";
import type { DiffractionPath } from "../physics/profile.ts";
import { rainAttenuation001, rainOutagePercent, RAIN_P530_VALIDITY } from "../physics/rain-path-attenuation.ts";
import { POLARISATION_TILT_DEG } from "../physics/rain-specific-attenuation.ts";
import type { Study } from "../study/study.ts";
import type { LinkProfile } from "./link-profile.ts";
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
 * length; rain by P.838-3 and P.530-16 §2.4.1; multipath by P.530-16 §2.3 converted from the
 * worst month to the average year (§2.3.4); unavailability = multipath + rain (common practice).
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

  // Budget.
  const eirp_dbm = radio.tx_power_dbm - from.feeder_loss_db + from.gain_dbi;
  const received_dbm = eirp_dbm - base.losses_db.free_space - diffraction - gases + to.gain_dbi - to.feeder_loss_db;
  const fade_margin_db = received_dbm - radio.rx_threshold_dbm - study.design.field_margin_db;

  // Rain.
  const R = study.climate.rain_rate_mm_h;
  let rain001: number | null = null;
  let rain_outage_pct = 0;
  if (R === undefined) {
    warnings.push("No rain rate R0.01 in the study (climate.rain_rate_mm_h): the budget has no rain term.");
  } else {
    const r = rainAttenuation001({ distance_m: D, frequency_ghz: f, rain_rate_001_mm_h: R, elevation_deg: 0, tilt_deg: link.polarization === "h" ? POLARISATION_TILT_DEG.horizontal : POLARISATION_TILT_DEG.vertical });
    rain001 = r.A001_db;
    const outage = rainOutagePercent(fade_margin_db, r.A001_db, f);
    rain_outage_pct = fade_margin_db <= 0 ? 100 : outage.outage_pct;
    warn(rangeWarning(RAIN_P530_VALIDITY.method, "frequency", f, RAIN_P530_VALIDITY.frequency_ghz, "GHz"));
    warn(rangeWarning(RAIN_P530_VALIDITY.method, "path length", d_km, RAIN_P530_VALIDITY.distance_km, "km"));
    if (outage.flag !== "within_range" && fade_margin_db > 0) warn(`${RAIN_P530_VALIDITY.method}: the rain outage (${formatSmall(outage.outage_pct, 3)} %) lies outside the 0.001–1 % the method covers (${outage.flag.replace(/_/g, " ")}).`);
  }

  // Multipath, worst month → average year.
  const mp = multipathOutagePercent({ distance_m: D, frequency_ghz: f, he_m: from.antenna_amsl_m, hr_m: to.antenna_amsl_m, dN1: study.climate.dn1, sa_m: study.climate.sa_m, fade_margin_db: Math.max(fade_margin_db, 0) });
  const midLat = (study.sites.find((s) => s.id === base.from)!.lat_deg + study.sites.find((s) => s.id === base.to)!.lat_deg) / 2;
  const dG = worstMonthToAnnualDeltaGDb(midLat, d_km, mp.epsilon_p_mrad);
  const multipath_outage_pct = fade_margin_db <= 0 ? 100 : annualPercentFromWorstMonth(mp.pw_pct, dG);
  const V = MULTIPATH_P530_VALIDITY;
  warn(rangeWarning(V.method, "frequency", f, [Math.max(V.frequency_ghz[0], V.frequency_min_ghz_km / d_km), V.frequency_ghz[1]], "GHz"));
  warn(rangeWarning(V.method, "path length", d_km, V.distance_km, "km"));
  if (study.climate.sa_m === undefined) warnings.push("No terrain roughness sa (climate.sa_m): multipath uses the quick-planning geoclimatic factor of P.530-16 §2.3.1.");

  const availability_pct = Math.max(0, Math.min(100, linkAvailabilityPct({ multipath_outage_pct, rain_outage_pct })));
  const target = link.availability_pct ?? study.design.availability_pct;
  if (fade_margin_db <= 0) warnings.push(`The median received level is ${(-fade_margin_db).toFixed(1)} dB short of the threshold plus field margin: the link does not close.`);
  const target_met = base.clearance_met && fade_margin_db > 0 && availability_pct >= target;
  const { reflection, height_gain } = linkReflection(study, profile, base.ends, f, link.polarization);
  const result: LinkResult = {
    ...base,
    losses_db: { free_space: base.losses_db.free_space, diffraction, gases, rain_0_01pct: rain001 },
    diffraction_method: method,
    diffraction_db_by_method: byMethod,
    budget: {
      tx_power_dbm: radio.tx_power_dbm,
      tx_feeder_loss_db: from.feeder_loss_db,
      tx_gain_dbi: from.gain_dbi,
      eirp_dbm,
      free_space_db: base.losses_db.free_space,
      diffraction_db: diffraction,
      gases_db: gases,
      rx_gain_dbi: to.gain_dbi,
      rx_feeder_loss_db: to.feeder_loss_db,
      received_dbm,
      rx_threshold_dbm: radio.rx_threshold_dbm,
      field_margin_db: study.design.field_margin_db,
      fade_margin_db,
    },
    availability: {
      multipath_worst_month_pct: mp.pw_pct,
      multipath_annual_pct: multipath_outage_pct,
      rain_annual_pct: rain_outage_pct,
      unavailability_pct: 100 - availability_pct,
      geoclimatic_k: mp.K,
      path_inclination_mrad: mp.epsilon_p_mrad,
    },
    reflection,
    received_dbm,
    fade_margin_db,
    availability_pct,
    target_availability_pct: target,
    target_met,
    warnings,
  };
  return { result, height_gain };
}
