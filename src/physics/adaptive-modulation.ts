/**
 * Time spent in each mode of an adaptive-modulation radio, from the probability that the
 * received level falls below each mode's threshold (common practice: a mode is in use while
 * the level lies between its threshold and the next mode's; hysteresis is ignored).
 *
 * Method: with modes ordered by rising threshold T_0 < T_1 < … and q_i the percentage of time
 * the level is below T_i (q rising with i; a q that falls is raised to its predecessor's, as
 * a level above T_i is above every lower threshold), the share of mode i is q_(i+1) − q_i,
 * the top mode's 100 − q_top, and q_0 is the time below the lowest mode (outage). The shares
 * and the outage add up to 100 %.
 * @param below_pct q_i for each mode in order of rising threshold (%)
 * @returns share of each mode (%), the outage (%) and the percentage of time each mode or a
 *   better one is available (100 − q_i)
 */
export function modeTimeShares(below_pct: readonly number[]): { share_pct: number[]; outage_pct: number; at_least_pct: number[] } {
  const q: number[] = [];
  for (const x of below_pct) {
    if (!(x >= 0)) return { share_pct: below_pct.map(() => NaN), outage_pct: NaN, at_least_pct: below_pct.map(() => NaN) };
    q.push(Math.min(100, Math.max(x, q.length ? q[q.length - 1] : 0)));
  }
  const share_pct = q.map((qi, i) => (i + 1 < q.length ? q[i + 1] - qi : 100 - qi));
  return { share_pct, outage_pct: q.length ? q[0] : 100, at_least_pct: q.map((qi) => 100 - qi) };
}

/**
 * Index of the highest mode available for at least `availability_pct` of the time, or −1
 * when even the lowest is not.
 * @param at_least_pct percentage of time each mode or a better one is available (%), rising threshold order
 * @param availability_pct required percentage of time (%)
 */
export function modeAtAvailability(at_least_pct: readonly number[], availability_pct: number): number {
  let best = -1;
  at_least_pct.forEach((a, i) => {
    if (a >= availability_pct) best = i;
  });
  return best;
}
