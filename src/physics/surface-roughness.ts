/**
 * Specular-reflection reduction factor of a rough surface with a Gaussian height distribution
 * of standard deviation σh (Ament's factor):
 *   ρs = exp(−g²/2),   g = 4π·σh·sin ψ / λ   (i.e. ρs = exp(−8·(π·σh·sin ψ/λ)²)).
 *
 * Reference: W. S. Ament, "Toward a theory of reflection by a rough surface", Proc. IRE 41,
 * 1953 — common practice, from memory; the same factor is used in Beckmann & Spizzichino (1963).
 * Validity: σh small enough that a coherent (specular) component exists (g ≲ 2); it multiplies
 * the Fresnel coefficient. Non-finite or negative inputs give NaN.
 * @param opts.sigma_h_m standard deviation of the surface height about its mean (m)
 * @param opts.grazing_angle_rad grazing angle ψ (rad)
 * @param opts.lambda_m wavelength (m)
 */
export function roughnessFactor(opts: { sigma_h_m: number; grazing_angle_rad: number; lambda_m: number }): number {
  const { sigma_h_m: sigmaH, grazing_angle_rad: psi, lambda_m: lambda } = opts;
  if (!(sigmaH >= 0) || !Number.isFinite(sigmaH) || !(psi >= 0) || !(psi <= Math.PI / 2) || !(lambda > 0)) return NaN;
  const g = (4 * Math.PI * sigmaH * Math.sin(psi)) / lambda; // Rayleigh roughness parameter
  return Math.exp(-(g * g) / 2); // Ament (1953) specular factor
}

/**
 * Rayleigh criterion: the height irregularity (m) below which a surface counts as smooth for
 * specular reflection at grazing angle ψ, Δh < λ / (8·sin ψ) (phase difference below π/2).
 *
 * Reference: Rayleigh criterion as given in Beckmann & Spizzichino (1963) §1 and most
 * propagation texts — common practice, from memory. ψ = 0 gives Infinity; bad input NaN.
 * @param opts.grazing_angle_rad grazing angle ψ (rad)
 * @param opts.lambda_m wavelength (m)
 */
export function rayleighCriterionHeightM(opts: { grazing_angle_rad: number; lambda_m: number }): number {
  const { grazing_angle_rad: psi, lambda_m: lambda } = opts;
  if (!(psi >= 0) || !(psi <= Math.PI / 2) || !(lambda > 0) || !Number.isFinite(lambda)) return NaN;
  return lambda / (8 * Math.sin(psi)); // Rayleigh criterion
}
