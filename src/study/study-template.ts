/**
 * The commented study that `ridgeline new <id>` writes: every section a study needs, with
 * values that build as they stand (two invented sites on seeded synthetic terrain) so that a
 * user replaces them one by one and rebuilds. Comments say what each key means and its unit.
 */
export function studyTemplate(o: { id: string; date: string }): string {
  return `# yaml-language-server: $schema=../../../schema/study.schema.json
#
# Study "${o.id}", scaffolded by \`ridgeline new\`. Replace the example values, then run
# \`ridgeline build ${o.id}\` (or \`ridgeline check ${o.id}\` for the verdict alone).
# Units are in key names: _m metres, _deg decimal degrees (WGS84), _dbm, _dbi, _db, _ghz.

title: New radio link study            # shown on every page
client: Client name
prepared_by: Engineer or team name
revision: A
date: ${o.date}                        # issue date of this revision (YYYY-MM-DD)
summary: >-
  One paragraph on what the network is for and what this revision decides.

# Document control. Sign-off steps left out print as empty boxes for a signature.
document:
  number: DOC-0001                     # your document number
  paper: a4                            # a4 or letter, for the printed report and PDF
  revisions:
    - { revision: A, date: ${o.date}, author: Engineer or team name, description: First issue }
  # prepared: { name: A. Person, role: Radio planning engineer, date: ${o.date} }
  # checked:  { name: B. Person, role: Checking engineer, date: ${o.date} }
  # approved: { name: C. Person, role: Approver, date: ${o.date} }

# Where ground heights come from: a .hgt tile or folder of tiles, a GeoTIFF
# (file: relative/path.tif), a constant height for sea paths (constant_m: 0), or seeded
# synthetic terrain, which is invented ground for trying the tool out (as here).
terrain:
  synthetic: { seed: 1, south_deg: -41.30, west_deg: -32.55, north_deg: -40.95, east_deg: -32.10 }

design:
  k_factors: ["4/3", "2/3"]            # effective Earth-radius factors checked for clearance
  clearance_criteria:                  # least clearance as a fraction of the first Fresnel radius
    - { k: "4/3", min_f1: 1.0 }
    - { k: "2/3", min_f1: 0.6 }
  availability_pct: 99.99              # required annual availability per link (%)
  diffraction_method: delta_bullington

climate:
  rain_rate_mm_h: 30                   # R0.01, rain rate exceeded 0.01 % of an average year
  dn1: -400                            # point refractivity gradient not exceeded 1 % of the year (ITU-R P.453)
  ground: medium_dry_ground

radios:
  - id: r18
    name: 18 GHz, 28 MHz channel
    frequency_ghz: 18.7
    tx_power_dbm: 18
    rx_threshold_dbm: -72              # at the bit-error ratio below
    threshold_ber: 1e-6

sites:                                 # WGS84 decimal degrees; ground_m optional (default: terrain)
  - { id: SITE1, name: First site, lat_deg: -41.0200, lon_deg: -32.2500 }
  - { id: SITE2, name: Second site, lat_deg: -41.0600, lon_deg: -32.1900 }

links:
  - id: site1-site2
    from: { site: SITE1, antenna_m: 30, gain_dbi: 38.6, feeder_loss_db: 0.3 }
    to: { site: SITE2, antenna_m: 30, gain_dbi: 38.6, feeder_loss_db: 0.3 }
    radio: r18
    polarization: v
    # design_status: alternative       # or rejected: shown apart, left out of the verdict
    # design_reason: one sentence saying why
`;
}
