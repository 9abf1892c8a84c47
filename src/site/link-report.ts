import type { LinkResult } from "../analysis/results.ts";
import { formatNumber, formatRatio } from "../format/quantity.ts";
import { linkPerformanceReport, type LinkPerformanceReport } from "./link-performance-report.ts";

/** Names and references of the diffraction methods, in report order. */
export const DIFFRACTION_LABELS: Record<string, { name: string; reference: string }> = {
  knife_edge: { name: "Single knife edge (highest edge)", reference: "ITU-R P.526-15 §4.1, eqs. (22), (26)–(27)" },
  deygout: { name: "Deygout (main edge and subsidiary edges)", reference: "Deygout construction; ν by P.526-15 eq. (22)" },
  epstein_peterson: { name: "Epstein–Peterson", reference: "Epstein & Peterson (1953); ν by P.526-15 eq. (22)" },
  bullington: { name: "Bullington", reference: "ITU-R P.526-15 §4.5.1" },
  delta_bullington: { name: "Delta-Bullington", reference: "ITU-R P.526-15 §4.5 (§4.5.1 with the spherical-Earth correction of §4.5.2)" },
};

/** One line of a table: a label, a value and its unit, and where it comes from. */
export interface Row {
  label: string;
  value: number | null;
  unit: string;
  note?: string;
  /** A subtotal line (EIRP, received level, fade margin). */
  total?: boolean;
  /** A "+" or "−" in front of the value (budget items). */
  sign?: "+" | "−" | "";
}

export interface DiffractionRow {
  method: string;
  name: string;
  reference: string;
  loss_db: number | null;
  used: boolean;
}

/** What a link page shows besides the raw result. */
export interface LinkReport {
  radio_name: string;
  budget: Row[];
  losses: Row[];
  diffraction: DiffractionRow[];
  /** Reflection points at the first k. */
  reflection_k: string | null;
  reflections: NonNullable<LinkResult["reflection"]>["per_k"][number]["points"];
  /** Height step of the height-gain curve (m), or null without one. */
  height_gain_step_m: number | null;
  /** The two objectives' tables and the minimum antenna heights. */
  performance: LinkPerformanceReport;
  /** Reflection points whose effective coefficient is below REFLECTION_SHOWN (left out of the table). */
  reflections_weak: number;
  /** Why the height-gain figure is left out (path obstructed, no reflection point), or null to draw it. */
  height_gain_omitted: string | null;
}

/** Reflection points with a smaller effective coefficient are counted, not listed (they print as 0.000). */
export const REFLECTION_SHOWN = 0.001;
const num = (v: unknown): number | null => (typeof v === "number" && Number.isFinite(v) ? v : null);

/** Tables of one link, from its result (values are never recomputed here, only arranged). */
export function linkReport(l: LinkResult, radioName: string | undefined, diffractionMethod: string): LinkReport {
  const b = l.budget ?? {};
  const method = l.diffraction_method ?? diffractionMethod;
  const methodName = DIFFRACTION_LABELS[method]?.name ?? method;
  const opt = (label: string, v: unknown, sign: Row["sign"], note?: string): Row[] => (typeof v === "number" && v !== 0 ? [{ label, value: num(v), unit: "dB", sign, ...(note ? { note } : {}) }] : []);
  const budget: Row[] = [
    { label: `Transmitter power (${l.ends.from.name})`, value: num(b.tx_power_dbm), unit: "dBm", sign: "", ...(num(b.atpc_range_db) !== null ? { note: `ATPC range ${num(b.atpc_range_db)} dB (informational: the budget is at full power)` } : {}) },
    { label: "Transmit feeder and branching loss", value: num(b.tx_feeder_loss_db), unit: "dB", sign: "−" },
    ...opt("Transmit connectors", b.tx_connector_loss_db, "−"),
    ...opt("Transmit waveguide run", b.tx_waveguide_loss_db, "−", "length × attenuation per 100 m"),
    ...opt("Transmit radome (dry)", b.tx_radome_loss_db, "−"),
    { label: "Transmit antenna gain", value: num(b.tx_gain_dbi), unit: "dBi", sign: "+" },
    { label: "EIRP", value: num(b.eirp_dbm), unit: "dBm", total: true, sign: "" },
    { label: "Free-space loss", value: num(b.free_space_db), unit: "dB", sign: "−", note: "ITU-R P.525-4" },
    { label: "Diffraction loss", value: num(b.diffraction_db), unit: "dB", sign: "−", note: methodName },
    { label: "Gaseous absorption", value: num(b.gases_db), unit: "dB", sign: "−", note: "ITU-R P.676-12 Annex 1" },
    { label: `Receive antenna gain (${l.ends.to.name})`, value: num(b.rx_gain_dbi), unit: "dBi", sign: "+" },
    ...opt("Receive radome (dry)", b.rx_radome_loss_db, "−"),
    ...opt("Receive waveguide run", b.rx_waveguide_loss_db, "−", "length × attenuation per 100 m"),
    ...opt("Receive connectors", b.rx_connector_loss_db, "−"),
    { label: "Receive feeder and branching loss", value: num(b.rx_feeder_loss_db), unit: "dB", sign: "−" },
    { label: "Median received level", value: num(b.received_dbm), unit: "dBm", total: true, sign: "" },
    { label: "Receiver threshold", value: num(b.rx_threshold_dbm), unit: "dBm", sign: "", note: `at a bit-error ratio of ${formatRatio(l.threshold_ber)}` },
    { label: "Design allowance", value: num(b.design_allowance_db), unit: "dB", sign: "−" },
    { label: "Flat fade margin", value: num(b.fade_margin_db), unit: "dB", total: true, sign: "", note: "received level − threshold − design allowance" },
    ...(typeof b.wet_radome_loss_db === "number" && b.wet_radome_loss_db > 0
      ? [
          { label: "Wet radomes, both ends", value: num(b.wet_radome_loss_db), unit: "dB", sign: "−" as const, note: "in rain only" },
          { label: "Fade margin against rain", value: num(b.rain_fade_margin_db), unit: "dB", total: true, sign: "" as const },
        ]
      : []),
  ];
  const losses: Row[] = [
    { label: "Free space", value: num(l.losses_db.free_space), unit: "dB", note: "ITU-R P.525-4, 20·log10(4πd/λ)" },
    { label: "Diffraction", value: num(l.losses_db.diffraction), unit: "dB", note: `${methodName}, ${DIFFRACTION_LABELS[method]?.reference ?? ""}, at k = ${l.clearance[0]?.k_label ?? "4/3"}` },
    { label: "Gaseous absorption", value: num(l.losses_db.gases), unit: "dB", note: "ITU-R P.676-12 Annex 1 (oxygen and water vapour)" },
    { label: "Rain, exceeded 0.01 % of the year", value: num(l.losses_db.rain_0_01pct), unit: "dB", note: "ITU-R P.838-3 and P.530-16 §2.4.1 — for availability, not in the median budget" },
  ];
  const diffraction: DiffractionRow[] = Object.keys(DIFFRACTION_LABELS).map((m) => ({
    method: m,
    name: DIFFRACTION_LABELS[m].name,
    reference: DIFFRACTION_LABELS[m].reference,
    loss_db: num(l.diffraction_db_by_method?.[m]),
    used: m === method,
  }));
  const first = l.reflection?.per_k[0];
  const height_gain_step_m = l.reflection ? num(l.reflection.height_gain_step_m) : null;
  const points = first?.points ?? [];
  const shown = points.filter((p) => (p.effective_coefficient ?? 0) >= REFLECTION_SHOWN);
  const worst = l.clearance[0];
  let height_gain_omitted: string | null = null;
  if (worst && worst.min_clearance_f1 < 0)
    height_gain_omitted = `The path is obstructed at k = ${worst.k_label} (least clearance ${formatNumber(worst.min_clearance_f1, 2)} F1): the received level is set by diffraction (${formatNumber(l.losses_db.diffraction, 1)} dB), not by a ground reflection, so no height-gain curve is drawn.`;
  else if (!shown.length) height_gain_omitted = `No ground reflection of consequence lies on the profile at k = ${first?.k_label ?? worst?.k_label ?? "4/3"}, so the level does not vary with antenna height and no height-gain curve is drawn.`;
  return {
    radio_name: radioName ?? l.radio,
    budget,
    losses,
    diffraction,
    reflection_k: first?.k_label ?? null,
    reflections: shown,
    height_gain_step_m,
    reflections_weak: points.length - shown.length,
    height_gain_omitted,
    performance: linkPerformanceReport(l),
  };
}
