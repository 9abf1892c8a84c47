import { inlandTau } from "./itu-path-geometry.ts";

/** Inputs of `ductingLayerReflectionLoss` (one object can be reused per call). */
export interface AnomalousInput {
  /** path length d (km) */
  d_km: number;
  /** horizon distances dlt, dlr (km) */
  dlt_km: number;
  dlr_km: number;
  /** distances over land from Tx/Rx to the coast (km), 0 for a terminal at sea */
  dct_km: number;
  dcr_km: number;
  /** longest continuous inland section dlm (km) */
  dlm_km: number;
  /** antenna heights amsl hts, hrs (m) */
  hts_m: number;
  hrs_m: number;
  /** effective heights for ducting hte, hre (m) */
  hte_m: number;
  hre_m: number;
  /** terrain roughness hm (m) */
  hm_m: number;
  /** horizon elevation angles θt, θr (mrad) */
  theta_t_mrad: number;
  theta_r_mrad: number;
  /** frequency (GHz) */
  f_ghz: number;
  /** time percentage p (%) */
  p_pct: number;
  /** sea fraction ω */
  omega: number;
  /** median effective Earth radius ae (km) */
  ae_km: number;
  /** β0 (%) */
  beta0_pct: number;
  /** P.1812 adds the low-frequency correction Alf below 0.5 GHz; P.452 does not */
  low_frequency_correction: boolean;
}

/**
 * Basic transmission loss Lba (dB) during anomalous propagation (ducting and layer
 * reflection), without gaseous absorption (P.452 adds its Ag to this).
 * Method: ITU-R P.1812-6 §4.5 eq. (46)–(56a); ITU-R P.452-18 §4.4 eq. (46)–(56a) (the same
 * except the low-frequency term Alf of P.1812 and the Ag of P.452):
 *   Lba = Af + Ad(p) (eq. (46));
 *   Af = 102.45 + 20·log f + 20·log(dlt + dlr) + Alf + Ast + Asr + Act + Acr (eq. (47)),
 *   Alf = 45.375 − 137·f + 92.5·f² for f < 0.5 GHz (P.1812 eq. (47a));
 *   θ″ = θ − 0.1·dl, Ast = 20·log[1 + 0.361·θ″·sqrt(f·dl)] + 0.264·θ″·f^(1/3) for θ″ > 0 (eq. (48), (48a));
 *   Act = −3·exp(−0.25·dct²)·[1 + tanh(0.07·(50 − hts))] for ω ≥ 0.75, dct ≤ dlt, dct ≤ 5 km (eq. (49));
 *   Ad(p) = γd·θ′ + A(p), γd = 5e-5·ae·f^(1/3), θ′ = 1e3·d/ae + θ′t + θ′r,
 *     θ′t = min(θt, 0.1·dlt) (eq. (50)–(52a));
 *   A(p) = −12 + (1.2 + 3.7e-3·d)·log(p/β) + 12·(p/β)^Γ,
 *     Γ = 1.076/(2.0058 − log β)^1.012 · exp(−(9.51 − 4.8·log β + 0.198·(log β)²)·1e-6·d^1.13) (eq. (53), (53a));
 *   β = β0·μ2·μ3, μ2 = [500/ae · d²/(sqrt(hte) + sqrt(hre))²]^α ≤ 1,
 *     α = max(−0.6 − 3.5e-9·d^3.1·τ, −3.4), τ = 1 − exp(−4.12e-4·dlm^2.41),
 *     μ3 = exp(−4.6e-5·(hm − 10)·(43 + 6·dI)) for hm > 10 m, else 1, dI = min(d − dlt − dlr, 40) (eq. (54)–(56a)).
 * Powers x^y are taken as exp(y·ln x) (equal to rounding; Math.pow costs several times more),
 * and the terms of f, p and ae alone come from `anomalousConstants` (a coverage computes them once).
 * @param i inputs
 * @param k the terms of f, p and ae alone (default: computed from i)
 * @param tau τ of P.1812-6 eq. (3) for i.dlm_km (default: computed; a coverage shares it with β0)
 * @returns Lba (dB)
 */
export function ductingLayerReflectionLoss(i: AnomalousInput, k: AnomalousConstants = anomalousConstants(i.f_ghz, i.p_pct, i.ae_km, i.low_frequency_correction), tau = inlandTau(i.dlm_km)): number {
  const d = i.d_km;
  const lnD = Math.log(d);
  const tt2 = i.theta_t_mrad - 0.1 * i.dlt_km; // P.1812-6 eq. (48a)
  const tr2 = i.theta_r_mrad - 0.1 * i.dlr_km; // P.1812-6 eq. (48a)
  const Ast = tt2 > 0 ? 20 * Math.log10(1 + 0.361 * tt2 * k.sqrtF * Math.sqrt(i.dlt_km)) + 0.264 * tt2 * k.cbrtF : 0; // P.1812-6 eq. (48)
  const Asr = tr2 > 0 ? 20 * Math.log10(1 + 0.361 * tr2 * k.sqrtF * Math.sqrt(i.dlr_km)) + 0.264 * tr2 * k.cbrtF : 0; // P.1812-6 eq. (48)
  const Act = i.dct_km <= 5 && i.dct_km <= i.dlt_km && i.omega >= 0.75 ? -3 * Math.exp(-0.25 * i.dct_km * i.dct_km) * (1 + Math.tanh(0.07 * (50 - i.hts_m))) : 0; // P.1812-6 eq. (49)
  const Acr = i.dcr_km <= 5 && i.dcr_km <= i.dlr_km && i.omega >= 0.75 ? -3 * Math.exp(-0.25 * i.dcr_km * i.dcr_km) * (1 + Math.tanh(0.07 * (50 - i.hrs_m))) : 0; // P.1812-6 eq. (49)
  const tt1 = i.theta_t_mrad <= 0.1 * i.dlt_km ? i.theta_t_mrad : 0.1 * i.dlt_km; // P.1812-6 eq. (52a)
  const tr1 = i.theta_r_mrad <= 0.1 * i.dlr_km ? i.theta_r_mrad : 0.1 * i.dlr_km; // P.1812-6 eq. (52a)
  const theta1 = (1e3 * d) / i.ae_km + tt1 + tr1; // P.1812-6 eq. (52)
  const dI = Math.min(d - i.dlt_km - i.dlr_km, 40); // P.1812-6 eq. (56a)
  const lnMu3 = i.hm_m > 10 ? -4.6e-5 * (i.hm_m - 10) * (43 + 6 * dI) : 0; // P.1812-6 eq. (56), ln μ3
  let alpha = -0.6 - 3.5e-9 * Math.exp(3.1 * lnD) * tau; // P.1812-6 eq. (55a), d^3.1
  if (alpha < -3.4) alpha = -3.4;
  const sh = Math.sqrt(i.hte_m) + Math.sqrt(i.hre_m);
  let lnMu2 = alpha * (k.ln500ae + 2 * lnD - 2 * Math.log(sh)); // P.1812-6 eq. (55), ln μ2 = α·ln(500/ae · d²/(√hte + √hre)²)
  if (lnMu2 > 0) lnMu2 = 0; // P.1812-6 eq. (55), μ2 ≤ 1
  const lnBeta = Math.log(i.beta0_pct) + lnMu2 + lnMu3; // P.1812-6 eq. (54), β = β0·μ2·μ3
  const lb = lnBeta / Math.LN10;
  const Gamma = (1.076 * Math.exp(-1.012 * Math.log(2.0058 - lb))) * Math.exp(-(9.51 - 4.8 * lb + 0.198 * lb * lb) * 1e-6 * Math.exp(1.13 * lnD)); // P.1812-6 eq. (53a)
  const lnPb = k.lnP - lnBeta; // ln(p/β)
  const Ap = -12 + (1.2 + 3.7e-3 * d) * (lnPb / Math.LN10) + 12 * Math.exp(Gamma * lnPb); // P.1812-6 eq. (53)
  const Adp = k.gammaD * theta1 + Ap; // P.1812-6 eq. (50)
  const Af = 102.45 + k.twentyLogF + 20 * Math.log10(i.dlt_km + i.dlr_km) + k.Alf + Ast + Asr + Act + Acr; // P.1812-6 eq. (47)
  return Af + Adp; // P.1812-6 eq. (46)
}

/** What `ductingLayerReflectionLoss` needs of frequency, time percentage and ae alone (compute once per coverage). */
export interface AnomalousConstants {
  sqrtF: number;
  cbrtF: number;
  /** 20·log f (f in GHz) */
  twentyLogF: number;
  /** low-frequency correction Alf (dB), P.1812-6 eq. (47a); 0 when not applied */
  Alf: number;
  /** specific attenuation γd (dB/mrad), eq. (51) */
  gammaD: number;
  /** ln(500/ae) (ae in km), for μ2 */
  ln500ae: number;
  /** ln p */
  lnP: number;
}

/**
 * The frequency-, time- and ae-only terms of the ducting loss, for `ductingLayerReflectionLoss`.
 * @param f_ghz frequency (GHz)
 * @param p_pct time percentage (%)
 * @param ae_km median effective Earth radius (km)
 * @param lowFrequencyCorrection apply P.1812's Alf below 0.5 GHz
 */
export function anomalousConstants(f_ghz: number, p_pct: number, ae_km: number, lowFrequencyCorrection: boolean): AnomalousConstants {
  const f = f_ghz;
  return {
    sqrtF: Math.sqrt(f),
    cbrtF: Math.cbrt(f),
    twentyLogF: 20 * Math.log10(f),
    Alf: lowFrequencyCorrection && f < 0.5 ? 45.375 - 137.0 * f + 92.5 * f * f : 0, // P.1812-6 eq. (47a)
    gammaD: 5e-5 * ae_km * Math.cbrt(f), // P.1812-6 eq. (51)
    ln500ae: Math.log(500 / ae_km),
    lnP: Math.log(p_pct),
  };
}

/**
 * A lower bound (dB) of `ductingLayerReflectionLoss` that needs neither the terrain roughness
 * hm nor the effective heights hte, hre: Ast, Asr ≥ 0 are left out of Af (eq. (47), (48)), and
 * A(p) (eq. (53)) is taken at β = β0, its largest value (μ2, μ3 ≤ 1, eq. (54)–(56)): A(p)
 * decreases as β grows (checked for 1e-12 ≤ β ≤ 50 %, 1 ≤ p ≤ 50 %, 0 < d ≤ 3000 km in
 * test/unit/ducting-lower-bound.test.ts; as β → 0 its slope in log β tends to
 * −(1.2 + 3.7e-3·d) < 0). Act, Acr and γd·θ′ are exact. A coverage uses it to leave out Lba
 * (and hm) where the bound is so far above Lb0p that Lba cannot move the blend (see
 * P1812_DUCTING_NEGLIGIBLE_DB in p1812.ts).
 * With a `target`, a cruder bound is tried first and returned when it already reaches the
 * target: for p ≥ β0, (p/β)^Γ ≥ 1 for every β ≤ β0 (Γ > 0 for β < 101 %), so
 * A(p) ≥ (1.2 + 3.7e-3·d)·log(p/β0) without Γ.
 * @param i inputs (hm_m, hte_m, hre_m are not read)
 * @param k the terms of f, p and ae alone
 * @param target the value the caller compares the bound with (default +∞: the full bound)
 * @returns a value ≤ Lba (dB)
 */
export function ductingLossLowerBound(i: AnomalousInput, k: AnomalousConstants, target = Infinity): number {
  const d = i.d_km;
  const Act = i.dct_km <= 5 && i.dct_km <= i.dlt_km && i.omega >= 0.75 ? -3 * Math.exp(-0.25 * i.dct_km * i.dct_km) * (1 + Math.tanh(0.07 * (50 - i.hts_m))) : 0; // P.1812-6 eq. (49)
  const Acr = i.dcr_km <= 5 && i.dcr_km <= i.dlr_km && i.omega >= 0.75 ? -3 * Math.exp(-0.25 * i.dcr_km * i.dcr_km) * (1 + Math.tanh(0.07 * (50 - i.hrs_m))) : 0; // P.1812-6 eq. (49)
  const tt1 = i.theta_t_mrad <= 0.1 * i.dlt_km ? i.theta_t_mrad : 0.1 * i.dlt_km; // P.1812-6 eq. (52a)
  const tr1 = i.theta_r_mrad <= 0.1 * i.dlr_km ? i.theta_r_mrad : 0.1 * i.dlr_km; // P.1812-6 eq. (52a)
  const theta1 = (1e3 * d) / i.ae_km + tt1 + tr1; // P.1812-6 eq. (52)
  const Af = 102.45 + k.twentyLogF + 20 * Math.log10(i.dlt_km + i.dlr_km) + k.Alf + Act + Acr; // P.1812-6 eq. (47) without Ast, Asr ≥ 0
  const base = Af + k.gammaD * theta1; // P.1812-6 eq. (46), (50) without A(p)
  const lnBeta = Math.log(i.beta0_pct); // β ≤ β0 (eq. (54)), the bound of A(p) at β = β0
  const lnPb = k.lnP - lnBeta;
  const c = 1.2 + 3.7e-3 * d;
  if (lnPb >= 0) {
    const crude = base + c * (lnPb / Math.LN10); // P.1812-6 eq. (53) with (p/β)^Γ ≥ 1: −12 + 12 cancel
    if (crude >= target) return crude;
  }
  const lb = lnBeta / Math.LN10;
  const Gamma = (1.076 * Math.exp(-1.012 * Math.log(2.0058 - lb))) * Math.exp(-(9.51 - 4.8 * lb + 0.198 * lb * lb) * 1e-6 * Math.exp(1.13 * Math.log(d))); // P.1812-6 eq. (53a)
  const Ap = -12 + c * (lnPb / Math.LN10) + 12 * Math.exp(Gamma * lnPb); // P.1812-6 eq. (53)
  return base + Ap; // P.1812-6 eq. (46), (50)
}
