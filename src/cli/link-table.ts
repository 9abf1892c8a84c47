import type { LinkResult } from "../analysis/results.ts";
import { formatNumber as f } from "../site/format.ts";

/** Print one link result as a readable table on stdout, with a method's own rows after the targets. */
export function printLinkTable(l: LinkResult, methodRows: [string, string][] = []): void {
  const rows: [string, string][] = [
    ["Distance", `${f(l.distance_m / 1000, 3)} km`],
    ["Azimuth from / to", `${f(l.azimuth_from_deg, 2)}° / ${f(l.azimuth_to_deg, 2)}° (true)`],
    ["Frequency", `${f(l.frequency_ghz, 3)} GHz, ${l.polarization === "h" ? "horizontal" : "vertical"}`],
    ["Profile", `${l.profile.source}, ${l.profile.samples} samples every ${f(l.profile.step_m, 1)} m`],
    ...l.clearance.map((c): [string, string] => [
      `Clearance at k = ${c.k_label}`,
      `${f(c.min_clearance_f1, 2)} F1 (${f(c.clearance_m, 1)} m) at ${f(c.at_distance_m / 1000, 2)} km${c.required_f1 === null ? "" : `; required ${f(c.required_f1, 2)} F1: ${c.met ? "meets" : "SHORT"}`}`,
    ]),
    ["Lowest antenna heights", l.minimum_heights ? `${l.minimum_heights.from_antenna_m} m / ${l.minimum_heights.to_antenna_m} m (step ${l.minimum_heights.step_m} m) meet the clearance criteria` : "none up to the search limit"],
    ["Free-space loss", `${f(l.losses_db.free_space, 2)} dB`],
  ];
  if (l.losses_db.diffraction !== undefined) rows.push(["Diffraction", `${f(l.losses_db.diffraction, 2)} dB (${l.diffraction_method})`]);
  if (l.diffraction_db_by_method) rows.push(["  by method", Object.entries(l.diffraction_db_by_method).map(([k, v]) => `${k} ${f(v, 2)}`).join(", ")]);
  if (l.losses_db.gases !== undefined) rows.push(["Gases", `${f(l.losses_db.gases, 2)} dB`]);
  if (l.losses_db.rain_0_01pct !== undefined) rows.push(["Rain, 0.01 % of time", l.losses_db.rain_0_01pct === null ? "no rain rate given" : `${f(l.losses_db.rain_0_01pct, 2)} dB`]);
  if (l.received_dbm !== undefined) rows.push(["Received level", `${f(l.received_dbm, 1)} dBm`]);
  if (l.fade_margin_db !== undefined) rows.push(["Fade margin", `${f(l.fade_margin_db, 1)} dB`]);
  if (l.availability_pct !== undefined) rows.push(["Availability", `${f(l.availability_pct, 5)} % (target ${f(l.target_availability_pct, 3)} %)`]);
  rows.push(["Targets", l.target_met ? "met" : "MISSED"]);
  rows.push(...methodRows);
  const w = Math.max(...rows.map((r) => r[0].length));
  process.stdout.write(rows.map(([k, v]) => `${k.padEnd(w)}  ${v}`).join("\n") + "\n");
  for (const warning of l.warnings) process.stdout.write(`warning: ${warning}\n`);
}
