import { readFileSync } from "node:fs";
import { ProfileCsvError } from "./profile-csv-error.ts";
import { TerrainError } from "./terrain-error.ts";

export { ProfileCsvError } from "./profile-csv-error.ts";

/** A surveyed path profile, used exactly as given (never resampled). */
export interface SurveyedProfile {
  /** distance from the first end (m), strictly increasing from 0 */
  d_m: Float64Array;
  /** ground elevation (m amsl) */
  h_m: Float64Array;
  /** height of trees/buildings above ground (m, ≥ 0); zeros when the column is absent */
  obstruction_m: Float64Array;
  /** whether the file had an obstruction_m column */
  hasObstruction: boolean;
  /** clutter category per point (optional `clutter_class` column), null when absent */
  clutter_class: ProfileClutterClass[] | null;
  /** representative clutter height per point (m, ≥ 0; optional `clutter_height_m` column), null when absent */
  clutter_height_m: Float64Array | null;
  /** radio-climatic zone per point (optional `zone` column), null when absent */
  zone: ProfileZone[] | null;
}

/** Clutter categories of a surveyed profile: the five of ITU-R P.1812-6 Table 2. */
export const PROFILE_CLUTTER_CLASSES = ["water", "open", "suburban", "urban", "dense_urban"] as const;
export type ProfileClutterClass = (typeof PROFILE_CLUTTER_CLASSES)[number];

/** Radio-climatic zones of a surveyed profile (ITU-R P.1812-6 §3.6, P.452-18 Table 3). */
export const PROFILE_ZONES = ["sea", "coastal", "inland"] as const;
export type ProfileZone = (typeof PROFILE_ZONES)[number];

const REQUIRED = ["distance_m", "elevation_m"] as const;
const KNOWN = ["distance_m", "elevation_m", "obstruction_m", "clutter_class", "clutter_height_m", "zone"];
const NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

/**
 * Parse a surveyed profile CSV: a header `distance_m,elevation_m` with optional
 * `obstruction_m`, `clutter_class` (water, open, suburban, urban, dense_urban),
 * `clutter_height_m` (representative clutter height, m ≥ 0) and `zone` (sea, coastal,
 * inland) columns (any order), then one row per point. Blank lines and lines starting with
 * `#` are ignored. Distances start at 0 and strictly increase, at any spacing; at least two
 * rows. Numbers are decimal, in metres.
 * @param text file contents
 * @param path file name used in error messages
 * @throws ProfileCsvError naming the line, column and value at the first problem
 */
export function parseProfileCsv(text: string, path: string): SurveyedProfile {
  const lines = text.replace(/^\uFEFF/, "").split(/\r?\n/);
  const fail = (problem: string, line: number, column: number, field: string, value: string, expected: string): never => {
    throw new ProfileCsvError(problem, { path, line, column, field, value, expected });
  };

  // --- Header ---
  let h = 0;
  while (h < lines.length && isSkipped(lines[h])) h++;
  if (h === lines.length) fail("the file has no header", 1, 1, "distance_m", "", "a header line distance_m,elevation_m[,obstruction_m][,clutter_class][,clutter_height_m][,zone]");
  const header = lines[h].split(",").map((c) => c.trim());
  const col: Record<string, number> = {};
  header.forEach((name, i) => {
    if (!KNOWN.includes(name)) fail("unknown column", h + 1, i + 1, name, name, `one of ${KNOWN.join(", ")}`);
    if (col[name] !== undefined) fail("column appears twice", h + 1, i + 1, name, name, "each column once");
    col[name] = i;
  });
  for (const name of REQUIRED) {
    if (col[name] === undefined) fail("missing column", h + 1, header.length + 1, name, lines[h].trim(), `a header with ${REQUIRED.join(" and ")}`);
  }
  const hasObstruction = col.obstruction_m !== undefined;

  // --- Rows ---
  const d: number[] = [];
  const e: number[] = [];
  const o: number[] = [];
  const cc: ProfileClutterClass[] = [];
  const ch: number[] = [];
  const zn: ProfileZone[] = [];
  const word = <T extends string>(cells: string[], lineNo: number, name: string, allowed: readonly T[]): T => {
    const c = col[name];
    const raw = cells[c] ?? "";
    if (!(allowed as readonly string[]).includes(raw)) fail(raw === "" ? "missing value" : "unknown value", lineNo, c + 1, name, raw, `one of ${allowed.join(", ")}`);
    return raw as T;
  };
  let lastLine = h + 1;
  for (let i = h + 1; i < lines.length; i++) {
    if (isSkipped(lines[i])) continue;
    const lineNo = i + 1;
    lastLine = lineNo;
    const cells = lines[i].split(",").map((c) => c.trim());
    if (cells.length > header.length) {
      fail("extra value beyond the header's columns", lineNo, header.length + 1, "(none)", cells[header.length], `${header.length} values per row`);
    }
    const num = (name: string): number => {
      const c = col[name];
      const raw = cells[c] ?? "";
      if (!NUMBER.test(raw)) fail(raw === "" ? "missing value" : "not a number", lineNo, c + 1, name, raw, "a decimal number of metres");
      return Number(raw);
    };
    const dist = num("distance_m");
    if (d.length === 0 && dist !== 0) fail("the first distance must be 0", lineNo, col.distance_m + 1, "distance_m", cells[col.distance_m], "0");
    if (d.length > 0 && !(dist > d[d.length - 1])) {
      fail("distance does not increase", lineNo, col.distance_m + 1, "distance_m", cells[col.distance_m], `a distance greater than ${d[d.length - 1]} (rows in order of distance)`);
    }
    const elev = num("elevation_m");
    let obs = 0;
    if (hasObstruction) {
      obs = num("obstruction_m");
      if (obs < 0) fail("obstruction height is negative", lineNo, col.obstruction_m + 1, "obstruction_m", cells[col.obstruction_m], "a height ≥ 0 above ground");
    }
    if (col.clutter_class !== undefined) cc.push(word(cells, lineNo, "clutter_class", PROFILE_CLUTTER_CLASSES));
    if (col.clutter_height_m !== undefined) {
      const r = num("clutter_height_m");
      if (r < 0) fail("clutter height is negative", lineNo, col.clutter_height_m + 1, "clutter_height_m", cells[col.clutter_height_m], "a height ≥ 0 above ground (m)");
      ch.push(r);
    }
    if (col.zone !== undefined) zn.push(word(cells, lineNo, "zone", PROFILE_ZONES));
    d.push(dist);
    e.push(elev);
    o.push(obs);
  }
  if (d.length < 2) {
    fail("too few rows", lastLine, 1, header[0], String(d.length), "at least 2 rows (the two ends of the path)");
  }
  return {
    d_m: Float64Array.from(d),
    h_m: Float64Array.from(e),
    obstruction_m: Float64Array.from(o),
    hasObstruction,
    clutter_class: col.clutter_class !== undefined ? cc : null,
    clutter_height_m: col.clutter_height_m !== undefined ? Float64Array.from(ch) : null,
    zone: col.zone !== undefined ? zn : null,
  };
}

/**
 * Read and parse a surveyed profile CSV file (see parseProfileCsv).
 * @throws TerrainError when the file cannot be read; ProfileCsvError for bad contents
 */
export function readProfileCsv(path: string, options: { label?: string } = {}): SurveyedProfile {
  const label = options.label ?? path;
  let text: string;
  try {
    text = readFileSync(path, "utf8");
  } catch (e) {
    throw new TerrainError(
      `surveyed profile ${label} could not be read (${(e as NodeJS.ErrnoException).code ?? (e as Error).message}); check the path in the study file`,
      { path, hint: "check the profile path" },
      { cause: e },
    );
  }
  return parseProfileCsv(text, label);
}

function isSkipped(line: string): boolean {
  const t = line.trim();
  return t === "" || t.startsWith("#");
}
