/** Area type of the Hata formulas. */
export type HataEnvironment = "urban" | "suburban" | "open";
/**
 * City size: "small-medium" (Hata's medium-small city; COST-231 medium-sized city, Cm = 0 dB) or
 * "large" (Hata's large city; COST-231 metropolitan centre, Cm = 3 dB).
 */
export type HataCitySize = "small-medium" | "large";
export type HataModel = "okumura-hata" | "cost231-hata";

export interface ValidityRange {
  frequency_mhz: readonly [number, number];
  base_m: readonly [number, number];
  mobile_m: readonly [number, number];
  distance_km: readonly [number, number];
}

/** Validity of the Okumura–Hata formulas (Hata 1980, §III). */
export const HATA_VALIDITY: ValidityRange = {
  frequency_mhz: [150, 1500],
  base_m: [30, 200],
  mobile_m: [1, 10],
  distance_km: [1, 20],
};

/** Validity of COST-231 Hata (COST Action 231 Final Report, 1999, §4.4.1). */
export const COST231_HATA_VALIDITY: ValidityRange = {
  frequency_mhz: [1500, 2000],
  base_m: [30, 200],
  mobile_m: [1, 10],
  distance_km: [1, 20],
};

export interface HataResult {
  /** median basic transmission loss (dB) */
  loss_db: number;
  model: HataModel;
  /** every departure from the model's validity range or definition, in words */
  warnings: string[];
}

const MODEL_NAME: Record<HataModel, string> = { "okumura-hata": "Okumura–Hata", "cost231-hata": "COST-231 Hata" };

/**
 * Median path loss of the Okumura–Hata model (150–1500 MHz) or its COST-231 extension
 * (1500–2000 MHz), for urban, suburban and open areas. The model is chosen by frequency
 * (≤ 1500 MHz Okumura–Hata, above COST-231) unless `model` names one.
 *
 * Method (f in MHz, hb and hm in m, d in km; log = log10):
 *   Okumura–Hata urban:  L = 69.55 + 26.16·log f − 13.82·log hb − a(hm) + (44.9 − 6.55·log hb)·log d
 *   COST-231 urban:      L = 46.3 + 33.9·log f − 13.82·log hb − a(hm) + (44.9 − 6.55·log hb)·log d + Cm
 *   a(hm), small-medium city: (1.1·log f − 0.7)·hm − (1.56·log f − 0.8)
 *   a(hm), large city: 8.29·(log 1.54hm)² − 1.1 (f ≤ 200 MHz); 3.2·(log 11.75hm)² − 4.97 (f ≥ 400 MHz)
 *   suburban: L − 2·(log(f/28))² − 5.4;   open: L − 4.78·(log f)² + 18.33·log f − 40.94
 *   Cm = 0 dB medium-sized city and suburban centres, 3 dB metropolitan centres.
 * References: M. Hata, "Empirical formula for propagation loss in land mobile radio services",
 * IEEE Trans. Veh. Technol. VT-29(3), 1980, pp. 317–325, §III; COST Action 231, "Digital mobile
 * radio towards future generation systems", Final Report, 1999, §4.4.1. Both from memory;
 * equation numbers of the sources are not quoted because they were not re-checked.
 * Choices where the sources are silent (each one is reported in `warnings` when it applies):
 * - large city between 200 and 400 MHz: the ≤ 200 MHz formula below 300 MHz, the ≥ 400 MHz one
 *   from 300 MHz (common practice);
 * - suburban and open areas use the small-medium a(hm), as Hata derived them from that case;
 * - COST-231 defines urban (Cm) only; "suburban" is taken as its Cm = 0 case (the report's
 *   "suburban centres") and "open" applies Hata's open-area correction to it (common practice,
 *   an extrapolation).
 * Validity: HATA_VALIDITY / COST231_HATA_VALIDITY; outside them the formula is evaluated and a
 * warning names the model, the quantity and the range. Non-positive or non-finite inputs give
 * NaN with a warning.
 * @param opts.frequency_mhz frequency (MHz)
 * @param opts.base_m base-station effective antenna height hb (m)
 * @param opts.mobile_m mobile antenna height hm (m)
 * @param opts.distance_km distance (km)
 * @param opts.environment "urban", "suburban" or "open"
 * @param opts.city_size "small-medium" or "large"
 * @param opts.model force "okumura-hata" or "cost231-hata" (default: by frequency)
 */
export function hataLoss(opts: {
  frequency_mhz: number;
  base_m: number;
  mobile_m: number;
  distance_km: number;
  environment: HataEnvironment;
  city_size: HataCitySize;
  model?: HataModel;
}): HataResult {
  const { frequency_mhz: f, base_m: hb, mobile_m: hm, distance_km: d, environment, city_size } = opts;
  const model: HataModel = opts.model ?? (f > 1500 ? "cost231-hata" : "okumura-hata");
  const name = MODEL_NAME[model];
  const warnings: string[] = [];

  const inputs: [string, number][] = [
    ["frequency_mhz", f],
    ["base_m", hb],
    ["mobile_m", hm],
    ["distance_km", d],
  ];
  const bad = inputs.filter(([, v]) => !(v > 0) || !Number.isFinite(v));
  if (bad.length > 0 || !["urban", "suburban", "open"].includes(environment) || !["small-medium", "large"].includes(city_size)) {
    for (const [k, v] of bad) warnings.push(`${name}: ${k} = ${v} is not a positive finite number; loss is NaN`);
    if (!["urban", "suburban", "open"].includes(environment)) warnings.push(`${name}: unknown environment "${environment}"; loss is NaN`);
    if (!["small-medium", "large"].includes(city_size)) warnings.push(`${name}: unknown city size "${city_size}"; loss is NaN`);
    return { loss_db: NaN, model, warnings };
  }

  const range = model === "okumura-hata" ? HATA_VALIDITY : COST231_HATA_VALIDITY;
  const checks: [keyof ValidityRange, number, string, string][] = [
    ["frequency_mhz", f, "frequency", "MHz"],
    ["base_m", hb, "base-station height", "m"],
    ["mobile_m", hm, "mobile height", "m"],
    ["distance_km", d, "distance", "km"],
  ];
  for (const [key, v, label, unit] of checks) {
    const [lo, hi] = range[key];
    if (v < lo || v > hi) warnings.push(`${name}: ${label} ${v} ${unit} is outside the validity range ${lo}–${hi} ${unit}`);
  }

  const logf = Math.log10(f);
  const loghb = Math.log10(hb);
  const aSmall = (1.1 * logf - 0.7) * hm - (1.56 * logf - 0.8); // Hata (1980) a(hR), medium-small city
  let a = aSmall;
  if (environment === "urban" && city_size === "large" && model === "okumura-hata") {
    if (f > 200 && f < 400) {
      warnings.push(`${name}: large-city mobile correction is defined for f ≤ 200 MHz and f ≥ 400 MHz; ${f} MHz uses the ${f < 300 ? "≤ 200" : "≥ 400"} MHz form`);
    }
    a = f < 300
      ? 8.29 * Math.log10(1.54 * hm) ** 2 - 1.1 // Hata (1980) a(hR), large city, f ≤ 200 MHz
      : 3.2 * Math.log10(11.75 * hm) ** 2 - 4.97; // Hata (1980) a(hR), large city, f ≥ 400 MHz
  }
  if (environment !== "urban" && city_size === "large") {
    warnings.push(`${name}: city size "large" applies to urban areas only; the ${environment} formula uses the small-medium city mobile correction`);
  }
  if (model === "cost231-hata" && environment === "open") {
    warnings.push(`${name}: open areas are not defined by COST-231; Hata's open-area correction is applied (extrapolation)`);
  }

  const distanceTerm = (44.9 - 6.55 * loghb) * Math.log10(d);
  let L: number;
  if (model === "okumura-hata") {
    L = 69.55 + 26.16 * logf - 13.82 * loghb - a + distanceTerm; // Hata (1980) Lp urban
  } else {
    const Cm = environment === "urban" && city_size === "large" ? 3 : 0; // COST 231 §4.4.1 Cm
    L = 46.3 + 33.9 * logf - 13.82 * loghb - a + distanceTerm + Cm; // COST 231 §4.4.1 Lb urban
  }
  if (environment === "suburban" && model === "okumura-hata") {
    L = L - 2 * Math.log10(f / 28) ** 2 - 5.4; // Hata (1980) Lps suburban
  } else if (environment === "open") {
    L = L - 4.78 * logf ** 2 + 18.33 * logf - 40.94; // Hata (1980) Lpo open area
  }
  return { loss_db: L, model, warnings };
}
