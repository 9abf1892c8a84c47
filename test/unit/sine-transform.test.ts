import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { makeSineTransform } from "../../src/physics/parabolic-equation/vertical-propagator.ts";

// The wave solution's fast sine transform (one FFT of n points for two real sequences) against
// the direct sum of its definition, X_k = Σ_{j=1}^{n−1} x_j·sin(πjk/n) (DST-I; SciPy's
// scipy.fft.dst type 1 is the same sum times 2, on the n − 1 interior points).
function direct(x: ArrayLike<number>, n: number): Float64Array {
  const X = new Float64Array(n + 1);
  for (let k = 1; k < n; k++) {
    let s = 0;
    for (let j = 1; j < n; j++) s += x[j] * Math.sin((Math.PI * j * k) / n);
    X[k] = s;
  }
  return X;
}

describe("sine transform (DST-I) by a half-size FFT", () => {
  it.each([4, 8, 16, 64, 256])("n = %i: both sequences equal the direct sum within 1e-12 of their scale", (n) => {
    fc.assert(
      fc.property(fc.array(fc.double({ min: -1, max: 1, noNaN: true }), { minLength: 2 * (n + 1), maxLength: 2 * (n + 1) }), (v) => {
        const ar = Float64Array.from(v.slice(0, n + 1));
        const ai = Float64Array.from(v.slice(n + 1));
        const xr = new Float64Array(n + 1);
        const xi = new Float64Array(n + 1);
        makeSineTransform(n)(ar, ai, xr, xi);
        const er = direct(ar, n);
        const ei = direct(ai, n);
        for (let k = 1; k < n; k++) {
          expect(Math.abs(xr[k] - er[k])).toBeLessThan(1e-12 * n);
          expect(Math.abs(xi[k] - ei[k])).toBeLessThan(1e-12 * n);
        }
      }),
      { numRuns: 20 },
    );
  });
});

describe("sine transform with a spectral factor applied as it is unpacked", () => {
  it.each([4, 16, 256])("n = %i: equals the transform (A + iB) times m, within 1e-12 of the scale", (n) => {
    fc.assert(
      fc.property(fc.array(fc.double({ min: -1, max: 1, noNaN: true }), { minLength: 4 * (n + 1), maxLength: 4 * (n + 1) }), (v) => {
        const ar = Float64Array.from(v.slice(0, n + 1));
        const ai = Float64Array.from(v.slice(n + 1, 2 * (n + 1)));
        const mr = Float64Array.from(v.slice(2 * (n + 1), 3 * (n + 1)));
        const mi = Float64Array.from(v.slice(3 * (n + 1)));
        const xr = new Float64Array(n + 1);
        const xi = new Float64Array(n + 1);
        makeSineTransform(n)(ar, ai, xr, xi, mr, mi);
        const er = direct(ar, n);
        const ei = direct(ai, n);
        for (let k = 1; k < n; k++) {
          expect(Math.abs(xr[k] - (er[k] * mr[k] - ei[k] * mi[k]))).toBeLessThan(2e-12 * n);
          expect(Math.abs(xi[k] - (er[k] * mi[k] + ei[k] * mr[k]))).toBeLessThan(2e-12 * n);
        }
      }),
      { numRuns: 20 },
    );
  });
});

describe("sine transform with the mixed transform's forward recursion run as it is unpacked", () => {
  it.each([4, 16, 256])("n = %i: v_1 = 0, v_{j+1} = ρ·v_j + c·X_j over the direct sum, within 1e-12 of the scale", (n) => {
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: -1, max: 1, noNaN: true }), { minLength: 2 * (n + 1), maxLength: 2 * (n + 1) }),
        fc.double({ min: -0.9, max: 0.9, noNaN: true }),
        fc.double({ min: -0.4, max: 0.4, noNaN: true }),
        (v, rhoRe, rhoIm) => {
          const ar = Float64Array.from(v.slice(0, n + 1));
          const ai = Float64Array.from(v.slice(n + 1));
          const xr = new Float64Array(n + 1);
          const xi = new Float64Array(n + 1);
          const c = 0.3;
          makeSineTransform(n)(ar, ai, xr, xi, undefined, undefined, { rhoRe, rhoIm, c });
          const er = direct(ar, n);
          const ei = direct(ai, n);
          let vr = 0;
          let vi = 0;
          for (let j = 1; j <= n; j++) {
            expect(Math.abs(xr[j] - vr)).toBeLessThan(1e-12 * n);
            expect(Math.abs(xi[j] - vi)).toBeLessThan(1e-12 * n);
            if (j < n) {
              const nr = rhoRe * vr - rhoIm * vi + c * er[j];
              vi = rhoRe * vi + rhoIm * vr + c * ei[j];
              vr = nr;
            }
          }
        },
      ),
      { numRuns: 20 },
    );
  });
});
