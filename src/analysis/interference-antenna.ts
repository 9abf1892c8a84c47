import { resolve } from "node:path";
import { f1245GainDbi, f699GainDbi } from "../physics/fixed-antenna-patterns.ts";
import { envelopeAttenuationDb, type TabulatedEnvelope } from "../physics/tabulated-envelope.ts";
import type { OffAxis } from "../physics/off-axis-angle.ts";
import { readEnvelopeCsv } from "../study/envelope-csv.ts";
import { InputError } from "../study/input-error.ts";
import type { AntennaPatternInput } from "../study/interference-schema.ts";
import type { Study } from "../study/study.ts";

/** Default boresight cross-polar discrimination (dB) of a reference-pattern antenna. */
export const DEFAULT_XPD_DB = 30;

/** An antenna's pattern as the interference analysis reads it. */
export interface AntennaEnvelope {
  /** "f699", "f1245" or the CSV's path relative to the study */
  label: string;
  /**
   * Co-polar and cross-polar attenuation (dB) relative to the boresight gain toward an
   * off-axis direction.
   */
  attenuation(off: OffAxis, frequency_ghz: number): { co_db: number; cross_db: number };
}

/**
 * The envelope of a link end or external transmitter. Reference patterns (F.699-8, F.1245-3)
 * are rotationally symmetric and co-polar only: their cross-polar attenuation is taken as
 * the larger of the boresight XPD and the co-polar attenuation — no polarisation
 * discrimination off the main lobe beyond what the co-polar envelope gives (a conservative
 * choice; a tabulated envelope carries measured cross-polar levels).
 */
export function antennaEnvelope(study: Study, pattern: AntennaPatternInput | undefined, gain_dbi: number, xpd_db: number | undefined, envelopes: Map<string, TabulatedEnvelope>): AntennaEnvelope {
  const p = pattern ?? "f699";
  const xpd = xpd_db ?? DEFAULT_XPD_DB;
  if (typeof p === "string") {
    const g = p === "f699" ? f699GainDbi : f1245GainDbi;
    return {
      label: p,
      attenuation(off, f) {
        const co_db = gain_dbi - g(off.theta_deg, gain_dbi, f);
        return { co_db, cross_db: Math.max(xpd, co_db) };
      },
    };
  }
  const abs = resolve(study.dir, p.envelope_csv);
  let env = envelopes.get(abs);
  if (!env) {
    const r = readEnvelopeCsv(abs, "envelope_csv", { file: study.file });
    if (!r.envelope) throw new InputError(r.problems);
    env = r.envelope;
    envelopes.set(abs, env);
  }
  const e = env;
  return {
    label: p.envelope_csv,
    attenuation(off) {
      return { co_db: envelopeAttenuationDb(e, off.theta_deg, off.psi_deg, false), cross_db: envelopeAttenuationDb(e, off.theta_deg, off.psi_deg, true) };
    },
  };
}

/**
 * Coupling gain (dBi + dBi) of a transmitting and a receiving antenna toward each other,
 * with polarisation: co-polar, Gt,co + Gr,co; cross-polar, the power sum of the transmitter's
 * co-polar wave met by the receiver's cross-polar response and the transmitter's cross-polar
 * radiation met by the receiver's co-polar response (depolarisation on the path neglected).
 */
export function couplingGainDb(gt_dbi: number, tx: { co_db: number; cross_db: number }, gr_dbi: number, rx: { co_db: number; cross_db: number }, samePolarization: boolean): number {
  if (samePolarization) return gt_dbi - tx.co_db + gr_dbi - rx.co_db;
  const a = gt_dbi - tx.co_db + gr_dbi - rx.cross_db;
  const b = gt_dbi - tx.cross_db + gr_dbi - rx.co_db;
  return 10 * Math.log10(10 ** (a / 10) + 10 ** (b / 10));
}
