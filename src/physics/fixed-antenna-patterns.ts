/**
 * Radiation pattern envelopes of point-to-point fixed-service antennas, from the antenna's
 * boresight gain and the frequency alone (no measured pattern needed).
 *
 * - ITU-R F.699-8 (01/2018), "Reference radiation patterns for fixed wireless system antennas
 *   for use in coordination studies and interference assessment in the frequency range from
 *   100 MHz to about 86 GHz": a peak envelope (the level that sidelobes do not exceed), for
 *   coordination — recommends 2.1 (D/λ > 100), 2.2 (D/λ ≤ 100), 2.3 (0.1–1 GHz), and
 *   recommends 3, 20·log10(D/λ) ≈ G_max − 7.7, when only the gain is known.
 * - ITU-R F.1245-3 (01/2019), "Mathematical model of average and related radiation patterns
 *   for point-to-point fixed wireless system antennas …": an average pattern, for aggregate
 *   interference from many entries — recommends 1.1 (D/λ > 100) and 1.2 (D/λ ≤ 100),
 *   1–70 GHz.
 *
 * Gains in dBi; off-axis angle φ in degrees from the boresight, 0–180 (larger angles are
 * folded back: φ and 360 − φ give the same value). NaN outside a pattern's frequency range or
 * for non-finite input. Both are rotationally symmetric: one angle, both planes, co-polar only.
 */

/** Frequency ranges (GHz) of the two envelopes. */
export const F699_VALIDITY = { method: "ITU-R F.699-8", frequency_ghz: [0.1, 86] as [number, number] };
export const F1245_VALIDITY = { method: "ITU-R F.1245-3", frequency_ghz: [1, 70] as [number, number] };

/**
 * D/λ of a parabolic antenna from its boresight gain: 20·log10(D/λ) ≈ G_max − 7.7.
 * Reference: ITU-R F.699-8 recommends 3 (also used by F.1245-3 recommends 3).
 * @param gmax_dbi boresight gain (dBi)
 */
export function dOverLambdaFromGain(gmax_dbi: number): number {
  return 10 ** ((gmax_dbi - 7.7) / 20); // F.699-8 recommends 3
}

/** Fold an off-axis angle (deg) into 0–180. */
function foldDeg(phi_deg: number): number {
  const a = Math.abs(phi_deg) % 360;
  return a > 180 ? 360 - a : a;
}

/**
 * F.699-8 reference (peak envelope) gain (dBi) at an off-axis angle.
 * Method: F.699-8 recommends 2.1, 2.2 (1–86 GHz; above 70 GHz the wide-angle floor starts at
 * 120° instead of 48°) and 2.3 (0.1–1 GHz), with D/λ from the gain (recommends 3):
 *   G1 = 2 + 15·log10(D/λ); φm = (20λ/D)·√(Gmax − G1); φr = 15.85·(D/λ)^−0.6.
 * Validity: 0.1–86 GHz; D/λ > 0.63 below 1 GHz.
 * @param phi_deg off-axis angle (deg)
 * @param gmax_dbi boresight gain (dBi)
 * @param frequency_ghz frequency (GHz)
 */
export function f699GainDbi(phi_deg: number, gmax_dbi: number, frequency_ghz: number): number {
  if (!Number.isFinite(phi_deg) || !Number.isFinite(gmax_dbi) || !(frequency_ghz >= 0.1 && frequency_ghz <= 86)) return NaN;
  const phi = foldDeg(phi_deg);
  const DL = dOverLambdaFromGain(gmax_dbi); // F.699-8 recommends 3
  const G1 = 2 + 15 * Math.log10(DL); // F.699-8 recommends 2.1.1
  const phiM = (20 / DL) * Math.sqrt(gmax_dbi - G1); // F.699-8 recommends 2.1
  if (!Number.isFinite(phiM)) return NaN;
  if (phi < phiM) return gmax_dbi - 2.5e-3 * (DL * phi) ** 2; // F.699-8 recommends 2.1 (main lobe)
  if (frequency_ghz < 1) {
    // 0.1–1 GHz
    if (DL <= 0.63) return NaN;
    const phiS = 144.5 * DL ** -0.2; // F.699-8 recommends 2.3
    if (phi < 100 / DL) return G1; // F.699-8 recommends 2.3
    if (phi < phiS) return 52 - 10 * Math.log10(DL) - 25 * Math.log10(phi); // F.699-8 recommends 2.3
    return -2 - 5 * Math.log10(DL); // F.699-8 recommends 2.3
  }
  const wide = frequency_ghz > 70 ? 120 : 48; // F.699-8 recommends 2.1, 2.2: 48° up to 70 GHz, 120° above
  if (DL > 100) {
    const phiR = 15.85 * DL ** -0.6; // F.699-8 recommends 2.1
    if (phi < phiR) return G1; // F.699-8 recommends 2.1
    if (phi < wide) return 32 - 25 * Math.log10(phi); // F.699-8 recommends 2.1
    return frequency_ghz > 70 ? -20 : -10; // F.699-8 recommends 2.1
  }
  if (phi < 100 / DL) return G1; // F.699-8 recommends 2.2
  if (phi < wide) return 52 - 10 * Math.log10(DL) - 25 * Math.log10(phi); // F.699-8 recommends 2.2
  return (frequency_ghz > 70 ? 0 : 10) - 10 * Math.log10(DL); // F.699-8 recommends 2.2
}

/**
 * F.1245-3 average pattern gain (dBi) at an off-axis angle.
 * Method: F.1245-3 recommends 1.1 (D/λ > 100) and 1.2 (D/λ ≤ 100), D/λ from the gain:
 *   G1 = 2 + 15·log10(D/λ); φm = (20λ/D)·√(Gmax − G1); φr = 12.02·(D/λ)^−0.6;
 *   D/λ > 100: main lobe to φm, G1 to max(φm, φr), 29 − 25·log10 φ to 48°, −13 beyond;
 *   D/λ ≤ 100: main lobe to φm, 39 − 5·log10(D/λ) − 25·log10 φ to 48°, −3 − 5·log10(D/λ) beyond.
 * Validity: 1–70 GHz.
 * @param phi_deg off-axis angle (deg)
 * @param gmax_dbi boresight gain (dBi)
 * @param frequency_ghz frequency (GHz)
 */
export function f1245GainDbi(phi_deg: number, gmax_dbi: number, frequency_ghz: number): number {
  if (!Number.isFinite(phi_deg) || !Number.isFinite(gmax_dbi) || !(frequency_ghz >= 1 && frequency_ghz <= 70)) return NaN;
  const phi = foldDeg(phi_deg);
  const DL = dOverLambdaFromGain(gmax_dbi); // F.1245-3 recommends 3
  const G1 = 2 + 15 * Math.log10(DL); // F.1245-3 recommends 1.1
  const phiM = (20 / DL) * Math.sqrt(gmax_dbi - G1); // F.1245-3 recommends 1.1
  if (!Number.isFinite(phiM)) return NaN;
  if (phi < phiM) return gmax_dbi - 2.5e-3 * (DL * phi) ** 2; // F.1245-3 recommends 1.1, 1.2
  if (DL > 100) {
    const phiR = 12.02 * DL ** -0.6; // F.1245-3 recommends 1.1
    if (phi < Math.max(phiM, phiR)) return G1; // F.1245-3 recommends 1.1
    if (phi < 48) return 29 - 25 * Math.log10(phi); // F.1245-3 recommends 1.1
    return -13; // F.1245-3 recommends 1.1
  }
  if (phi < 48) return 39 - 5 * Math.log10(DL) - 25 * Math.log10(phi); // F.1245-3 recommends 1.2
  return -3 - 5 * Math.log10(DL); // F.1245-3 recommends 1.2
}
