/** Ground and polarisation options of the spherical-Earth first-term loss. */
export interface FirstTermOptions {
  /** fraction of the path over sea, 0–1 (default 0, all land) */
  omega?: number;
  /** polarisation: "h" horizontal (default) or "v" vertical */
  polarization?: "h" | "v";
  /** relative permittivity of land (default 22) */
  epsilon_r?: number;
  /** conductivity of land (S/m) (default 0.003) */
  sigma_s_m?: number;
  /**
   * frequency (GHz): when given, the practical-unit form of P.1812-6 eq. (29)–(36) and
   * P.452-18 §4.2.2.1 (constants 0.036, 21.88, 0.9575 with f in GHz, km) is used, as those
   * Recommendations print it; otherwise the SI form of P.526-15
   */
  frequency_ghz?: number;
}

/**
 * First-term spherical-Earth diffraction loss (dB) for a path over land and sea:
 * Ldft = ω·Ldft(εr = 80, σ = 5 S/m) + (1 − ω)·Ldft(εr, σ), each
 * Ldft = −F(X) − G(Y1) − G(Y2), the first term of the residue series.
 *
 * Method: ITU-R P.526-15 §3.1.1 in its consistent-unit (SI) form, with the land/sea mix of
 * P.452-17 §4.2.2.1:
 *   K_H = (2π·a/λ)^(−1/3)·[(εr − 1)² + (60·λ·σ)²]^(−1/4), K_V = K_H·[εr² + (60·λ·σ)²]^(1/2);
 *   β = (1 + 1.6K² + 0.67K⁴)/(1 + 4.5K² + 1.53K⁴);
 *   X = β·(π/(λ·a²))^(1/3)·d, Y = 2β·(π²/(λ²·a))^(1/3)·h;
 *   F(X) = 11 + 10·log10(X) − 17.6·X for X ≥ 1.6, else −20·log10(X) − 5.6488·X^1.425;
 *   B = β·Y, G(Y) = 17.6·(B − 1.1)^0.5 − 5·log10(B − 1.1) − 8 for B > 2,
 *   else 20·log10(B + 0.1·B³), and not below 2 + 20·log10(K).
 * The practical-unit constants of P.452-17 (21.88, 0.9575, 0.036 with f in GHz) are these
 * for c = 3e8 m/s rounded to 4 digits; the ITU validation examples (λ = 0.3/f) follow the
 * unrounded form, which moves Ldsph by up to 0.01 dB, so this one is used.
 * (Equation numbers are not quoted: the tags name the section and the quantity.)
 * Validity: the first term alone is accurate beyond the radio horizon; used inside the
 * spherical-Earth method (P.526-15 §3.2: 10 MHz and above). NaN in gives NaN.
 * @param d_m path length (m)
 * @param hte_m Tx height above the smooth Earth (m)
 * @param hre_m Rx height above the smooth Earth (m)
 * @param adft_m effective Earth radius used in the term (m)
 * @param lambda_m wavelength (m)
 * @param options sea fraction ω, polarisation, land εr and σ (S/m)
 * @returns Ldft (dB)
 */
export function sphericalEarthFirstTermLoss(
  d_m: number,
  hte_m: number,
  hre_m: number,
  adft_m: number,
  lambda_m: number,
  options: FirstTermOptions = {},
): number {
  const omega = options.omega ?? 0;
  const vertical = options.polarization === "v";
  const epsilonR = options.epsilon_r ?? 22;
  const sigma = options.sigma_s_m ?? 0.003;
  const f = options.frequency_ghz;
  const land = f !== undefined ? firstTermPractical(d_m, hte_m, hre_m, adft_m, f, epsilonR, sigma, vertical) : firstTerm(d_m, hte_m, hre_m, adft_m, lambda_m, epsilonR, sigma, vertical);
  if (omega === 0) return land;
  const sea = f !== undefined ? firstTermPractical(d_m, hte_m, hre_m, adft_m, f, 80, 5, vertical) : firstTerm(d_m, hte_m, hre_m, adft_m, lambda_m, 80, 5, vertical);
  return omega * sea + (1 - omega) * land; // P.452-17 §4.2.2.1 (Ldft, land/sea mix)
}

/** −F(X) − G(Y1) − G(Y2) for one ground type, SI units. */
function firstTerm(d: number, h1: number, h2: number, a: number, lambda: number, epsilonR: number, sigma: number, vertical: boolean): number {
  const s60 = 60 * lambda * sigma;
  const KH = Math.cbrt(lambda / (2 * Math.PI * a)) * Math.pow((epsilonR - 1) ** 2 + s60 * s60, -0.25); // P.526-15 §3.1.1.1 (K_H)
  const K = vertical ? KH * Math.sqrt(epsilonR * epsilonR + s60 * s60) : KH; // P.526-15 §3.1.1.1 (K_V)
  const K2 = K * K;
  const K4 = K2 * K2;
  const beta = (1 + 1.6 * K2 + 0.67 * K4) / (1 + 4.5 * K2 + 1.53 * K4); // P.526-15 §3.1.1.2 (β)
  const X = beta * Math.cbrt(Math.PI / (lambda * a * a)) * d; // P.526-15 §3.1.1.2 (X)
  const yScale = 2 * beta * Math.cbrt((Math.PI * Math.PI) / (lambda * lambda * a));
  const Y1 = yScale * h1; // P.526-15 §3.1.1.2 (Y)
  const Y2 = yScale * h2; // P.526-15 §3.1.1.2 (Y)
  const Fx = X >= 1.6 ? 11 + 10 * Math.log10(X) - 17.6 * X : -20 * Math.log10(X) - 5.6488 * Math.pow(X, 1.425); // P.526-15 §3.1.1.2 (F(X))
  const Gmin = 2 + 20 * Math.log10(K);
  return -Fx - sphericalEarthHeightGain(beta * Y1, Gmin) - sphericalEarthHeightGain(beta * Y2, Gmin); // P.526-15 §3.1.1.2 (L = −F − G − G)
}

/**
 * −F(X) − G(Y1) − G(Y2) in the practical units of P.1812-6 eq. (29)–(36) (= P.452-18
 * §4.2.2.1): K_H = 0.036·(a·f)^(−1/3)·[(εr − 1)² + (18σ/f)²]^(−1/4), K_V = K_H·[εr² + (18σ/f)²]^(1/2),
 * X = 21.88·β·(f/a²)^(1/3)·d, Y = 0.9575·β·(f²/a)^(1/3)·h (a, d in km, h in m, f in GHz).
 */
function firstTermPractical(d_m: number, h1: number, h2: number, a_m: number, f: number, epsilonR: number, sigma: number, vertical: boolean): number {
  const a = a_m / 1000;
  const d = d_m / 1000;
  // one cube root of a and one of f: (a·f)^(−1/3), (f/a²)^(1/3), (f²/a)^(1/3) are products of them;
  // the terms of f and the ground alone are kept from the previous call with the same ones
  const g = groundTerms(f, epsilonR, sigma, vertical);
  const ca = Math.cbrt(1 / a);
  const cf = g.cf;
  const K = ca * g.kScale; // P.1812-6 eq. (29a), (29b)
  const K2 = K * K;
  const K4 = K2 * K2;
  const beta = (1 + 1.6 * K2 + 0.67 * K4) / (1 + 4.5 * K2 + 1.53 * K4); // P.1812-6 eq. (30)
  const X = 21.88 * beta * cf * ca * ca * d; // P.1812-6 eq. (31)
  const yScale = 0.9575 * beta * cf * cf * ca;
  const Fx = X >= 1.6 ? 11 + 10 * Math.log10(X) - 17.6 * X : -20 * Math.log10(X) - 5.6488 * Math.exp(1.425 * Math.log(X)); // P.1812-6 eq. (33)
  const Gmin = 2 + 20 * Math.log10(K);
  return -Fx - sphericalEarthHeightGain(beta * yScale * h1, Gmin) - sphericalEarthHeightGain(beta * yScale * h2, Gmin); // P.1812-6 eq. (32), (34)–(36)
}

/** f^(1/3) and K/a^(−1/3) of P.1812-6 eq. (29a), (29b) for the last frequency and ground asked for. */
const lastGround = { f: NaN, epsilonR: NaN, sigma: NaN, vertical: false, cf: NaN, kScale: NaN };

function groundTerms(f: number, epsilonR: number, sigma: number, vertical: boolean): typeof lastGround {
  const g = lastGround;
  if (g.f === f && g.epsilonR === epsilonR && g.sigma === sigma && g.vertical === vertical) return g;
  const s18 = (18 * sigma) / f;
  const cf = Math.cbrt(f);
  const kh = 0.036 / cf / Math.sqrt(Math.sqrt((epsilonR - 1) ** 2 + s18 * s18)); // P.1812-6 eq. (29a), times a^(1/3)
  g.f = f;
  g.epsilonR = epsilonR;
  g.sigma = sigma;
  g.vertical = vertical;
  g.cf = cf;
  g.kScale = vertical ? kh * Math.sqrt(epsilonR * epsilonR + s18 * s18) : kh; // P.1812-6 eq. (29b)
  return g;
}

/**
 * Height-gain function G(Y) (dB) of P.526-15 §3.1.1.2 with B = β·Y, floored at Gmin
 * (Gmin = 2 + 20·log10 K). Valid for B ≥ 0; NaN in, NaN out.
 */
export function sphericalEarthHeightGain(B: number, Gmin: number): number {
  const G = B > 2 ? 17.6 * Math.sqrt(B - 1.1) - 5 * Math.log10(B - 1.1) - 8 : 20 * Math.log10(B + 0.1 * B * B * B); // P.526-15 §3.1.1.2 (G(Y))
  return G < Gmin ? Gmin : G;
}
