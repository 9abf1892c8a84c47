/**
 * Value noise on the unit square: random values on a (cells+1)² lattice, blended with the
 * quintic fade 6t⁵ − 15t⁴ + 10t³ so the surface has continuous slope and curvature.
 * Built from a caller's random source, so it is as deterministic as that source.
 */
export class ValueNoise {
  private readonly lattice: Float64Array;

  /**
   * @param cells lattice cells per side (≥ 1)
   * @param random source of numbers in [0, 1), consumed (cells + 1)² times
   */
  constructor(
    readonly cells: number,
    random: () => number,
  ) {
    const n = cells + 1;
    this.lattice = new Float64Array(n * n);
    for (let i = 0; i < n * n; i++) this.lattice[i] = random();
  }

  /** Noise in [0, 1] at (u, v) ∈ [0, 1]² (clamped outside). */
  at(u: number, v: number): number {
    const c = this.cells;
    const x = Math.min(Math.max(u, 0), 1) * c;
    const y = Math.min(Math.max(v, 0), 1) * c;
    const ix = Math.min(Math.floor(x), c - 1);
    const iy = Math.min(Math.floor(y), c - 1);
    const sx = fade(x - ix);
    const sy = fade(y - iy);
    const n = c + 1;
    const i = iy * n + ix;
    const L = this.lattice;
    const a = L[i] + (L[i + 1] - L[i]) * sx;
    const b = L[i + n] + (L[i + n + 1] - L[i + n]) * sx;
    return a + (b - a) * sy;
  }

  /**
   * The same lattice interpolated bicubically (Catmull–Rom, edge values repeated): it passes
   * through the same node values but keeps its slope across lattice lines, so a hillshade shows
   * no straight bands along them (the fade blend flattens the surface along every lattice line).
   */
  cubicAt(u: number, v: number): number {
    const c = this.cells;
    const n = c + 1;
    const x = Math.min(Math.max(u, 0), 1) * c;
    const y = Math.min(Math.max(v, 0), 1) * c;
    const ix = Math.min(Math.floor(x), c - 1);
    const iy = Math.min(Math.floor(y), c - 1);
    const tx = x - ix;
    const ty = y - iy;
    const L = this.lattice;
    const at = (i: number, j: number) => L[Math.min(Math.max(j, 0), c) * n + Math.min(Math.max(i, 0), c)];
    const row = (j: number) => catmullRom(at(ix - 1, j), at(ix, j), at(ix + 1, j), at(ix + 2, j), tx);
    return catmullRom(row(iy - 1), row(iy), row(iy + 1), row(iy + 2), ty);
  }
}

/** Catmull–Rom weights of the four lattice values around t ∈ [0, 1]. */
function catmullRom(p0: number, p1: number, p2: number, p3: number, t: number): number {
  return p1 + 0.5 * t * (p2 - p0 + t * (2 * p0 - 5 * p1 + 4 * p2 - p3 + t * (3 * (p1 - p2) + p3 - p0)));
}

function fade(t: number): number {
  return t * t * t * (t * (t * 6 - 15) + 10);
}

/**
 * Sum of `octaves` value-noise layers, each with twice the lattice density and `gain`
 * times the amplitude of the previous, normalised to [0, 1].
 */
export class FractalNoise {
  private readonly layers: ValueNoise[] = [];
  private readonly amps: number[] = [];
  private readonly total: number;

  /** @param cubic interpolate each lattice bicubically (ValueNoise.cubicAt) instead of by the fade blend */
  constructor(baseCells: number, octaves: number, gain: number, random: () => number, private readonly cubic = false) {
    let amp = 1;
    let total = 0;
    for (let o = 0; o < octaves; o++) {
      this.layers.push(new ValueNoise(baseCells << o, random));
      this.amps.push(amp);
      total += amp;
      amp *= gain;
    }
    this.total = total;
  }

  at(u: number, v: number): number {
    let s = 0;
    for (let o = 0; o < this.layers.length; o++) s += this.amps[o] * (this.cubic ? this.layers[o].cubicAt(u, v) : this.layers[o].at(u, v));
    return s / this.total;
  }

  /** Ridged variant: each layer folded as 1 − |2n − 1| (sharp crests), normalised to [0, 1]. */
  ridged(u: number, v: number): number {
    let s = 0;
    for (let o = 0; o < this.layers.length; o++) {
      const n = this.cubic ? Math.min(1, Math.max(0, this.layers[o].cubicAt(u, v))) : this.layers[o].at(u, v);
      const r = 1 - Math.abs(2 * n - 1);
      s += this.amps[o] * r * r;
    }
    return s / this.total;
  }
}
