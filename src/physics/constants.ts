/** Speed of light in vacuum (m/s), exact by the SI definition of the metre. */
export const SPEED_OF_LIGHT_M_S = 299_792_458;

/**
 * Mean Earth radius (m) used for effective-Earth geometry, 6371 km as in
 * ITU-R P.452-17 §4 and P.526-15 §4.5 (a_e = k · 6371 km).
 */
export const EARTH_RADIUS_M = 6_371_000;

/** Wavelength (m) for a frequency in GHz, exact c. */
export function wavelengthM(frequency_ghz: number): number {
  return SPEED_OF_LIGHT_M_S / (frequency_ghz * 1e9);
}
