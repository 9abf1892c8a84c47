import { z } from "zod";
import { ID_MAX_LENGTH, ID_PATTERN, ID_RULE, idProblem } from "./name-rules.ts";

/**
 * Study fields of the frequency plan and the interference analysis (used by schema.ts).
 * Frequencies of the plan are channel centres in MHz, bandwidths in MHz; C/I and filter
 * discrimination in dB.
 */

const polarization = z.enum(["h", "v"]);

/** Ids by the study's id rule (name-rules.ts): they name entries in pages and results. */
const id = () => z.string().max(ID_MAX_LENGTH, ID_RULE).regex(ID_PATTERN, ID_RULE).refine((s) => idProblem(s) === null, ID_RULE);

/** A link's channel: centre frequency each way, bandwidth, polarisation each way. */
export const frequencyPlan = z
  .object({
    go_mhz: z.number().min(30).max(1e6).describe("centre frequency from → to (MHz)"),
    return_mhz: z.number().min(30).max(1e6).describe("centre frequency to → from (MHz)"),
    bandwidth_mhz: z.number().min(0.001).max(10_000).describe("occupied (channel) bandwidth of each direction (MHz)"),
    go_polarization: polarization.optional().describe("polarisation from → to; default: the link's polarization"),
    return_polarization: polarization.optional().describe("polarisation to → from; default: the link's polarization"),
  })
  .strict()
  .describe("the link's channel: centre frequencies, bandwidth and polarisation each way");

/** A radio's protection requirement as a receiver. */
export const receiverProtection = z
  .object({
    co_channel_ci_db: z.number().min(-20).max(100).describe("C/I the receiver needs co-channel, at its threshold, for the allowed threshold degradation (dB); not the C0/I of the XPD outage (radios[].co_channel_ci_db), which gives the threshold bit-error ratio by itself"),
    adjacent_ci_db: z
      .array(z.object({ offset_mhz: z.number().positive(), ci_db: z.number().min(-100).max(100) }).strict())
      .optional()
      .describe("C/I needed at these centre-frequency offsets (dB); interference further away than the last offset is not counted"),
    nfd_db: z
      .array(z.object({ offset_mhz: z.number().positive(), nfd_db: z.number().min(0).max(150) }).strict())
      .optional()
      .describe("net filter discrimination at these offsets (dB), instead of adjacent_ci_db"),
    threshold_degradation_db: z.number().gt(0).max(10).default(1).describe("threshold degradation allowed from all interference together (dB); 1 dB is common practice"),
    noise_figure_db: z.number().min(0).max(30).describe("receiver noise figure (dB), for the noise floor kT0·B·NF"),
  })
  .strict()
  .describe("what the radio needs as a receiver: C/I co-channel and by offset, allowed threshold degradation, noise figure");

/** Antenna radiation pattern envelope of a link end. */
export const antennaPattern = z
  .union([
    z.enum(["f699", "f1245"]).describe("ITU-R F.699-8 reference (peak) envelope or ITU-R F.1245-3 average pattern, from the gain and frequency"),
    z.object({ envelope_csv: z.string().min(1).max(1024).describe("tabulated envelope (angle_deg,h_copolar_db,h_crosspolar_db,v_copolar_db,v_crosspolar_db), relative to the study folder") }).strict(),
  ])
  .describe("radiation pattern envelope for interference: f699, f1245 or {envelope_csv}");

/** A transmitter outside the study's links (another operator's station, a planned link). */
const externalTransmitter = z
  .object({
    id: id(),
    site: id().describe("id of a site in `sites`"),
    antenna_m: z.number().min(0).max(1000).describe("antenna centre height above ground (m)"),
    gain_dbi: z.number().min(-10).max(70),
    pattern: antennaPattern.default("f699"),
    xpd_db: z.number().min(0).max(60).default(30).describe("cross-polar discrimination on the boresight (dB), for reference patterns"),
    toward_site: id().optional().describe("id of the site the antenna points at"),
    azimuth_deg: z.number().min(0).lt(360).optional().describe("boresight azimuth (deg), when it points at no site"),
    elevation_deg: z.number().min(-90).max(90).optional().describe("boresight elevation (deg); default: toward toward_site at the same height above its ground, else 0 (level)"),
    frequency_mhz: z.number().min(30).max(1e6).describe("centre frequency (MHz)"),
    bandwidth_mhz: z.number().min(0.001).max(10_000).describe("occupied bandwidth (MHz)"),
    polarization,
    tx_power_dbm: z.number().min(-30).max(80),
    feeder_loss_db: z.number().min(0).max(50).default(0),
  })
  .strict();

/** The study-level interference section: asking for the analysis and its time percentages. */
export const interferenceSection = z
  .object({
    long_term_pct: z.number().min(0.001).max(50).default(20).describe("time percentage of the long-term interference level (%), within ITU-R P.452-18's 0.001–50 %; 20 % is common practice"),
    short_term_pct: z.number().min(0.001).max(50).optional().describe("time percentage of the short-term level (%), 0.001–50; default: each receiving link's outage budget, 100 − its availability target (at least 0.001 %)"),
    external: z.array(externalTransmitter).default([]).describe("transmitters outside the study's links"),
  })
  .strict()
  .describe("interference between the study's links (and external transmitters); needs frequency_plan on every link and interference requirements on every radio");

export type FrequencyPlanInput = z.output<typeof frequencyPlan>;
export type ReceiverProtectionInput = z.output<typeof receiverProtection>;
export type AntennaPatternInput = z.output<typeof antennaPattern>;
export type InterferenceSectionInput = z.output<typeof interferenceSection>;
export type ExternalTransmitterInput = InterferenceSectionInput["external"][number];
