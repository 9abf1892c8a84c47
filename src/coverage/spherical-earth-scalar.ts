import { sphericalEarthHeightGain } from "../physics/spherical-earth-first-term.ts";

/** Ground and polarisation of the spherical-Earth term, resolved once per coverage. */
export interface SphericalGround {
  /** relative permittivity of land */
  epsilon_r: number;
  /** conductivity of land (S/m) */
  sigma_s_m: number;
  /** true for vertical polarisation */
  vertical: boolean;
}

/**
 * Spherical-Earth diffraction loss Ldsph (dB) — the same equations as
 * `sphericalEarthDiffractionLoss` (src/physics/spherical-earth-diffraction.ts) and its first
 * term (spherical-earth-first-term.ts), for an all-land path (ω = 0), returning only the
 * number so that a coverage can call it for every cell without allocating. One difference:
 * the argument of acos and b itself are clamped to [−1, 1] (see there): for an antenna very
 * low over the smooth surface, rounding can push them outside and the physics function then
 * gives NaN. Heights of exactly 0 still give NaN (the method's h/hreq is 0/0 there); the
 * coverage inputs require antennas above ground, which keeps hts', hrs' > 0.
 *
 * Method: ITU-R P.526-15 §3.2 with the first term of §3.1.1 in SI units; see the physics
 * functions for the equations and their tags. Checked against them in
 * test/coverage/incremental-delta-bullington.test.ts.
 * @param d_m path length (m)
 * @param h1_m Tx height above the smooth Earth (m)
 * @param h2_m Rx height above the smooth Earth (m)
 * @param ae_m effective Earth radius (m), Infinity gives 0
 * @param lambda_m wavelength (m)
 * @param g ground constants and polarisation
 */
export function sphericalEarthLossScalar(d_m: number, h1_m: number, h2_m: number, ae_m: number, lambda_m: number, g: SphericalGround): number {
  const d = d_m;
  const a = ae_m;
  const h1 = h1_m;
  const h2 = h2_m;
  const dlos = Math.sqrt(2 * a) * (Math.sqrt(h1) + Math.sqrt(h2)); // P.526-15 §3.2 (dlos)
  if (dlos !== dlos || d !== d) return NaN;
  if (a === Infinity) return 0;
  if (d >= dlos) return firstTermLoss(d, h1, h2, a, lambda_m, g); // P.526-15 §3.2 (d ≥ dlos)
  const c = (h1 - h2) / (h1 + h2); // P.526-15 §3.2 (c)
  const m = (d * d) / (4 * a * (h1 + h2)); // P.526-15 §3.2 (m)
  // The acos argument lies in [−1, 1]; it reaches ±1 only for c = ±1 (an antenna on the smooth
  // surface) at m = 1/2, where rounding can push it just outside: clamp it there.
  // b lies in [−1, 1] (d1 between the terminals); clamp it against the same rounding.
  const arg = ((3 * c) / 2) * Math.sqrt((3 * m) / ((m + 1) ** 3));
  const b0 = 2 * Math.sqrt((m + 1) / (3 * m)) * Math.cos(Math.PI / 3 + (1 / 3) * Math.acos(arg > 1 ? 1 : arg < -1 ? -1 : arg)); // P.526-15 §3.2 (b)
  const b = b0 > 1 ? 1 : b0 < -1 ? -1 : b0;
  const d1 = (d / 2) * (1 + b); // P.526-15 §3.2 (d1)
  const d2 = d - d1; // P.526-15 §3.2 (d2)
  const h = ((h1 - (d1 * d1) / (2 * a)) * d2 + (h2 - (d2 * d2) / (2 * a)) * d1) / d; // P.526-15 §3.2 (h)
  const hreq = 0.552 * Math.sqrt((d1 * d2 * lambda_m) / d); // P.526-15 §3.2 (hreq)
  if (h > hreq) return 0;
  const aem = 0.5 * (d / (Math.sqrt(h1) + Math.sqrt(h2))) ** 2; // P.526-15 §3.2 (aem)
  const Ldft = firstTermLoss(d, h1, h2, aem, lambda_m, g);
  return Ldft < 0 ? 0 : (1 - h / hreq) * Ldft; // P.526-15 §3.2 (A = (1 − h/hreq)·Ah)
}

/** −F(X) − G(Y1) − G(Y2) of P.526-15 §3.1.1 for one land ground type, SI units. */
function firstTermLoss(d: number, h1: number, h2: number, a: number, lambda: number, g: SphericalGround): number {
  // cbrt(1/a) once; the three cube roots of §3.1.1 are it times constants of λ
  const ca = Math.cbrt(1 / a);
  const s60 = 60 * lambda * g.sigma_s_m;
  const er = g.epsilon_r;
  const KH = Math.cbrt(lambda / (2 * Math.PI)) * ca * Math.pow((er - 1) * (er - 1) + s60 * s60, -0.25); // P.526-15 §3.1.1.1 (K_H)
  const K = g.vertical ? KH * Math.sqrt(er * er + s60 * s60) : KH; // P.526-15 §3.1.1.1 (K_V)
  const K2 = K * K;
  const K4 = K2 * K2;
  const beta = (1 + 1.6 * K2 + 0.67 * K4) / (1 + 4.5 * K2 + 1.53 * K4); // P.526-15 §3.1.1.2 (β)
  const X = beta * Math.cbrt(Math.PI / lambda) * ca * ca * d; // P.526-15 §3.1.1.2 (X)
  const yScale = 2 * beta * Math.cbrt((Math.PI * Math.PI) / (lambda * lambda)) * ca;
  const Fx = X >= 1.6 ? 11 + 10 * Math.log10(X) - 17.6 * X : -20 * Math.log10(X) - 5.6488 * Math.pow(X, 1.425); // P.526-15 §3.1.1.2 (F(X))
  const Gmin = 2 + 20 * Math.log10(K);
  return -Fx - sphericalEarthHeightGain(beta * yScale * h1, Gmin) - sphericalEarthHeightGain(beta * yScale * h2, Gmin); // P.526-15 §3.1.1.2 (L = −F − G − G)
}
