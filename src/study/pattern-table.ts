/**
 * The problem with an antenna pattern table ([angle (deg), attenuation (dB)] rows), or null
 * when its angles rise strictly from `lo` to exactly `hi` and every attenuation is a finite
 * number ≥ 0. The text completes "expected …". Shared by the study schema and the command line.
 */
export function patternTableProblem(rows: readonly (readonly [number, number])[], lo: number, hi: number): string | null {
  if (rows.length < 2) return `at least two entries, from ${lo}° to ${hi}°`;
  for (let i = 0; i < rows.length; i++) {
    const [a, v] = rows[i];
    if (!Number.isFinite(a) || !Number.isFinite(v)) return `finite numbers in every entry (entry ${i} is [${a}, ${v}])`;
    if (v < 0) return `attenuations ≥ 0 dB relative to the boresight (entry ${i} has ${v} dB)`;
    if (i > 0 && !(a > rows[i - 1][0])) return `angles strictly rising (entry ${i}, ${a}°, follows ${rows[i - 1][0]}°)`;
  }
  if (rows[0][0] !== lo || rows[rows.length - 1][0] !== hi) {
    return `a table covering ${lo}° to ${hi}°: its first angle must be ${lo}° and its last ${hi}° (received ${rows[0][0]}° to ${rows[rows.length - 1][0]}°)`;
  }
  return null;
}
