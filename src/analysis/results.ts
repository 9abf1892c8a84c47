import type { ChainResult } from "./chains.ts";
import type { CoverageResult } from "../coverage/coverage-result.ts";
import type { ReflectionResult } from "./link-reflection.ts";

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
  /** Lowest antenna heights above ground meeting the clearance criteria, on the search step; null if none. */
  minimum_heights: { from_antenna_m: number; to_antenna_m: number; step_m: number } | null;
  losses_db: { free_space: number; diffraction?: number; gases?: number; rain_0_01pct?: number | null };
  diffraction_method?: string;
  diffraction_db_by_method?: Record<string, number>;
  budget?: Record<string, number | null>;
  availability?: Record<string, number | null>;
  reflection?: ReflectionResult;
  received_dbm?: number;
  fade_margin_db?: number;
  availability_pct?: number;
  target_availability_pct?: number;
  target_met: boolean;
  warnings: string[];
}

export interface Provenance {
  tool_version: string;
  inputs_sha256: string;
  git_commit: string | null;
  git_dirty: boolean | null;
}

export interface StudyResult {
  id: string;
  title: string;
  client: string;
  prepared_by: string;
  revision: string;
  date: string;
  summary?: string;
  terrain: { description: string; synthetic: boolean };
  assumptions: Record<string, unknown>;
  sites: SiteResult[];
  links: LinkResult[];
  chains: ChainResult[];
  coverage: CoverageResult[];
  warnings: string[];
  provenance: Provenance;
}
