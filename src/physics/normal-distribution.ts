/**
 * The standard normal distribution: cumulative probability and its inverse, for the
 * location statistics of coverage (ITU-R P.1812-6 §4.8, P.2108-1, P.2109-1 use the
 * normal quantile; the location probability of a cell is its cumulative probability).
 */

/**
 * Complementary error function erfc(x), by the Chebyshev fit of Press et al., Numerical
 * Recipes (2nd ed., §6.2, `erfcc`): fractional error below 1.2e-7 everywhere. NaN → NaN.
 */
export function erfc(x: number): number {
  const z = Math.abs(x);
  const t = 1 / (1 + 0.5 * z);
  const r =
    t *
    Math.exp(
      -z * z -
        1.26551223 +
        t * (1.00002368 + t * (0.37409196 + t * (0.09678418 + t * (-0.18628806 + t * (0.27886807 + t * (-1.13520398 + t * (1.48851587 + t * (-0.82215223 + t * 0.17087277)))))))),
    );
  return x >= 0 ? r : 2 - r;
}

/**
 * Φ(x), the probability that a standard normal variable is at most x: erfc(−x/√2)/2.
 * Absolute error below 1e-7 (from erfc). NaN → NaN. Beyond ±9 the tails (below 1.2e-19) are
 * not computed: 0 and 1 (a coverage asks for many cells far from every threshold).
 */
export function normalCdf(x: number): number {
  if (x < -9) return 0;
  if (x > 9) return 1;
  return 0.5 * erfc(-x / Math.SQRT2);
}

const A = [-3.969683028665376e1, 2.209460984245205e2, -2.759285104469687e2, 1.38357751867269e2, -3.066479806614716e1, 2.506628277459239];
const B = [-5.447609879822406e1, 1.615858368580409e2, -1.556989798598866e2, 6.680131188771972e1, -1.328068155288572e1];
const C = [-7.784894002430293e-3, -3.223964580411365e-1, -2.400758277161838, -2.549732539343734, 4.374664141464968, 2.938163982698783];
const D = [7.784695709041462e-3, 3.224671290700398e-1, 2.445134137142996, 3.754408661907416];
const P_LOW = 0.02425;

/**
 * Φ⁻¹(p), the standard normal quantile, by P. J. Acklam's rational approximation (2003;
 * relative error below 1.15e-9 over (0, 1)); coefficients from memory of that publication,
 * checked against SciPy 1.17 `scipy.stats.norm.ppf` in test/unit/normal-distribution.test.ts.
 * @param p probability, 0 < p < 1 (0 → −∞, 1 → +∞, otherwise NaN)
 */
export function normalQuantile(p: number): number {
  if (!(p >= 0 && p <= 1)) return NaN;
  if (p === 0) return -Infinity;
  if (p === 1) return Infinity;
  if (p < P_LOW) {
    const q = Math.sqrt(-2 * Math.log(p));
    return (((((C[0] * q + C[1]) * q + C[2]) * q + C[3]) * q + C[4]) * q + C[5]) / ((((D[0] * q + D[1]) * q + D[2]) * q + D[3]) * q + 1);
  }
  if (p > 1 - P_LOW) {
    const q = Math.sqrt(-2 * Math.log(1 - p));
    return -(((((C[0] * q + C[1]) * q + C[2]) * q + C[3]) * q + C[4]) * q + C[5]) / ((((D[0] * q + D[1]) * q + D[2]) * q + D[3]) * q + 1);
  }
  const q = p - 0.5;
  const r = q * q;
  return ((((((A[0] * r + A[1]) * r + A[2]) * r + A[3]) * r + A[4]) * r + A[5]) * q) / (((((B[0] * r + B[1]) * r + B[2]) * r + B[3]) * r + B[4]) * r + 1);
}
