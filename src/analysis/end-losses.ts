import type { Study } from "../study/study.ts";

type LinkEndInput = Study["links"][number]["from"];

/** Itemised fixed losses at one end of a link (dB): feeder, connectors, the waveguide run and the dry radome. */
export interface EndLosses {
  feeder_db: number;
  connector_db: number;
  /** Length × attenuation per 100 m. */
  waveguide_db: number;
  radome_db: number;
  /** Extra radome loss when wet, against rain only. */
  wet_radome_db: number;
  /** Everything between the radio and the antenna in median conditions. */
  total_db: number;
}

/** The fixed losses of one end as the study gives them (absent items are 0 dB). */
export function endLosses(e: LinkEndInput): EndLosses {
  const connector_db = e.connector_loss_db ?? 0;
  const waveguide_db = ((e.waveguide_m ?? 0) * (e.waveguide_loss_db_per_100m ?? 0)) / 100;
  const radome_db = e.radome_loss_db ?? 0;
  return { feeder_db: e.feeder_loss_db, connector_db, waveguide_db, radome_db, wet_radome_db: e.wet_radome_loss_db ?? 0, total_db: e.feeder_loss_db + connector_db + waveguide_db + radome_db };
}
