import type { Complex } from "../complex.ts";
import { csqrt } from "../complex.ts";

/** Ground under the parabolic-equation solver: a perfect conductor, or a dielectric by its constants. */
export type PeGround = { kind: "pec" } | { kind: "impedance"; epsilon_r: number; sigma_s_m: number };

/**
 * Coefficient α of the Leontovich impedance boundary condition ∂u/∂z + α·u = 0 at the ground
 * for the reduced field u of the parabolic equation, time convention e^{−iωt}:
 *   n² = εr + i·60·λ·σ,  α_H = i·k·√(n² − 1),  α_V = i·k·√(n² − 1)/n².
 * The plane-wave reflection coefficient it gives, (sinψ − √(n²−1)·[1/n²])/(sinψ + …), is the
 * Fresnel coefficient with cos²ψ ≈ 1 (grazing incidence).
 * Reference: M. Levy, "Parabolic Equation Methods for Electromagnetic Wave Propagation",
 * IEE 2000, §6 (impedance boundary conditions) — from memory; n² in the ITU-R form of
 * P.526-15 §3.1.1.1 (εr − j60λσ for e^{+jωt}, conjugated here).
 * Validity: |n| ≫ 1 (real grounds and water above about 1 MHz). NaN in → NaN out.
 * @param epsilon_r relative permittivity
 * @param sigma_s_m conductivity (S/m)
 * @param lambda_m wavelength (m)
 * @param polarization "h" or "v"
 */
export function impedanceAlpha(epsilon_r: number, sigma_s_m: number, lambda_m: number, polarization: "h" | "v"): Complex {
  const k = (2 * Math.PI) / lambda_m;
  const n2re = epsilon_r;
  const n2im = 60 * lambda_m * sigma_s_m; // P.526-15 §3.1.1.1, conjugated for e^{−iωt}
  const s = csqrt({ re: n2re - 1, im: n2im });
  // α_H = i·k·s
  let re = -k * s.im;
  let im = k * s.re;
  if (polarization === "v") {
    // divide by n²
    const d = n2re * n2re + n2im * n2im;
    const r2 = (re * n2re + im * n2im) / d;
    const i2 = (im * n2re - re * n2im) / d;
    re = r2;
    im = i2;
  }
  return { re, im };
}
