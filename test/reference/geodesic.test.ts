import { readFileSync } from "node:fs";
import { describe, it } from "vitest";
import { geodesicPath, normalizeAzimuthDeg } from "../../src/geo/geodesic-path.ts";
import { expectClose, parseCsv } from "../helpers/expect-close.ts";

// Reference: GeographicLib C++ GeodSolve 2.1.2 (test/fixtures/geodesic/README.md).
const rows = parseCsv(readFileSync(new URL("../fixtures/geodesic/inverse.csv", import.meta.url), "utf8"));

describe("geodesic path against GeographicLib GeodSolve", () => {
  it.each(rows)("$lat1_deg,$lon1_deg → $lat2_deg,$lon2_deg", (r) => {
    const p = geodesicPath(+r.lat1_deg, +r.lon1_deg, +r.lat2_deg, +r.lon2_deg, 1e9);
    expectClose(p.distance_m, +r.s12_m, { abs: 1e-3 }, r); // < 1 mm
    // 1e-9 deg of azimuth is ~0.2 mm of lateral offset at 10 000 km.
    expectClose(p.azimuth_from_deg, normalizeAzimuthDeg(+r.azi1_deg), { abs: 1e-9 }, r);
    expectClose(p.azimuth_to_deg, normalizeAzimuthDeg(+r.azi2_deg + 180), { abs: 1e-9 }, r);
  });

  it("samples end exactly at the sites with equal steps no longer than asked", () => {
    const p = geodesicPath(46.5, 7.2, 46.62, 7.41, 30);
    expectClose(p.d_m[p.d_m.length - 1], 20910.004966989, { abs: 1e-3 }, "last distance");
    expectClose(p.lat_deg[p.lat_deg.length - 1], 46.62, { abs: 0 }, "last lat");
    if (!(p.step_m <= 30)) throw new Error(`step ${p.step_m} > 30`);
    expectClose(p.d_m[1] - p.d_m[0], p.step_m, { abs: 1e-9 }, "step");
  });
});
