import { describe, expect, it } from "vitest";
import { wavelengthM } from "../../src/physics/constants.ts";
import { knifeEdgeLossExact } from "../../src/physics/knife-edge.ts";
import { parabolicEquationField, type ParabolicEquationInput } from "../../src/physics/parabolic-equation/split-step.ts";
import { sphericalEarthDiffractionLoss } from "../../src/physics/spherical-earth-diffraction.ts";
import { expectClose } from "../helpers/expect-close.ts";

/** A flat path of n samples over D metres at ground height 0 (m). */
function flatPath(D: number, n: number): { d_m: Float64Array; ground_m: Float64Array } {
  return { d_m: Float64Array.from({ length: n }, (_, i) => (i * D) / (n - 1)), ground_m: new Float64Array(n) };
}

const flatEarth = { kind: "k-factor", k: Infinity } as const;

describe("parabolic equation: free space where the ground cannot be seen", () => {
  // Reference: free-space propagation (ITU-R P.525-4: loss relative to free space is 0 dB) with
  // the Gaussian source's own pattern off its axis, exp(−4·ln2·θ²/θbw²) in power (the
  // transform of the aperture; common practice). The ground reflection arrives 6.8° off the
  // 0.5° beam's axis: below −2000 dB.
  const D = 5000;
  const r = parabolicEquationField({
    ...flatPath(D, 501),
    frequency_ghz: 3,
    tx_antenna_m: 300,
    rx_antenna_m: 300,
    polarization: "h",
    ground: { kind: "pec" },
    refractivity: flatEarth,
    beamwidth_deg: 0.5,
    height_gain: { half_range_m: 10, step_m: 2.5 },
  });
  it.each([0, 1, 2, 3, 4, 5, 6, 7, 8])("height step %i within 0.1 dB of the free-space beam", (i) => {
    const dz = r.height_gain!.rx_antenna_m[i] - 300;
    const theta = Math.atan(dz / D);
    const bw = (r.beamwidth_used_deg * Math.PI) / 180;
    const pattern = 10 * Math.log10(Math.exp((-4 * Math.LN2 * theta * theta) / (bw * bw)));
    expectClose(r.height_gain!.relative_db[i], pattern, { abs: 0.1 }, { dz, bw_deg: r.beamwidth_used_deg });
  });
  it("at the receiver, on the beam's axis, 0 dB within 0.1 dB", () => {
    expectClose(r.excess_loss_db, 0, { abs: 0.1 });
  });
});

describe("parabolic equation: a single thin screen (ITU-R P.526-15 §4.1, exact J(ν) from the Fresnel integrals)", () => {
  // Screen at mid-path, antennas 400 m above a conductor so that the ground reflection leaves
  // 9° off the beam (≥ 70 dB down): the knife edge alone. The solver rounds the edge to its
  // vertical grid (Δz = 0.57 m here, Δν ≤ 0.02, up to 0.15 dB), which the tolerance covers.
  const f = 3;
  const lambda = wavelengthM(f);
  const d1 = 5000;
  const D = 2 * d1;
  const H = 400;
  const scale = Math.sqrt((lambda * d1 * d1) / (2 * D)); // P.526-15 eq. (22) solved for h at ν = 1
  it.each([-1, -0.5, 0, 0.5, 1, 2, 3])("ν = %f within 0.5 dB of J(ν)", (nu) => {
    const path = flatPath(D, 1001);
    path.ground_m[500] = H + nu * scale;
    const r = parabolicEquationField({ ...path, frequency_ghz: f, tx_antenna_m: H, rx_antenna_m: H, polarization: "h", ground: { kind: "pec" }, refractivity: flatEarth, beamwidth_deg: 20, grid: { max_angle_deg: 5 } });
    expectClose(r.excess_loss_db, knifeEdgeLossExact(nu), { abs: 0.5 }, { nu, dz_m: r.grid.dz_m });
  });
});

describe("parabolic equation: smooth spherical Earth beyond the horizon (ITU-R P.526-15 §3, sphericalEarthDiffractionLoss)", () => {
  // 20 m antennas, k = 4/3, land εr = 22, σ = 0.003 S/m (the first term's defaults); the
  // radio horizon is 36.9 km, so 60 and 80 km are well beyond it, where the first term of the
  // residue series that P.526 §3 uses is accurate.
  const cases: [number, number, "h" | "v"][] = [
    [3, 60000, "h"],
    [3, 80000, "v"],
    [1, 70000, "h"],
  ];
  it.each(cases)("%f GHz, %f m, %s: within 1.5 dB", (f, D, pol) => {
    const r = parabolicEquationField({ ...flatPath(D, 801), frequency_ghz: f, tx_antenna_m: 20, rx_antenna_m: 20, polarization: pol, ground: { kind: "impedance", epsilon_r: 22, sigma_s_m: 0.003 }, refractivity: { kind: "k-factor", k: 4 / 3 }, beamwidth_deg: 10 });
    const ref = sphericalEarthDiffractionLoss(D, 20, 20, (4 / 3) * 6371000, wavelengthM(f), { polarization: pol, epsilon_r: 22, sigma_s_m: 0.003 });
    expect(ref.transhorizon).toBe(true);
    expectClose(r.excess_loss_db, ref.Ldsph, { abs: 1.5 }, { f, D, pol, grid: r.grid });
  });
});

describe("parabolic equation: flat perfectly conducting ground against the two-ray sum", () => {
  // Two rays over a flat conductor, R = −1 (horizontal) or +1 (vertical), exact path lengths
  // (common practice). Lobe spacing in receiver height λD/(2h1) = 25 m; positions of nulls and
  // maxima within a tenth of it, maxima within 0.3 dB, nulls deeper than −15 dB.
  const f = 3;
  const D = 10000;
  const h1 = 20;
  const lambda = wavelengthM(f);
  const k = (2 * Math.PI) / lambda;
  const lobe = (lambda * D) / (2 * h1);
  for (const pol of ["h", "v"] as const) {
    const R = pol === "h" ? -1 : 1;
    const r = parabolicEquationField({ ...flatPath(D, 201), frequency_ghz: f, tx_antenna_m: h1, rx_antenna_m: 35, polarization: pol, ground: { kind: "pec" }, refractivity: flatEarth, beamwidth_deg: 20, grid: { max_angle_deg: 5 }, height_gain: { half_range_m: 33, step_m: 0.05 } });
    const z = r.height_gain!.rx_antenna_m;
    const pe = r.height_gain!.relative_db;
    const twoRay = Array.from(z, (h2) => {
      const a = Math.hypot(D, h2 - h1);
      const b = Math.hypot(D, h2 + h1);
      return 20 * Math.log10(Math.hypot(Math.cos(k * a) / a + (R * Math.cos(k * b)) / b, Math.sin(k * a) / a + (R * Math.sin(k * b)) / b) * a);
    });
    const extrema = (v: ArrayLike<number>, sign: 1 | -1) => {
      const out: number[] = [];
      for (let i = 1; i < v.length - 1; i++) if (sign * (v[i] - v[i - 1]) > 0 && sign * (v[i] - v[i + 1]) >= 0) out.push(i);
      return out;
    };
    it(`${pol}: maxima in position and level`, () => {
      const a = extrema(twoRay, 1);
      const b = extrema(pe, 1);
      expect(b.length).toBe(a.length);
      a.forEach((i, n) => {
        expectClose(z[b[n]], z[i], { abs: lobe / 10 }, { pol, maximum: n });
        expectClose(pe[b[n]], twoRay[i], { abs: 0.3 }, { pol, maximum: n });
      });
    });
    it(`${pol}: nulls in position and depth`, () => {
      const a = extrema(twoRay, -1).filter((i) => twoRay[i] < -15);
      const b = extrema(pe, -1).filter((i) => pe[i] < -15);
      expect(a.length).toBeGreaterThan(0);
      expect(b.length).toBe(a.length);
      a.forEach((i, n) => expectClose(z[b[n]], z[i], { abs: lobe / 10 }, { pol, null: n }));
    });
  }
});

describe("parabolic equation: reciprocity on a terrain profile", () => {
  // Swapping the ends of a hilly path (two ridges, one grazing the line of sight) gives the
  // same loss relative to free space within 0.5 dB (reciprocity; common practice). Both ends
  // use the same broad beam, as reciprocity needs.
  const D = 12000;
  const n = 401;
  const d = Float64Array.from({ length: n }, (_, i) => (i * D) / (n - 1));
  const g = Float64Array.from(d, (x) => 100 + 60 * Math.exp(-(((x - 3500) / 700) ** 2)) + 45 * Math.exp(-(((x - 8000) / 900) ** 2)) + 8 * Math.sin(x / 400));
  const base: Omit<ParabolicEquationInput, "d_m" | "ground_m" | "tx_antenna_m" | "rx_antenna_m"> = { frequency_ghz: 2, polarization: "v", ground: { kind: "impedance", epsilon_r: 15, sigma_s_m: 0.01 }, refractivity: { kind: "k-factor", k: 4 / 3 }, beamwidth_deg: 30 };
  it.each([
    [30, 20],
    [15, 60],
  ])("antennas %f m and %f m", (ha, hb) => {
    const ab = parabolicEquationField({ ...base, d_m: d, ground_m: g, tx_antenna_m: ha, rx_antenna_m: hb });
    const rev = Float64Array.from(g).reverse();
    const ba = parabolicEquationField({ ...base, d_m: d, ground_m: rev, tx_antenna_m: hb, rx_antenna_m: ha });
    expect(ab.status).toBe("ok");
    expect(ab.excess_loss_db).toBeGreaterThan(3);
    expectClose(ba.excess_loss_db, ab.excess_loss_db, { abs: 0.5 }, { ha, hb, grid: ab.grid });
  });
});

describe("parabolic equation: regression, a transmitter high above the lowest ground of the path", () => {
  // Symptom: the field of a link from a quarry rim down towards a valley was lost at the first
  // step (excess loss Infinity on the demo's pell-kvtw): the slope-limited floor of the
  // terrain-following frame lay hundreds of metres below the transmitter's ground and the cells
  // in between pushed the source out of the domain. Here the ground falls evenly from 400 m to
  // 0 m over 5 km, 8 % (steeper than the frame's slope limit), and the line of sight runs 60 m
  // above it: the ground reflection arrives 2.7° off the 0.5° beam's axis (below −100 dB), so
  // the answer is free space (ITU-R P.525-4) and the beam's own pattern on its axis.
  const D = 5000;
  const n = 501;
  const d_m = Float64Array.from({ length: n }, (_, i) => (i * D) / (n - 1));
  const ground_m = Float64Array.from(d_m, (x) => 400 * (1 - x / D));
  it("keeps its field: finite, within 0.5 dB of free space", () => {
    const r = parabolicEquationField({ d_m, ground_m, frequency_ghz: 3, tx_antenna_m: 60, rx_antenna_m: 60, polarization: "h", ground: { kind: "pec" }, refractivity: flatEarth, beamwidth_deg: 0.5 });
    expect(r.status).toBe("ok");
    expectClose(r.excess_loss_db, 0, { abs: 0.5 });
  });
});

describe("parabolic equation: regression, an answer that depended on the grid over steep terrain", () => {
  // Symptom: over terrain steeper than the terrain-following frame's slope limit the answer
  // moved by many dB when the grid was refined (the staircase's heights rounded to whole cells,
  // the angular filter tied to the grid's band): on this sawtooth of ±21 % slopes (150 m
  // teeth, 6 GHz, 10 km) the default grid read 38.8 dB, the grids twice and four times finer
  // 28.0 and 27.1 dB. Reference: the same solution on finer grids (convergence check, common
  // practice); measured now 23.8, 26.9, 27.3 dB.
  const D = 9990;
  const d_m = Float64Array.from({ length: 334 }, (_, i) => i * 30);
  const ground_m = Float64Array.from(d_m, (x) => 200 + 150 * Math.abs(((x / 700) % 2) - 1));
  const base: ParabolicEquationInput = { d_m, ground_m, frequency_ghz: 6, tx_antenna_m: 30, rx_antenna_m: 30, polarization: "v", ground: { kind: "impedance", epsilon_r: 15, sigma_s_m: 0.005 }, refractivity: { kind: "k-factor", k: 4 / 3 }, beamwidth_deg: 3 };
  it("the default grid within 4 dB, and the grid twice as fine within 0.5 dB, of the grid four times finer", () => {
    expect(d_m[d_m.length - 1]).toBe(D);
    const r1 = parabolicEquationField(base);
    const g = r1.grid;
    const finer = (h: number) => parabolicEquationField({ ...base, grid: { dz_m: g.dz_m / h, dx_m: g.dx_m / h, max_angle_deg: g.max_angle_deg } }).excess_loss_db;
    const r2 = finer(2);
    const r4 = finer(4);
    expectClose(r1.excess_loss_db, r4, { abs: 4 }, { r1: r1.excess_loss_db, r2, r4 });
    expectClose(r2, r4, { abs: 0.5 }, { r1: r1.excess_loss_db, r2, r4 });
  });
});

describe("parabolic equation: a uniform slope is flat ground rotated", () => {
  // Without refraction or curvature (k = ∞) a plane ground sloping at s = tan ψ is flat ground
  // rotated by ψ: the same field (the wave equation is invariant under rotation; common
  // practice). Antennas h_t and h_r above the slope (vertically) are h·cos ψ above it along its
  // normal, and the receiver is D/cos ψ + (h_r − h_t)·sin ψ from the transmitter along it, so
  // the reference is flat ground with those heights and that distance, on the same θmax. The
  // terrain-following frame follows the slope; what is measured is its propagator
  // (vertical-propagator.ts, frameEvenPhase). Before the frame's own propagator (the flat
  // ground's Feit–Fleck phase used in the tilted frame), measured 2026-12-05, in dB off the
  // rotated reference: 0.13, 16.08, −6.35, 5.66, 1.45, −1.06 for the rows below in order; with
  // it: 0.05, 0.03, −0.96, −0.74, −0.29, −0.22. What is left with unequal heights is the odd
  // part of the tilted frame's phase, which the ground's transforms cannot carry (about
  // k·sin ψ·θ³/2 per metre at angle θ to the frame).
  const plane = (slope: number, D: number, ht: number, hr: number, f: number, grid?: ParabolicEquationInput["grid"]) => {
    const d_m = Float64Array.from({ length: 301 }, (_, i) => (i * D) / 300);
    const ground_m = Float64Array.from(d_m, (x) => 1000 + slope * x);
    return parabolicEquationField({ d_m, ground_m, frequency_ghz: f, tx_antenna_m: ht, rx_antenna_m: hr, polarization: "v", ground: { kind: "impedance", epsilon_r: 15, sigma_s_m: 0.005 }, refractivity: flatEarth, beamwidth_deg: 5, grid });
  };
  it.each([
    // slope, h_t, h_r (m), frequency (GHz), tolerance (dB)
    [0.1, 10, 10, 3, 0.1],
    [-0.1, 30, 30, 10, 0.1],
    [0.1, 10, 60, 10, 1],
    [0.1, 60, 10, 3, 1],
    [-0.1, 10, 60, 3, 0.5],
    [0.05, 10, 60, 10, 0.5],
  ] as const)("slope %f, antennas %f m and %f m, %f GHz: within %f dB of flat ground rotated", (slope, ht, hr, f, tol) => {
    const D = 3000;
    const r = plane(slope, D, ht, hr, f);
    expect(r.status).toBe("ok");
    expect(r.angle_limit_exceeded).toBe(false);
    const psi = Math.atan(slope);
    const ref = plane(0, D / Math.cos(psi) + (hr - ht) * Math.sin(psi), ht * Math.cos(psi), hr * Math.cos(psi), f, { max_angle_deg: r.grid.max_angle_deg });
    expectClose(r.excess_loss_db, ref.excess_loss_db, { abs: tol }, { slope, ht, hr, f });
  });
});

describe("parabolic equation: a ground with a change of slope, rotated", () => {
  // Rotation invariance (common practice) across a change of slope, which a uniform slope does
  // not test: a ground level for 1.5 km and then sloping at s2, antennas h_t and h_r above its
  // ends, is solved as given (φ = 0) and turned by φ (profile sampled under the turned ground
  // from the turned transmitter to the turned receiver, antenna heights measured vertically
  // there); the loss must not change. Measured 2026-12-05, dB off the unturned answer, before
  // the tilted frame had its own propagator → with it: −7.47 → −0.34 (first row: 3 GHz,
  // 30/10 m, φ 0.08; the rows below in order) 9.54 → −0.18, 6.37 → 0.01, 0.29 → 0.29 (the
  // receiver in the kink's shadow, about 36 dB); over 36 such cases 2.02 → 0.28 dB on average.
  const solve = (phi: number, s2: number, ht: number, hr: number, f: number) => {
    const c = Math.cos(phi);
    const sn = Math.sin(phi);
    const turn = (u: number, y: number) => [u * c - y * sn, u * sn + y * c];
    const body = (u: number) => (u < 1500 ? 0 : s2 * (u - 1500));
    const [xt, zt] = turn(0, ht);
    const [xr, zr] = turn(3000, body(3000) + hr);
    /** height of the turned ground at x (bisection on the body coordinate, monotone for these angles) */
    const groundAt = (x: number) => {
      let lo = -1e4;
      let hi = 1e4;
      for (let it = 0; it < 80; it++) {
        const m = (lo + hi) / 2;
        if (turn(m, body(m))[0] < x) lo = m;
        else hi = m;
      }
      return turn(lo, body(lo))[1];
    };
    const d_m = Float64Array.from({ length: 601 }, (_, i) => (i * (xr - xt)) / 600);
    const ground_m = Float64Array.from(d_m, (x) => 1000 + groundAt(xt + x));
    const input: ParabolicEquationInput = { d_m, ground_m, frequency_ghz: f, tx_antenna_m: zt + 1000 - ground_m[0], rx_antenna_m: zr + 1000 - ground_m[600], polarization: "v", ground: { kind: "impedance", epsilon_r: 15, sigma_s_m: 0.005 }, refractivity: flatEarth, beamwidth_deg: 5, grid: { max_angle_deg: 12 } };
    return parabolicEquationField(input);
  };
  it.each([
    // s2, h_t, h_r (m), frequency (GHz), φ (rad)
    [0.05, 30, 10, 3, 0.08],
    [0.05, 30, 10, 11, 0.08],
    [0.05, 20, 20, 3, 0.08],
    [-0.05, 20, 20, 11, -0.05],
  ] as const)("slope 0 then %f, antennas %f m and %f m, %f GHz, turned by %f rad: within 0.5 dB", (s2, ht, hr, f, phi) => {
    const ref = solve(0, s2, ht, hr, f);
    const r = solve(phi, s2, ht, hr, f);
    expect(ref.status).toBe("ok");
    expect(r.status).toBe("ok");
    expectClose(r.excess_loss_db, ref.excess_loss_db, { abs: 0.5 }, { s2, ht, hr, f, phi });
  });
});
