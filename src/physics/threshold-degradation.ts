/**
 * Receiver noise and the degradation of its threshold by interference.
 */

/**
 * Thermal noise power (dBm) of a receiver: N = 10·log10(k·T0·B) + NF with k·T0 = −174.0 dBm/Hz
 * at T0 = 290 K (Boltzmann's constant 1.380649e−23 J/K, exact since 2019; common practice).
 * @param bandwidth_hz noise bandwidth (Hz)
 * @param noise_figure_db receiver noise figure (dB)
 */
export function thermalNoiseDbm(bandwidth_hz: number, noise_figure_db: number): number {
  if (!(bandwidth_hz > 0)) return NaN;
  const kT0_dbm_hz = 10 * Math.log10(1.380649e-23 * 290 * 1000); // kT0 in dBm/Hz (≈ −173.98)
  return kT0_dbm_hz + 10 * Math.log10(bandwidth_hz) + noise_figure_db;
}

/**
 * Threshold degradation (dB) by interference of power I added to noise N:
 * TD = 10·log10(1 + I/N), I and N in the same bandwidth (noise and interference powers add;
 * common practice). 1 dB of degradation is I/N = −5.87 dB.
 * @param interference_dbm interference power (dBm); −Infinity for none
 * @param noise_dbm noise power (dBm)
 */
export function thresholdDegradationDb(interference_dbm: number, noise_dbm: number): number {
  if (Number.isNaN(interference_dbm) || !Number.isFinite(noise_dbm)) return NaN;
  return 10 * Math.log10(1 + 10 ** ((interference_dbm - noise_dbm) / 10));
}

/** Power sum (dBm) of powers in dBm; −Infinity for none. */
export function powerSumDbm(levels_dbm: Iterable<number>): number {
  let s = 0;
  for (const l of levels_dbm) s += 10 ** (l / 10);
  return 10 * Math.log10(s);
}
