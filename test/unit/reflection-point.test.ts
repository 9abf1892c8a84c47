import { describe, it, expect } from "vitest";
import fc from "fast-check";
import { reflectionPoints } from "../../src/physics/reflection-point.ts";
import { smoothEarthReflectionPoint } from "../../src/physics/smooth-earth-reflection-point.ts";
import { expectClose } from "../helpers/expect-close.ts";

const profileArb = fc
  .record({
    steps: fc.array(fc.double({ min: 5, max: 500, noNaN: true }), { minLength: 2, maxLength: 40 }),
    heights: fc.array(fc.double({ min: 0, max: 120, noNaN: true }), { minLength: 41, maxLength: 41 }),
    tx: fc.double({ min: 5, max: 200, noNaN: true }),
    rx: fc.double({ min: 5, max: 200, noNaN: true }),
    ae: fc.constantFrom(Infinity, 8_500_000, 6_371_000),
  })
  .map(({ steps, heights, tx, rx, ae }) => {
    const d_m = [0];
    for (const s of steps) d_m.push(d_m[d_m.length - 1] + s);
    const h_m = d_m.map((_, i) => heights[i]);
    return { d_m, h_m, hts_m: h_m[0] + tx, hrs_m: h_m[h_m.length - 1] + rx, ae_m: ae };
  });

describe("reflectionPoints invariants", () => {
  it("reciprocity: swapping the ends mirrors every specular point (same ψ and Δ)", () => {
    fc.assert(
      fc.property(profileArb, (p) => {
        const D = p.d_m[p.d_m.length - 1];
        const fwd = reflectionPoints(p);
        const rev = reflectionPoints({
          d_m: p.d_m.map((d) => D - d).reverse(),
          h_m: [...p.h_m].reverse(),
          hts_m: p.hrs_m,
          hrs_m: p.hts_m,
          ae_m: p.ae_m,
        });
        expect(rev.length).toBe(fwd.length);
        const back = [...rev].reverse();
        fwd.forEach((a, i) => {
          expectClose(back[i].distance_m, D - a.distance_m, { abs: 1e-6 * D }, { p, i, q: "mirrored distance" });
          expectClose(back[i].grazing_angle_rad, a.grazing_angle_rad, { abs: 1e-9, rel: 1e-6 }, { i, q: "ψ" });
          expectClose(back[i].path_difference_m, a.path_difference_m, { abs: 1e-9, rel: 1e-6 }, { i, q: "Δ" });
        });
      }),
      { numRuns: 300 },
    );
  });

  it("every returned point: ψ > 0, Δ > 0, delay = Δ/c, inside the profile", () => {
    fc.assert(
      fc.property(profileArb, (p) => {
        const D = p.d_m[p.d_m.length - 1];
        for (const s of reflectionPoints(p)) {
          expect(s.grazing_angle_rad).toBeGreaterThan(0);
          expect(s.path_difference_m).toBeGreaterThan(0);
          expectClose(s.delay_ns, (s.path_difference_m / 299_792_458) * 1e9, { rel: 1e-12 }, "delay");
          expect(s.distance_m).toBeGreaterThanOrEqual(0);
          expect(s.distance_m).toBeLessThanOrEqual(D);
        }
      }),
    );
  });

  it("does not modify the caller's arrays", () => {
    const d_m = [0, 1000, 2000, 3000];
    const h_m = [10, 0, 0, 12];
    const copy = [[...d_m], [...h_m]];
    reflectionPoints({ d_m, h_m, hts_m: 40, hrs_m: 40, ae_m: 8_500_000 });
    expect([d_m, h_m]).toEqual(copy);
  });

  it("a hill between the transmitter and the flat reflecting area hides the reflection", () => {
    const d_m = Array.from({ length: 101 }, (_, i) => i * 100);
    const flat = d_m.map(() => 0);
    const open = reflectionPoints({ d_m, h_m: flat, hts_m: 30, hrs_m: 30, ae_m: Infinity });
    expect(open).toHaveLength(1);
    expectClose(open[0].distance_m, 5000, { abs: 1e-6 }, "symmetric point");
    // a 12 m ridge at 3.5 km: above the incident ray (height 30·(1 − 3.5/5) = 9 m there) but
    // below the direct ray (30 m)
    const ridge = flat.map((h, i) => (i === 35 ? 12 : h));
    const hidden = reflectionPoints({ d_m, h_m: ridge, hts_m: 30, hrs_m: 30, ae_m: Infinity });
    expect(hidden.some((s) => Math.abs(s.distance_m - 5000) < 1)).toBe(false);
  });

  it("undulating terrain: several specular points, each balancing the angles on the analytic surface", () => {
    // h(x) = 5·sin(2πx/2000) m, sampled every 10 m; the check uses the analytic slope, not the
    // code's interpolated one; measured mismatch 4e-4 of ψ, tolerance 2e-3.
    const A = 5;
    const P = 2000;
    const d_m = Array.from({ length: 1001 }, (_, i) => i * 10);
    const h_m = d_m.map((x) => A * Math.sin((2 * Math.PI * x) / P));
    const D = 10_000;
    const pts = reflectionPoints({ d_m, h_m, hts_m: 50, hrs_m: 50, ae_m: Infinity });
    expect(pts.length).toBeGreaterThanOrEqual(2);
    for (const s of pts) {
      const x = s.distance_m;
      const h = A * Math.sin((2 * Math.PI * x) / P);
      const beta = Math.atan(((A * 2 * Math.PI) / P) * Math.cos((2 * Math.PI * x) / P));
      const psiT = Math.atan2(50 - h, x) + beta;
      const psiR = Math.atan2(50 - h, D - x) - beta;
      expectClose(psiT, psiR, { rel: 2e-3 }, { x, q: "angle balance" });
      expectClose(s.grazing_angle_rad, (psiT + psiR) / 2, { rel: 2e-3 }, { x, q: "ψ" });
    }
  });

  it("invalid profiles give an empty list; invalid smooth-Earth inputs NaN", () => {
    const base = { hts_m: 30, hrs_m: 30, ae_m: Infinity };
    expect(reflectionPoints({ ...base, d_m: [0], h_m: [0] })).toEqual([]);
    expect(reflectionPoints({ ...base, d_m: [0, 10], h_m: [0] })).toEqual([]);
    expect(reflectionPoints({ ...base, d_m: [0, 10, 10], h_m: [0, 0, 0] })).toEqual([]);
    expect(reflectionPoints({ ...base, d_m: [0, NaN, 20], h_m: [0, 0, 0] })).toEqual([]);
    expect(reflectionPoints({ ...base, d_m: [0, 10, 20], h_m: [0, 0, 0], ae_m: -1 })).toEqual([]);
    expect(smoothEarthReflectionPoint(NaN, 10, 1000, Infinity).d1_m).toBeNaN();
    expect(smoothEarthReflectionPoint(10, 10, 0, Infinity).grazing_angle_rad).toBeNaN();
    expect(smoothEarthReflectionPoint(10, 10, 1000, -5).path_difference_m).toBeNaN();
  });

  it("smooth Earth: swapping the antennas swaps d1 and d2", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 5, max: 500, noNaN: true }),
        fc.double({ min: 5, max: 500, noNaN: true }),
        fc.double({ min: 1000, max: 60_000, noNaN: true }),
        (h1, h2, d) => {
          const a = smoothEarthReflectionPoint(h1, h2, d, 8_500_000);
          const b = smoothEarthReflectionPoint(h2, h1, d, 8_500_000);
          if (Number.isNaN(a.d1_m)) return Number.isNaN(b.d1_m);
          expectClose(b.d1_m, a.d2_m, { abs: 1e-8 * d }, { h1, h2, d });
          expectClose(b.path_difference_m, a.path_difference_m, { rel: 1e-9 }, { h1, h2, d });
          return true;
        },
      ),
    );
  });
});
