// A hand-built two-link study on flat ground (constant terrain, 100 m masts), co-channel and
// co-polar at 2.2 GHz, for the interference tests.

export const SITES = {
  A1: [-33.4, -70.7],
  A2: [-33.4, -70.59],
  B1: [-33.43, -70.82],
  B2: [-33.37, -70.52],
} as const;
export const G = 38; // dBi, every antenna
export const P = 25; // dBm
export const LF = 0.5; // dB feeder
export const H = 100; // m above ground, ground 0 m
export const F_GHZ = 2.2;

/** The study's YAML; `bPlan` replaces link b's frequency plan (default: the same channels as a). */
export function twoLinkYaml(bPlan = "{ go_mhz: 2200, return_mhz: 2300, bandwidth_mhz: 28 }"): string {
  return `title: Two-link interference geometry
client: Test
prepared_by: Test
revision: A
date: 2026-01-15
terrain:
  constant_m: 0
climate:
  pressure_hpa: 300
  water_vapour_g_m3: 0
radios:
  - id: r1
    frequency_ghz: ${F_GHZ}
    tx_power_dbm: ${P}
    rx_threshold_dbm: -75
    interference: { co_channel_ci_db: 30, noise_figure_db: 5 }
sites:
${Object.entries(SITES)
  .map(([id, [lat, lon]]) => `  - { id: ${id}, name: Site ${id}, lat_deg: ${lat}, lon_deg: ${lon} }`)
  .join("\n")}
links:
  - id: a
    from: { site: A1, antenna_m: ${H}, gain_dbi: ${G}, feeder_loss_db: ${LF}, pattern: f699 }
    to: { site: A2, antenna_m: ${H}, gain_dbi: ${G}, feeder_loss_db: ${LF} }
    radio: r1
    frequency_plan: { go_mhz: 2200, return_mhz: 2300, bandwidth_mhz: 28 }
  - id: b
    from: { site: B1, antenna_m: ${H}, gain_dbi: ${G}, feeder_loss_db: ${LF} }
    to: { site: B2, antenna_m: ${H}, gain_dbi: ${G}, feeder_loss_db: ${LF} }
    radio: r1
    frequency_plan: ${bPlan}
interference:
  long_term_pct: 50
`;
}
