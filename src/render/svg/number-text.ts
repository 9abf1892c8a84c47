/** A number with fixed decimals and a true minus sign (U+2212), for labels inside figures. */
export function fixed(v: number, digits: number): string {
  const s = v.toFixed(digits);
  const z = Number(s) === 0 ? (0).toFixed(digits) : s;
  return z.startsWith("-") ? `−${z.slice(1)}` : z;
}
