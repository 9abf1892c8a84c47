/** Plain-JSON results of the interference analysis (results.json `interference`; units in keys). */

/** One interferer into one receiver. */
export interface InterferenceEntry {
  /** receiver id: `<link> go` (received at the link's to-end) or `<link> return` (at its from-end) */
  receiver: string;
  receiver_link: string;
  receiver_site: string;
  /** transmitter id: `<link> go|return` or `external <id>` */
  transmitter: string;
  transmitter_link: string | null;
  transmitter_site: string;
  frequency_offset_mhz: number;
  co_polar: boolean;
  same_site: boolean;
  distance_m: number | null;
  /** off-axis angles (deg): total, and in azimuth and elevation, at the transmitter and at the receiver */
  tx_off_axis_deg: number | null;
  tx_off_axis_azimuth_deg: number | null;
  tx_off_axis_elevation_deg: number | null;
  rx_off_axis_deg: number | null;
  rx_off_axis_azimuth_deg: number | null;
  rx_off_axis_elevation_deg: number | null;
  /** co-polar attenuation of each antenna toward the other, relative to its boresight (dB) */
  tx_discrimination_db: number | null;
  rx_discrimination_db: number | null;
  /** extra discrimination from crossed polarisations (dB; 0 when co-polar) */
  polarization_discrimination_db: number | null;
  /** net filter discrimination at this offset (dB) */
  filter_discrimination_db: number;
  path_loss_long_term_db: number | null;
  path_loss_short_term_db: number | null;
  /** interference at the receiver input, before the receiver's filter (dBm) */
  interference_long_term_dbm: number | null;
  interference_short_term_dbm: number | null;
  /** C/I with the carrier at its median level and the long-term interference (dB) */
  ci_median_db: number | null;
  /** C/I with the carrier faded to the receiver threshold, long-term interference (dB): the protection criterion */
  ci_at_threshold_db: number | null;
  /** C/I the receiver needs at this offset (co-channel C/I − net filter discrimination) (dB) */
  required_ci_db: number;
  /** ci_at_threshold_db − required_ci_db (dB); negative: the criterion is missed */
  ci_margin_db: number | null;
  met: boolean;
}

/** One receiver with every interferer together. */
export interface InterferenceReceiver {
  id: string;
  link: string;
  direction: "go" | "return";
  site: string;
  /** the site transmitting the wanted signal */
  from_site: string;
  frequency_mhz: number;
  bandwidth_mhz: number;
  polarization: "h" | "v";
  noise_dbm: number;
  carrier_dbm: number | null;
  threshold_dbm: number;
  fade_margin_db: number | null;
  short_term_pct: number;
  required_co_channel_ci_db: number;
  allowed_degradation_db: number;
  /** number of interferers counted and the worst C/I margin among them (dB) */
  entries: number;
  worst_ci_margin_db: number | null;
  /** aggregate interference after the receiver filter, co-channel equivalent (dBm); null without interferers */
  interference_long_term_dbm: number | null;
  interference_short_term_dbm: number | null;
  /** threshold degradation by the aggregate (dB); null when an interferer could not be computed */
  threshold_degradation_long_term_db: number | null;
  threshold_degradation_short_term_db: number | null;
  /** fade margin less the long-term (short-term) threshold degradation (dB) */
  fade_margin_left_db: number | null;
  fade_margin_left_short_term_db: number | null;
  met: boolean;
  /** why the receiver misses its limits (empty when met) */
  reasons: string[];
}

export interface InterferenceResult {
  long_term_pct: number;
  /** a fixed percentage, or null: each receiving link's outage budget */
  short_term_pct: number | null;
  path_loss_method: string;
  receivers: InterferenceReceiver[];
  /** every counted entry, worst C/I margin first */
  entries: InterferenceEntry[];
  /** transmitter–receiver pairs within the adjacent-channel range, computed and left out by the free-space bound */
  paths: { in_frequency_range: number; computed: number; below_bound: number };
  receivers_total: number;
  receivers_met: number;
  met: boolean;
  /** methods' ranges exceeded and the like (also among the study's warnings) */
  warnings: string[];
}
