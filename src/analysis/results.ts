import type { ChainResult } from "./chains.ts";
import type { CoverageResult } from "../coverage/coverage-result.ts";
import type { LinkPerformance } from "./link-performance.ts";
import type { InterferenceResult } from "./interference-result.ts";
import type { ReflectionResult } from "./link-reflection.ts";
import type { Remedy } from "./remedies.ts";
import type { WaveResult } from "./link-wave.ts";

/** Plain-JSON results of a study (no NaN: the boundary turns NaN into errors or null with a warning). */

export interface SiteResult {
  id: string;
  name: string;
  lat_deg: number;
  lon_deg: number;
  ground_m: number;
  notes?: string;
}

export interface LinkEndResult {
  site: string;
  name: string;
  ground_m: number;
  antenna_m: number;
  antenna_amsl_m: number;
  gain_dbi: number;
  feeder_loss_db: number;
  /** EIRP of this end when it transmits: radio power − feeder loss + gain (dBm). */
  eirp_dbm: number;
}

export interface ClearanceRow {
  k: number | "inf";
  k_label: string;
  min_clearance_f1: number;
  at_distance_m: number;
  clearance_m: number;
  f1_m: number;
  required_f1: number | null;
  met: boolean | null;
  /** Set for a case Ridgeline adds itself (k_e exceeded 99.9 % of the worst month, ITU-R P.530-16 §2.2.2). */
  automatic?: string;
}

export interface LinkResult {
  id: string;
  from: string;
  to: string;
  radio: string;
  radio_name: string;
  /** Bit-error ratio at which rx_threshold_dbm is stated. */
  threshold_ber: string;
  frequency_ghz: number;
  polarization: "h" | "v";
  distance_m: number;
  azimuth_from_deg: number;
  azimuth_to_deg: number;
  ends: { from: LinkEndResult; to: LinkEndResult };
  profile: { source: string; samples: number; step_m: number };
  clearance: ClearanceRow[];
  clearance_met: boolean;
  /** false when the terrain is too coarse for the path to judge clearance (a warning says why); absent when reliable. */
  clearance_reliable?: false;
  /** Lowest antenna heights above ground meeting the clearance criteria, on the search step; null if none. */
  minimum_heights: { from_antenna_m: number; to_antenna_m: number; step_m: number } | null;
  losses_db: { free_space: number; diffraction?: number; gases?: number; rain_0_01pct?: number | null };
  diffraction_method?: string;
  diffraction_db_by_method?: Record<string, number>;
  budget?: Record<string, number | null>;
  availability?: Record<string, number | string | null>;
  /** Performance (short fades, worst month) and availability (long outages, year) with verdicts; the combined figure for comparison. */
  objectives?: LinkPerformance["objectives"];
  /** Dispersive-fading outage (ITU-R P.530-16 §2.3.6), null without a radio signature. */
  dispersive?: LinkPerformance["dispersive"];
  /** Diversity improvement (§6.2), null without diversity. */
  diversity?: LinkPerformance["diversity"];
  /** XPD outage (§4), null unless the link is co-channel dual-polarised. */
  xpd?: LinkPerformance["xpd"];
  /** Time in each adaptive-modulation mode, null without modes. */
  adaptive_modulation?: LinkPerformance["adaptive_modulation"];
  /** What would bring the link to its targets (empty when it meets them). */
  remedies?: Remedy[];
  reflection?: ReflectionResult;
  /** The parabolic-equation wave solution and its difference from each diffraction method. */
  wave?: WaveResult;
  received_dbm?: number;
  fade_margin_db?: number;
  availability_pct?: number;
  target_availability_pct?: number;
  /** Percentage of the worst month free of short-fade outage, and its target. */
  performance_pct?: number;
  target_performance_pct?: number;
  target_met: boolean;
  warnings: string[];
  /** A design kept for the record (study key design_status): not part of the study's verdict. */
  design_status?: "alternative" | "rejected";
  /** Why it is an alternative or was rejected (study key design_reason). */
  design_reason?: string;
}

export interface Provenance {
  tool_version: string;
  inputs_sha256: string;
  git_commit: string | null;
  git_dirty: boolean | null;
}

export interface SignOff {
  name?: string;
  role?: string;
  date?: string;
}

export interface StudyDocument {
  number?: string;
  paper: "a4" | "letter";
  revisions: { revision: string; date: string; author?: string; description: string }[];
  prepared?: SignOff;
  checked?: SignOff;
  approved?: SignOff;
}

/** Whether a link counts toward the study's verdict (alternative and rejected designs do not). */
export const inVerdict = (l: Pick<LinkResult, "design_status">): boolean => !l.design_status;

export interface StudyResult {
  id: string;
  title: string;
  client: string;
  prepared_by: string;
  revision: string;
  date: string;
  summary?: string;
  /** Document control as the study gives it (number, paper, revisions, sign-off). */
  document?: StudyDocument;
  /** tiles_used: for a folder of HGT tiles, the tiles the study can reach (by name), which its inputs hash covers by their bytes. */
  terrain: { description: string; synthetic: boolean; tiles_used?: string[] };
  assumptions: Record<string, unknown>;
  sites: SiteResult[];
  links: LinkResult[];
  chains: ChainResult[];
  coverage: CoverageResult[];
  /** Interference between the links (present when the study asks for it). */
  interference?: InterferenceResult;
  warnings: string[];
  provenance: Provenance;
}
