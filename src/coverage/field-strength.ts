import { wavelengthM } from "../physics/constants.ts";

/** Impedance of free space used with field strength (Ω), 120π (common practice). */
const Z0_OHM = 120 * Math.PI;

/**
 * Received power (dBm) at the terminals of an isotropic antenna in a field of strength
 * E (dBµV/m): Pr = E²/Z0 · λ²/(4π), i.e.
 *   Pr(dBm) = E(dBµV/m) − 120 + 30 + 20·log10(λ) − 10·log10(4π·Z0).
 * Derived from the power density E²/(120π) and the isotropic aperture λ²/(4π); in the familiar
 * form Pr(dBW) = E − 20·log10 f(GHz) − 167.2 (ITU-R P.525-4 §2; from memory, equation number
 * not checked), which this reproduces to 0.02 dB.
 * @param e_dbuv_m field strength (dB(µV/m))
 * @param frequency_ghz frequency (GHz)
 */
export function isotropicPowerDbm(e_dbuv_m: number, frequency_ghz: number): number {
  return e_dbuv_m - 90 + 20 * Math.log10(wavelengthM(frequency_ghz)) - 10 * Math.log10(4 * Math.PI * Z0_OHM);
}

/** Inverse of isotropicPowerDbm: field strength (dBµV/m) for a power (dBm) at an isotropic antenna. */
export function fieldStrengthDbuvM(p_dbm: number, frequency_ghz: number): number {
  return p_dbm + 90 - 20 * Math.log10(wavelengthM(frequency_ghz)) + 10 * Math.log10(4 * Math.PI * Z0_OHM);
}
