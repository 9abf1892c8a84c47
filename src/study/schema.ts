import { z } from "zod";
import { patternTableProblem } from "./pattern-table.ts";

/**
 * The study file format (`content/studies/<id>/study.yaml`), defined once: the loader
 * validates with it and `npm run schema` turns it into `schema/study.schema.json` for editors.
 * Units are in key names; angles in degrees, heights in metres, powers in dBm, gains in dBi.
 */

const kValue = z
  .union([
    z.number().positive(),
    z.string().regex(/^(inf|\d+(\.\d+)?\/\d+(\.\d+)?)$/, "a fraction such as 4/3, or inf"),
    z.object({ gradient_n_km: z.number().gt(-157).describe("refractivity gradient dN/dh in the lowest km (N-units/km); k by ITU-R P.453") }).strict(),
  ])
  .describe("effective Earth-radius factor: a positive number, a fraction like 4/3, inf, or {gradient_n_km}");

const latitude = z.number().min(-90).max(90).describe("WGS84 latitude (decimal degrees, north positive)");
const longitude = z.number().min(-180).max(180).describe("WGS84 longitude (decimal degrees, east positive)");
const id = z.string().regex(/^[A-Za-z0-9][A-Za-z0-9_.-]*$/, "letters, digits, '-', '_' or '.'");

const terrain = z
  .union([
    z.object({ file: z.string().min(1).describe("a .hgt tile, a folder of .hgt tiles, or a GeoTIFF, relative to the study folder") }).strict(),
    z.object({ constant_m: z.number().describe("smooth Earth at this height above mean sea level (sea paths)") }).strict(),
    z
      .object({
        synthetic: z
          .object({
            seed: z.number().int(),
            south_deg: latitude,
            west_deg: longitude,
            north_deg: latitude,
            east_deg: longitude,
            spacing_arcsec: z.number().positive().optional(),
          })
          .strict()
          .describe("seeded synthetic terrain for demonstrations — not real ground"),
      })
      .strict(),
  ])
  .describe("where ground heights come from");

const linkEnd = z
  .object({
    site: id.describe("id of a site in `sites`"),
    antenna_m: z.number().min(0).max(1000).describe("antenna centre height above ground (m)"),
    gain_dbi: z.number().min(-10).max(70).describe("antenna gain (dBi)"),
    feeder_loss_db: z.number().min(0).max(50).default(0).describe("feeder and branching loss at this end (dB)"),
  })
  .strict();

const patternTable = (lo: number, hi: number, what: string) =>
  z
    .array(z.tuple([z.number(), z.number()]))
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
                value: z.number().int().describe("raster value"),
                name: z.string().min(1).optional(),
                category: clutterCategory,
                height_m: z.number().min(0).max(100).optional().describe("representative clutter height (m); default per category"),
              })
              .strict(),
          )
          .min(1)
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
    frequency_ghz: z.number().positive().max(1000).describe("carrier frequency (GHz)"),
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
    resolution_m: z.number().positive().default(30).describe("cell size (m); a single-raster terrain uses its own grid"),
    thresholds: z.array(z.number()).default([]).refine(ascending, "levels in strictly ascending order, e.g. [-100, -90, -80]").describe("levels whose covered area is reported and contoured"),
    threshold_unit: z.enum(["dBm", "dBuV/m"]).default("dBm").describe("unit of the thresholds: received level (dBm) or field strength (dBµV/m)"),
    k: kValue.default("4/3"),
    clearance_f1: z.number().min(0).max(5).default(0).describe("visibility: required clearance as a fraction of the first Fresnel radius (0: geometric line of sight)"),
    polarization: z.enum(["h", "v"]).default("v"),
    p1812: p1812Options.optional().describe("p1812: time and location statistics, clutter, indoor reception"),
    note: z.string().min(1).optional().describe("a sentence for the report under the coverage's heading (e.g. how the thresholds were chosen)"),
    service_area: z.string().min(1).optional().describe("service-area polygon (GeoJSON or KML file, relative to the study): coverage share and area reliability inside it"),
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
  .superRefine((e, ctx) => {
    if (e.method === "p1812" && !(e.frequency_ghz >= 0.03 && e.frequency_ghz <= 6)) {
      ctx.addIssue({ code: "custom", path: ["frequency_ghz"], message: `method p1812 (ITU-R P.1812-6) covers 0.03–6 GHz; received ${e.frequency_ghz} GHz: choose a frequency in that range or another method` });
    }
    if (e.p1812?.land_cover && e.p1812.receiver_clutter_loss === "p2108") {
      ctx.addIssue({ code: "custom", path: ["p1812", "receiver_clutter_loss"], message: "p2108 applies only where no land cover is given (the land cover's clutter already enters the P.1812 profile): remove one of them" });
    }
  });

export const studySchema = z
  .object({
    $schema: z.string().optional(),
    title: z.string().min(1),
    client: z.string().min(1),
    prepared_by: z.string().min(1),
    revision: z.union([z.string(), z.number()]).transform(String),
    date: z
      .string()
      .regex(/^\d{4}-\d{2}-\d{2}$/, "a date as YYYY-MM-DD")
      .describe("issue date of this revision (YYYY-MM-DD)"),
    summary: z.string().optional(),
    terrain,
    design: z
      .object({
        k_factors: z.array(kValue).min(1).default(["4/3", "2/3"]),
        clearance_criteria: z
          .array(z.object({ k: kValue, min_f1: z.number().min(-5).max(5).describe("required clearance as a fraction of the first Fresnel radius") }).strict())
          .default([
            { k: "4/3", min_f1: 1.0 },
            { k: "2/3", min_f1: 0.6 },
          ]),
        availability_pct: z.number().gt(0).lt(100).default(99.99).describe("required annual availability (%)"),
        diffraction_method: z.enum(["knife_edge", "deygout", "epstein_peterson", "bullington", "delta_bullington"]).default("delta_bullington"),
        profile_step_m: z.number().positive().optional().describe("profile sample spacing (m); default and upper bound: the terrain's own spacing"),
        field_margin_db: z.number().min(0).max(30).default(0).describe("allowance for ageing, misalignment and the like (dB)"),
        antenna_search: z
          .object({
            step_m: z.number().positive().max(50).default(1).describe("candidate step for the minimum-antenna-height search (m)"),
            max_m: z.number().positive().max(1000).default(100).describe("tallest antenna height the search considers (m)"),
          })
          .strict()
          .prefault({}),
        structure_notice_height_m: z.number().positive().default(45).describe("antennas higher than this above ground get a structure/aviation notice"),
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
            name: z.string().optional(),
            frequency_ghz: z.number().positive().max(1000).describe("carrier frequency (GHz)"),
            tx_power_dbm: z.number().min(-30).max(70),
            rx_threshold_dbm: z.number().min(-150).max(0).describe("receiver threshold at the stated bit-error ratio (dBm)"),
            threshold_ber: z.union([z.number(), z.string()]).transform(String).default("1e-6"),
          })
          .strict(),
      )
      .min(1),
    sites: z
      .array(
        z
          .object({
            id,
            name: z.string().min(1),
            lat_deg: latitude,
            lon_deg: longitude,
            ground_m: z.number().min(-500).max(9000).optional().describe("surveyed ground elevation (m amsl); default: from the terrain"),
            notes: z.string().optional(),
          })
          .strict(),
      )
      .min(1),
    links: z
      .array(
        z
          .object({
            id,
            from: linkEnd,
            to: linkEnd,
            radio: id.describe("id of a radio in `radios`"),
            polarization: z.enum(["h", "v"]).default("v"),
            profile_csv: z.string().optional().describe("surveyed profile CSV (distance_m,elevation_m[,obstruction_m]) used instead of the terrain"),
            availability_pct: z.number().gt(0).lt(100).optional().describe("overrides design.availability_pct for this link"),
          })
          .strict(),
      )
      .default([]),
    chains: z
      .array(z.object({ id, name: z.string().optional(), links: z.array(id).min(1) }).strict())
      .default([]),
    coverage: z.array(coverageEntry).default([]).describe("coverage maps around base sites"),
  })
  .strict();

export type StudyInput = z.output<typeof studySchema>;
export type KValueInput = z.output<typeof kValue>;
export type CoverageEntryInput = z.output<typeof coverageEntry>;
