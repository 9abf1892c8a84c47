/**
 * Small complex-number helpers for the reflection and two-ray code: a plain {re, im} value and
 * the handful of operations those formulas need. Every function returns a new value.
 *
 * Method: textbook complex arithmetic; `csqrt` is the principal square root (Re ≥ 0), computed
 * in the cancellation-free form sqrt((|z| + |re|)/2) (Kahan's rearrangement — common practice);
 * `cdiv` uses Smith's algorithm so that large permittivities (sea water, σ → ∞) do not overflow.
 * NaN in any part gives NaN out.
 */
export interface Complex {
  readonly re: number;
  readonly im: number;
}

/** z = re + j·im. */
export function complex(re: number, im = 0): Complex {
  return { re, im };
}

/** z = r·e^{jθ}. @param r magnitude @param theta_rad phase (rad) */
export function fromPolar(r: number, theta_rad: number): Complex {
  return { re: r * Math.cos(theta_rad), im: r * Math.sin(theta_rad) };
}

export function cadd(a: Complex, b: Complex): Complex {
  return { re: a.re + b.re, im: a.im + b.im };
}

export function csub(a: Complex, b: Complex): Complex {
  return { re: a.re - b.re, im: a.im - b.im };
}

export function cmul(a: Complex, b: Complex): Complex {
  return { re: a.re * b.re - a.im * b.im, im: a.re * b.im + a.im * b.re };
}

/** a·s for a real s. */
export function cscale(a: Complex, s: number): Complex {
  return { re: a.re * s, im: a.im * s };
}

/** a / b by Smith's algorithm (1962): scales by the larger part of b to avoid overflow. */
export function cdiv(a: Complex, b: Complex): Complex {
  if (Math.abs(b.re) >= Math.abs(b.im)) {
    const r = b.im / b.re;
    const den = b.re + b.im * r;
    return { re: (a.re + a.im * r) / den, im: (a.im - a.re * r) / den };
  }
  const r = b.re / b.im;
  const den = b.re * r + b.im;
  return { re: (a.re * r + a.im) / den, im: (a.im * r - a.re) / den };
}

/** |z|, overflow-safe. */
export function cabs(z: Complex): number {
  return Math.hypot(z.re, z.im);
}

/** arg z in (−π, π]. */
export function carg(z: Complex): number {
  return Math.atan2(z.im, z.re);
}

/** Principal square root (Re ≥ 0; branch cut on the negative real axis, Im follows the sign of z.im). */
export function csqrt(z: Complex): Complex {
  if (Number.isNaN(z.re) || Number.isNaN(z.im)) return { re: NaN, im: NaN };
  if (z.re === 0 && z.im === 0) return { re: 0, im: 0 };
  const t = Math.sqrt((cabs(z) + Math.abs(z.re)) / 2);
  if (z.re >= 0) return { re: t, im: z.im / (2 * t) };
  return { re: Math.abs(z.im) / (2 * t), im: z.im >= 0 ? t : -t };
}

/** e^{jθ} for a real θ. */
export function cexpj(theta_rad: number): Complex {
  return { re: Math.cos(theta_rad), im: Math.sin(theta_rad) };
}
