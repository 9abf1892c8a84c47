import type { AnalyzedStudy } from "../analysis/analyze-study.ts";
import { studyCautions, type StudyCautions } from "./cautions.ts";
import { formatNumber } from "../format/quantity.ts";
import { interferenceReport, type InterferenceReport } from "./interference-report.ts";
import { inVerdict } from "../analysis/results.ts";
import { DIFFRACTION_LABELS } from "./link-report.ts";

/** "All 7 links meet their design targets." / "1 of 7 links misses a design target." */
export function verdictSentence(total: number, met: number): string {
  if (total === 0) return "The study has no links to judge.";
  if (met === total) return total === 1 ? "The link meets its design targets." : `All ${total} links meet their design targets.`;
  const missed = total - met;
  return `${missed} of ${total} ${total === 1 ? "link" : "links"} ${missed === 1 ? "misses" : "miss"} a design target.`;
}

/** A statement of the study's basis: what, the value, and where it comes from. */
export interface AssumptionRow {
  topic: string;
  value: string;
  basis: string;
}

export interface MethodRow {
  quantity: string;
  method: string;
}

export interface ChainRow {
  id: string;
  name: string;
  links: { id: string; availability_pct: number | null }[];
  availability_pct: number | null;
  target_pct: number;
  met: boolean;
  performance_pct: number | null;
  target_performance_pct: number;
  performance_met: boolean;
  availability_met: boolean;
  combined_availability_pct: number | null;
}

/** A failing link and what would fix it. */
export interface RemedyRow {
  link: string;
  name: string;
  remedies: { issue: string; fix: string }[];
}

/** What the study page shows besides the raw results. */
export interface StudyReport {
  /** Links counted in the study's verdict (alternative and rejected designs are not). */
  links_total: number;
  links_met: number;
  /** The verdict as one sentence ("✓ All 7 links meet their design targets."). */
  verdict: string;
  /** Ids of the links counted in the verdict, in study order. */
  design_links: string[];
  /** Alternative and rejected designs, with the reason, in study order. */
  alternatives: { id: string; status: string; reason: string; target_met: boolean }[];
  assumptions: AssumptionRow[];
  methods: MethodRow[];
  chains: ChainRow[];
  /** The failing links and what would bring each to its targets. */
  remedies: RemedyRow[];
  cautions: StudyCautions;
  /** Frequency plan and interference tables; null when the study has no frequency plan. */
  interference: InterferenceReport | null;
}

const COMMON_CRITERIA = [
  { k: 4 / 3, min_f1: 1.0 },
  { k: 2 / 3, min_f1: 0.6 },
];

const GROUND_NAMES: Record<string, string> = {
  sea_water: "sea water",
  fresh_water: "fresh water",
  wet_ground: "wet ground",
  medium_dry_ground: "medium dry ground",
  very_dry_ground: "very dry ground",
};

/** Methods and editions the analysis uses, in report order. */
export const METHODS: MethodRow[] = [
  { quantity: "Path geometry", method: "WGS84 geodesics (GeographicLib, Karney 2013); Earth bulge and first Fresnel radius by the standard formulas" },
  { quantity: "Free-space loss", method: "ITU-R P.525-4, 20·log10(4πd/λ) with c = 299 792 458 m/s" },
  { quantity: "Diffraction", method: "ITU-R P.526-15 §4.5 (Bullington, delta-Bullington); §4.1 single knife edge; Deygout and Epstein–Peterson constructions for comparison" },
  { quantity: "Gaseous absorption", method: "ITU-R P.676-12 Annex 1 (line-by-line), specific attenuation times path length" },
  { quantity: "Rain", method: "ITU-R P.838-3 specific attenuation; ITU-R P.530-16 §2.4.1 path attenuation and outage" },
  { quantity: "Multipath fading", method: "ITU-R P.530-16 §2.3 (§2.3.1, §2.3.2 worst month; §2.3.4 to the average year for the combined figure)" },
  { quantity: "Dispersive fading", method: "ITU-R P.530-16 §2.3.6, signature method (radios with a signature)" },
  { quantity: "Diversity", method: "ITU-R P.530-16 §6.2.1 space and frequency diversity improvement, §6.2.2 with dispersive fading" },
  { quantity: "Cross-polar discrimination", method: "ITU-R P.530-16 §4.1 clear air, §4.2 precipitation (co-channel dual-polarised links)" },
  { quantity: "Clearance at k_e (99.9 % worst month)", method: "ITU-R P.530-16 §2.2.2, Fig. 3 (read from memory, about ±0.05 in k_e): an automatic case beside the study's k values" },
  { quantity: "Adaptive modulation", method: "Time below each mode's threshold per year from the fade statistics above; a mode is in use between its threshold and the next (common practice)" },
  { quantity: "Reflection", method: "Specular points by geometrical optics over the profile; ground constants of ITU-R P.527 classes" },
  { quantity: "Objectives", method: "Performance: short-fade outage (multipath flat + dispersive + clear-air XPD) per average worst month; availability: rain and rain XPD per average year (ITU-R P.530-16 §7); hops in a chain added (common practice). The combined figure adds everything per year, for comparison" },
];

/** Methods of the interference analysis, listed when the study asks for it. */
export const INTERFERENCE_METHODS: MethodRow[] = [
  { quantity: "Interference paths", method: "ITU-R P.452-18 clear-air basic transmission loss at the long-term and short-term time percentages" },
  { quantity: "Antenna discrimination", method: "ITU-R F.699-8 reference envelope or ITU-R F.1245-3 average pattern from gain and frequency, or a tabulated envelope; off-axis angles from WGS84 geodesics and k = 4/3 elevations" },
  { quantity: "Threshold degradation", method: "10·log10(1 + I/N), noise kT0·B·NF, interference summed in power after the receiver's net filter discrimination (common practice)" },
];

/** Build the study page's statements, summaries and cautions from an analysed study. */
export function studyReport(s: AnalyzedStudy): StudyReport {
  const r = s.result;
  const d = s.study.design;
  const c = s.study.climate;
  const ks = d.k_factors.map((k) => k.label);
  const crit = d.clearance_criteria;
  const isCommon = crit.length === COMMON_CRITERIA.length && crit.every((cr, i) => Math.abs(cr.k.k - COMMON_CRITERIA[i].k) < 1e-9 && cr.min_f1 === COMMON_CRITERIA[i].min_f1);
  const overrides = s.study.links.filter((l) => l.availability_pct !== undefined);
  const assumptions: AssumptionRow[] = [
    { topic: "Effective Earth-radius factors k", value: ks.join(", "), basis: `Clearance is checked at each; diffraction loss, reflection and height gain use the first, k = ${ks[0]}.` },
    {
      topic: "Clearance criteria",
      value: crit.map((cr) => `at least ${cr.min_f1.toFixed(2)} F1 at k = ${cr.k.label}`).join("; "),
      basis: isCommon ? "Common-practice defaults for line-of-sight microwave paths." : "Set for this study.",
    },
    {
      topic: "Availability target",
      value: `${d.availability_pct} % of an average year per link`,
      basis: overrides.length ? `Overridden for ${overrides.map((l) => `${l.id} (${l.availability_pct} %)`).join(", ")}.` : "Applies to every link.",
    },
    { topic: "Performance target", value: `${d.performance_pct ?? 99.995} % of the average worst month per link`, basis: d.performance_pct === undefined ? "Default: a common-practice choice; set the operator's own objective (design.performance_pct)." : "Set for this study." },
    { topic: "Diffraction method used in the budget", value: DIFFRACTION_LABELS[d.diffraction_method]?.name ?? d.diffraction_method, basis: "Other methods are shown on each link page for comparison." },
    { topic: "Design allowance", value: `${d.design_allowance_db} dB`, basis: "Allowance for ageing, misalignment and the like, subtracted from the fade margin." },
    {
      topic: "Rain rate R0.01",
      value: c.rain_rate_mm_h === undefined ? "not given" : `${c.rain_rate_mm_h} mm/h`,
      basis: c.rain_rate_mm_h === undefined ? "Rain attenuation is not computed." : "Rain rate exceeded for 0.01 % of an average year, as entered for the study area.",
    },
    { topic: "Atmosphere", value: `${c.pressure_hpa} hPa, ${c.temperature_c} °C, water vapour ${c.water_vapour_g_m3} g/m³`, basis: "Surface values for gaseous absorption (P.676-12)." },
    { topic: "Refractivity gradient dN1", value: `${formatNumber(c.dn1, 0)} N-units/km`, basis: "Point gradient in the lowest 65 m not exceeded for 1 % of an average year (P.453), for multipath fading." },
    {
      topic: "Terrain roughness sa",
      value: c.sa_m === undefined ? "not given" : `${c.sa_m} m`,
      basis: c.sa_m === undefined ? "Multipath uses the quick-planning geoclimatic factor of P.530-16 §2.3.1." : "Detailed geoclimatic factor of P.530-16 §2.3.1.",
    },
    { topic: "Ground", value: GROUND_NAMES[c.ground] ?? c.ground, basis: "Electrical constants for reflection and for the spherical-Earth part of delta-Bullington." },
    { topic: "Terrain", value: r.terrain.description, basis: r.terrain.synthetic ? "Synthetic: the figures show invented ground, not a real place." : "Elevation data named in the study." },
    { topic: "Structure notice height", value: `${d.structure_notice_height_m} m above ground`, basis: "Antennas above it are listed under Cautions." },
  ];
  const byId = new Map(r.links.map((l) => [l.id, l]));
  const chains: ChainRow[] = r.chains.map((ch) => ({
    id: ch.id,
    name: ch.name,
    links: ch.links.map((id) => ({ id, availability_pct: byId.get(id)?.availability_pct ?? null })),
    availability_pct: ch.availability_pct,
    target_pct: ch.target_availability_pct,
    met: ch.target_met,
    performance_pct: ch.performance_pct ?? null,
    target_performance_pct: ch.target_performance_pct,
    performance_met: ch.performance_met,
    availability_met: ch.availability_met,
    combined_availability_pct: ch.combined_availability_pct ?? null,
  }));
  const remedies: RemedyRow[] = r.links.filter((l) => !l.target_met).map((l) => ({ link: l.id, name: `${l.ends.from.name} → ${l.ends.to.name}`, remedies: l.remedies ?? [] }));
  const counted = r.links.filter(inVerdict);
  const met = counted.filter((l) => l.target_met).length;
  return {
    links_total: counted.length,
    links_met: met,
    verdict: verdictSentence(counted.length, met),
    design_links: counted.map((l) => l.id),
    alternatives: r.links.filter((l) => !inVerdict(l)).map((l) => ({ id: l.id, status: l.design_status!, reason: l.design_reason ?? "", target_met: l.target_met })),
    assumptions,
    methods: s.result.interference ? [...METHODS, ...INTERFERENCE_METHODS] : METHODS,
    chains,
    remedies,
    cautions: studyCautions(s),
    interference: interferenceReport(s),
  };
}
