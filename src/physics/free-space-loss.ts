import { SPEED_OF_LIGHT_M_S } from "./constants.ts";

/**
 * Basic free-space transmission loss (dB) between isotropic antennas:
 * Lbf = 20·log10(4πd/λ), with λ = c/f and c = 299 792 458 m/s exactly.
 *
 * Reference: ITU-R P.525-4 §2.2 eq. (4) in its exact form; the familiar
 * 32.4 + 20 log f(MHz) + 20 log d(km) rounds the constant 32.45 and is not used here.
 * Valid in the far field (d ≫ λ).
 * @param distance_m path length (m)
 * @param frequency_ghz frequency (GHz)
 */
export function freeSpaceLossDb(distance_m: number, frequency_ghz: number): number {
  const lambda = SPEED_OF_LIGHT_M_S / (frequency_ghz * 1e9);
  return 20 * Math.log10((4 * Math.PI * distance_m) / lambda); // P.525-4 eq. (4)
}
