import { z } from "zod";
import { ID_MAX_LENGTH, ID_PATTERN, ID_RULE, idProblem, textProblem } from "./name-rules.ts";
import { patternTableProblem } from "./pattern-table.ts";
import { antennaPattern, frequencyPlan, interferenceSection, receiverProtection } from "./interference-schema.ts";

/**
 * The study file format (`content/studies/<id>/study.yaml`), defined once: the loader
 * validates with it and `npm run schema` turns it into `schema/study.schema.json` for editors.
 * Units are in key names; angles in degrees, heights in metres, powers in dBm, gains in dBi.
 */

const kValue = z
  .union([
    z.number().min(0.1).max(100),
    z.string().max(40).regex(/^(inf|\d+(\.\d+)?\/\d+(\.\d+)?)$/, "a fraction such as 4/3, or inf"),
    z.object({ gradient_n_km: z.number().min(-150).max(1000).describe("refractivity gradient dN/dh in the lowest km (N-units/km); k by ITU-R P.453") }).strict(),
  ])
  .describe("effective Earth-radius factor: a positive number, a fraction like 4/3, inf, or {gradient_n_km}");

const latitude = z.number().min(-90).max(90).describe("WGS84 latitude (decimal degrees, north positive)");
const longitude = z.number().min(-180).max(180).describe("WGS84 longitude (decimal degrees, east positive)");
const id = z
  .string()
  .max(ID_MAX_LENGTH, ID_RULE)
  .regex(ID_PATTERN, ID_RULE)
  .refine((s) => idProblem(s) === null, ID_RULE);

/** Free text shown in pages: one line (titles, names) or several (summary, notes); see name-rules.ts. */
const text = (multiline = false) =>
  z.string().superRefine((s, ctx) => {
    const problem = textProblem(s, multiline);
    if (problem) ctx.addIssue({ code: "custom", message: problem });
  });
const oneLine = () => text().pipe(z.string().min(1));

/** A calendar date YYYY-MM-DD that exists (no month 13, no 30 February), years 1900–2999. */
const calendarDate = z
  .string()
  .regex(/^\d{4}-\d{2}-\d{2}$/, "a date as YYYY-MM-DD")
  .refine((s) => {
    const [y, m, d] = s.split("-").map(Number);
    const t = new Date(Date.UTC(y, m - 1, d));
    return y >= 1900 && y <= 2999 && t.getUTCFullYear() === y && t.getUTCMonth() === m - 1 && t.getUTCDate() === d;
  }, "a calendar date that exists, as YYYY-MM-DD, between 1900 and 2999");

/** Ground and sea heights the Earth holds (m amsl): the Dead Sea shore to above Everest. */
const groundHeight = () => z.number().min(-500).max(9000);

/** Carrier frequencies the link and coverage methods accept (GHz): VHF to the P.676 limit. */
const frequencyGhz = () => z.number().min(0.03).max(1000);

const terrain = z
  .union([
    z.object({ file: z.string().min(1).max(1024).describe("a .hgt tile, a folder of .hgt tiles, or a GeoTIFF, relative to the study folder") }).strict(),
    z.object({ constant_m: groundHeight().describe("smooth Earth at this height above mean sea level (sea paths)") }).strict(),
    z
      .object({
        synthetic: z
          .object({
            seed: z.number().int().min(-2147483648).max(4294967295),
            south_deg: latitude,
            west_deg: longitude,
            north_deg: latitude,
            east_deg: longitude,
            spacing_arcsec: z.number().min(0.1).max(3600).optional(),
          })
          .strict()
          .describe("seeded synthetic terrain for demonstrations — not real ground"),
      })
      .strict(),
  ])
  .describe("where ground heights come from");

/** Budget details practitioners itemise at each end (ITU-R F.1101 style listing; common practice). */
const linkEndDetails = {
  radome_loss_db: z.number().min(0).max(10).optional().describe("loss of the antenna's radome, dry (dB); default 0"),
  wet_radome_loss_db: z.number().min(0).max(20).optional().describe("extra radome loss when wet, taken off the margin against rain only (dB); default 0"),
  connector_loss_db: z.number().min(0).max(10).optional().describe("connector and adaptor losses at this end (dB); default 0"),
  waveguide_m: z.number().min(0).max(1000).optional().describe("length of the waveguide or cable run at this end (m); default 0"),
  waveguide_loss_db_per_100m: z.number().min(0).max(200).optional().describe("attenuation of that run per 100 m (dB/100 m); default 0"),
};

/** A radio's signature for the dispersive-fading outage (ITU-R P.530-16 §2.3.6). */
const signature = z
  .object({
    width_mhz: z.number().min(0.01).max(1000).describe("signature width W (MHz)"),
    depth_minimum_phase_db: z.number().min(0).max(80).describe("signature depth B_M for minimum-phase fades (dB)"),
    depth_non_minimum_phase_db: z.number().min(0).max(80).describe("signature depth B_NM for non-minimum-phase fades (dB)"),
    reference_delay_ns: z.number().min(0.01).max(100).default(6.3).describe("echo delay τ_r at which the signature was measured (ns)"),
  })
  .strict()
  .describe("radio signature: width and depths of the notch a two-ray echo must make to cause errors at the threshold bit-error ratio");

const modulationMode = z
  .object({
    name: oneLine().describe("mode name, e.g. 1024-QAM"),
    capacity_mbps: z.number().min(0.001).max(100_000).describe("payload capacity in this mode (Mbit/s)"),
    rx_threshold_dbm: z.number().min(-150).max(0).describe("receiver threshold of this mode at the radio's threshold bit-error ratio (dBm)"),
    signature: signature.optional(),
  })
  .strict();

const modesInOrder = (modes: { capacity_mbps: number; rx_threshold_dbm: number }[]) => modes.every((m, i) => i === 0 || (m.rx_threshold_dbm > modes[i - 1].rx_threshold_dbm && m.capacity_mbps > modes[i - 1].capacity_mbps));

const linkEnd = z
  .object({
    site: id.describe("id of a site in `sites`"),
    antenna_m: z.number().min(0).max(1000).describe("antenna centre height above ground (m)"),
    gain_dbi: z.number().min(-10).max(70).describe("antenna gain (dBi)"),
    feeder_loss_db: z.number().min(0).max(50).default(0).describe("feeder and branching loss at this end (dB)"),
    ...linkEndDetails,
    pattern: antennaPattern.optional().describe("radiation pattern envelope for interference: f699 (default), f1245 or {envelope_csv}"),
    xpd_db: z.number().min(0).max(60).optional().describe("cross-polar discrimination on the boresight (dB), used with the f699 and f1245 patterns; default 30"),
  })
  .strict();

const patternTable = (lo: number, hi: number, what: string) =>
  z
    .array(z.tuple([z.number(), z.number().max(100)]))
    .max(3601)
    .superRefine((rows, ctx) => {
      const problem = patternTableProblem(rows, lo, hi);
      if (problem) ctx.addIssue({ code: "custom", message: problem });
    })
    .describe(`[${what} relative to the boresight (deg), attenuation (dB)] rows, angles rising from ${lo} to ${hi}`);

const ascending = (v: number[]) => v.every((x, i) => i === 0 || x > v[i - 1]);

const clutterCategory = z.enum(["water", "open", "suburban", "urban", "dense_urban"]).describe("ITU-R P.1812-6 clutter category");

const p1812Options = z
  .object({
    time_pct: z.number().min(1, "a percentage of time from 1 to 50 %").max(50, "a percentage of time from 1 to 50 %").default(50).describe("percentage of time the level is exceeded (1–50 %)"),
    location_pct: z.number().min(1, "a percentage of locations from 1 to 99 %").max(99, "a percentage of locations from 1 to 99 %").default(50).describe("percentage of locations the mapped level is exceeded at (1–99 %)"),
    sigma_l_db: z.number().min(0).max(30).optional().describe("location variability σL (dB); default: ITU-R P.1812-6 §4.8 for the frequency, cell size and the receiver's clutter"),
    dn: z.number().gt(0).lt(157).default(45).describe("average radio-refractivity lapse rate ΔN through the lowest 1 km (N-units/km)"),
    n0: z.number().min(250).max(400).default(325).describe("sea-level surface refractivity N0 (N-units)"),
    land_cover: z
      .object({
        file: z.string().min(1).describe("land-cover GeoTIFF (class values), relative to the study"),
        classes: z
          .array(
            z
              .object({
                value: z.number().int().min(-2147483648).max(4294967295).describe("raster value"),
                name: oneLine().optional(),
                category: clutterCategory,
                height_m: z.number().min(0).max(100).optional().describe("representative clutter height (m); default per category"),
              })
              .strict(),
          )
          .min(1)
          .max(256)
          .describe("every value the raster holds inside the radius, with its category and height"),
      })
      .strict()
      .optional()
      .describe("clutter from a land-cover raster; without it `clutter` applies everywhere"),
    clutter: clutterCategory.default("open").describe("one clutter category for the whole area (when no land cover is given)"),
    clutter_height_m: z.number().min(0).max(100).optional().describe("its representative height (m); default per category"),
    receiver_clutter_loss: z.enum(["none", "p2108"]).default("none").describe("p2108: add the ITU-R P.2108-1 §3.2 terrestrial clutter loss at the receiver (only without a land cover)"),
    indoor: z
      .object({ building: z.enum(["traditional", "thermally-efficient"]).default("traditional").describe("ITU-R P.2109-1 building class") })
      .strict()
      .optional()
      .describe("indoor receivers: building entry loss of ITU-R P.2109-1 (median, and its spread added to the location variability)"),
  })
  .strict();

const coverageEntry = z
  .object({
    id,
    site: id.describe("id of a site in `sites`: the transmitter"),
    method: z
      .enum(["visibility", "delta-bullington", "hata", "p1812"])
      .default("delta-bullington")
      .describe("visibility (radio line of sight), delta-bullington (free space + ITU-R P.526-15 §4.5), hata (Okumura–Hata / COST-231) or p1812 (ITU-R P.1812-6 with clutter, time and location statistics)"),
    frequency_ghz: frequencyGhz().describe("carrier frequency (GHz); hata: at most 3 GHz; p1812: 0.03–6 GHz"),
    antenna_m: z.number().min(0).max(1000).describe("antenna centre height above ground (m)"),
    gain_dbi: z.number().min(-10).max(40).default(0).describe("antenna gain toward the boresight (dBi)"),
    pattern: z
      .object({
        azimuth_deg: z.number().min(0).lt(360).default(0).describe("boresight azimuth, clockwise from true north (deg)"),
        downtilt_deg: z.number().min(-90).max(90).default(0).describe("boresight below the horizontal (deg)"),
        horizontal: patternTable(0, 360, "azimuth").optional(),
        vertical: patternTable(-90, 90, "elevation").optional(),
      })
      .strict()
      .optional()
      .describe("tabulated antenna pattern; omit for an omnidirectional antenna"),
    tx_power_dbm: z.number().min(-30).max(80).default(0).describe("transmitter output power (dBm)"),
    tx_losses_db: z.number().min(0).max(50).default(0).describe("feeder and other losses between transmitter and antenna (dB)"),
    receiver_m: z.number().min(0).max(1000).default(1.5).describe("receiver antenna height above ground (m)"),
    receiver_gain_dbi: z.number().min(-20).max(40).default(0).describe("receiver antenna gain (dBi)"),
    receiver_losses_db: z.number().min(0).max(50).default(0).describe("receiver feeder and body losses (dB)"),
    radius_km: z.number().gt(0).max(500).describe("radius of the coverage around the site (km)"),
    resolution_m: z.number().min(0.1).max(10000).default(30).describe("cell size (m); a single-raster terrain uses its own grid"),
    thresholds: z.array(z.number().min(-300).max(300)).max(32).default([]).refine(ascending, "levels in strictly ascending order, e.g. [-100, -90, -80]").describe("levels whose covered area is reported and contoured"),
    threshold_unit: z.enum(["dBm", "dBuV/m"]).default("dBm").describe("unit of the thresholds: received level (dBm) or field strength (dBµV/m)"),
    k: kValue.default("4/3"),
    clearance_f1: z.number().min(0).max(5).default(0).describe("visibility: required clearance as a fraction of the first Fresnel radius (0: geometric line of sight)"),
    polarization: z.enum(["h", "v"]).default("v"),
    p1812: p1812Options.optional().describe("p1812: time and location statistics, clutter, indoor reception"),
    note: text(true).pipe(z.string().min(1).max(1000)).optional().describe("a sentence for the report under the coverage's heading (e.g. how the thresholds were chosen)"),
    service_area: z.string().min(1).optional().describe("service-area polygon (GeoJSON or KML file, relative to the study): coverage share and area reliability inside it"),
    wave_check_radials: z.number().int().min(0).max(72).default(8).describe("radials (equally spaced from north) along which the wave solution checks a level coverage's method; 0 turns the check off"),
    talk_back: z
      .object({
        tx_power_dbm: z.number().min(-30).max(60).describe("outstation / mobile transmitter power (dBm)"),
        base_threshold_dbm: z.number().min(-160).max(0).describe("receive threshold at the base (dBm)"),
      })
      .strict()
      .optional()
      .describe("uplink check: the outstation's power and the base's threshold (same antennas and losses as the downlink)"),
    hata: z
      .object({
        environment: z.enum(["urban", "suburban", "open"]).default("urban"),
        city_size: z.enum(["small-medium", "large"]).default("small-medium"),
      })
      .strict()
      .prefault({})
      .describe("hata: area type and city size"),
  })
  .strict()
  .refine((c) => c.method !== "hata" || c.frequency_ghz <= 3, { message: "a frequency of at most 3 GHz for the hata method (Okumura–Hata and COST-231 stop at 2 GHz)", path: ["frequency_ghz"] })
  .superRefine((e, ctx) => {
    if (e.method === "p1812" && !(e.frequency_ghz >= 0.03 && e.frequency_ghz <= 6)) {
      ctx.addIssue({ code: "custom", path: ["frequency_ghz"], message: `method p1812 (ITU-R P.1812-6) covers 0.03–6 GHz; received ${e.frequency_ghz} GHz: choose a frequency in that range or another method` });
    }
    if (e.p1812?.land_cover && e.p1812.receiver_clutter_loss === "p2108") {
      ctx.addIssue({ code: "custom", path: ["p1812", "receiver_clutter_loss"], message: "p2108 applies only where no land cover is given (the land cover's clutter already enters the P.1812 profile): remove one of them" });
    }
  });

const signOff = z
  .object({
    name: oneLine().optional(),
    role: oneLine().optional(),
    date: calendarDate.optional(),
  })
  .strict()
  .describe("who signed this step, in what role and when; the report leaves empty boxes for what is not given");

const documentControl = z
  .object({
    number: oneLine().optional().describe("document number under the client's or the firm's document control"),
    paper: z.enum(["a4", "letter"]).default("a4").describe("paper size of the printed report and its PDF"),
    revisions: z
      .array(
        z
          .object({
            revision: z.union([oneLine(), z.number().min(0).max(1e9)]).transform(String),
            date: calendarDate,
            author: oneLine().optional(),
            description: text(true).pipe(z.string().min(1)),
          })
          .strict(),
      )
      .max(200)
      .default([])
      .describe("revision history, oldest first"),
    prepared: signOff.optional(),
    checked: signOff.optional(),
    approved: signOff.optional(),
  })
  .strict()
  .describe("document control: number, revision history and sign-off (shown on the study page and the PDF's first page)");

export const studySchema = z
  .object({
    $schema: z.string().max(1024).optional(),
    title: oneLine(),
    client: oneLine(),
    prepared_by: oneLine(),
    revision: z.union([oneLine(), z.number().min(0).max(1e9)]).transform(String),
    date: calendarDate.describe("issue date of this revision (YYYY-MM-DD)"),
    summary: text(true).optional(),
    document: documentControl.prefault({}),
    terrain,
    design: z
      .object({
        k_factors: z.array(kValue).min(1).max(8).default(["4/3", "2/3"]),
        clearance_criteria: z
          .array(z.object({ k: kValue, min_f1: z.number().min(-5).max(5).describe("required clearance as a fraction of the first Fresnel radius") }).strict())
          .max(8)
          .default([
            { k: "4/3", min_f1: 1.0 },
            { k: "2/3", min_f1: 0.6 },
          ]),
        availability_pct: z.number().gt(0).lt(100).default(99.99).describe("required annual availability against long outages (rain, rain depolarisation) (%)"),
        diffraction_method: z.enum(["knife_edge", "deygout", "epstein_peterson", "bullington", "delta_bullington"]).default("delta_bullington"),
        profile_step_m: z.number().min(0.1).max(10000).optional().describe("profile sample spacing (m); default and upper bound: the terrain's own spacing"),
        performance_pct: z.number().gt(0).lt(100).optional().describe("required percentage of the average worst month free of short-fade outage (multipath flat, dispersive, clear-air XPD): the error-performance objective (%); default 99.995"),
        worst_month_k: z
          .object({
            enabled: z.boolean().default(true).describe("add the clearance case at k_e exceeded 99.9 % of the worst month (ITU-R P.530-16 §2.2.2, Fig. 3) for the path's length"),
            min_f1: z.number().min(-1).max(1).default(0.3).describe("clearance required at that k (F1): 0 for a single isolated obstruction, 0.3 where it extends along the path (P.530-16 §2.2.2)"),
          })
          .strict()
          .optional()
          .describe("the automatic clearance case at k_e exceeded 99.9 % of the worst month; default enabled, 0.3 F1"),
        design_allowance_db: z.number().min(0).max(30).default(0).describe("design allowance: margin set aside for ageing, misalignment and the like, taken off the fade margin (dB)"),
        antenna_search: z
          .object({
            step_m: z.number().min(0.1).max(50).default(1).describe("candidate step for the minimum-antenna-height search (m)"),
            max_m: z.number().positive().max(1000).default(100).describe("tallest antenna height the search considers (m)"),
          })
          .strict()
          .refine((a) => a.max_m / a.step_m <= 2000, { message: "at most 2000 candidate heights: max_m / step_m ≤ 2000 (e.g. step_m: 0.5 up to 1000 m)", path: ["step_m"] })
          .prefault({}),
        structure_notice_height_m: z.number().positive().max(1000).default(45).describe("antennas higher than this above ground get a structure/aviation notice"),
        wave_solution: z.boolean().default(true).describe("compute the parabolic-equation wave solution for every link (field figure and comparison with the diffraction methods)"),
      })
      .strict()
      .prefault({}),
    climate: z
      .object({
        rain_rate_mm_h: z.number().min(0).max(300).optional().describe("rain rate exceeded 0.01 % of an average year, R0.01 (mm/h)"),
        pressure_hpa: z.number().min(300).max(1100).default(1013.25).describe("total atmospheric pressure (hPa)"),
        temperature_c: z.number().min(-60).max(60).default(15),
        water_vapour_g_m3: z.number().min(0).max(50).default(7.5),
        dn1: z.number().min(-2000).max(500).default(-400).describe("point refractivity gradient in the lowest 65 m not exceeded 1 % of an average year, dN1 (ITU-R P.453)"),
        sa_m: z.number().min(0).max(1000).optional().describe("terrain roughness: standard deviation of heights in a 110 km × 110 km area (m), ITU-R P.530"),
        ground: z.enum(["sea_water", "fresh_water", "wet_ground", "medium_dry_ground", "very_dry_ground"]).default("medium_dry_ground"),
      })
      .strict()
      .prefault({}),
    radios: z
      .array(
        z
          .object({
            id,
            name: oneLine().optional(),
            frequency_ghz: frequencyGhz().describe("carrier frequency (GHz)"),
            tx_power_dbm: z.number().min(-30).max(70),
            rx_threshold_dbm: z.number().min(-150).max(0).describe("receiver threshold at the stated bit-error ratio (dBm)"),
            threshold_ber: z.union([z.number().gt(0).lt(1), z.string().max(20).regex(/^[0-9.eE+-]+$/, "a bit-error ratio such as 1e-6")]).transform(String).default("1e-6"),
            signature: signature.optional(),
            modes: z
              .array(modulationMode)
              .min(1)
              .refine(modesInOrder, "modes listed in order of rising threshold and rising capacity (the lowest, most robust mode first)")
              .refine((m) => new Set(m.map((x) => x.name)).size === m.length, "modes with different names (a capacity target names its mode)")
              .optional()
              .describe("adaptive modulation: the radio's modes, most robust first; rx_threshold_dbm above is then the lowest mode's"),
            xpd_db: z.number().min(0).max(60).optional().describe("antennas' guaranteed minimum cross-polar discrimination XPD_g at boresight (dB), for co-channel dual-polarised links"),
            xpif_db: z.number().min(0).max(40).optional().describe("cross-polar improvement factor of the canceller (XPIC); default 0, without one (dB)"),
            co_channel_ci_db: z.number().min(0).max(60).optional().describe("C0/I of ITU-R P.530 §4: the C/I at which co-channel interference alone gives the threshold bit-error ratio, for the XPD outage (dB); not the C/I for a threshold degradation, which is interference.co_channel_ci_db (typically about 6 dB higher for 1 dB)"),
            atpc_range_db: z.number().min(0).max(60).optional().describe("automatic transmit power control range (dB); informational"),
            interference: receiverProtection.optional(),
          })
          .strict(),
      )
      .min(1)
      .max(1000),
    sites: z
      .array(
        z
          .object({
            id,
            name: oneLine(),
            lat_deg: latitude,
            lon_deg: longitude,
            ground_m: groundHeight().optional().describe("surveyed ground elevation (m amsl); default: from the terrain"),
            notes: text(true).optional(),
          })
          .strict(),
      )
      .min(1)
      .max(10000),
    links: z
      .array(
        z
          .object({
            id,
            from: linkEnd,
            to: linkEnd,
            radio: id.describe("id of a radio in `radios`"),
            polarization: z.enum(["h", "v"]).default("v"),
            profile_csv: z.string().min(1).max(1024).optional().describe("surveyed profile CSV (distance_m,elevation_m[,obstruction_m]) used instead of the terrain"),
            availability_pct: z.number().gt(0).lt(100).optional().describe("overrides design.availability_pct for this link"),
            performance_pct: z.number().gt(0).lt(100).optional().describe("overrides design.performance_pct for this link"),
            diversity: z
              .union([
                z.object({ space: z.object({ spacing_m: z.number().min(0.1).max(100).describe("vertical spacing of the two receive antennas, centre to centre (m)"), gain_dbi: z.number().min(-10).max(70).optional().describe("the second antenna's gain (dBi); default the main antenna's") }).strict() }).strict(),
                z.object({ frequency: z.object({ spacing_mhz: z.number().min(0.001).max(5000).describe("separation of the two channels (MHz)") }).strict() }).strict(),
              ])
              .optional()
              .describe("diversity reception at the link's receiving end: {space: {spacing_m, gain_dbi}} or {frequency: {spacing_mhz}}"),
            co_channel_dual_polarised: z.boolean().optional().describe("true when the link carries two co-channel signals on orthogonal polarisations (XPD outage applies); default false"),
            capacity_target: z
              .object({
                capacity_mbps: z.number().positive().optional().describe("capacity that must be available"),
                mode: oneLine().optional().describe("or a mode of the radio that must be available"),
                availability_pct: z.number().gt(0).lt(100).describe("for this percentage of the year (%)"),
              })
              .strict()
              .optional()
              .describe("adaptive modulation target, e.g. ≥ 200 Mbit/s for 99.99 % of the year"),
            frequency_plan: frequencyPlan.optional(),
            design_status: z.enum(["alternative", "rejected"]).optional().describe("a design kept for the record: computed and shown in its own section, left out of the study's verdict and of `ridgeline check`'s exit code"),
            design_reason: text(true).pipe(z.string().min(1)).optional().describe("why the design is an alternative or was rejected (required with design_status)"),
          })
          .strict()
          .superRefine((l, ctx) => {
            if (l.design_status && !l.design_reason) ctx.addIssue({ code: "custom", path: ["design_reason"], message: `a link marked design_status: ${l.design_status} needs design_reason, one sentence saying why` });
          }),
      )
      .max(10000)
      .default([]),
    chains: z
      .array(z.object({ id, name: oneLine().optional(), links: z.array(id).min(1).max(1000) }).strict())
      .max(1000)
      .default([]),
    coverage: z.array(coverageEntry).max(64).default([]).describe("coverage maps around base sites"),
    interference: interferenceSection.optional(),
  })
  .strict();

export type StudyInput = z.output<typeof studySchema>;
export type KValueInput = z.output<typeof kValue>;
export type DocumentControlInput = z.output<typeof documentControl>;
export type CoverageEntryInput = z.output<typeof coverageEntry>;
