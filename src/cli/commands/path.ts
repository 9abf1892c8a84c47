import { analyzeLink } from "../../analysis/analyze-link.ts";
import { checkSitesOnTerrain, openStudyTerrain } from "../../analysis/analyze-study.ts";
import { sanitizeNumbers } from "../../analysis/sanitize.ts";
import { parseK } from "../../study/load-study.ts";
import type { KFactor, Study } from "../../study/study.ts";
import { parseTerrainArg } from "../../terrain/open-terrain.ts";
import { TerrainError } from "../../terrain/terrain-error.ts";
import { latLonArg, numberArg, parseArgs, UsageError } from "../args.ts";
import { printLinkTable } from "../link-table.ts";
import { PATH_METHOD_OPTIONS, PATH_METHOD_USAGE, preparePathMethod } from "./path-methods/index.ts";

export const PATH_USAGE = `Usage: ridgeline path --from LAT,LON --to LAT,LON (--terrain PATH|constant:M | --profile CSV)
         --frequency-ghz F --from-antenna-m H --to-antenna-m H [--k K]... [--polarization h|v]
         [--rain-rate-mm-h R] [--tx-power-dbm P] [--from-gain-dbi G] [--to-gain-dbi G]
         [--rx-threshold-dbm T] [--availability-pct A] [--json]
${PATH_METHOD_USAGE}`;

const DEFAULTS = { tx_power_dbm: 0, gain_dbi: 0, rx_threshold_dbm: -90, availability_pct: 99.99 };

/** `ridgeline path …`: one link without a study file. Exit 0 whether or not targets are met; 2 on bad input. */
export async function pathCommand(argv: string[]): Promise<number> {
  if (argv.includes("--help")) {
    process.stdout.write(`${PATH_USAGE}\n`);
    return 0;
  }
  const a = parseArgs(argv, {
    values: ["from", "to", "terrain", "profile", "frequency-ghz", "from-antenna-m", "to-antenna-m", "polarization", "rain-rate-mm-h", "tx-power-dbm", "from-gain-dbi", "to-gain-dbi", "rx-threshold-dbm", "availability-pct", ...PATH_METHOD_OPTIONS],
    repeat: ["k"],
    flags: ["json"],
  });
  const v = (n: string) => a.values.get(n)?.[0];
  if (a.positional.length) throw new UsageError(`unexpected argument "${a.positional[0]}".\n${PATH_USAGE}`);
  for (const req of ["from", "to", "frequency-ghz", "from-antenna-m", "to-antenna-m"]) {
    if (v(req) === undefined) throw new UsageError(`--${req} is required.\n${PATH_USAGE}`);
  }
  if ((v("terrain") === undefined) === (v("profile") === undefined)) throw new UsageError(`give exactly one of --terrain and --profile.\n${PATH_USAGE}`);
  const from = latLonArg("from", v("from"));
  const to = latLonArg("to", v("to"));
  const f = numberArg("frequency-ghz", v("frequency-ghz"), (x) => x > 0 && x <= 1000, "a frequency in GHz above 0 and up to 1000");
  const method = preparePathMethod(a.values, f);
  const hA = numberArg("from-antenna-m", v("from-antenna-m"), (x) => x >= 0, "a height above ground ≥ 0 (m)");
  const hB = numberArg("to-antenna-m", v("to-antenna-m"), (x) => x >= 0, "a height above ground ≥ 0 (m)");
  const pol = v("polarization") ?? "v";
  if (pol !== "h" && pol !== "v") throw new UsageError(`--polarization: received "${pol}"; expected h or v.`);
  const kList: KFactor[] = (a.values.get("k") ?? ["4/3", "2/3"]).map((s) => {
    const text = s.trim();
    const k = /^(inf|\d+(\.\d+)?(\/\d+(\.\d+)?)?)$/.test(text) ? parseK(text.includes("/") || text === "inf" ? text : Number(text)) : NaN;
    if (!(k > 0)) throw new UsageError(`--k: received "${s}"; expected a positive number, a fraction such as 4/3, or inf.`);
    return { k, label: text === "inf" ? "∞" : text };
  });
  const rain = v("rain-rate-mm-h") === undefined ? undefined : numberArg("rain-rate-mm-h", v("rain-rate-mm-h"), (x) => x >= 0 && x <= 300, "a rain rate R0.01 from 0 to 300 mm/h");
  const num = (name: string, dflt: number, ok: (x: number) => boolean, what: string) => (v(name) === undefined ? dflt : numberArg(name, v(name), ok, what));
  const study: Study = {
    id: "path",
    dir: process.cwd(),
    file: "(command line)",
    meta: { title: "One-off path", client: "-", prepared_by: "-", revision: "-", date: "1970-01-01" },
    terrain: v("terrain") !== undefined ? terrainInput(v("terrain")!) : { constant_m: 0 },
    design: {
      k_factors: kList,
      clearance_criteria: [
        { k: { k: 4 / 3, label: "4/3" }, min_f1: 1.0 },
        { k: { k: 2 / 3, label: "2/3" }, min_f1: 0.6 },
      ],
      availability_pct: num("availability-pct", DEFAULTS.availability_pct, (x) => x > 0 && x < 100, "a percentage between 0 and 100"),
      diffraction_method: "delta_bullington",
      field_margin_db: 0,
      antenna_search: { step_m: 1, max_m: 100 },
      structure_notice_height_m: 45,
    },
    climate: { pressure_hpa: 1013.25, temperature_c: 15, water_vapour_g_m3: 7.5, dn1: -400, ground: "medium_dry_ground", ...(rain !== undefined ? { rain_rate_mm_h: rain } : {}) },
    radios: [{ id: "radio", frequency_ghz: f, tx_power_dbm: num("tx-power-dbm", DEFAULTS.tx_power_dbm, Number.isFinite, "a power in dBm"), rx_threshold_dbm: num("rx-threshold-dbm", DEFAULTS.rx_threshold_dbm, Number.isFinite, "a level in dBm"), threshold_ber: "1e-6" }],
    sites: [
      { id: "A", name: "From", lat_deg: from[0], lon_deg: from[1] },
      { id: "B", name: "To", lat_deg: to[0], lon_deg: to[1] },
    ],
    links: [
      {
        index: 0,
        id: "path",
        from: { site: "A", antenna_m: hA, gain_dbi: num("from-gain-dbi", DEFAULTS.gain_dbi, Number.isFinite, "a gain in dBi"), feeder_loss_db: 0 },
        to: { site: "B", antenna_m: hB, gain_dbi: num("to-gain-dbi", DEFAULTS.gain_dbi, Number.isFinite, "a gain in dBi"), feeder_loss_db: 0 },
        radio: "radio",
        polarization: pol,
        ...(v("profile") !== undefined ? { profile_csv: v("profile") } : {}),
      },
    ],
    chains: [],
    locate: () => ({ line: 0, col: 0 }),
    file_sha256: "",
  };
  const terrain = await openStudyTerrain(study);
  if (v("profile") === undefined) checkSitesOnTerrain(study, terrain);
  const { result, figure } = analyzeLink(study, study.links[0], terrain);
  const warnings = [...result.warnings];
  if (rain === undefined) warnings.push("No --rain-rate-mm-h given: the budget has no rain term.");
  const l0 = study.links[0];
  const extra = method?.run({ from, to, profile: figure.profile, profile_csv: v("profile"), from_antenna_m: hA, to_antenna_m: hB, polarization: pol, from_gain_dbi: l0.from.gain_dbi, to_gain_dbi: l0.to.gain_dbi });
  if (extra) warnings.push(...extra.warnings);
  const link = { ...sanitizeNumbers({ ...result, ...extra?.fields }, warnings, "path"), warnings };
  if (a.flags.has("json")) process.stdout.write(`${JSON.stringify(link, null, 2)}\n`);
  else printLinkTable(link, extra?.lines);
  return 0;
}

function terrainInput(arg: string): Study["terrain"] {
  try {
    const spec = parseTerrainArg(arg);
    return spec.kind === "constant" ? { constant_m: spec.height_m } : spec.kind === "file" ? { file: spec.path } : { synthetic: spec };
  } catch (e) {
    if (e instanceof TerrainError) throw new UsageError(`--terrain: ${e.message}`);
    throw e;
  }
}

