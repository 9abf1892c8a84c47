import { describe, it, expect } from "vitest";
import { reflectionPoints } from "../../src/physics/reflection-point.ts";
import { smoothEarthReflectionPoint } from "../../src/physics/smooth-earth-reflection-point.ts";
import { expectClose } from "../helpers/expect-close.ts";

const C = 299_792_458;

/** Uniformly sampled profile of constant height. */
function flatProfile(d: number, step: number, height: number) {
  const n = Math.ceil(d / step);
  const d_m = Array.from({ length: n + 1 }, (_, i) => Math.min(d, i * step));
  return { d_m, h_m: d_m.map(() => height) };
}

// Closed-form flat-Earth image geometry (any optics text; common practice):
//   d1 = d·h1/(h1 + h2), ψ = atan((h1 + h2)/d), Δ = √(d² + (h1 + h2)²) − √(d² + (h1 − h2)²).
const flatCases = [
  [30, 10, 1_000],
  [50, 20, 20_000],
  [120, 35, 43_210],
  [8, 300, 5_000],
  [60, 60, 12_345],
] as const;

describe("reflection point on a flat Earth (ae = ∞) vs the closed form", () => {
  it.each(flatCases)("h1=%s m h2=%s m d=%s m, profile step 37 m at 112 m amsl", (h1, h2, d) => {
    const ground = 112;
    const { d_m, h_m } = flatProfile(d, 37, ground);
    const pts = reflectionPoints({ d_m, h_m, hts_m: ground + h1, hrs_m: ground + h2, ae_m: Infinity });
    expect(pts).toHaveLength(1);
    const p = pts[0];
    const delta = Math.hypot(d, h1 + h2) - Math.hypot(d, h1 - h2);
    const ctx = { h1, h2, d };
    expectClose(p.distance_m, (d * h1) / (h1 + h2), { abs: 1e-6 * d }, { ...ctx, q: "d1" });
    expectClose(p.grazing_angle_rad, Math.atan((h1 + h2) / d), { rel: 1e-9 }, { ...ctx, q: "ψ" });
    expectClose(p.path_difference_m, delta, { rel: 1e-7 }, { ...ctx, q: "Δ" });
    expectClose(p.delay_ns, (delta / C) * 1e9, { rel: 1e-7 }, { ...ctx, q: "delay" });
    expectClose(p.height_m, ground, { abs: 1e-9 }, { ...ctx, q: "height" });
  });

  it.each(flatCases)("smoothEarthReflectionPoint(h1=%s, h2=%s, d=%s, ∞) is the closed form", (h1, h2, d) => {
    const s = smoothEarthReflectionPoint(h1, h2, d, Infinity);
    const delta = Math.hypot(d, h1 + h2) - Math.hypot(d, h1 - h2);
    expectClose(s.d1_m, (d * h1) / (h1 + h2), { rel: 1e-14 }, "d1");
    expectClose(s.d2_m, (d * h2) / (h1 + h2), { rel: 1e-12 }, "d2");
    expectClose(s.grazing_angle_rad, Math.atan((h1 + h2) / d), { rel: 1e-14 }, "ψ");
    expectClose(s.path_difference_m, delta, { rel: 1e-9 }, "Δ");
  });

  it.each(flatCases)("smooth Earth with ae = 1e13 m tends to the flat case (h1=%s h2=%s d=%s)", (h1, h2, d) => {
    const s = smoothEarthReflectionPoint(h1, h2, d, 1e13);
    expectClose(s.d1_m, (d * h1) / (h1 + h2), { rel: 1e-6 }, "d1");
    expectClose(s.grazing_angle_rad, Math.atan((h1 + h2) / d), { rel: 1e-6 }, "ψ");
  });

  // A tilted plane z = z0 + s·x: the specular point is found independently here by bisection on
  // the equality of the two angles measured with vector dot products against the plane.
  it.each([
    [0.01, 40, 25, 6_000],
    [-0.004, 15, 70, 9_000],
  ])("tilted plane slope %s: angle equality by bisection", (slope, h1, h2, d) => {
    const z0 = 200;
    const d_m = Array.from({ length: 301 }, (_, i) => (i * d) / 300);
    const h_m = d_m.map((x) => z0 + slope * x);
    const T = [0, z0 + h1];
    const R = [d, z0 + slope * d + h2];
    const u = [1 / Math.hypot(1, slope), slope / Math.hypot(1, slope)];
    const angle = (x: number, A: number[], sign: number) => {
      const v = [A[0] - x, A[1] - (z0 + slope * x)];
      return Math.acos((sign * (v[0] * u[0] + v[1] * u[1])) / Math.hypot(v[0], v[1]));
    };
    let lo = 0;
    let hi = d;
    for (let k = 0; k < 200; k++) {
      const m = (lo + hi) / 2;
      if (angle(m, T, -1) > angle(m, R, 1)) lo = m;
      else hi = m;
    }
    const pts = reflectionPoints({ d_m, h_m, hts_m: T[1], hrs_m: R[1], ae_m: Infinity });
    expect(pts).toHaveLength(1);
    expectClose(pts[0].distance_m, (lo + hi) / 2, { abs: 1e-6 * d }, { slope, q: "d1" });
    expectClose(pts[0].grazing_angle_rad, angle((lo + hi) / 2, R, 1), { rel: 1e-7 }, { slope, q: "ψ" });
  });
});

/**
 * Exact specular point on a circle of radius ae (no parabolic approximation), by bisection on
 * the central angle α of the point: grazing angle towards each antenna from asin(v·n/|v|).
 */
function sphereReflection(h1: number, h2: number, d: number, ae: number) {
  const th = d / ae;
  const T = [0, ae + h1];
  const R = [(ae + h2) * Math.sin(th), (ae + h2) * Math.cos(th)];
  const g = (a: number) => {
    const P = [ae * Math.sin(a), ae * Math.cos(a)];
    const n = [Math.sin(a), Math.cos(a)];
    const vt = [T[0] - P[0], T[1] - P[1]];
    const vr = [R[0] - P[0], R[1] - P[1]];
    const psiT = Math.asin((vt[0] * n[0] + vt[1] * n[1]) / Math.hypot(vt[0], vt[1]));
    const psiR = Math.asin((vr[0] * n[0] + vr[1] * n[1]) / Math.hypot(vr[0], vr[1]));
    const delta = Math.hypot(vt[0], vt[1]) + Math.hypot(vr[0], vr[1]) - Math.hypot(R[0] - T[0], R[1] - T[1]);
    return { f: psiT - psiR, psi: psiT, delta };
  };
  let lo = 0;
  let hi = th;
  for (let i = 0; i < 200; i++) {
    const m = (lo + hi) / 2;
    if (g(m).f > 0) lo = m;
    else hi = m;
  }
  const a = (lo + hi) / 2;
  return { d1: ae * a, psi: g(a).psi, delta: g(a).delta };
}

// Measured differences of the parabolic (P.526-15 §3.2) solution from the exact sphere over
// these cases: d1 ≤ 2.5e-6·d, ψ and Δ ≤ 6e-5 relative. Tolerances: 1e-5·d, 2e-4 relative.
const sphereCases = [
  [50, 20, 20_000, 8_500_000],
  [100, 30, 40_000, 8_500_000],
  [300, 10, 50_000, 8_500_000],
  [60, 60, 30_000, 6_371_000],
  [20, 500, 30_000, 8_500_000],
  [100, 100, 60_000, 12_742_000],
] as const;

describe("smooth-Earth reflection point vs an exact spherical solution", () => {
  it.each(sphereCases)("h1=%s h2=%s d=%s ae=%s", (h1, h2, d, ae) => {
    const s = smoothEarthReflectionPoint(h1, h2, d, ae);
    const x = sphereReflection(h1, h2, d, ae);
    const ctx = { h1, h2, d, ae };
    expectClose(s.d1_m, x.d1, { abs: 1e-5 * d }, { ...ctx, q: "d1" });
    expectClose(s.grazing_angle_rad, x.psi, { rel: 2e-4 }, { ...ctx, q: "ψ" });
    expectClose(s.path_difference_m, x.delta, { rel: 2e-4 }, { ...ctx, q: "Δ" });
  });

  // The terrain-profile search on a sea-level profile sampled every 10 m, with the bulge
  // applied internally, against the closed form: measured ≤ 3e-6·d in d1, ≤ 2e-5 relative in ψ, Δ.
  it.each(sphereCases)("profile search on a sampled sphere h1=%s h2=%s d=%s ae=%s", (h1, h2, d, ae) => {
    const { d_m, h_m } = flatProfile(d, 10, 0);
    const pts = reflectionPoints({ d_m, h_m, hts_m: h1, hrs_m: h2, ae_m: ae });
    const s = smoothEarthReflectionPoint(h1, h2, d, ae);
    expect(pts).toHaveLength(1);
    const ctx = { h1, h2, d, ae };
    expectClose(pts[0].distance_m, s.d1_m, { abs: 1e-5 * d }, { ...ctx, q: "d1" });
    expectClose(pts[0].grazing_angle_rad, s.grazing_angle_rad, { rel: 1e-4 }, { ...ctx, q: "ψ" });
    expectClose(pts[0].path_difference_m, s.path_difference_m, { rel: 1e-4 }, { ...ctx, q: "Δ" });
    expectClose(pts[0].height_m, 0, { abs: 1e-5 }, { ...ctx, q: "height" });
  });

  it("beyond the horizon of the reflection point: NaN", () => {
    // 10 m antennas 40 km apart at ae = 6371 km: h1' = 10 − 20 000²/(2·6 371 000) < 0
    expect(smoothEarthReflectionPoint(10, 10, 40_000, 6_371_000).d1_m).toBeNaN();
    expect(reflectionPoints({ ...flatProfile(40_000, 50, 0), hts_m: 10, hrs_m: 10, ae_m: 6_371_000 })).toEqual([]);
  });
});
