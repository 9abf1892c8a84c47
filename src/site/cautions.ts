import type { AnalyzedStudy } from "../analysis/analyze-study.ts";
import { complianceDistanceM, dbmToW, generalPublicReferenceLevelWm2, RF_EXPOSURE_VALIDITY } from "../physics/rf-exposure.ts";

/** One transmitting antenna's RF-exposure estimate. */
export interface ExposureRow {
  link: string;
  site: string;
  site_name: string;
  antenna_m: number;
  frequency_ghz: number;
  eirp_dbm: number;
  eirp_w: number;
  /** General-public reference level of power density (W/m²); null outside the guideline's table. */
  reference_wm2: number | null;
  /** Far-field compliance distance in the main beam (m); null when no reference level applies. */
  distance_m: number | null;
}

/** An antenna standing higher above ground than the study's notice height. */
export interface TallAntenna {
  link: string;
  site: string;
  site_name: string;
  antenna_m: number;
}

export interface StudyCautions {
  guideline: string;
  exposure: ExposureRow[];
  /** The largest compliance distance in the study (m), or null. */
  max_distance_m: number | null;
  notice_height_m: number;
  tall: TallAntenna[];
}

/**
 * Cautions for a study: an RF-exposure compliance distance for every transmitting antenna
 * (both ends of every link are taken to transmit the link radio's power through their own
 * feeder and antenna), and the antennas higher above ground than
 * `design.structure_notice_height_m`, where aviation or structural rules may govern.
 */
export function studyCautions(s: AnalyzedStudy): StudyCautions {
  const exposure: ExposureRow[] = [];
  const tall: TallAntenna[] = [];
  const notice = s.study.design.structure_notice_height_m;
  for (const l of s.result.links) {
    const radio = s.study.radios.find((r) => r.id === l.radio);
    const tx_dbm = radio?.tx_power_dbm ?? Number.NaN;
    for (const end of [l.ends.from, l.ends.to]) {
      const eirp_dbm = tx_dbm - end.feeder_loss_db + end.gain_dbi;
      const eirp_w = dbmToW(eirp_dbm);
      const S = generalPublicReferenceLevelWm2(l.frequency_ghz * 1000);
      const r = complianceDistanceM(eirp_w, S);
      exposure.push({
        link: l.id,
        site: end.site,
        site_name: end.name,
        antenna_m: end.antenna_m,
        frequency_ghz: l.frequency_ghz,
        eirp_dbm,
        eirp_w,
        reference_wm2: Number.isFinite(S) ? S : null,
        distance_m: Number.isFinite(r) ? r : null,
      });
      if (end.antenna_m > notice) tall.push({ link: l.id, site: end.site, site_name: end.name, antenna_m: end.antenna_m });
    }
  }
  const ds = exposure.map((e) => e.distance_m).filter((d): d is number => d !== null);
  return { guideline: RF_EXPOSURE_VALIDITY.guideline, exposure, max_distance_m: ds.length ? Math.max(...ds) : null, notice_height_m: notice, tall };
}
