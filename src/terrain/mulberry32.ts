/**
 * Mulberry32 pseudo-random generator (Tommy Ettinger's 32-bit mixing generator, public
 * domain): a Weyl sequence with increment 0x6D2B79F5 passed through an xorshift-multiply
 * finaliser. Period 2³²; good enough for procedural terrain, not for statistics or
 * cryptography. Deterministic across platforms (integer arithmetic only).
 * @param seed any integer (used modulo 2³²)
 * @returns a function giving the next number in [0, 1)
 */
export function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = Math.imul(a ^ (a >>> 15), 1 | a);
    t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}
