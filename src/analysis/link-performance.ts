import { modeAtAvailability, modeTimeShares } from "../physics/adaptive-modulation.ts";
import { wavelengthM } from "../physics/constants.ts";
import { DISPERSIVE_P530_VALIDITY, selectiveOutageProbability, type RadioSignature } from "../physics/dispersive-fading.ts";
import { diversityOutageProbability, DIVERSITY_P530_VALIDITY, frequencyDiversityImprovement, spaceDiversityImprovement } from "../physics/diversity.ts";
import { fadeDepthExceedancePercent, multipathOccurrenceFactor, MULTIPATH_P530_VALIDITY } from "../physics/multipath-fading.ts";
import { rainAttenuation001, rainOutagePercent, RAIN_P530_VALIDITY } from "../physics/rain-path-attenuation.ts";
import { POLARISATION_TILT_DEG } from "../physics/rain-specific-attenuation.ts";
import { annualFadeExceedancePercent, annualPercentFromWorstMonth, worstMonthToAnnualDeltaGDb } from "../physics/worst-month-to-annual.ts";
import { xpdOutageClearAir, xpdOutagePrecipitation, XPD_P530_VALIDITY } from "../physics/xpd-outage.ts";
import { fieldPath, InputError } from "../study/input-error.ts";
import type { Study } from "../study/study.ts";
import { rangeWarning } from "./range-warning.ts";

type LinkInput = Study["links"][number];
type RadioInput = Study["radios"][number];
type SignatureInput = NonNullable<RadioInput["signature"]>;

/** Performance objective's default: percentage of the worst month free of short-fade outage (common-practice choice; set the operator's own). */
export const DEFAULT_PERFORMANCE_PCT = 99.995;

/** How the rain outage relates to the range of ITU-R P.530-16 §2.4.1 (0.001–1 % of the year). */
export type RainRange = "within" | "below_0_001_pct" | "below_method_range" | "above_1_pct" | "link_does_not_close" | "no_rain_rate";

export interface ObjectiveResult {
  /** Outage counted against this objective (%): of the worst month for performance, of the year for availability. */
  outage_pct: number;
  /** 100 − outage (%). */
  achieved_pct: number;
  target_pct: number;
  met: boolean;
}

export interface ModeRow {
  name: string;
  capacity_mbps: number;
  rx_threshold_dbm: number;
  /** Fade margin to this mode's threshold (dB). */
  margin_db: number;
  /** Percentage of the year spent in this mode (%). */
  time_share_pct: number;
  /** Percentage of the year this mode or a better one is available (%). */
  available_pct: number;
  /** Dispersive outage of this mode's signature, worst month (%), or null without one. */
  dispersive_worst_month_pct: number | null;
}

export interface AdaptiveModulationResult {
  modes: ModeRow[];
  /** Below the lowest mode (%/year). */
  outage_pct: number;
  /** Capacity available for the link's availability target, or 0 when no mode is (Mbit/s). */
  capacity_at_availability_mbps: number;
  mode_at_availability: string | null;
  availability_pct: number;
  /** The study's capacity target and its verdict, or null without one. */
  target: { capacity_mbps: number; mode: string | null; availability_pct: number; capacity_there_mbps: number; met: boolean } | null;
  method: string;
}

export interface DiversityResult {
  kind: "space" | "frequency";
  /** Vertical spacing (m) or channel separation (MHz) the study gives. */
  spacing: number;
  spacing_unit: "m" | "MHz";
  /** Non-selective improvement factor I_ns at the flat fade margin. */
  improvement: number;
  /** Outage without and with diversity, flat + dispersive, worst month (%). */
  outage_without_pct: number;
  outage_with_pct: number;
  /** Space diversity: improvement against vertical spacing over the method's range (figure series). */
  curve: { spacing_m: number[]; improvement: number[] } | null;
  /** Second antenna's gain difference |G1 − G2| (dB), space diversity. */
  gain_difference_db: number | null;
  method: string;
}

export interface LinkPerformance {
  /** Record published as LinkResult.availability (kept keys plus the new ones). */
  availability: Record<string, number | string | null>;
  objectives: { performance: ObjectiveResult; availability: ObjectiveResult; combined: { unavailability_pct: number; availability_pct: number; note: string } };
  dispersive: { signature: SignatureInput; tau_m_ns: number; eta: number; outage_worst_month_pct: number; method: string } | null;
  diversity: DiversityResult | null;
  xpd: { clear_air_worst_month_pct: number; rain_annual_pct: number; margin_db: number; xpd_g_db: number; xpif_db: number; c0_i_db: number; method: string } | null;
  adaptive_modulation: AdaptiveModulationResult | null;
  rain_0_01pct_db: number | null;
  warnings: string[];
}

const sigGhz = (s: SignatureInput): RadioSignature => ({ width_ghz: s.width_mhz / 1000, depth_minimum_phase_db: s.depth_minimum_phase_db, depth_non_minimum_phase_db: s.depth_non_minimum_phase_db, reference_delay_ns: s.reference_delay_ns });

/**
 * Outage of a link against its two objectives (ITU-R P.530-16 §7 split):
 * performance — short fades counted per average worst month: flat multipath (§2.3.1–2.3.2),
 * dispersive fading (§2.3.6) when the radio has a signature, with diversity (§6.2) when the
 * link has it, and clear-air XPD (§4.1) on co-channel dual-polarised links;
 * availability — long outages counted per average year: rain (§2.4.1) and rain
 * depolarisation (§4.2), and the whole year when the median level is below threshold.
 * The combined figure (every mechanism per year, worst-month terms converted by §2.3.4) is
 * kept for comparison, labelled as such.
 */
export function linkPerformance(
  study: Study,
  link: LinkInput,
  radio: RadioInput,
  p: { distance_m: number; he_m: number; hr_m: number; mid_lat_deg: number; fade_margin_db: number; rain_margin_db: number; received_dbm: number; rx_gain_dbi: number },
): LinkPerformance {
  const warnings: string[] = [];
  const warn = (w: string | null) => {
    if (w && !warnings.includes(w)) warnings.push(w);
  };
  const f = radio.frequency_ghz;
  const d_km = p.distance_m / 1000;
  const closes = p.fade_margin_db > 0;
  const problems = (field: PropertyKey[], received: string, expected: string) =>
    new InputError([{ file: study.file, ...study.locate(field), field: fieldPath(field), received, expected }]);

  // --- Multipath, worst month, and its conversion to the year (§2.3.4, any depth) ---
  const occ = multipathOccurrenceFactor({ distance_m: p.distance_m, frequency_ghz: f, he_m: p.he_m, hr_m: p.hr_m, dN1: study.climate.dn1, sa_m: study.climate.sa_m });
  const A = Math.max(p.fade_margin_db, 0);
  // A multipath occurrence factor so large that P.530's interpolation (eq. 15) has no value
  // means fades beyond any margin nearly all the worst month: taken as 100 %, with a warning.
  const pwRaw = fadeDepthExceedancePercent(occ.p0_pct, A);
  const saturated = Number.isNaN(pwRaw.pw_pct) && occ.p0_pct > 0;
  if (saturated) warn(`${MULTIPATH_P530_VALIDITY.method}: the multipath occurrence factor p0 = ${occ.p0_pct.toExponential(2)} % is beyond the method's interpolation; the worst-month multipath outage is taken as 100 %.`);
  const pw = saturated ? { ...pwRaw, pw_pct: 100 } : pwRaw;
  const dG = worstMonthToAnnualDeltaGDb(p.mid_lat_deg, d_km, occ.epsilon_p_mrad);
  const toYear = (worstMonthPct: number) => Math.min(worstMonthPct, annualPercentFromWorstMonth(worstMonthPct, Math.max(0, dG)));
  // saturated: the annual figure follows the worst month's 100 % through §2.3.4 (eq. 15 has no value either)
  const flatYearRaw = annualFadeExceedancePercent(occ.p0_pct, A, dG).p_pct;
  const flatYear = saturated && Number.isNaN(flatYearRaw) ? toYear(pw.pw_pct) : flatYearRaw;
  const V = MULTIPATH_P530_VALIDITY;
  warn(rangeWarning(V.method, "frequency", f, [Math.max(V.frequency_ghz[0], V.frequency_min_ghz_km / d_km), V.frequency_ghz[1]], "GHz"));
  warn(rangeWarning(V.method, "path length", d_km, V.distance_km, "km"));
  warn(rangeWarning(V.method, "path inclination", occ.epsilon_p_mrad, V.inclination_mrad, "mrad"));
  warn(rangeWarning(V.method, "lower antenna altitude", Math.min(p.he_m, p.hr_m), V.lower_antenna_m, "m amsl"));
  if (study.climate.sa_m === undefined) warn("No terrain roughness sa (climate.sa_m): multipath uses the quick-planning geoclimatic factor of P.530-16 §2.3.1.");

  // --- Dispersive fading (§2.3.6) ---
  let dispersive: LinkPerformance["dispersive"] = null;
  let Ps = 0;
  if (radio.signature) {
    const s = selectiveOutageProbability(sigGhz(radio.signature), d_km, occ.p0_pct);
    Ps = s.Ps;
    dispersive = { signature: radio.signature, tau_m_ns: s.tau_m_ns, eta: s.eta, outage_worst_month_pct: 100 * s.Ps, method: DISPERSIVE_P530_VALIDITY.method };
  }
  const Pns = pw.pw_pct / 100;

  // --- Diversity (§6.2) ---
  let diversity: DiversityResult | null = null;
  let clearAirPct = 100 * (Pns + Ps);
  if (link.diversity) {
    const DV = DIVERSITY_P530_VALIDITY;
    if ("space" in link.diversity) {
      const S = link.diversity.space.spacing_m;
      const G2 = link.diversity.space.gain_dbi ?? p.rx_gain_dbi;
      const Vdb = Math.abs(p.rx_gain_dbi - G2);
      const I = spaceDiversityImprovement(S, f, d_km, occ.p0_pct, A, Vdb);
      const combined = diversityOutageProbability(Pns, Ps, occ.p0_pct, I);
      const spacing_m: number[] = [];
      const improvement: number[] = [];
      for (let s = DV.space.spacing_m[0]; s <= DV.space.spacing_m[1] + 1e-9; s += 0.5) {
        spacing_m.push(s);
        improvement.push(spaceDiversityImprovement(s, f, d_km, occ.p0_pct, A, Vdb));
      }
      warn(rangeWarning(`${DV.method}, space`, "antenna spacing", S, DV.space.spacing_m, "m"));
      warn(rangeWarning(`${DV.method}, space`, "frequency", f, DV.space.frequency_ghz, "GHz"));
      warn(rangeWarning(`${DV.method}, space`, "path length", d_km, DV.space.distance_km, "km"));
      diversity = { kind: "space", spacing: S, spacing_unit: "m", improvement: I, outage_without_pct: clearAirPct, outage_with_pct: 100 * combined.Pd, curve: { spacing_m, improvement }, gain_difference_db: Vdb, method: `${DV.method}: §6.2.1 space diversity, §6.2.2 with dispersive fading` };
      clearAirPct = 100 * combined.Pd;
    } else {
      const df_ghz = link.diversity.frequency.spacing_mhz / 1000;
      const I = frequencyDiversityImprovement(f, df_ghz, d_km, A);
      const combined = diversityOutageProbability(Pns, Ps, occ.p0_pct, I);
      warn(rangeWarning(`${DV.method}, frequency`, "relative spacing Δf/f", (100 * df_ghz) / f, DV.frequency.relative_spacing_pct, "%"));
      warn(rangeWarning(`${DV.method}, frequency`, "frequency", f, DV.frequency.frequency_ghz, "GHz"));
      warn(rangeWarning(`${DV.method}, frequency`, "path length", d_km, DV.frequency.distance_km, "km"));
      diversity = { kind: "frequency", spacing: link.diversity.frequency.spacing_mhz, spacing_unit: "MHz", improvement: I, outage_without_pct: clearAirPct, outage_with_pct: 100 * combined.Pd, curve: null, gain_difference_db: null, method: `${DV.method}: §6.2.1 frequency diversity, §6.2.2 steps with dispersive fading` };
      clearAirPct = 100 * combined.Pd;
    }
  }

  // --- Rain (§2.4.1), against the margin less the wet radomes ---
  const R = study.climate.rain_rate_mm_h;
  let A001: number | null = null;
  let rainPct = 0;
  let rainShown: number | null = null;
  let rainRange: RainRange = "within";
  if (R === undefined) {
    rainRange = "no_rain_rate";
    warn("No rain rate R0.01 in the study (climate.rain_rate_mm_h): the budget has no rain term.");
  } else {
    const r = rainAttenuation001({ distance_m: p.distance_m, frequency_ghz: f, rain_rate_001_mm_h: R, elevation_deg: 0, tilt_deg: link.polarization === "h" ? POLARISATION_TILT_DEG.horizontal : POLARISATION_TILT_DEG.vertical });
    A001 = r.A001_db;
    warn(rangeWarning(RAIN_P530_VALIDITY.method, "frequency", f, RAIN_P530_VALIDITY.frequency_ghz, "GHz"));
    warn(rangeWarning(RAIN_P530_VALIDITY.method, "path length", d_km, RAIN_P530_VALIDITY.distance_km, "km"));
    if (!closes) {
      rainRange = "link_does_not_close";
    } else {
      const o = rainOutagePercent(p.rain_margin_db, r.A001_db, f);
      const lo = RAIN_P530_VALIDITY.time_percentage_pct[0];
      if (o.flag === "clamped_at_min") {
        // no solution: the margin exceeds the attenuation at the search floor — not a result
        rainRange = "below_method_range";
        warn(`${RAIN_P530_VALIDITY.method}: the rain fade margin (${p.rain_margin_db.toFixed(1)} dB) exceeds the attenuation the method gives at any percentage it covers (A0.01 = ${r.A001_db.toFixed(2)} dB): rain outage is below the method's range (< ${lo} % of the year) and counted as 0.`);
      } else if (o.flag === "clamped_at_max") {
        rainRange = "above_1_pct";
        rainPct = rainShown = o.outage_pct;
        warn(`${RAIN_P530_VALIDITY.method}: the rain fade margin is exceeded more than 1 % of the year, beyond the method's range; 1 % is a lower bound.`);
      } else {
        rainPct = rainShown = o.outage_pct;
        if (o.flag === "extrapolated") rainRange = "below_0_001_pct";
      }
    }
  }

  // --- Cross-polar discrimination (§4) on co-channel dual-polarised links ---
  let xpd: LinkPerformance["xpd"] = null;
  let xpClear = 0;
  let xpRain = 0;
  if (link.co_channel_dual_polarised) {
    const missing = (["xpd_db", "co_channel_ci_db"] as const).filter((k) => radio[k] === undefined);
    if (missing.length) {
      const ri = study.radios.indexOf(radio);
      throw problems(["radios", ri], `radio ${radio.id} without ${missing.join(" and ")}`, `${missing.join(" and ")} on radio ${radio.id}: link ${link.id} is co-channel dual-polarised, and its XPD outage (ITU-R P.530-16 §4) needs the antennas' guaranteed XPD and the radio's C0/I`);
    }
    const eq = { xpd_g_db: radio.xpd_db!, c0_i_db: radio.co_channel_ci_db!, xpif_db: radio.xpif_db ?? 0 };
    const ca = xpdOutageClearAir(eq, occ.p0_pct, { lambda_m: wavelengthM(f) });
    const pr = A001 === null ? { Pxpr: 0 } : xpdOutagePrecipitation(eq, A001, f);
    xpClear = 100 * ca.Pxp;
    xpRain = closes ? 100 * pr.Pxpr : 0;
    warn(rangeWarning(`${XPD_P530_VALIDITY.method}, precipitation`, "frequency", f, XPD_P530_VALIDITY.precipitation_frequency_ghz, "GHz"));
    if (xpRain > 0) warn(rangeWarning(`${XPD_P530_VALIDITY.method}, precipitation`, "outage (percentage of the year)", xpRain, XPD_P530_VALIDITY.precipitation_time_pct, "%"));
    xpd = { clear_air_worst_month_pct: xpClear, rain_annual_pct: xpRain, margin_db: ca.M_xpd_db, ...eq, method: `${XPD_P530_VALIDITY.method}: §4.1 clear air, §4.2 precipitation` };
  }

  // --- Objectives ---
  const perfTarget = link.performance_pct ?? study.design.performance_pct ?? DEFAULT_PERFORMANCE_PCT;
  const availTarget = link.availability_pct ?? study.design.availability_pct;
  const perfOutage = Math.min(100, clearAirPct + xpClear);
  const availOutage = closes ? Math.min(100, rainPct + xpRain) : 100;
  const performance: ObjectiveResult = { outage_pct: perfOutage, achieved_pct: 100 - perfOutage, target_pct: perfTarget, met: 100 - perfOutage >= perfTarget };
  const availability: ObjectiveResult = { outage_pct: availOutage, achieved_pct: 100 - availOutage, target_pct: availTarget, met: 100 - availOutage >= availTarget };
  const clearAirYear = diversity ? toYear(clearAirPct) : flatYear + toYear(100 * Ps);
  const combinedU = closes ? Math.min(100, clearAirYear + toYear(xpClear) + rainPct + xpRain) : 100;

  // --- Adaptive modulation: time in each mode over the year ---
  let adaptive: AdaptiveModulationResult | null = null;
  if (radio.modes?.length) {
    const below: number[] = [];
    const disp: (number | null)[] = [];
    for (const m of radio.modes) {
      const M = p.received_dbm - m.rx_threshold_dbm - study.design.design_allowance_db;
      const Am = Math.max(M, 0);
      const flat = annualFadeExceedancePercent(occ.p0_pct, Am, dG).p_pct;
      const ps = m.signature ? 100 * selectiveOutageProbability(sigGhz(m.signature), d_km, occ.p0_pct).Ps : null;
      disp.push(ps);
      let rain = 0;
      if (A001 !== null && M > 0) {
        const o = rainOutagePercent(M - (p.fade_margin_db - p.rain_margin_db), A001, f);
        rain = o.flag === "clamped_at_min" ? 0 : o.outage_pct;
      }
      below.push(M <= 0 ? 100 : Math.min(100, flat + (ps === null ? 0 : toYear(ps)) + rain));
    }
    const shares = modeTimeShares(below);
    const modes: ModeRow[] = radio.modes.map((m, i) => ({
      name: m.name,
      capacity_mbps: m.capacity_mbps,
      rx_threshold_dbm: m.rx_threshold_dbm,
      margin_db: p.received_dbm - m.rx_threshold_dbm - study.design.design_allowance_db,
      time_share_pct: shares.share_pct[i],
      available_pct: shares.at_least_pct[i],
      dispersive_worst_month_pct: disp[i],
    }));
    const at = modeAtAvailability(shares.at_least_pct, availTarget);
    let target: AdaptiveModulationResult["target"] = null;
    if (link.capacity_target) {
      const t = link.capacity_target;
      let need = t.capacity_mbps ?? 0;
      if (t.mode !== undefined) {
        const named = radio.modes.find((m) => m.name === t.mode);
        if (!named) throw problems(["links", link.index, "capacity_target", "mode"], JSON.stringify(t.mode), `the name of a mode of radio ${radio.id} (${radio.modes.map((m) => m.name).join(", ")})`);
        need = Math.max(need, named.capacity_mbps);
      }
      const j = modeAtAvailability(shares.at_least_pct, t.availability_pct);
      const there = j < 0 ? 0 : radio.modes[j].capacity_mbps;
      target = { capacity_mbps: need, mode: t.mode ?? null, availability_pct: t.availability_pct, capacity_there_mbps: there, met: there >= need };
    }
    adaptive = {
      modes,
      outage_pct: shares.outage_pct,
      capacity_at_availability_mbps: at < 0 ? 0 : radio.modes[at].capacity_mbps,
      mode_at_availability: at < 0 ? null : radio.modes[at].name,
      availability_pct: availTarget,
      target,
      method: "time below each mode's threshold per average year: flat multipath (ITU-R P.530-16 §2.3.2, §2.3.4) + the mode's dispersive outage (§2.3.6, converted by §2.3.4) + rain (§2.4.1); a mode is in use between its threshold and the next (common practice, no hysteresis)",
    };
  } else if (link.capacity_target) {
    throw problems(["links", link.index, "capacity_target"], "a capacity target", `modes on radio ${radio.id} (radios[].modes): a capacity target needs an adaptive-modulation radio`);
  }

  const availabilityRecord: Record<string, number | string | null> = {
    multipath_worst_month_pct: pw.pw_pct,
    multipath_annual_pct: flatYear,
    dispersive_worst_month_pct: dispersive ? dispersive.outage_worst_month_pct : null,
    rain_annual_pct: closes ? rainShown : null,
    rain_range: rainRange,
    xpd_clear_air_worst_month_pct: xpd ? xpClear : null,
    xpd_rain_annual_pct: xpd ? xpRain : null,
    performance_outage_worst_month_pct: perfOutage,
    availability_outage_annual_pct: availOutage,
    unavailability_pct: combinedU,
    geoclimatic_k: occ.K,
    multipath_occurrence_p0_pct: occ.p0_pct,
    worst_month_to_year_db: dG,
    path_inclination_mrad: occ.epsilon_p_mrad,
  };
  return {
    availability: availabilityRecord,
    objectives: { performance, availability, combined: { unavailability_pct: combinedU, availability_pct: 100 - combinedU, note: "every mechanism added per average year (worst-month terms converted by ITU-R P.530-16 §2.3.4): a combined figure for comparison, not one of the two objectives" } },
    dispersive,
    diversity,
    xpd,
    adaptive_modulation: adaptive,
    rain_0_01pct_db: A001,
    warnings,
  };
}
