/** Muted hypsometric colours, low to high (RGB): sage, pale sand, light umber, stone. */
export const TINT_STOPS: [number, number, number][] = [
  [178, 202, 160],
  [222, 221, 178],
  [214, 192, 150],
  [190, 165, 135],
  [236, 232, 226],
];

/** The colour of relative height t ∈ [0, 1] on the tint ramp (linear between stops). */
export function tintAt(t: number): [number, number, number] {
  const u = Math.min(1, Math.max(0, Number.isFinite(t) ? t : 0)) * (TINT_STOPS.length - 1);
  const i = Math.min(TINT_STOPS.length - 2, Math.floor(u));
  const f = u - i;
  const a = TINT_STOPS[i];
  const b = TINT_STOPS[i + 1];
  return [a[0] + (b[0] - a[0]) * f, a[1] + (b[1] - a[1]) * f, a[2] + (b[2] - a[2]) * f];
}

/**
 * Shaded relief as RGBA bytes: the tint of each cell's height between `min_m` and `max_m`,
 * darkened by its hillshade (brightness = ambient + (1 − ambient)·shade/255); transparent
 * where `valid` is 0. Returns a new array of width·height·4 bytes.
 */
export function shadedRelief(z: ArrayLike<number>, shade: Uint8Array, valid: Uint8Array, min_m: number, max_m: number, ambient = 0.4): Uint8Array {
  const n = shade.length;
  const out = new Uint8Array(n * 4);
  const span = max_m - min_m || 1;
  for (let i = 0; i < n; i++) {
    const [r, g, b] = tintAt((z[i] - min_m) / span);
    const k = ambient + ((1 - ambient) * shade[i]) / 255;
    out[4 * i] = Math.round(r * k);
    out[4 * i + 1] = Math.round(g * k);
    out[4 * i + 2] = Math.round(b * k);
    out[4 * i + 3] = valid[i] ? 255 : 0;
  }
  return out;
}
