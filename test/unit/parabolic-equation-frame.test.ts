import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { frameEvenPhase, frameGauge } from "../../src/physics/parabolic-equation/vertical-propagator.ts";
import { expectClose } from "../helpers/expect-close.ts";

// The terrain-following frame's propagator (vertical-propagator.ts, frameEvenPhase) against the
// plane-wave dispersion relation of the Helmholtz equation (common practice): a plane wave at
// angle φ above the horizontal has vertical wavenumber k·sin φ and range wavenumber k·cos φ; in
// a frame z' = z − s·x (s = tan ψ) with the gauge exp(−ik·sin ψ·z') it has vertical wavenumber
// p = k(sin φ − sin ψ) and range wavenumber k·cos φ + s·k·sin φ. The frame's propagator is the
// even part in p of that (the transforms that hold the ground condition pair p with −p).
const k = (2 * Math.PI) / 0.03; // 10 GHz
/** range wavenumber in the frame of the wave of frame vertical wavenumber p, less k·cos ψ (the constant the propagator drops), straight from the plane wave's angle */
const exactRange = (p: number, s: number): number => {
  const { kSigma } = frameGauge(s, k);
  const phi = Math.asin((p + kSigma) / k);
  return k * Math.cos(phi) + s * k * Math.sin(phi) - (k * Math.cos(Math.atan(s)) + s * kSigma);
};

describe("wave solution: the tilted frame's propagator", () => {
  it("is the even part of the exact plane-wave phase in the frame, within 1e-9 rad/m", () => {
    fc.assert(
      fc.property(fc.double({ min: -0.3, max: 0.3, noNaN: true }), fc.double({ min: -0.4, max: 0.4, noNaN: true }), (s, t) => {
        const p = k * t;
        const { kSigma, kCos } = frameGauge(s, k);
        const even = 0.5 * (exactRange(p, s) + exactRange(-p, s));
        expect(Math.abs(frameEvenPhase(p, k, kSigma, kCos) - even)).toBeLessThan(1e-9);
      }),
    );
  });

  it("on a level frame is the Feit–Fleck phase √(k² − p²) − k", () => {
    for (const t of [0, 0.01, 0.1, 0.26]) {
      const p = k * t;
      expectClose(frameEvenPhase(p, k, 0, k), Math.sqrt(k * k - p * p) - k, { abs: 1e-9 }, { t });
    }
  });

  it("spreads as the rotated frame does: p² term −p²/(2k·cos³ψ), not the level frame's −p²/(2k)", () => {
    // the rotated frame (η = z'·cos ψ normal to the floor, ξ = x/cos ψ along it) gives the
    // Fresnel phase −(p/cos ψ)²/(2k) per metre of ξ, i.e. per metre of x −p²/(2k·cos³ψ)
    for (const s of [0.05, 0.1, 0.2]) {
      const { kSigma, kCos } = frameGauge(s, k);
      const p = 1e-3 * k;
      const c = Math.cos(Math.atan(s));
      expectClose(frameEvenPhase(p, k, kSigma, kCos) / (-(p * p) / (2 * k * c ** 3)), 1, { abs: 1e-5 }, { s });
    }
  });

  it("has no term linear in p in the exact phase (the sin ψ gauge: p = 0 runs along the floor)", () => {
    for (const s of [0.05, 0.2]) {
      const h = 1e-4 * k;
      const slope = (exactRange(h, s) - exactRange(-h, s)) / (2 * h);
      expect(Math.abs(slope)).toBeLessThan(1e-6);
    }
  });
});
