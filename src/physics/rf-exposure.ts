/**
 * Radio-frequency exposure: general-public reference levels and a far-field estimate of the
 * distance from an antenna beyond which the power density is below them.
 *
 * Guideline: ICNIRP (2020), "Guidelines for limiting exposure to electromagnetic fields
 * (100 kHz to 300 GHz)", Health Physics 118(5): 483–524, Table 5 — reference levels for
 * whole-body exposure of the general public, averaged over 30 min. The table values below
 * are quoted from memory and must be checked against the published table before a
 * compliance statement relies on them.
 */

/** Lowest and highest frequency (MHz) for which this file gives a power-density reference level. */
export const RF_EXPOSURE_VALIDITY = { frequency_mhz: [30, 300_000] as [number, number], guideline: "ICNIRP 2020 (Health Physics 118(5)), Table 5, general public, whole body" };

/**
 * General-public whole-body reference level of incident power density S_inc (W/m²).
 *
 * Method: piecewise in frequency f_M (MHz):
 *   30–400 MHz: 2 W/m²;  400–2000 MHz: f_M/200 W/m²;  2–300 GHz: 10 W/m².
 * Reference: ICNIRP 2020, Health Physics 118(5), Table 5 (from memory). Below 30 MHz the
 * table gives field strengths only, so this returns NaN there (and above 300 GHz).
 * @param frequency_mhz frequency (MHz)
 * @returns reference level S_inc (W/m²), NaN outside 30 MHz–300 GHz
 */
export function generalPublicReferenceLevelWm2(frequency_mhz: number): number {
  const fM = frequency_mhz;
  if (!(fM >= 30 && fM <= 300_000)) return NaN;
  if (fM <= 400) return 2; // ICNIRP 2020 Table 5, 30–400 MHz (from memory)
  if (fM <= 2000) return fM / 200; // ICNIRP 2020 Table 5, 400–2000 MHz (from memory)
  return 10; // ICNIRP 2020 Table 5, 2–300 GHz (from memory)
}

/**
 * Far-field power density of a point source (W/m²): S = EIRP / (4π r²).
 *
 * Method: spherical spreading of the effective isotropically radiated power in the main
 * beam, no ground reflection (common practice; the same expression as the free-space
 * density of ITU-R P.525-4 §2.1 in linear units). Valid in the far field of the antenna
 * (r beyond about 2D²/λ); nearer, it overestimates the density of an aperture antenna.
 * @param eirp_w effective isotropically radiated power (W)
 * @param distance_m distance from the antenna (m)
 * @returns power density (W/m²); NaN for negative or non-finite input
 */
export function farFieldPowerDensityWm2(eirp_w: number, distance_m: number): number {
  if (!(eirp_w >= 0) || !(distance_m > 0) || !Number.isFinite(eirp_w)) return NaN;
  return eirp_w / (4 * Math.PI * distance_m * distance_m); // common practice: S = EIRP/(4πr²)
}

/**
 * Compliance distance (m): the range in the main beam beyond which the far-field power density
 * falls below the reference level, r = sqrt(EIRP / (4π S)).
 *
 * Method: `farFieldPowerDensityWm2` solved for r (common practice). It is an estimate for a
 * single source; a measurement or a full assessment (near field, reflections, other
 * transmitters on the site) governs.
 * @param eirp_w effective isotropically radiated power (W)
 * @param reference_wm2 reference level of power density (W/m²)
 * @returns distance (m); NaN for non-positive or non-finite input
 */
export function complianceDistanceM(eirp_w: number, reference_wm2: number): number {
  if (!(eirp_w >= 0) || !(reference_wm2 > 0) || !Number.isFinite(eirp_w) || !Number.isFinite(reference_wm2)) return NaN;
  return Math.sqrt(eirp_w / (4 * Math.PI * reference_wm2)); // common practice: r = sqrt(EIRP/(4πS))
}

/**
 * A power level in dBm as watts: P_W = 10^((P_dBm − 30)/10).
 * @param p_dbm power (dBm)
 * @returns power (W)
 */
export function dbmToW(p_dbm: number): number {
  return 10 ** ((p_dbm - 30) / 10); // definition of dBm
}
