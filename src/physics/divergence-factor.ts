/**
 * Divergence factor D of a ray reflected from a spherical (effective) Earth: the amplitude
 * reduction because the convex surface spreads the reflected beam,
 *   D = [1 + 2·d1·d2 / (ae·d·sin ψ)]^(−1/2),   d = d1 + d2.
 *
 * Reference: common practice — the small-angle form found in D. E. Kerr (ed.), "Propagation of
 * Short Radio Waves", MIT Rad. Lab. Series vol. 13, 1951 (ch. 2), and in Beckmann & Spizzichino
 * (1963); cited from memory without a checked equation number.
 * Validity: d ≪ ae, ψ small but not below the grazing region where ray optics fails
 * (ψ ≳ (λ/ae)^(1/3) — common practice); D → 1 as ae → ∞. Non-finite or negative distances,
 * ψ ≤ 0 or ae ≤ 0 give NaN (ae = Infinity gives 1).
 * @param opts.d1_m distance from the first end to the reflection point (m)
 * @param opts.d2_m distance from the reflection point to the second end (m)
 * @param opts.grazing_angle_rad grazing angle ψ (rad)
 * @param opts.ae_m effective Earth radius (m); Infinity for a flat Earth
 */
export function divergenceFactor(opts: {
  d1_m: number;
  d2_m: number;
  grazing_angle_rad: number;
  ae_m: number;
}): number {
  const { d1_m: d1, d2_m: d2, grazing_angle_rad: psi, ae_m: ae } = opts;
  if (!(d1 >= 0) || !(d2 >= 0) || !Number.isFinite(d1 + d2) || !(psi > 0) || !(psi <= Math.PI / 2) || !(ae > 0)) {
    return NaN;
  }
  if (ae === Infinity) return 1;
  const d = d1 + d2;
  if (d === 0) return 1;
  return 1 / Math.sqrt(1 + (2 * d1 * d2) / (ae * d * Math.sin(psi))); // Kerr (1951) divergence factor
}
