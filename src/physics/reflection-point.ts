import { SPEED_OF_LIGHT_M_S } from "./constants.ts";
import { earthBulgeM } from "./earth-bulge.ts";

/** The closed-form smooth-Earth solution lives in its own file; re-exported for convenience. */
export { smoothEarthReflectionPoint, type SmoothEarthReflection } from "./smooth-earth-reflection-point.ts";

export interface SpecularPoint {
  /** position of the reflection point, in the profile's own distance coordinate (m) */
  distance_m: number;
  /** terrain height at the reflection point, amsl, without Earth bulge (m) */
  height_m: number;
  /** index i of the profile segment [d_i, d_i+1] that reflects */
  segment: number;
  /** grazing angle ψ between the rays and the local tangent of the terrain (rad) */
  grazing_angle_rad: number;
  /** reflected minus direct path length (m) */
  path_difference_m: number;
  /** delay of the reflected ray behind the direct one (ns) */
  delay_ns: number;
}

/** Height tolerance (m) for the blocking test: terrain must rise above a ray by more than this. */
const BLOCK_TOLERANCE_M = 1e-6;

/**
 * All specular ground-reflection points on a terrain profile that both antennas can see.
 *
 * Method (geometrical optics; the local-tangent construction is common practice):
 * 1. Effective-Earth frame: terrain z_k = h_k + x_k·(D − x_k)/(2·ae) (Earth bulge, P.452-17
 *    eq. (14c), parabolic approximation), antennas at (0, hts) and (D, hrs); rays are straight.
 * 2. Reflecting surface: the profile, linear between samples, with a continuous local slope s(x)
 *    interpolated linearly between sample slopes (central differences of z; one-sided at the
 *    ends). The local tangent at x has elevation β = atan s(x).
 * 3. Angle balance: with e_T, e_R the elevation angles of the two antennas seen from the point,
 *    ψT = e_T + β (above the backward tangent) and ψR = e_R − β (above the forward tangent),
 *    F(x) = ψT − ψR. F is continuous; every zero is a point where the angle of incidence equals
 *    the angle of reflection. Zeros are bracketed per segment (ends and midpoint) and refined
 *    by bisection to 1e-9·D.
 * 4. A zero is kept if both antennas are above the local tangent (ψT, ψR > 0) and neither ray
 *    passes below the terrain at any profile sample (the terrain is linear between samples).
 * 5. Path difference Δ = |T − P| + |P − R| − |T − R|, delay Δ/c, grazing angle (ψT + ψR)/2.
 * On flat terrain with ae = Infinity this is the flat-Earth image solution exactly; on a
 * uniformly sampled smooth sphere the interpolated slope is the parabola's exact slope, so the
 * result tracks `smoothEarthReflectionPoint` to within the chord sag (step²/(8·ae)).
 *
 * Validity: line-of-sight geometry, path length ≪ ae; the surface at each point is treated as
 * a smooth plane (roughness and the size of the reflecting Fresnel zone are the caller's
 * concern). Two zeros closer than half a segment may be missed. Invalid input (arrays of
 * different length or shorter than 2, non-finite values, distances not strictly increasing,
 * ae ≤ 0) gives an empty list. The caller's arrays are not modified.
 * @param input.d_m distances along the profile (m), strictly increasing; d_m[0] is the transmitter
 * @param input.h_m terrain heights amsl at those distances (m)
 * @param input.hts_m transmitting antenna height amsl (m), at d_m[0]
 * @param input.hrs_m receiving antenna height amsl (m), at the last distance
 * @param input.ae_m effective Earth radius (m); Infinity for a flat Earth
 * @returns candidates sorted by distance
 */
export function reflectionPoints(input: {
  d_m: readonly number[];
  h_m: readonly number[];
  hts_m: number;
  hrs_m: number;
  ae_m: number;
}): SpecularPoint[] {
  const { d_m, h_m, hts_m, hrs_m, ae_m } = input;
  const n = d_m.length;
  if (!isValidProfile(d_m, h_m) || !Number.isFinite(hts_m) || !Number.isFinite(hrs_m) || !(ae_m > 0)) return [];

  // Step 1: effective-Earth frame
  const D = d_m[n - 1] - d_m[0];
  const x: number[] = new Array(n);
  const z: number[] = new Array(n);
  for (let k = 0; k < n; k++) {
    x[k] = d_m[k] - d_m[0];
    z[k] = h_m[k] + earthBulgeM(x[k], D - x[k], ae_m); // P.452-17 eq. (14c)
  }
  // Step 2: sample slopes
  const slope: number[] = new Array(n);
  for (let k = 0; k < n; k++) {
    const a = Math.max(0, k - 1);
    const b = Math.min(n - 1, k + 1);
    slope[k] = (z[b] - z[a]) / (x[b] - x[a]);
  }
  const T = { x: 0, z: hts_m };
  const R = { x: D, z: hrs_m };

  /** Surface height, tangent elevation and the two grazing angles at x in segment i. */
  const at = (i: number, xp: number) => {
    const t = (xp - x[i]) / (x[i + 1] - x[i]);
    const zp = z[i] + t * (z[i + 1] - z[i]);
    const beta = Math.atan(slope[i] + t * (slope[i + 1] - slope[i]));
    const psiT = Math.atan2(T.z - zp, xp - T.x) + beta; // incidence, above the backward tangent
    const psiR = Math.atan2(R.z - zp, R.x - xp) - beta; // reflection, above the forward tangent
    return { zp, psiT, psiR, F: psiT - psiR };
  };

  // Visibility of each sample from each antenna (running horizon). The surface is linear
  // between samples and the slope of the sight line from an antenna to a point moving along a
  // segment is monotone, so a segment whose two ends are hidden from an antenna is hidden
  // everywhere: it cannot hold a usable reflection point and is skipped. This prunes the
  // search without changing its result (the blocking test of step 4 still decides).
  const seenT = new Uint8Array(n);
  const seenR = new Uint8Array(n);
  let maxT = -Infinity;
  for (let k = 1; k < n; k++) {
    const s = (z[k] - hts_m) / x[k];
    if (s >= maxT - 1e-12) seenT[k] = 1;
    if (s > maxT) maxT = s;
  }
  seenT[0] = 1;
  let maxR = -Infinity;
  for (let k = n - 2; k >= 0; k--) {
    const s = (z[k] - hrs_m) / (D - x[k]);
    if (s >= maxR - 1e-12) seenR[k] = 1;
    if (s > maxR) maxR = s;
  }
  seenR[n - 1] = 1;

  // Step 3: bracket and refine the zeros of F
  const roots: { i: number; x: number }[] = [];
  const tolX = 1e-9 * Math.max(1, D);
  for (let i = 0; i < n - 1; i++) {
    if (!(seenT[i] || seenT[i + 1]) || !(seenR[i] || seenR[i + 1])) continue;
    const xs = [x[i], (x[i] + x[i + 1]) / 2, x[i + 1]];
    for (let j = 0; j < 2; j++) {
      let lo = xs[j];
      let hi = xs[j + 1];
      let Flo = at(i, lo).F;
      const Fhi = at(i, hi).F;
      if (Flo === 0) {
        roots.push({ i, x: lo });
        continue;
      }
      if (i === n - 2 && j === 1 && Fhi === 0) roots.push({ i, x: hi });
      if (!(Flo * Fhi < 0)) continue;
      while (hi - lo > tolX) {
        const mid = (lo + hi) / 2;
        const Fm = at(i, mid).F;
        if (Fm === 0) {
          lo = hi = mid;
          break;
        }
        if (Fm * Flo > 0) {
          lo = mid;
          Flo = Fm;
        } else {
          hi = mid;
        }
      }
      roots.push({ i, x: (lo + hi) / 2 });
    }
  }

  // Steps 4–5: visibility and geometry
  const rDirect = Math.hypot(R.x - T.x, R.z - T.z);
  const out: SpecularPoint[] = [];
  for (const { i, x: px } of roots) {
    const prev = out[out.length - 1];
    if (prev !== undefined && Math.abs(prev.distance_m - (d_m[0] + px)) <= 10 * tolX) continue;
    const { zp, psiT, psiR } = at(i, px);
    if (!(psiT > 0) || !(psiR > 0)) continue;
    if (blocked(x, z, T.x, T.z, px, zp) || blocked(x, z, px, zp, R.x, R.z)) continue;
    const delta = Math.hypot(px - T.x, zp - T.z) + Math.hypot(R.x - px, R.z - zp) - rDirect;
    out.push({
      distance_m: d_m[0] + px,
      height_m: zp - earthBulgeM(px, D - px, ae_m),
      segment: i,
      grazing_angle_rad: (psiT + psiR) / 2, // angle of incidence = angle of reflection
      path_difference_m: delta,
      delay_ns: (delta / SPEED_OF_LIGHT_M_S) * 1e9,
    });
  }
  return out;
}

/**
 * True when a profile is usable by `reflectionPoints`: at least two samples, equal lengths,
 * finite values and strictly increasing distances.
 * @param d_m distances (m)
 * @param h_m heights (m)
 */
export function isValidProfile(d_m: readonly number[], h_m: readonly number[]): boolean {
  const n = d_m.length;
  if (n < 2 || h_m.length !== n) return false;
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(d_m[i]) || !Number.isFinite(h_m[i])) return false;
    if (i > 0 && !(d_m[i] > d_m[i - 1])) return false;
  }
  return true;
}

/** True when the terrain rises above the straight ray (x0,z0)→(x1,z1) at a sample strictly between. */
function blocked(x: readonly number[], z: readonly number[], x0: number, z0: number, x1: number, z1: number): boolean {
  for (let k = 0; k < x.length; k++) {
    if (x[k] <= x0 || x[k] >= x1) continue;
    const ray = z0 + ((z1 - z0) * (x[k] - x0)) / (x1 - x0);
    if (z[k] > ray + BLOCK_TOLERANCE_M) return true;
  }
  return false;
}
