import { patternTableProblem } from "../study/pattern-table.ts";
import { CoverageError } from "./coverage-error.ts";

/** A transmitting antenna's pattern as given: attenuation (dB, ≥ 0) against angle (deg). */
export interface AntennaPatternInput {
  /** boresight azimuth, clockwise from true north (deg) */
  azimuth_deg?: number;
  /** mechanical downtilt of the boresight below the horizontal (deg) */
  downtilt_deg?: number;
  /** [azimuth relative to boresight (deg), attenuation (dB)], angles rising from 0 to 360 */
  horizontal?: [number, number][];
  /** [elevation relative to boresight (deg), attenuation (dB)], angles rising from −90 to 90 */
  vertical?: [number, number][];
}

/** Dense lookup tables built from the pattern (0.1° steps), plain data for the workers. */
export interface PatternTables {
  azimuth_deg: number;
  downtilt_deg: number;
  /** 3600 attenuations (dB) at relative azimuths 0, 0.1, … 359.9°; null for omni */
  horizontal: Float32Array | null;
  /** 1801 attenuations (dB) at relative elevations −90, −89.9, … 90°; null for none */
  vertical: Float32Array | null;
}

/**
 * Check a tabulated pattern and turn it into lookup tables. The horizontal table must run
 * from 0° to 360° (a full turn), the vertical one from −90° to 90°, angles strictly rising,
 * attenuations finite and ≥ 0; values between entries are interpolated linearly.
 * The total gain toward a receiver is gain_dbi − A_h(φ − azimuth) − A_v(θ + downtilt), θ the
 * elevation angle of the receiver above the horizontal (the sum of the two principal cuts,
 * common practice when only the cuts are known).
 * @param field how errors name the pattern (e.g. "coverage[0].pattern")
 * @throws CoverageError naming the table, the entry and the fix
 */
export function buildPatternTables(p: AntennaPatternInput | undefined, field: string): PatternTables {
  const az = p?.azimuth_deg ?? 0;
  const tilt = p?.downtilt_deg ?? 0;
  const horizontal = p?.horizontal ? dense(p.horizontal, 0, 360, 3600, `${field}.horizontal`, "azimuth") : null;
  const vertical = p?.vertical ? dense(p.vertical, -90, 90, 1800, `${field}.vertical`, "elevation") : null;
  return { azimuth_deg: az, downtilt_deg: tilt, horizontal, vertical };
}

function dense(rows: [number, number][], lo: number, hi: number, steps: number, field: string, what: string): Float32Array {
  const problem = patternTableProblem(rows, lo, hi);
  if (problem) throw new CoverageError(`${field}: the ${what} pattern needs ${problem}`, field, { received: JSON.stringify(rows).slice(0, 80), expected: problem });
  const out = new Float32Array(what === "azimuth" ? steps : steps + 1);
  let j = 0;
  for (let i = 0; i < out.length; i++) {
    const a = lo + ((hi - lo) * i) / steps;
    while (j < rows.length - 2 && rows[j + 1][0] < a) j++;
    const [a0, v0] = rows[j];
    const [a1, v1] = rows[j + 1];
    out[i] = v0 + ((v1 - v0) * (a - a0)) / (a1 - a0);
  }
  return out;
}

/**
 * Attenuation (dB) of the pattern toward a receiver at true azimuth az_deg and elevation
 * angle el_deg (above the horizontal).
 */
export function patternAttenuationDb(t: PatternTables, az_deg: number, el_deg: number): number {
  let a = 0;
  if (t.horizontal !== null) {
    let rel = (az_deg - t.azimuth_deg) % 360;
    if (rel < 0) rel += 360;
    let i = Math.round(rel * 10);
    if (i >= 3600) i -= 3600;
    a += t.horizontal[i];
  }
  if (t.vertical !== null) {
    let rel = el_deg + t.downtilt_deg;
    if (rel < -90) rel = -90;
    else if (rel > 90) rel = 90;
    a += t.vertical[Math.round((rel + 90) * 10)];
  }
  return a;
}
