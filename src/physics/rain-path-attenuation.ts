import { rainCoefficients, type RainGeometry } from "./rain-specific-attenuation.ts";

/**
 * Where the terrestrial rain-attenuation method applies (for warnings at the boundary).
 * Edition: ITU-R P.530-16 (07/2015) §2.4.1; the method is unchanged in P.530-17 and
 * P.530-18. The Recommendation states it for frequencies up to at least 100 GHz, path
 * lengths up to 60 km and time percentages 0.001–1 %; the 1 GHz floor is P.838-3's.
 */
export const RAIN_P530_VALIDITY = {
  method: "ITU-R P.530-16 §2.4.1 (same in P.530-17, P.530-18)",
  frequency_ghz: [1, 100] as const,
  distance_km: [0, 60] as const,
  time_percentage_pct: [0.001, 1] as const,
} as const;

/** Largest distance factor the Recommendation allows (P.530-16 §2.4.1 Step 3). */
export const RAIN_DISTANCE_FACTOR_MAX = 2.5;

/**
 * Distance factor r turning the path length into the effective rain-cell length d_eff = r·d.
 *
 * Method: r = 1 / (0.477·d^0.633·R^(0.073α)·f^0.123 − 10.579·(1 − exp(−0.024·d))), d in km;
 * where the denominator is below 0.4 (short paths, light rain, also where it turns
 * negative) r = 2.5, the maximum the Recommendation allows.
 * Reference: ITU-R P.530-16 §2.4.1 Step 3, eq. (32) (same in P.530-18).
 * @param distance_km path length d (km) — the km of the fitted formula
 * @param rain_rate_001_mm_h rain rate R0.01 exceeded 0.01 % of the time, 1-min integration (mm/h)
 * @param alpha exponent α of P.838-3 for the path's polarisation
 * @param frequency_ghz frequency f (GHz)
 */
export function rainDistanceFactor(
  distance_km: number,
  rain_rate_001_mm_h: number,
  alpha: number,
  frequency_ghz: number,
): number {
  if (!(distance_km > 0) || !(rain_rate_001_mm_h >= 0) || !(frequency_ghz > 0) || !Number.isFinite(alpha)) return NaN;
  const d = distance_km;
  const denominator =
    0.477 * d ** 0.633 * rain_rate_001_mm_h ** (0.073 * alpha) * frequency_ghz ** 0.123 -
    10.579 * (1 - Math.exp(-0.024 * d)); // P.530-16 eq. (32)
  if (!(denominator >= 1 / RAIN_DISTANCE_FACTOR_MAX)) return RAIN_DISTANCE_FACTOR_MAX; // P.530-16 §2.4.1 Step 3: r ≤ 2.5
  return 1 / denominator; // P.530-16 eq. (32)
}

export interface RainAttenuation001Input extends RainGeometry {
  distance_m: number;
  frequency_ghz: number;
  /** R0.01: rain rate exceeded 0.01 % of an average year, 1-min integration (mm/h). */
  rain_rate_001_mm_h: number;
}

export interface RainAttenuation001 {
  /** Path attenuation exceeded 0.01 % of an average year (dB). */
  A001_db: number;
  /** Specific attenuation γR at R0.01 (dB/km). */
  gammaR_db_km: number;
  /** Distance factor r (dimensionless). */
  r: number;
  /** Effective path length d_eff = r·d (m). */
  d_eff_m: number;
}

/**
 * Rain attenuation exceeded for 0.01 % of an average year on a terrestrial line-of-sight path.
 *
 * Method: γR = k·R0.01^α (P.838-3), d_eff = r·d, A0.01 = γR·d_eff.
 * Reference: ITU-R P.530-16 §2.4.1 Steps 1–4, eqs. (32), (33) (same in P.530-18).
 * Valid up to at least 100 GHz and for paths up to 60 km.
 * @param input.distance_m path length d (m)
 * @param input.frequency_ghz frequency f (GHz)
 * @param input.rain_rate_001_mm_h rain rate R0.01 (mm/h)
 * @param input.elevation_deg path elevation θ (degrees)
 * @param input.tilt_deg polarisation tilt τ (degrees): 0 horizontal, 90 vertical, 45 circular
 */
export function rainAttenuation001(input: RainAttenuation001Input): RainAttenuation001 {
  const { distance_m, frequency_ghz, rain_rate_001_mm_h } = input;
  const { k, alpha } = rainCoefficients(frequency_ghz, input);
  const gammaR = !(rain_rate_001_mm_h >= 0) ? NaN : k * rain_rate_001_mm_h ** alpha; // P.838-3 eq. (1)
  const d_km = distance_m / 1000;
  const r = rainDistanceFactor(d_km, rain_rate_001_mm_h, alpha, frequency_ghz);
  const d_eff_km = r * d_km;
  return { A001_db: gammaR * d_eff_km, gammaR_db_km: gammaR, r, d_eff_m: d_eff_km * 1000 }; // P.530-16 eq. (33)
}

/**
 * The coefficients C0…C3 of the time-percentage scaling at a frequency.
 * C0 = 0.12 + 0.4·log10((f/10)^0.8) for f ≥ 10 GHz, 0.12 below; C1 = 0.07^C0·0.12^(1−C0);
 * C2 = 0.855·C0 + 0.546·(1 − C0); C3 = 0.139·C0 + 0.043·(1 − C0).
 * The printed "log10(f/10)^0.8" is read as log10 of (f/10)^0.8 = 0.8·log10(f/10).
 * Reference: ITU-R P.530-16 §2.4.1 Step 5, eqs. (35a)–(35c), (36).
 * @param frequency_ghz frequency f (GHz)
 */
export function rainScalingCoefficients(frequency_ghz: number): { C0: number; C1: number; C2: number; C3: number } {
  if (!(frequency_ghz > 0)) return { C0: NaN, C1: NaN, C2: NaN, C3: NaN };
  const C0 = frequency_ghz >= 10 ? 0.12 + 0.4 * Math.log10((frequency_ghz / 10) ** 0.8) : 0.12; // P.530-16 eq. (36)
  const C1 = 0.07 ** C0 * 0.12 ** (1 - C0); // P.530-16 eq. (35a)
  const C2 = 0.855 * C0 + 0.546 * (1 - C0); // P.530-16 eq. (35b)
  const C3 = 0.139 * C0 + 0.043 * (1 - C0); // P.530-16 eq. (35c)
  return { C0, C1, C2, C3 };
}

/**
 * Rain attenuation (dB) exceeded for p % of an average year, scaled from A0.01.
 *
 * Method: A_p = A0.01 · C1 · p^−(C2 + C3·log10 p). Since P.530-16 the frequency-dependent
 * C0 replaces the earlier editions' separate curves for latitudes ≥ 30° and < 30°
 * (which are its C0 = 0 and C0 = 1 ends), so latitude does not enter. Note that the
 * power law gives A_0.01 ≈ 0.998·A0.01, not exactly A0.01: that is the Recommendation's
 * own rounding of its constants, kept as published.
 * Reference: ITU-R P.530-16 §2.4.1 Step 5, eq. (34) (same in P.530-18).
 * Valid for 0.001 ≤ p ≤ 1 %; outside that range the power law is extrapolated.
 * @param A001_db attenuation exceeded 0.01 % of the time (dB)
 * @param p_pct time percentage p (%)
 * @param frequency_ghz frequency f (GHz)
 */
export function rainAttenuationAtPercent(A001_db: number, p_pct: number, frequency_ghz: number): number {
  if (!(p_pct > 0)) return NaN;
  const { C1, C2, C3 } = rainScalingCoefficients(frequency_ghz);
  return A001_db * C1 * p_pct ** -(C2 + C3 * Math.log10(p_pct)); // P.530-16 eq. (34)
}

/** How a rain-outage result relates to the range the scaling law covers. */
export type RainOutageFlag =
  /** 0.001 ≤ p ≤ 1 %: inside the Recommendation's range. */
  | "within_range"
  /** Solved between the search floor and 0.001 %: the power law is extrapolated. */
  | "extrapolated"
  /** The fade margin is exceeded more than 1 % of the time: the value 1 % is a lower bound. */
  | "clamped_at_max"
  /** The fade margin is exceeded less often than the search floor: the floor is an upper bound. */
  | "clamped_at_min";

/** Smallest time percentage the outage search considers (%). */
export const RAIN_OUTAGE_SEARCH_MIN_PCT = 1e-5;

/**
 * Time percentage of an average year for which rain attenuation exceeds a fade margin.
 *
 * Method: inverts eq. (34) by bisection on x = log10 p over [log10 p_min, 0], where
 * p_min = max(1e-5 %, p at the turning point x* = −C2/(2·C3) of the power law), so that
 * A_p decreases strictly with p on the whole interval and the root is unique. 200 halvings
 * (the interval is then far below double precision). A margin beyond the interval returns
 * the nearer end and says so in `flag`; A0.01 = 0 (no rain fade) gives 0 %.
 * Reference: ITU-R P.530-16 §2.4.1 Step 5, eq. (34) solved for p (same in P.530-18).
 * @param fade_margin_db fade margin available against rain (dB)
 * @param A001_db attenuation exceeded 0.01 % of the time (dB)
 * @param frequency_ghz frequency f (GHz)
 */
export function rainOutagePercent(
  fade_margin_db: number,
  A001_db: number,
  frequency_ghz: number,
): { outage_pct: number; flag: RainOutageFlag } {
  const { C2, C3 } = rainScalingCoefficients(frequency_ghz);
  if (!Number.isFinite(fade_margin_db) || !(A001_db >= 0) || !Number.isFinite(C2)) {
    return { outage_pct: NaN, flag: "within_range" };
  }
  if (A001_db === 0) return { outage_pct: 0, flag: "within_range" }; // no rain fade at all
  const Ap = (x: number) => rainAttenuationAtPercent(A001_db, 10 ** x, frequency_ghz);
  const xTurn = -C2 / (2 * C3); // d(log A_p)/d(log p) = −(C2 + 2·C3·log10 p) vanishes here
  const pMin = Math.max(RAIN_OUTAGE_SEARCH_MIN_PCT, 10 ** xTurn);
  let lo = Math.log10(pMin);
  let hi = 0;
  if (fade_margin_db <= Ap(hi)) return { outage_pct: 1, flag: "clamped_at_max" };
  if (fade_margin_db >= Ap(lo)) return { outage_pct: pMin, flag: "clamped_at_min" };
  for (let i = 0; i < 200 && hi - lo > 1e-15; i++) {
    const mid = (lo + hi) / 2;
    if (Ap(mid) > fade_margin_db) lo = mid;
    else hi = mid;
  }
  const x = (lo + hi) / 2;
  // The 1e-9 slack in log10 p keeps p = 0.001 % itself, found to rounding, inside the range.
  const extrapolated = x < Math.log10(RAIN_P530_VALIDITY.time_percentage_pct[0]) - 1e-9;
  return { outage_pct: 10 ** x, flag: extrapolated ? "extrapolated" : "within_range" };
}
