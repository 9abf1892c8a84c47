/** Range in which a diffraction method is used without a warning. */
export interface DiffractionValidity {
  /** frequency range (GHz) */
  frequency_ghz: { min: number; max: number };
  /** path length range (m) */
  distance_m: { min: number; max: number };
  /** where the range comes from */
  source: string;
  /** conditions that a range cannot express */
  note: string;
}

/**
 * Ranges of the diffraction methods in src/physics/, for warnings at the boundary (the
 * functions themselves compute outside them).
 *
 * The Recommendations' own words, as far as they bound these methods (scope clauses quoted
 * from memory of the texts, not from a copy at hand):
 * - ITU-R P.526-15 gives the knife-edge J(ν) (§4.1) and the delta-Bullington method (§4.5)
 *   without a frequency limit of their own; its spherical-Earth method (§3.2) is stated for
 *   10 MHz and above. The same delta-Bullington scheme is used by P.452-17 §4.2 (scope about
 *   0.1–50 GHz) and by P.1812-6 §4.3 (30 MHz–6 GHz, 0.25–3 000 km). The range below is the
 *   envelope of those uses, 30 MHz–50 GHz.
 * - Knife-edge methods (single edge, Deygout, Epstein–Peterson) rest on the paraxial
 *   Fresnel–Kirchhoff approximation: d1, d2 ≫ λ, obstacle heights ≪ d1, d2, edges thin
 *   compared with the Fresnel zone. Deygout and Epstein–Peterson are common practice for
 *   a few well-separated edges; no ITU-R Recommendation in force sets their range, so the
 *   project uses the same 30 MHz–50 GHz envelope.
 * The distance limits are common practice, not the Recommendations': 1 km minimum (below
 * it profile sampling rather than the method limits accuracy), 200 km for the knife-edge
 * methods (terrestrial line-of-sight and near-line-of-sight links) and 3 000 km for the
 * Bullington schemes (the upper end of P.1812-6).
 */
export const DIFFRACTION_VALIDITY: Readonly<Record<
  "single_knife_edge" | "deygout" | "epstein_peterson" | "bullington" | "delta_bullington",
  DiffractionValidity
>> = Object.freeze({
  single_knife_edge: {
    frequency_ghz: { min: 0.03, max: 50 },
    distance_m: { min: 1_000, max: 200_000 },
    source: "ITU-R P.526-15 §4.1 eqs. (22), (26)–(27)",
    note: "One dominant obstacle; paraxial geometry (d1, d2 ≫ λ, h ≪ d1, d2). Underestimates several comparable obstacles.",
  },
  deygout: {
    frequency_ghz: { min: 0.03, max: 50 },
    distance_m: { min: 1_000, max: 200_000 },
    source: "Deygout (1966), common practice; J(ν) from ITU-R P.526-15 §4.1",
    note: "Main edge plus one subsidiary edge per side; overestimates closely spaced edges of similar height.",
  },
  epstein_peterson: {
    frequency_ghz: { min: 0.03, max: 50 },
    distance_m: { min: 1_000, max: 200_000 },
    source: "Epstein & Peterson (1953), common practice; J(ν) from ITU-R P.526-15 §4.1",
    note: "Edges of the stretched string; misestimates edges closer than a few Fresnel radii.",
  },
  bullington: {
    frequency_ghz: { min: 0.03, max: 50 },
    distance_m: { min: 1_000, max: 3_000_000 },
    source: "ITU-R P.526-15 §4.5.1 (= P.452-17 §4.2.1)",
    note: "Alone it underestimates long smooth paths; it is the first part of delta-Bullington.",
  },
  delta_bullington: {
    frequency_ghz: { min: 0.03, max: 50 },
    distance_m: { min: 1_000, max: 3_000_000 },
    source: "ITU-R P.526-15 §4.5; P.452-17 §4.2 (≈0.1–50 GHz); P.1812-6 §4.3 (0.03–6 GHz, 0.25–3000 km)",
    note: "General terrestrial paths; heights amsl with the smooth-Earth surface fitted to the profile.",
  },
});
