import { SPEED_OF_LIGHT_M_S } from "./constants.ts";
import { type Complex, cabs, cadd, carg, cdiv, cmul, complex, csqrt, csub } from "./complex.ts";

export type Polarization = "horizontal" | "vertical";

export interface ReflectionCoefficient {
  /** |R| */
  magnitude: number;
  /** arg R (rad), in (−π, π] */
  phase_rad: number;
  /** Re R */
  re: number;
  /** Im R */
  im: number;
}

/**
 * Complex relative permittivity of the ground in ITU-R notation, η = εr − j·60·λ·σ
 * (≈ εr − j·18·σ/f_GHz), λ = c/f.
 *
 * Reference: ITU-R P.526-15 §3.1.1.1 (the εr − j60λσ form inside K_H, K_V); the 18·σ/f_GHz
 * shorthand is the same quantity rounded (60·c/1e9 = 17.99). Time convention e^{+jωt}.
 * @param epsilon_r relative permittivity (dimensionless)
 * @param sigma_s_m conductivity (S/m)
 * @param frequency_ghz frequency (GHz)
 */
export function complexPermittivity(epsilon_r: number, sigma_s_m: number, frequency_ghz: number): Complex {
  const lambda = SPEED_OF_LIGHT_M_S / (frequency_ghz * 1e9);
  return complex(epsilon_r, -60 * lambda * sigma_s_m); // P.526-15 §3.1.1.1: εr − j60λσ
}

/**
 * Fresnel reflection coefficient of a smooth, homogeneous ground for a plane wave at grazing
 * angle ψ (angle between the ray and the surface), for horizontal or vertical polarisation:
 *   R_h = (sinψ − √(η − cos²ψ)) / (sinψ + √(η − cos²ψ))
 *   R_v = (η·sinψ − √(η − cos²ψ)) / (η·sinψ + √(η − cos²ψ))
 * with η = εr − j·60·λ·σ and the principal square root.
 *
 * Reference: the Fresnel equations in grazing-angle form as in J. D. Parsons, "The Mobile Radio
 * Propagation Channel", 2nd ed., Wiley 2000, §2.3 (reflection from a plane surface) — cited
 * from memory, section number not re-checked; the same coefficients appear in terms of the angle
 * of incidence θ = π/2 − ψ in ITU-R P.2040-3 §2. Sign convention for R_v: the ratio of
 * reflected to incident E-field normal-plane components such that R_v → −1 at grazing and
 * R_v → +1 for a perfect conductor (common practice in ground-reflection work; some texts use
 * the opposite sign for R_v).
 *
 * Validity: any ψ in [0, π/2], smooth surface (see `roughnessFactor` for the Rayleigh
 * criterion), plane-wave incidence (see `divergenceFactor` for a spherical Earth).
 * Limits: ψ → 0 gives R → −1 for both polarisations; σ = Infinity means a perfect conductor
 * (R_h = −1, R_v = +1 at every ψ); η = 1 (εr = 1, σ = 0: no contrast with the air above) gives
 * R = 0 at every ψ, where the formulas would give 0/0 at ψ = 0. ψ outside [0, π/2] or
 * non-finite inputs give NaN.
 * @param opts.epsilon_r relative permittivity (dimensionless)
 * @param opts.sigma_s_m conductivity (S/m); Infinity for a perfect conductor
 * @param opts.frequency_ghz frequency (GHz)
 * @param opts.grazing_angle_rad grazing angle ψ (rad)
 * @param opts.polarization "horizontal" or "vertical"
 */
export function reflectionCoefficient(opts: {
  epsilon_r: number;
  sigma_s_m: number;
  frequency_ghz: number;
  grazing_angle_rad: number;
  polarization: Polarization;
}): ReflectionCoefficient {
  const { epsilon_r, sigma_s_m, frequency_ghz, grazing_angle_rad: psi, polarization } = opts;
  const bad =
    !(psi >= 0 && psi <= Math.PI / 2) ||
    !Number.isFinite(epsilon_r) ||
    !(sigma_s_m >= 0) ||
    !(frequency_ghz > 0) ||
    !Number.isFinite(frequency_ghz) ||
    (polarization !== "horizontal" && polarization !== "vertical");
  if (bad) return fromComplex(complex(NaN, NaN));
  if (sigma_s_m === Infinity) return fromComplex(complex(polarization === "horizontal" ? -1 : 1, 0));
  if (epsilon_r === 1 && sigma_s_m === 0) return fromComplex(complex(0, 0)); // no interface, no reflection

  const eta = complexPermittivity(epsilon_r, sigma_s_m, frequency_ghz);
  const sinPsi = Math.sin(psi);
  const cosPsi = Math.cos(psi);
  const root = csqrt(csub(eta, complex(cosPsi * cosPsi))); // √(η − cos²ψ)
  if (polarization === "horizontal") {
    const s = complex(sinPsi);
    return fromComplex(cdiv(csub(s, root), cadd(s, root))); // Fresnel R_h (Parsons §2.3)
  }
  const etaSin = cmul(eta, complex(sinPsi));
  return fromComplex(cdiv(csub(etaSin, root), cadd(etaSin, root))); // Fresnel R_v (Parsons §2.3)
}

function fromComplex(z: Complex): ReflectionCoefficient {
  const phase = carg(z);
  // atan2(−0, −1) = −π: fold onto +π so the phase stays in (−π, π]
  return { magnitude: cabs(z), phase_rad: phase === -Math.PI ? Math.PI : phase, re: z.re, im: z.im };
}
