import { normalQuantile } from "./normal-distribution.ts";

/** Building classes of ITU-R P.2109-1 Table 1. */
export type BuildingClass = "traditional" | "thermally-efficient";

/** ITU-R P.2109-1 Table 1 coefficients (r, s, t, u, v, w, x, y, z). */
const TABLE1: Record<BuildingClass, { r: number; s: number; t: number; u: number; v: number; w: number; x: number; y: number; z: number }> = {
  traditional: { r: 12.64, s: 3.72, t: 0.96, u: 9.6, v: 2.0, w: 9.1, x: -3.0, y: 4.5, z: -2.0 },
  "thermally-efficient": { r: 28.19, s: -3.0, t: 8.48, u: 13.5, v: 3.8, w: 27.8, x: -2.9, y: 9.4, z: -2.1 },
};

/** Validity of ITU-R P.2109-1 §3: frequency (GHz), probability (%), elevation (deg). */
export const BUILDING_ENTRY_LOSS_VALIDITY = { frequency_ghz: [0.08, 100], probability_pct: [0, 100], elevation_deg: [-90, 90] } as const;

/**
 * Building entry loss not exceeded for a fraction P of locations — ITU-R P.2109-1 §3
 * (statistical model): L_BEL(P) = 10·log10(10^{0.1·A(P)} + 10^{0.1·B(P)} + 10^{0.1·C}) with
 * A(P) = F⁻¹(P)·σ1 + μ1, B(P) = F⁻¹(P)·σ2 + μ2, C = −3 dB, μ1 = L_h + L_e,
 * L_h = r + s·log10 f + t·(log10 f)², L_e = 0.212·|θ|, μ2 = w + x·log10 f,
 * σ1 = u + v·log10 f, σ2 = y + z·log10 f (Table 1), F⁻¹ the standard normal quantile.
 * Valid 80 MHz – 100 GHz.
 * @param f_ghz frequency (GHz)
 * @param p_pct probability that the loss is not exceeded (%), 0 < p < 100
 * @param cls building class
 * @param theta_deg elevation of the path at the building façade (deg)
 * @returns loss (dB); NaN for bad input
 */
export function buildingEntryLoss(f_ghz: number, p_pct: number, cls: BuildingClass, theta_deg: number): number {
  const k = TABLE1[cls];
  if (!k || !(f_ghz > 0) || !(p_pct > 0 && p_pct < 100) || !Number.isFinite(theta_deg)) return NaN;
  const lf = Math.log10(f_ghz);
  const Lh = k.r + k.s * lf + k.t * lf * lf; // P.2109-1 eq. (2)
  const Le = 0.212 * Math.abs(theta_deg); // P.2109-1 eq. (3)
  const mu1 = Lh + Le; // P.2109-1 eq. (4)
  const mu2 = k.w + k.x * lf; // P.2109-1 eq. (5)
  const sigma1 = k.u + k.v * lf; // P.2109-1 eq. (6)
  const sigma2 = k.y + k.z * lf; // P.2109-1 eq. (7)
  const Fi = normalQuantile(p_pct / 100);
  const Ap = Fi * sigma1 + mu1; // P.2109-1 eq. (8)
  const Bp = Fi * sigma2 + mu2; // P.2109-1 eq. (9)
  const C = -3.0; // P.2109-1 eq. (10)
  return 10 * Math.log10(10 ** (0.1 * Ap) + 10 ** (0.1 * Bp) + 10 ** (0.1 * C)); // P.2109-1 eq. (1)
}
