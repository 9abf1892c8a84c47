/**
 * Ridgeline's colour map for field strength, built in the OKLab perceptual colour space
 * (B. Ottosson, 2020): lightness rises linearly from 0.20 to 0.96, so equal steps in dB are
 * equal steps in perceived lightness and the map reads correctly in greyscale print; the hue
 * turns from violet through blue, teal and green to a pale yellow, the chroma swelling in the
 * middle and cut back wherever a colour would leave the sRGB gamut. Our own construction.
 */
export const FIELD_COLORMAP_SIZE = 256;

function oklabToSrgb(L: number, a: number, b: number): [number, number, number] | null {
  const l_ = L + 0.3963377774 * a + 0.2158037573 * b;
  const m_ = L - 0.1055613458 * a - 0.0638541728 * b;
  const s_ = L - 0.0894841775 * a - 1.291485548 * b;
  const l = l_ ** 3;
  const m = m_ ** 3;
  const s = s_ ** 3;
  const lin = [4.0767416621 * l - 3.3077115913 * m + 0.2309699292 * s, -1.2684380046 * l + 2.6097574011 * m - 0.3413193965 * s, -0.0041960863 * l - 0.7034186147 * m + 1.707614701 * s];
  if (lin.some((v) => v < -1e-4 || v > 1 + 1e-4)) return null;
  const enc = (v: number) => {
    const c = Math.min(1, Math.max(0, v));
    return Math.round(255 * (c <= 0.0031308 ? 12.92 * c : 1.055 * c ** (1 / 2.4) - 0.055));
  };
  return [enc(lin[0]), enc(lin[1]), enc(lin[2])];
}

let table: Uint8Array | null = null;

/** The map as FIELD_COLORMAP_SIZE RGB triples, darkest first. */
export function fieldColormap(): Uint8Array {
  if (table) return table;
  const t8 = new Uint8Array(FIELD_COLORMAP_SIZE * 3);
  for (let i = 0; i < FIELD_COLORMAP_SIZE; i++) {
    const t = i / (FIELD_COLORMAP_SIZE - 1);
    const L = 0.2 + 0.76 * t;
    const h = ((300 - 215 * t) * Math.PI) / 180;
    let C = 0.04 + 0.11 * Math.sin(Math.PI * (0.1 + 0.8 * t));
    let rgb = oklabToSrgb(L, C * Math.cos(h), C * Math.sin(h));
    while (rgb === null && C > 0) {
      C -= 0.002;
      rgb = oklabToSrgb(L, Math.max(C, 0) * Math.cos(h), Math.max(C, 0) * Math.sin(h));
    }
    const [r, g, b] = rgb ?? [0, 0, 0];
    t8[3 * i] = r;
    t8[3 * i + 1] = g;
    t8[3 * i + 2] = b;
  }
  table = t8;
  return t8;
}

/** CSS colour of the map at t ∈ [0, 1]. */
export function fieldColourCss(t: number): string {
  const m = fieldColormap();
  const i = Math.max(0, Math.min(FIELD_COLORMAP_SIZE - 1, Math.round(t * (FIELD_COLORMAP_SIZE - 1))));
  return `rgb(${m[3 * i]},${m[3 * i + 1]},${m[3 * i + 2]})`;
}
