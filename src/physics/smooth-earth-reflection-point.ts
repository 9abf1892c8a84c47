import { SPEED_OF_LIGHT_M_S } from "./constants.ts";

export interface SmoothEarthReflection {
  /** distance from end 1 to the reflection point (m) */
  d1_m: number;
  /** distance from the reflection point to end 2 (m) */
  d2_m: number;
  /** height of antenna 1 above the plane tangent at the reflection point, h1' = h1 − d1²/(2ae) (m) */
  h1_eff_m: number;
  /** height of antenna 2 above that plane, h2' = h2 − d2²/(2ae) (m) */
  h2_eff_m: number;
  /** grazing angle ψ at the reflection point (rad) */
  grazing_angle_rad: number;
  /** reflected minus direct path length (m) */
  path_difference_m: number;
  /** delay of the reflected ray behind the direct one (ns) */
  delay_ns: number;
}

/**
 * Specular reflection point on a smooth spherical Earth of effective radius ae, for antennas h1
 * and h2 above the surface a distance d apart.
 *
 * Method: the reflection point solves the cubic 2·d1³ − 3·d·d1² + (d² − 2·ae·(h1 + h2))·d1
 * + 2·ae·h1·d = 0 (equal angles to the tangent plane in the parabolic-Earth approximation),
 * in the closed trigonometric form of ITU-R P.526-15 §3.2 (equation numbers not re-checked):
 *   c = (h1 − h2)/(h1 + h2),  m = d²/(4·ae·(h1 + h2)),
 *   b = 2·√((m + 1)/(3m))·cos(π/3 + ⅓·arccos((3c/2)·√(3m/(m + 1)³))),
 *   d1 = d·(1 + b)/2,  d2 = d − d1.
 * Numerical rearrangement: with q = (3c/2)·√(3m/(m + 1)³), cos(π/3 + ⅓·arccos q) =
 * sin(⅓·arcsin q) exactly; that form does not cancel as m → 0 (large ae), where b → c and
 * d1 → d·h1/(h1 + h2), the flat-Earth point. ae = Infinity uses b = c directly.
 * Then h1' = h1 − d1²/(2ae), h2' = h2 − d2²/(2ae) (P.526-15 §3.2), and, in the tangent-plane
 * frame, ψ = atan((h1' + h2')/d) and Δ = √(d² + (h1' + h2')²) − √(d² + (h1' − h2')²),
 * evaluated as 4·h1'·h2'/(sum of the two roots) to avoid cancellation (common practice).
 *
 * Validity: line-of-sight paths with d ≪ ae and h1, h2 ≪ ae (parabolic approximation of the
 * sphere; see the test for the measured difference from an exact spherical solution). If either
 * h1' or h2' is ≤ 0 the reflection point is not visible from both ends and every field is NaN;
 * so is every field for non-finite or non-positive inputs.
 * @param h1_m height of antenna 1 above the smooth Earth (m)
 * @param h2_m height of antenna 2 above the smooth Earth (m)
 * @param d_m path length along the surface (m)
 * @param ae_m effective Earth radius (m); Infinity for a flat Earth
 */
export function smoothEarthReflectionPoint(h1_m: number, h2_m: number, d_m: number, ae_m: number): SmoothEarthReflection {
  const h1 = h1_m;
  const h2 = h2_m;
  const d = d_m;
  const ae = ae_m;
  if (!(h1 > 0) || !(h2 > 0) || !(d > 0) || !(ae > 0) || !Number.isFinite(h1 + h2 + d)) return nanResult();

  const c = (h1 - h2) / (h1 + h2); // P.526-15 §3.2, c
  let b: number;
  if (ae === Infinity) {
    b = c; // limit m → 0 of the expression below
  } else {
    const m = (d * d) / (4 * ae * (h1 + h2)); // P.526-15 §3.2, m
    const q = 1.5 * c * Math.sqrt((3 * m) / Math.pow(m + 1, 3));
    b = 2 * Math.sqrt((m + 1) / (3 * m)) * Math.sin(Math.asin(q) / 3); // P.526-15 §3.2, b (rearranged, see doc)
  }
  const d1 = (d * (1 + b)) / 2; // P.526-15 §3.2, d1
  const d2 = d - d1; // P.526-15 §3.2, d2
  const h1e = ae === Infinity ? h1 : h1 - (d1 * d1) / (2 * ae); // P.526-15 §3.2, h1'
  const h2e = ae === Infinity ? h2 : h2 - (d2 * d2) / (2 * ae); // P.526-15 §3.2, h2'
  if (!(h1e > 0) || !(h2e > 0)) return nanResult();

  const rReflected = Math.hypot(d, h1e + h2e);
  const rDirect = Math.hypot(d, h1e - h2e);
  const delta = (4 * h1e * h2e) / (rReflected + rDirect); // Δ = rReflected − rDirect, cancellation-free
  return {
    d1_m: d1,
    d2_m: d2,
    h1_eff_m: h1e,
    h2_eff_m: h2e,
    grazing_angle_rad: Math.atan((h1e + h2e) / d), // tangent-plane geometry (common practice)
    path_difference_m: delta,
    delay_ns: (delta / SPEED_OF_LIGHT_M_S) * 1e9,
  };
}

function nanResult(): SmoothEarthReflection {
  return {
    d1_m: NaN,
    d2_m: NaN,
    h1_eff_m: NaN,
    h2_eff_m: NaN,
    grazing_angle_rad: NaN,
    path_difference_m: NaN,
    delay_ns: NaN,
  };
}
