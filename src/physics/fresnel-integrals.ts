/**
 * Fresnel integrals C(x) = ∫₀ˣ cos(πt²/2) dt and S(x) = ∫₀ˣ sin(πt²/2) dt, the
 * normalisation of Abramowitz & Stegun §7.3.1–7.3.2 (and of ITU-R P.526-15 §2.7).
 *
 * Method (Abramowitz & Stegun, Handbook of Mathematical Functions, 1964, §7.3 and §7.1):
 * - |x| ≤ 2.5: the power series A&S 7.3.11 and 7.3.13, summed together in one recurrence
 *   over t^k/k! with t = πx²/2. The largest term is about e^t/√(2πt) ≈ 1e3 at x = 2.5, so
 *   rounding costs at most about 1e-13.
 * - |x| > 2.5: A&S 7.3.22, C + iS = ((1+i)/2)·erf(z) with z = (√π/2)(1−i)x, written as
 *   C + iS = (1+i)/2 − G·e^{iπx²/2}, G = (1+i)/(2√π)·K(z), where K(z) = √π·e^{z²}·erfc(z) is
 *   the continued fraction A&S 7.1.14 in its even (contracted) form
 *   K(z) = 2z / (2z²+1 − 1·2/(2z²+5 − 3·4/(2z²+9 − …))), evaluated with the modified Lentz
 *   algorithm. G is the complex form of the auxiliary functions f, g of A&S 7.3.5–7.3.6
 *   (G = g + i·f, about i/(πx) for large x), so no cancellation occurs. Here 2z² = −iπx².
 *   The phase πx²/2 is reduced with x² split exactly into a double plus its rounding error
 *   (Veltkamp/Dekker product), so the result stays accurate for large x.
 * Accuracy: |error| < 1e-12 in C and S against SciPy 1.17 `scipy.special.fresnel` for
 * x ∈ [−3, 10] (test/reference/fresnel-integrals.test.ts); both are odd functions and
 * tend to ±1/2 as x → ±∞.
 *
 * Validity: every real x. NaN gives NaN; ±Infinity gives ±1/2.
 * @param x argument (dimensionless; ν in the knife-edge formulas)
 * @returns C(x) and S(x) (dimensionless)
 */
export function fresnelIntegrals(x: number): { C: number; S: number } {
  if (Number.isNaN(x)) return { C: NaN, S: NaN };
  const sign = x < 0 ? -1 : 1;
  const ax = Math.abs(x);
  if (ax === Infinity) return { C: sign * 0.5, S: sign * 0.5 };
  if (ax <= 2.5) {
    const r = fresnelSeries(ax);
    return { C: sign * r.C, S: sign * r.S };
  }
  const r = fresnelContinuedFraction(ax);
  return { C: sign * r.C, S: sign * r.S };
}

/** Power series A&S 7.3.11 (C) and 7.3.13 (S) for x ≥ 0. */
function fresnelSeries(x: number): { C: number; S: number } {
  const t = (Math.PI / 2) * x * x;
  // term_k = t^k / k!; C takes k = 0, 2, 4, … with signs +, −, +, …; S takes k = 1, 3, 5, …
  // each divided by (2k + 1) — A&S 7.3.11 and 7.3.13 with 4n+1 = 2k+1 (k = 2n) and
  // 4n+3 = 2k+1 (k = 2n+1).
  let term = 1;
  let c = 0;
  let s = 0;
  for (let k = 0; k < 200; k++) {
    const contribution = term / (2 * k + 1);
    const phase = k & 3; // 0: +C, 1: +S, 2: −C, 3: −S
    if (phase === 0) c += contribution;
    else if (phase === 1) s += contribution;
    else if (phase === 2) c -= contribution;
    else s -= contribution;
    if (contribution < 1e-17 * (Math.abs(c) + Math.abs(s))) break;
    term *= t / (k + 1);
  }
  return { C: x * c, S: x * s }; // A&S 7.3.11, 7.3.13
}

/** A&S 7.3.22 with the continued fraction A&S 7.1.14 (even form) for x > 2.5. */
function fresnelContinuedFraction(x: number): { C: number; S: number } {
  const pix2 = Math.PI * x * x; // 2z² = −i·π·x²
  // Modified Lentz for f = b0 + a1/(b1 + a2/(b2 + …)), a_k = −(2k−1)(2k), b_k = (4k+1) − iπx².
  const tiny = 1e-300;
  let fr = 1;
  let fi = -pix2; // b0 = 2z² + 1
  let cr = fr;
  let ci = fi;
  let dr = 0;
  let di = 0;
  for (let k = 1; k < 1000; k++) {
    const a = -(2 * k - 1) * (2 * k);
    const br = 4 * k + 1;
    const bi = -pix2;
    // D = 1 / (b + a·D)
    let tr = br + a * dr;
    let ti = bi + a * di;
    if (tr === 0 && ti === 0) tr = tiny;
    let m = tr * tr + ti * ti;
    dr = tr / m;
    di = -ti / m;
    // C = b + a / C
    m = cr * cr + ci * ci;
    cr = br + (a * cr) / m;
    ci = bi - (a * ci) / m;
    if (cr === 0 && ci === 0) cr = tiny;
    // Δ = C·D; f ← f·Δ
    const delr = cr * dr - ci * di;
    const deli = cr * di + ci * dr;
    const nfr = fr * delr - fi * deli;
    fi = fr * deli + fi * delr;
    fr = nfr;
    if (Math.abs(delr - 1) + Math.abs(deli) < 1e-16) break;
  }
  // K = 2z / f with z = a(1 − i), a = (√π/2)x.
  const a = (Math.sqrt(Math.PI) / 2) * x;
  const m = fr * fr + fi * fi;
  const kr = (2 * a * (fr - fi)) / m; // 2a(1−i)·conj(f)/|f|², real part: 2a(fr − fi)
  const ki = (2 * a * (-fr - fi)) / m; // imaginary part: 2a(−fi − fr)
  // G = (1+i)/(2√π)·K
  const g = 1 / (2 * Math.sqrt(Math.PI));
  const Gr = g * (kr - ki);
  const Gi = g * (kr + ki);
  // e^{iθ}, θ = (π/2)·(x² mod 4), x² taken exactly as p + e.
  const p = x * x;
  const split = 134217729 * x; // 2^27 + 1: Veltkamp split of x into hi + lo
  const hi = split - (split - x);
  const lo = x - hi;
  const e = hi * hi - p + 2 * hi * lo + lo * lo;
  const theta = (Math.PI / 2) * ((p % 4) + e);
  const cos = Math.cos(theta);
  const sin = Math.sin(theta);
  return {
    C: 0.5 - (Gr * cos - Gi * sin), // A&S 7.3.22
    S: 0.5 - (Gr * sin + Gi * cos), // A&S 7.3.22
  };
}
