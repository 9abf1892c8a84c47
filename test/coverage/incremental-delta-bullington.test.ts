import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { deltaBullingtonIncremental, type DeltaBullingtonParts } from "../../src/coverage/delta-bullington-incremental.ts";
import { RadialProfile } from "../../src/coverage/radial-profile.ts";
import { sphericalEarthLossScalar } from "../../src/coverage/spherical-earth-scalar.ts";
import { EARTH_RADIUS_M, wavelengthM } from "../../src/physics/constants.ts";
import { deltaBullingtonLoss } from "../../src/physics/delta-bullington.ts";
import { sphericalEarthDiffractionLoss } from "../../src/physics/spherical-earth-diffraction.ts";
import { mulberry32 } from "../../src/terrain/mulberry32.ts";
import { expectClose } from "../helpers/expect-close.ts";

// Reference: the full-profile implementation of ITU-R P.526-15 §4.5 in src/physics/
// (deltaBullingtonLoss, itself checked against the 20 ITU-R SG3 validation paths in
// test/reference/delta-bullington.test.ts). The incremental evaluation must give the same
// numbers on the same profile: tolerance 1e-5 dB or 1e-6 relative (rounding only; with a low
// antenna P.526-15 §3.2 evaluates acos near ±1, which can turn a 1e-12 m difference in hrs'
// into ~1e-5 dB). Antennas stand above ground (> 0 m), as the coverage inputs require.
const TOL_DB = { abs: 1e-5, rel: 1e-6 };

interface Case {
  d: Float64Array;
  h: Float64Array;
  antenna_m: number;
  receiver_m: number;
  f_ghz: number;
  k: number;
  pol: "h" | "v";
}

/** A random terrain profile: random walk plus an optional ridge, irregular spacing. */
function randomProfile(seed: number, n: number, step: number, roughness: number, ridge: number): { d: Float64Array; h: Float64Array } {
  const rnd = mulberry32(seed);
  const d = new Float64Array(n);
  const h = new Float64Array(n);
  let y = 200 + 400 * rnd();
  const rc = 0.2 + 0.6 * rnd();
  for (let i = 0; i < n; i++) {
    d[i] = i === 0 ? 0 : d[i - 1] + step * (0.5 + rnd());
    y += roughness * (rnd() - 0.5);
    const u = i / (n - 1);
    h[i] = y + ridge * Math.exp(-(((u - rc) / 0.05) ** 2));
  }
  return { d, h };
}

function check(c: Case, ground = { epsilon_r: 15, sigma_s_m: 0.01 }): void {
  const n = c.d.length;
  const ae = c.k * EARTH_RADIUS_M;
  const lambda = wavelengthM(c.f_ghz);
  const hts = c.h[0] + c.antenna_m;
  const p = new RadialProfile(n);
  p.reset(c.h[0], hts, ae);
  const parts: DeltaBullingtonParts = { Lbulla: 0, Lbulls: 0, Ldsph: 0, hts_prime_m: 0, hrs_prime_m: 0 };
  // Evaluate a receiver at every sample along the radial (the incremental use), each against
  // the full method on the profile cut at that sample.
  for (let j = 1; j < n; j++) {
    const hrs = c.h[j] + c.receiver_m;
    const got = deltaBullingtonIncremental(p, c.d[j], c.h[j], hrs, { lambda_m: lambda, ae_m: ae, ground: { ...ground, vertical: c.pol === "v" } }, parts);
    const ref = deltaBullingtonLoss(
      { d_m: c.d.subarray(0, j + 1), h_m: c.h.subarray(0, j + 1), hts_m: hts, hrs_m: hrs, frequency_ghz: c.f_ghz, ae_m: ae },
      { polarization: c.pol, epsilon_r: ground.epsilon_r, sigma_s_m: ground.sigma_s_m },
    );
    const ctx = { j, n, f: c.f_ghz, k: c.k, ant: c.antenna_m, rx: c.receiver_m };
    expectClose(parts.Lbulla, ref.Lbulla, TOL_DB, { ...ctx, q: "Lbulla" });
    expectClose(parts.Lbulls, ref.Lbulls, TOL_DB, { ...ctx, q: "Lbulls" });
    expectClose(parts.hts_prime_m, ref.hts_prime_m, { abs: 1e-6 }, { ...ctx, q: "hts'" });
    expectClose(parts.hrs_prime_m, ref.hrs_prime_m, { abs: 1e-6 }, { ...ctx, q: "hrs'" });
    expectClose(parts.Ldsph, ref.Ldsph, TOL_DB, { ...ctx, q: "Ldsph" });
    expectClose(got, ref.Ld, TOL_DB, { ...ctx, q: "Ld" });
    p.push(c.d[j], c.h[j]);
  }
}

describe("incremental delta-Bullington = full P.526-15 §4.5 on the same profile", () => {
  it("random profiles: every receiver position along the radial (fast-check)", () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 1e6 }),
        fc.integer({ min: 3, max: 160 }),
        fc.constantFrom(10, 30, 90),
        fc.constantFrom(0, 5, 40),
        fc.constantFrom(0, 80, 300),
        fc.constantFrom(0.1, 0.9, 2.4, 11),
        fc.constantFrom(0.5, 4 / 3, 3, Infinity),
        fc.constantFrom(0.5, 2, 30),
        fc.constantFrom(1.5, 10),
        fc.constantFrom("h" as const, "v" as const),
        (seed, n, step, rough, ridge, f, k, ant, rx, pol) => {
          const { d, h } = randomProfile(seed, n, step, rough, ridge);
          check({ d, h, antenna_m: ant, receiver_m: rx, f_ghz: f, k, pol });
        },
      ),
      { numRuns: 120 },
    );
  });

  it("a long rough radial (2000 samples) exercises the block bounds of the νmax search", () => {
    const { d, h } = randomProfile(42, 2000, 30, 12, 150);
    check({ d, h, antenna_m: 30, receiver_m: 1.5, f_ghz: 0.9, k: 4 / 3, pol: "v" });
  });

  it("a plateau just below a long hull edge (νmax not at a hull vertex) is found exactly", () => {
    // Two peaks near the ends, a broad plateau slightly below the chord between them.
    const n = 600;
    const d = new Float64Array(n);
    const h = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      d[i] = i * 50;
      h[i] = i === 20 || i === n - 20 ? 160 : i > 150 && i < 450 ? 150 - 0.002 * (i - 300) ** 2 : 60;
    }
    check({ d, h, antenna_m: 110, receiver_m: 110, f_ghz: 0.45, k: Infinity, pol: "h" });
  });

  it("sphericalEarthLossScalar equals sphericalEarthDiffractionLoss", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 100, max: 200e3, noNaN: true }),
        fc.double({ min: 0.1, max: 500, noNaN: true }),
        fc.double({ min: 0.1, max: 500, noNaN: true }),
        fc.constantFrom(0.5, 4 / 3, 10),
        fc.constantFrom(0.03, 0.9, 10),
        fc.boolean(),
        (dist, h1, h2, k, f, vertical) => {
          const ae = k * EARTH_RADIUS_M;
          const lambda = wavelengthM(f);
          const g = { epsilon_r: 22, sigma_s_m: 0.003, vertical };
          const ref = sphericalEarthDiffractionLoss(dist, h1, h2, ae, lambda, { polarization: vertical ? "v" : "h", epsilon_r: 22, sigma_s_m: 0.003 }).Ldsph;
          expectClose(sphericalEarthLossScalar(dist, h1, h2, ae, lambda, g), ref, { abs: 1e-9 }, { dist, h1, h2, k, f });
        },
      ),
      { numRuns: 300 },
    );
  });

  it("NaN heights give NaN, not a number", () => {
    const p = new RadialProfile(4);
    p.reset(100, 130, 4 / 3 * EARTH_RADIUS_M);
    p.push(30, NaN);
    const v = deltaBullingtonIncremental(p, 60, 100, 102, { lambda_m: 0.3, ae_m: 4 / 3 * EARTH_RADIUS_M, ground: { epsilon_r: 15, sigma_s_m: 0.01, vertical: true } });
    expect(Number.isNaN(v)).toBe(true);
  });
});
