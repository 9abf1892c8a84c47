/**
 * Gradient noise on a periodic lattice: a random unit gradient at each lattice node, the
 * surface the blend (quintic fade 6t⁵ − 15t⁴ + 10t³) of the four nodes' linear ramps — the
 * construction of Perlin's 2002 "improved noise", written here for a seeded source. Zero at
 * every node and smooth between, so it has no plateaus at the nodes as value noise has.
 * The lattice wraps, so any (x, y) is defined.
 */
export class GradientNoise {
  private readonly gx: Float64Array;
  private readonly gy: Float64Array;

  /**
   * @param cells lattice cells per side (≥ 1); the noise repeats every `cells` units
   * @param random source of numbers in [0, 1), consumed cells² times
   */
  constructor(
    readonly cells: number,
    random: () => number,
  ) {
    const n = cells * cells;
    this.gx = new Float64Array(n);
    this.gy = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      const a = 2 * Math.PI * random();
      this.gx[i] = Math.cos(a);
      this.gy[i] = Math.sin(a);
    }
  }

  /** Noise at (x, y) in lattice units, about −0.7 to 0.7 (0 at nodes). */
  at(x: number, y: number): number {
    const c = this.cells;
    const fx = Math.floor(x);
    const fy = Math.floor(y);
    const tx = x - fx;
    const ty = y - fy;
    const x0 = ((fx % c) + c) % c;
    const y0 = ((fy % c) + c) % c;
    const x1 = x0 + 1 === c ? 0 : x0 + 1;
    const r0 = y0 * c;
    const r1 = (y0 + 1 === c ? 0 : y0 + 1) * c;
    const gx = this.gx;
    const gy = this.gy;
    const n00 = gx[r0 + x0] * tx + gy[r0 + x0] * ty;
    const n10 = gx[r0 + x1] * (tx - 1) + gy[r0 + x1] * ty;
    const n01 = gx[r1 + x0] * tx + gy[r1 + x0] * (ty - 1);
    const n11 = gx[r1 + x1] * (tx - 1) + gy[r1 + x1] * (ty - 1);
    const sx = tx * tx * tx * (tx * (tx * 6 - 15) + 10);
    const sy = ty * ty * ty * (ty * (ty * 6 - 15) + 10);
    const a = n00 + (n10 - n00) * sx;
    const b = n01 + (n11 - n01) * sx;
    return a + (b - a) * sy;
  }
}

/**
 * Octaves of gradient noise over the unit square, each with twice the frequency and `gain`
 * times the amplitude of the last, each turned by its own random angle and shifted, so no
 * octave's lattice lines up with another's or with the grid of the raster.
 */
export class RotatedFractalNoise {
  private readonly layers: { noise: GradientNoise; cos: number; sin: number; ox: number; oy: number; freq: number; amp: number }[] = [];
  private readonly total: number;

  constructor(baseCells: number, octaves: number, gain: number, random: () => number) {
    let amp = 1;
    let total = 0;
    for (let o = 0; o < octaves; o++) {
      const freq = baseCells * 2 ** o;
      const cells = Math.max(4, Math.ceil(freq * 1.5) + 2); // the turned unit square fits in one period
      const angle = 2 * Math.PI * random();
      this.layers.push({ noise: new GradientNoise(cells, random), cos: Math.cos(angle), sin: Math.sin(angle), ox: cells * random(), oy: cells * random(), freq, amp });
      total += amp;
      amp *= gain;
    }
    this.total = total;
  }

  /** Smooth fractal noise, about 0 to 1 with mean 0.5. */
  at(u: number, v: number): number {
    let s = 0;
    for (const l of this.layers) s += l.amp * l.noise.at(l.freq * (l.cos * u - l.sin * v) + l.ox, l.freq * (l.sin * u + l.cos * v) + l.oy);
    return 0.5 + (0.75 * s) / this.total;
  }

  /**
   * Ridged multifractal: each octave folded as (1 − |n|)², weighted by the octave before it,
   * so crests are sharp and continuous and the ground between them stays smooth; 0 to 1.
   */
  ridged(u: number, v: number): number {
    let s = 0;
    let weight = 1;
    for (const l of this.layers) {
      const r = 1 - Math.min(1, Math.abs(l.noise.at(l.freq * (l.cos * u - l.sin * v) + l.ox, l.freq * (l.sin * u + l.cos * v) + l.oy)) * 1.6);
      const sig = r * r * weight;
      s += l.amp * sig;
      weight = Math.min(1, Math.max(0, sig * 1.5));
    }
    return s / this.total;
  }
}

/**
 * Erosion-like smoothing of a height grid in place (thermal weathering): where the drop to
 * the lowest of the four neighbours exceeds `talus_m`, a share `rate` of the excess moves
 * downhill. Crests round off a little, scree fills the valley floors; deterministic (one
 * fixed sweep order per pass).
 */
export function thermalErosion(h: Float32Array, width: number, height: number, o: { talus_m: number; rate: number; passes: number }): void {
  for (let pass = 0; pass < o.passes; pass++) {
    for (let i = 1; i < height - 1; i++) {
      for (let j = 1; j < width - 1; j++) {
        const k = i * width + j;
        const z = h[k];
        let low = k - 1;
        if (h[k + 1] < h[low]) low = k + 1;
        if (h[k - width] < h[low]) low = k - width;
        if (h[k + width] < h[low]) low = k + width;
        const drop = z - h[low];
        if (drop > o.talus_m) {
          const moved = (o.rate * (drop - o.talus_m)) / 2;
          h[k] = z - moved;
          h[low] += moved;
        }
      }
    }
  }
}
