import { readFileSync } from "node:fs";
import type { TabulatedEnvelope } from "../physics/tabulated-envelope.ts";
import type { InputProblem } from "./input-error.ts";

/**
 * The neutral CSV of a tabulated antenna radiation pattern envelope (our own format, no
 * vendor's): lines starting with `#` are comments; a header row
 *
 *     angle_deg,h_copolar_db,h_crosspolar_db,v_copolar_db,v_crosspolar_db
 *
 * then one row per off-axis angle, rising strictly from 0 to 180 (the envelope is taken as
 * symmetric about the boresight). Values are attenuations relative to the boresight gain in
 * dB, ≥ 0: co-polar and cross-polar, in the horizontal (azimuth) and vertical (elevation)
 * plane. Interpolation between rows is linear in angle and dB.
 */
export const ENVELOPE_COLUMNS = ["angle_deg", "h_copolar_db", "h_crosspolar_db", "v_copolar_db", "v_crosspolar_db"] as const;

/**
 * Parse an envelope CSV's text; problems (with line numbers) instead of throwing.
 * @param text the file's text
 * @param file path for the problems
 * @param field field path of the study entry that names the file (for the problems)
 */
export function parseEnvelopeCsv(text: string, file: string, field: string): { envelope: TabulatedEnvelope | null; problems: InputProblem[] } {
  const problems: InputProblem[] = [];
  const add = (line: number, received: string, expected: string) => problems.push({ file, line, col: 1, field, received, expected });
  const lines = text.split(/\r?\n/);
  let header: string[] | null = null;
  let headerLine = 0;
  const rows: number[][] = [];
  const rowLines: number[] = [];
  for (let i = 0; i < lines.length; i++) {
    const t = lines[i].trim();
    if (t === "" || t.startsWith("#")) continue;
    const cells = t.split(",").map((c) => c.trim());
    if (!header) {
      header = cells;
      headerLine = i + 1;
      if (cells.join(",") !== ENVELOPE_COLUMNS.join(",")) add(i + 1, JSON.stringify(t), `the header ${ENVELOPE_COLUMNS.join(",")}`);
      continue;
    }
    const v = cells.map(Number);
    if (cells.length !== ENVELOPE_COLUMNS.length || v.some((x, j) => cells[j] === "" || !Number.isFinite(x))) {
      add(i + 1, JSON.stringify(t), `${ENVELOPE_COLUMNS.length} numbers: ${ENVELOPE_COLUMNS.join(", ")}`);
      continue;
    }
    if (v.slice(1).some((x) => x < 0)) add(i + 1, JSON.stringify(t), "attenuations ≥ 0 dB relative to the boresight gain");
    if (rows.length && !(v[0] > rows[rows.length - 1][0])) add(i + 1, `angle ${v[0]}° after ${rows[rows.length - 1][0]}°`, "angles rising strictly");
    rows.push(v);
    rowLines.push(i + 1);
  }
  if (!header) {
    add(1, "no header and no rows", `a header ${ENVELOPE_COLUMNS.join(",")} and rows from 0° to 180°`);
    return { envelope: null, problems };
  }
  if (rows.length < 2 || rows[0][0] !== 0 || rows[rows.length - 1][0] !== 180) {
    const span = rows.length ? `angles ${rows[0][0]}° to ${rows[rows.length - 1][0]}°` : "no rows";
    add(rows.length ? rowLines[rows.length - 1] : headerLine, span, "an envelope spanning 0° to 180° off the boresight: a first row at angle 0 and a last at 180");
  }
  if (problems.length) return { envelope: null, problems };
  const col = (j: number) => Float64Array.from(rows, (r) => r[j]);
  return { envelope: { angle_deg: col(0), h_copolar_db: col(1), h_crosspolar_db: col(2), v_copolar_db: col(3), v_crosspolar_db: col(4) }, problems };
}

/** Read and parse an envelope CSV file; a missing file is one problem. */
export function readEnvelopeCsv(path: string, field: string, at: { file: string; line?: number; col?: number }): { envelope: TabulatedEnvelope | null; problems: InputProblem[] } {
  let text: string;
  try {
    text = readFileSync(path, "utf8");
  } catch {
    return { envelope: null, problems: [{ ...at, field, received: JSON.stringify(path), expected: "a readable envelope CSV file, relative to the study folder" }] };
  }
  return parseEnvelopeCsv(text, path, field);
}
