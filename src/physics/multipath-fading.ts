/**
 * Where the multipath-fading method applies (for warnings at the boundary).
 *
 * Edition: ITU-R P.530-16 (07/2015) §2.3.1–§2.3.2, the last edition whose geoclimatic
 * factor comes from dN1 and sa; P.530-17 and P.530-18 replaced it by a method that reads
 * K and dN75 from the Recommendation's digital maps, which Ridgeline does not carry.
 * The method was derived from paths 7.5–185 km long at 0.45–37 GHz, inclinations up to
 * 37 mrad, lower-antenna altitudes 17–2300 m, dN1 −860…−150 N/km and sa 6–850 m; the
 * Recommendation applies it from f_min = 15/d GHz (d in km) up to 45 GHz.
 */
export const MULTIPATH_P530_VALIDITY = {
  method: "ITU-R P.530-16 §2.3.1, §2.3.2 (average worst month)",
  frequency_ghz: [0.45, 45] as const,
  /** Lower frequency limit f_min = frequency_min_ghz_km / d_km. */
  frequency_min_ghz_km: 15,
  distance_km: [7.5, 185] as const,
  inclination_mrad: [0, 37] as const,
  lower_antenna_m: [17, 2300] as const,
  dN1_n_per_km: [-860, -150] as const,
  sa_m: [6, 850] as const,
} as const;

/**
 * Geoclimatic factor K for the average worst month, for detailed link design.
 *
 * Method: K = 10^(−4.4 − 0.0027·dN1) · (10 + sa)^−0.46.
 * Reference: ITU-R P.530-16 §2.3.1 Step 1, eq. (4).
 * @param dN1 point refractivity gradient in the lowest 65 m not exceeded 1 % of an average year (N-units/km)
 * @param sa_m area terrain roughness: standard deviation of terrain heights over 110 km × 110 km at 30″ resolution (m)
 */
export function geoclimaticFactorK(dN1: number, sa_m: number): number {
  if (!(sa_m >= 0)) return NaN;
  return 10 ** (-4.4 - 0.0027 * dN1) * (10 + sa_m) ** -0.46; // P.530-16 eq. (4)
}

/**
 * Geoclimatic factor K for quick planning, or when sa is not known: K = 10^(−4.6 − 0.0027·dN1).
 * Reference: ITU-R P.530-16 §2.3.1 Step 1, eq. (5).
 * @param dN1 point refractivity gradient not exceeded 1 % of an average year (N-units/km)
 */
export function geoclimaticFactorKQuick(dN1: number): number {
  return 10 ** (-4.6 - 0.0027 * dN1); // P.530-16 eq. (5)
}

/**
 * Magnitude of the path inclination |εp| = |hr − he| / d (mrad, with heights in m and d in km).
 * Reference: ITU-R P.530-16 §2.3.1 Step 2, eq. (6).
 * @param he_m emitter antenna height above sea level (m)
 * @param hr_m receiver antenna height above sea level (m)
 * @param distance_m path length (m)
 */
export function pathInclinationMrad(he_m: number, hr_m: number, distance_m: number): number {
  if (!(distance_m > 0)) return NaN;
  return Math.abs(hr_m - he_m) / (distance_m / 1000); // P.530-16 eq. (6)
}

/** Which form of §2.3.1 to use: detailed link design (needs sa) or quick planning. */
export type MultipathPlanning = "detailed" | "quick";

export interface MultipathInput {
  distance_m: number;
  frequency_ghz: number;
  /** Emitter antenna height above sea level (m). */
  he_m: number;
  /** Receiver antenna height above sea level (m). */
  hr_m: number;
  /** dN1: point refractivity gradient not exceeded 1 % of an average year (N-units/km). */
  dN1: number;
  /** Area terrain roughness sa (m); when absent the quick-planning K and p0 are used. */
  sa_m?: number;
}

/**
 * Multipath occurrence factor p0 (%): the percentage of time of the deep-fade asymptote at
 * A = 0 dB, average worst month.
 *
 * Method: detailed  p0 = K·d^3.4·(1 + |εp|)^−1.03·f^0.8·10^(−0.00076·hL),
 *         quick     p0 = K·d^3.1·(1 + |εp|)^−1.29·f^0.8·10^(−0.00089·hL),
 * d in km, f in GHz, hL = min(he, hr) the altitude of the lower antenna (m).
 * Reference: ITU-R P.530-16 §2.3.2 Step 1, eqs. (10) and (11) — eqs. (7) and (8) of
 * §2.3.1 with A = 0.
 * @param input path, frequency (GHz), antenna heights (m amsl), dN1 (N/km), sa (m, optional)
 */
export function multipathOccurrenceFactor(input: MultipathInput): {
  p0_pct: number;
  K: number;
  epsilon_p_mrad: number;
  planning: MultipathPlanning;
} {
  const { distance_m, frequency_ghz: f, he_m, hr_m, dN1, sa_m } = input;
  const planning: MultipathPlanning = sa_m === undefined ? "quick" : "detailed";
  const d = distance_m / 1000;
  const epsilon_p = pathInclinationMrad(he_m, hr_m, distance_m);
  const hL = Math.min(he_m, hr_m);
  let K: number;
  let p0: number;
  if (planning === "detailed") {
    K = geoclimaticFactorK(dN1, sa_m as number);
    p0 = K * d ** 3.4 * (1 + epsilon_p) ** -1.03 * f ** 0.8 * 10 ** (-0.00076 * hL); // P.530-16 eq. (10)
  } else {
    K = geoclimaticFactorKQuick(dN1);
    p0 = K * d ** 3.1 * (1 + epsilon_p) ** -1.29 * f ** 0.8 * 10 ** (-0.00089 * hL); // P.530-16 eq. (11)
  }
  if (!(f > 0) || !(d > 0) || !Number.isFinite(hL)) p0 = NaN;
  return { p0_pct: p0, K, epsilon_p_mrad: epsilon_p, planning };
}

/**
 * Percentage of the average worst month that a fade depth A (dB) is exceeded, for any A ≥ 0,
 * from the occurrence factor p0.
 *
 * Method: At = 25 + 1.2·log10 p0. For A ≥ At the deep-fade law pw = p0·10^(−A/10).
 * For A < At the shallow-fade interpolation: pt = p0·10^(−At/10),
 * qa' = −20·log10(−ln((100 − pt)/100))/At,
 * qt = (qa' − 2)/[(1 + 0.3·10^(−At/20))·10^(−0.016·At)] − 4.3·(10^(−At/20) + At/800),
 * qa = 2 + (1 + 0.3·10^(−A/20))·10^(−0.016·A)·(qt + 4.3·(10^(−A/20) + A/800)),
 * pw = 100·(1 − exp(−10^(−qa·A/20))). Both branches meet at A = At; at A = 0, pw = 63.2 %.
 * Reference: ITU-R P.530-16 §2.3.2 Steps 2–3, eqs. (12)–(18).
 * Decreasing in A for p0 up to at least 1000 %; for p0 of several thousand % (far outside the
 * method's data) the interpolation is not monotone — the boundary should warn there.
 * @param p0_pct multipath occurrence factor p0 (%)
 * @param A_db fade depth A (dB), ≥ 0
 */
export function fadeDepthExceedancePercent(p0_pct: number, A_db: number): { pw_pct: number; At_db: number } {
  if (!(p0_pct > 0) || !(A_db >= 0)) return { pw_pct: NaN, At_db: NaN };
  const At = 25 + 1.2 * Math.log10(p0_pct); // P.530-16 eq. (12)
  if (A_db >= At) return { pw_pct: p0_pct * 10 ** (-A_db / 10), At_db: At }; // P.530-16 eq. (13)
  const pt = p0_pct * 10 ** (-At / 10); // P.530-16 eq. (14)
  // ln((100 − pt)/100) as log1p(−pt/100): a tiny pt must not round to ln 1 = 0 (then qa·A = ∞·0)
  const qaPrime = (-20 * Math.log10(-Math.log1p(-pt / 100))) / At; // P.530-16 eq. (15)
  const qt =
    (qaPrime - 2) / ((1 + 0.3 * 10 ** (-At / 20)) * 10 ** (-0.016 * At)) - 4.3 * (10 ** (-At / 20) + At / 800); // P.530-16 eq. (16)
  const qa = 2 + (1 + 0.3 * 10 ** (-A_db / 20)) * 10 ** (-0.016 * A_db) * (qt + 4.3 * (10 ** (-A_db / 20) + A_db / 800)); // P.530-16 eq. (17)
  const pw = 100 * (1 - Math.exp(-(10 ** ((-qa * A_db) / 20)))); // P.530-16 eq. (18)
  return { pw_pct: pw, At_db: At };
}

/**
 * Multipath outage: percentage of the average worst month that the flat fade margin is
 * exceeded by multipath fading (single frequency / narrow band; no diversity, no
 * dispersive-fading term).
 *
 * Method: p0 from {@link multipathOccurrenceFactor} (detailed when sa is given, quick
 * planning otherwise), then the all-fade-depths method of {@link fadeDepthExceedancePercent}
 * with A = fade margin.
 * Reference: ITU-R P.530-16 §2.3.1 eqs. (4)–(8), §2.3.2 eqs. (10)–(18).
 * Valid: see {@link MULTIPATH_P530_VALIDITY}; the result is a worst-month percentage.
 * @param input.distance_m path length (m)
 * @param input.frequency_ghz frequency (GHz)
 * @param input.he_m emitter antenna height above sea level (m)
 * @param input.hr_m receiver antenna height above sea level (m)
 * @param input.dN1 refractivity gradient not exceeded 1 % of the year (N-units/km)
 * @param input.sa_m area terrain roughness (m), optional
 * @param input.fade_margin_db flat fade margin (dB)
 */
export function multipathOutagePercent(input: MultipathInput & { fade_margin_db: number }): {
  pw_pct: number;
  p0_pct: number;
  At_db: number;
  K: number;
  epsilon_p_mrad: number;
  planning: MultipathPlanning;
} {
  const occurrence = multipathOccurrenceFactor(input);
  const { pw_pct, At_db } = fadeDepthExceedancePercent(occurrence.p0_pct, input.fade_margin_db);
  return { pw_pct, At_db, ...occurrence };
}
