/**
 * 3 dB beamwidth (°) of an antenna from its gain, G ≈ 27 000/θ² (θ in degrees, a circular
 * aperture with about 55 % efficiency; common practice, e.g. θ ≈ 70·λ/D with G = η·(πD/λ)²).
 * @param gain_dbi antenna gain (dBi)
 * @returns θ3dB (°); NaN for NaN
 */
export function beamwidthFromGainDeg(gain_dbi: number): number {
  return Math.sqrt(27000 / 10 ** (gain_dbi / 10)); // common practice: G ≈ 27 000/θ²
}

/**
 * Gaussian aperture source of the parabolic equation, the field on the first vertical plane:
 *   u(0, z) = exp(−(z − zs)²/(2σ²)) · exp(i·k·sin(θe)·z),  σ = √(4·ln 2)/(k·θbw),
 * whose angular spectrum is a Gaussian with a 3 dB (power) width θbw aimed at elevation θe.
 * Reference: M. Levy, "Parabolic Equation Methods for Electromagnetic Wave Propagation",
 * IEE 2000, §8 (Gaussian antenna patterns) — from memory; the σ follows from the transform
 * of a Gaussian (|U(p)|² ∝ exp(−p²σ²) is halved at p = k·θbw/2).
 * The free-space amplitude on the beam axis at distance r is (1 + (r/rR)²)^(−1/4), rR = k·σ²
 * (the two-dimensional Gaussian beam; common practice): the solver's reference for "relative
 * to free space".
 * @param beamwidth_rad 3 dB beamwidth θbw (rad)
 * @param k_rad_m wavenumber (rad/m)
 */
export function gaussianSourceSigmaM(beamwidth_rad: number, k_rad_m: number): number {
  return Math.sqrt(4 * Math.LN2) / (k_rad_m * beamwidth_rad);
}

/** Free-space amplitude of the unit Gaussian source on its axis at distance r (m). */
export function gaussianAxisAmplitude(r_m: number, sigma_m: number, k_rad_m: number): number {
  const rR = k_rad_m * sigma_m * sigma_m;
  return (1 + (r_m / rR) ** 2) ** -0.25;
}
