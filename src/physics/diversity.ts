import { multipathActivityFactor } from "./dispersive-fading.ts";

/**
 * Where the diversity-improvement formulas apply (for warnings at the boundary).
 * ITU-R P.530-16 §6.2.1 (space diversity, non-selective) was fitted to vertical spacings
 * 3–23 m, frequencies 2–11 GHz and paths 43–240 km; §6.2.1 frequency diversity to
 * 2–11 GHz, paths 30–70 km and Δf/f up to 5 % (ranges from memory of the text).
 */
export const DIVERSITY_P530_VALIDITY = {
  method: "ITU-R P.530-16 §6.2 (diversity improvement)",
  space: { spacing_m: [3, 23] as const, frequency_ghz: [2, 11] as const, distance_km: [43, 240] as const },
  frequency: { relative_spacing_pct: [0, 5] as const, frequency_ghz: [2, 11] as const, distance_km: [30, 70] as const },
} as const;

/**
 * Improvement factor of vertical space diversity for non-selective (flat) fading:
 * I_ns = [1 − exp(−0.04·S^0.87·f^−0.12·d^0.48·p0^−1.04)]·10^((A − V)/10),
 * V = |G1 − G2| the difference of the two receive antennas' gains (dB). The formula is a
 * deep-fade asymptote; below I = 1 (shallow fades, small spacing) it is bounded at 1, since a
 * second antenna cannot make the outage worse (common practice).
 * Reference: ITU-R P.530-16 §6.2 (space diversity; section and equation numbers from memory).
 * The formula, p0 in percent and the gain term 10^((A − V)/10) agree with an independent
 * public implementation (a PHP link calculator in the public code index, function SD).
 * @param S_m vertical separation of the receive antennas, centre to centre (m)
 * @param frequency_ghz frequency f (GHz)
 * @param distance_km path length d (km)
 * @param p0_pct multipath occurrence factor p0 (%), §2.3.2
 * @param A_db fade depth A (dB): the flat fade margin
 * @param V_db difference of the two antennas' gains |G1 − G2| (dB)
 */
export function spaceDiversityImprovement(S_m: number, frequency_ghz: number, distance_km: number, p0_pct: number, A_db: number, V_db: number): number {
  if (!(S_m > 0) || !(frequency_ghz > 0) || !(distance_km > 0) || !(p0_pct > 0) || !Number.isFinite(A_db) || !(V_db >= 0)) return NaN;
  const I = (1 - Math.exp(-0.04 * S_m ** 0.87 * frequency_ghz ** -0.12 * distance_km ** 0.48 * p0_pct ** -1.04)) * 10 ** ((A_db - V_db) / 10); // P.530-16 §6.2.1 (I_ns, space)
  return Math.max(1, I);
}

/**
 * Improvement factor of frequency diversity for non-selective fading:
 * I = (80/(f·d))·(Δf/f)·10^(F/10), bounded below at 1 (common practice, as above).
 * Reference: ITU-R P.530-16 §6.2 (frequency diversity; section and equation numbers from
 * memory). Agrees with the same independent PHP implementation, which also bounds I at 1.
 * @param frequency_ghz frequency f (GHz)
 * @param spacing_ghz frequency separation Δf (GHz)
 * @param distance_km path length d (km)
 * @param F_db fade depth F (dB): the flat fade margin
 */
export function frequencyDiversityImprovement(frequency_ghz: number, spacing_ghz: number, distance_km: number, F_db: number): number {
  if (!(frequency_ghz > 0) || !(spacing_ghz > 0) || !(distance_km > 0) || !Number.isFinite(F_db)) return NaN;
  const I = (80 / (frequency_ghz * distance_km)) * (spacing_ghz / frequency_ghz) * 10 ** (F_db / 10); // P.530-16 §6.2.1 (I, frequency)
  return Math.max(1, I);
}

/**
 * Outage with diversity, flat and dispersive fading together (average worst month).
 *
 * Method, ITU-R P.530-16 §6.2 (the step-by-step outage with diversity; space diversity, and
 * the same steps with the frequency-diversity improvement for frequency diversity):
 * η from P0 = p0/100; k_ns² = 1 − I_ns·P_ns/η (bounded to [0, 1]), the square of the
 * non-selective correlation coefficient;
 * r_w = 1 − 0.9746·(1 − k_ns²)^2.170 for k_ns² ≤ 0.26, else 1 − 0.6921·(1 − k_ns²)^1.034;
 * k_s², the SQUARE of the selective correlation coefficient, = 0.8238 for r_w ≤ 0.5,
 * 1 − 0.195·(1 − r_w)^(0.109 − 0.13·log10(1 − r_w)) for 0.5 < r_w ≤ 0.9628, else
 * 1 − 0.3957·(1 − r_w)^0.5136;
 * P_ds = P_s²/(η·(1 − k_s²)); P_dns = P_ns/I_ns; P_d = (P_ds^0.75 + P_dns^0.75)^(4/3), bounded
 * by the outage without diversity P_ns + P_s (a second receiver cannot add outage; common practice).
 * The piecewise expression gives k_s² itself, used as is in P_ds: P_ds then has the same form as
 * the non-selective term, P_dns = P_ns/I_ns = P_ns²/(η·(1 − k_ns²)) by the definition of k_ns².
 * Sources: the Recommendation's text was not at hand; the constants, the breakpoints
 * (0.26, 0.5, 0.9628) and the use of the piecewise value as 1 − k_s² directly agree with an
 * independent public implementation (a PHP link calculator in the public code index, function
 * SD: P_ds = P_s²/(η·(1 − Ks)) with Ks from the same pieces) and with the text as recalled
 * ("calculate the square of the selective correlation coefficient"). Section and step numbers
 * are from memory. Fixed 2026-12: the first transcription squared the piecewise value again
 * (1 − k_s⁴ in effect), which understated P_ds by the factor 1 + k_s² (1.82–2.0).
 * @param Pns non-selective outage probability without diversity (0–1)
 * @param Ps selective outage probability without diversity (0–1)
 * @param p0_pct multipath occurrence factor (%)
 * @param Ins non-selective improvement factor (≥ 1)
 */
export function diversityOutageProbability(Pns: number, Ps: number, p0_pct: number, Ins: number): { Pd: number; Pdns: number; Pds: number; k_ns2: number; r_w: number; k_s2: number; eta: number } {
  const eta = multipathActivityFactor(p0_pct);
  const bad = { Pd: NaN, Pdns: NaN, Pds: NaN, k_ns2: NaN, r_w: NaN, k_s2: NaN, eta };
  if (!(Pns >= 0) || !(Ps >= 0) || !(Ins >= 1) || !(eta > 0)) return bad;
  const k_ns2 = Math.min(1, Math.max(0, 1 - (Ins * Pns) / eta)); // P.530-16 §6.2 (k_ns²)
  const r_w = k_ns2 <= 0.26 ? 1 - 0.9746 * (1 - k_ns2) ** 2.17 : 1 - 0.6921 * (1 - k_ns2) ** 1.034; // P.530-16 §6.2 (r_w)
  const k_s2 = r_w <= 0.5 ? 0.8238 : r_w <= 0.9628 ? 1 - 0.195 * (1 - r_w) ** (0.109 - 0.13 * Math.log10(1 - r_w)) : 1 - 0.3957 * (1 - r_w) ** 0.5136; // P.530-16 §6.2 (k_s², already squared)
  const Pds = Ps ** 2 / (eta * (1 - k_s2)); // P.530-16 §6.2 (P_ds)
  const Pdns = Pns / Ins; // P.530-16 §6.2 (P_dns)
  const Pd = (Pds ** 0.75 + Pdns ** 0.75) ** (4 / 3); // P.530-16 §6.2 (P_d)
  return { Pd: Math.min(Pd, Pns + Ps), Pdns, Pds, k_ns2, r_w, k_s2, eta };
}
