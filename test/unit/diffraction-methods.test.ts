import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { bullingtonLoss } from "../../src/physics/bullington.ts";
import { deltaBullingtonLoss } from "../../src/physics/delta-bullington.ts";
import { deygoutLoss } from "../../src/physics/deygout.ts";
import { DIFFRACTION_VALIDITY } from "../../src/physics/diffraction-validity.ts";
import { epsteinPetersonLoss } from "../../src/physics/epstein-peterson.ts";
import { fresnelKirchhoffNu, knifeEdgeLossExact } from "../../src/physics/knife-edge.ts";
import { singleKnifeEdgeLoss } from "../../src/physics/knife-edge-path.ts";
import type { DiffractionPath } from "../../src/physics/profile.ts";
import { expectClose, parseCsv } from "../helpers/expect-close.ts";

/**
 * Two-edge path worked by hand: Tx (0 m, 10 m) and Rx (20 km, 10 m); edge A at 6 km, 40 m;
 * edge B at 13 km, 35 m; ground at −50 m elsewhere (0 m under the antennas); λ = 0.3 m.
 */
function twoEdgePath(ae_m: number): DiffractionPath {
  const n = 41;
  const d = Float64Array.from({ length: n }, (_, i) => i * 500);
  const h = Float64Array.from({ length: n }, (_, i) => (i === 0 || i === n - 1 ? 0 : -50));
  h[12] = 40; // A, 6000 m
  h[26] = 35; // B, 13000 m
  return { d_m: d, h_m: h, hts_m: 10, hrs_m: 10, frequency_ghz: 1, ae_m, lambda_m: 0.3 };
}

describe("multi-edge methods against the geometry worked by hand (flat Earth)", () => {
  const lambda = 0.3;
  const p = twoEdgePath(Infinity);
  // Over the Tx–Rx ray (10 m): A is 30 m above at 6/14 km, B 25 m above at 13/7 km.
  const nuA = fresnelKirchhoffNu(30, 6000, 14000, lambda);
  const nuB = fresnelKirchhoffNu(25, 13000, 7000, lambda);
  // B over the line A–Rx: 40 − 30·7/14 = 25 m there, so B is 10 m above, 7/7 km.
  const nuBoverA = fresnelKirchhoffNu(10, 7000, 7000, lambda);
  // A over the line Tx–B: 10 + 25·6/13 m there, 6/7 km.
  const nuAunderB = fresnelKirchhoffNu(40 - (10 + (25 * 6) / 13), 6000, 7000, lambda);

  it("A is the dominant edge", () => expect(nuA).toBeGreaterThan(nuB));

  it("single knife edge = J(ν_A)", () => {
    const r = singleKnifeEdgeLoss(p);
    expect(r.at_index).toBe(12);
    expectClose(r.nu, nuA, { abs: 1e-12 }, "ν");
    expectClose(r.loss_db, knifeEdgeLossExact(nuA), { abs: 1e-9 }, "loss");
  });

  it("Deygout = J(ν_A) + J(ν_B over A–Rx); no Tx-side edge", () => {
    const r = deygoutLoss(p);
    expect(r.main_index).toBe(12);
    expect(r.rx_side_index).toBe(26);
    expectClose(r.nu_rx_side, nuBoverA, { abs: 1e-12 }, "ν of B");
    expect(r.loss_tx_side_db).toBe(0);
    expectClose(r.loss_db, knifeEdgeLossExact(nuA) + knifeEdgeLossExact(nuBoverA), { abs: 1e-9 }, "total");
  });

  it("Epstein–Peterson = J(ν_A over Tx–B) + J(ν_B over A–Rx)", () => {
    const r = epsteinPetersonLoss(p);
    expect(r.edge_indices).toEqual([12, 26]);
    expectClose(r.edge_nu[0], nuAunderB, { abs: 1e-12 }, "ν of A");
    expectClose(r.edge_nu[1], nuBoverA, { abs: 1e-12 }, "ν of B");
    expectClose(r.loss_db, knifeEdgeLossExact(nuAunderB) + knifeEdgeLossExact(nuBoverA), { abs: 1e-9 }, "total");
  });

  it("Earth curvature adds the bulge d1·d2/(2·ae) to the edge height", () => {
    const ae = 8_500_000;
    const r = singleKnifeEdgeLoss(twoEdgePath(ae));
    const nu = fresnelKirchhoffNu(30 + (6000 * 14000) / (2 * ae), 6000, 14000, lambda);
    expectClose(r.nu, nu, { abs: 1e-12 }, "ν with bulge");
  });

  it("Bullington: the point where the Tx and Rx horizon lines cross (P.526-15 §4.5.1)", () => {
    // Flat Earth: Stim = (40 − 10)/6 m/km (A), Srim = (35 − 10)/7 m/km (B);
    // the lines cross at dbp = Srim·d/(Stim + Srim) km, height 10 + Stim·dbp.
    const Stim = 30 / 6;
    const Srim = 25 / 7;
    const dbp = (Srim * 20) / (Stim + Srim);
    const nuB = fresnelKirchhoffNu(Stim * dbp, dbp * 1000, (20 - dbp) * 1000, lambda);
    const r = bullingtonLoss(p);
    expect(r.los).toBe(false);
    expectClose(r.dbp_m, dbp * 1000, { abs: 1e-9 }, "dbp");
    expectClose(r.nu, nuB, { abs: 1e-12 }, "νb");
    const Luc = 6.9 + 20 * Math.log10(Math.sqrt((nuB - 0.1) ** 2 + 1) + nuB - 0.1);
    expectClose(r.Lbull, Luc + (1 - Math.exp(-Luc / 6)) * (10 + 0.02 * 20), { abs: 1e-9 }, "Lbull");
  });
});

describe("delta-Bullington structure and options", () => {
  // A 100 km smooth sea-level path: the actual and smooth profiles coincide (hts' = hts),
  // so Lbulla = Lbulls and Ld = max(Lbulla, Ldsph).
  const n = 201;
  const sea: DiffractionPath = {
    d_m: Float64Array.from({ length: n }, (_, i) => i * 500),
    h_m: new Float64Array(n),
    hts_m: 20,
    hrs_m: 20,
    frequency_ghz: 0.2,
    ae_m: 8_500_000,
  };

  it("on a smooth profile Ld = max(Lbulla, Ldsph) and hts' = hts", () => {
    const r = deltaBullingtonLoss(sea);
    expectClose(r.hts_prime_m, 20, { abs: 1e-9 }, "hts'");
    expectClose(r.Lbulla, r.Lbulls, { abs: 1e-12 }, "Lbulla vs Lbulls");
    expectClose(r.Ld, Math.max(r.Lbulla, r.Ldsph), { abs: 1e-12 }, "Ld");
    expect(r.spherical.transhorizon).toBe(true);
  });

  it("the sea fraction ω mixes the land and sea first-term losses linearly (P.452-17 §4.2.2.1)", () => {
    // Vertical polarisation, where sea (εr = 80, σ = 5 S/m) and land differ visibly.
    const land = deltaBullingtonLoss(sea, { omega: 0, polarization: "v" }).Ldsph;
    const water = deltaBullingtonLoss(sea, { omega: 1, polarization: "v" }).Ldsph;
    const half = deltaBullingtonLoss(sea, { omega: 0.5, polarization: "v" }).Ldsph;
    expect(Math.abs(land - water)).toBeGreaterThan(0.01);
    expectClose(half, (land + water) / 2, { abs: 1e-9 }, "ω = 0.5");
  });

  it("polarisation matters over sea at 200 MHz, hardly over land", () => {
    const seaH = deltaBullingtonLoss(sea, { omega: 1, polarization: "h" }).Ldsph;
    const seaV = deltaBullingtonLoss(sea, { omega: 1, polarization: "v" }).Ldsph;
    const landH = deltaBullingtonLoss(sea, { polarization: "h" }).Ldsph;
    const landV = deltaBullingtonLoss(sea, { polarization: "v" }).Ldsph;
    expect(Math.abs(seaH - seaV)).toBeGreaterThan(0.1);
    expect(Math.abs(seaH - seaV)).toBeGreaterThan(Math.abs(landH - landV));
  });

  it("an ω outside 0–1 gives NaN", () => {
    expect(deltaBullingtonLoss(sea, { omega: 1.5 }).Ld).toBeNaN();
  });
});

describe("validity table", () => {
  it("names a frequency and distance range and a source for every method", () => {
    for (const [name, v] of Object.entries(DIFFRACTION_VALIDITY)) {
      expect(v.frequency_ghz.min, name).toBeLessThan(v.frequency_ghz.max);
      expect(v.distance_m.min, name).toBeLessThan(v.distance_m.max);
      expect(v.source, name).toMatch(/P\.526-15|common practice/);
    }
  });
});

describe("speed", () => {
  it("every method gives a finite loss over 200 links on the ITU validation profiles (349–2648 samples); time printed", () => {
    const dir = new URL("../fixtures/itu/delta-bullington/", import.meta.url);
    const profiles = [1, 2, 3, 4].map((k) => {
      const rows = parseCsv(readFileSync(new URL(`itu_valid_path${k}.csv`, dir), "utf8"));
      return {
        d_m: Float64Array.from(rows, (r) => Number(r.distance_km) * 1000),
        h_m: Float64Array.from(rows, (r) => Number(r.height_m)),
      };
    });
    const t0 = performance.now();
    let sum = 0;
    for (let link = 0; link < 200; link++) {
      const p = profiles[link % 4];
      const path: DiffractionPath = {
        ...p,
        hts_m: p.h_m[0] + 10 + (link % 7) * 10,
        hrs_m: p.h_m[p.h_m.length - 1] + 10 + (link % 5) * 10,
        frequency_ghz: 0.1 + (link % 13),
        ae_m: 8_500_000,
      };
      sum += singleKnifeEdgeLoss(path).loss_db + deygoutLoss(path).loss_db + epsteinPetersonLoss(path).loss_db;
      sum += bullingtonLoss(path).Lbull + deltaBullingtonLoss(path).Ld;
    }
    const ms = performance.now() - t0;
    console.info(`diffraction: 200 links × 5 methods in ${ms.toFixed(1)} ms`);
    expect(Number.isFinite(sum)).toBe(true); // speed is measured by npm run bench, not asserted here
  });
});

describe("documented limits of the methods (behaviour of the published constructions, not defects)", () => {
  const mk = (len: number, h: number[], tx_agl: number, rx_agl: number, f: number): DiffractionPath => {
    const n = h.length;
    return {
      d_m: Float64Array.from({ length: n }, (_, i) => (len * i) / (n - 1)),
      h_m: Float64Array.from(h),
      hts_m: h[0] + tx_agl,
      hrs_m: h[n - 1] + rx_agl,
      frequency_ghz: f,
      ae_m: 8_500_000,
    };
  };
  const withHeight = (p: DiffractionPath, i: number, h: number): DiffractionPath => {
    const hh = Float64Array.from(p.h_m);
    hh[i] = h;
    return { ...p, h_m: hh };
  };

  it("Deygout: raising the main edge lowers its subsidiary edge's loss more than it raises its own", () => {
    // 2 km flat path, 5 m masts, 100 MHz: all three samples partly obstruct the Fresnel zone.
    const p = mk(2000, [0, 0, 0, 0, 0], 5, 5, 0.1);
    const before = deygoutLoss(p);
    const after = deygoutLoss(withHeight(p, 2, 1));
    expect(after.main_index).toBe(before.main_index);
    expect(after.loss_main_db).toBeGreaterThan(before.loss_main_db);
    expect(after.loss_db).toBeLessThan(before.loss_db - 0.1);
  });

  it("Epstein–Peterson: a second edge next to the first splits its sub-path and lowers the total", () => {
    // 20 km flat path, 10 m masts, 1 GHz; a 100 m edge at 10 km; a second sample 200 m
    // beyond it rises to 99.5 m and joins the string.
    const h = Array.from({ length: 101 }, (_, i) => (i === 50 ? 100 : 0));
    const p = mk(20_000, h, 10, 10, 1);
    const one = epsteinPetersonLoss(p);
    const two = epsteinPetersonLoss(withHeight(p, 51, 99.5));
    expect(one.edge_indices).toEqual([50]);
    expect(two.edge_indices).toEqual([50, 51]);
    expect(two.loss_db).toBeLessThan(one.loss_db - 5);
  });

  it("delta-Bullington: raising ground near the Tx lowers the smooth-Earth surface there and can lower Ld", () => {
    // 70 km, Tx at the foot of a 200 m escarpment; raising its edge by 100 m moves the
    // smooth-Earth surface (hobs, αobt) so that hts' grows and Ldsph − Lbulls shrinks.
    const p = mk(70_000, [0, 200, 200, 230, 200], 10, 10, 2.5);
    const before = deltaBullingtonLoss(p);
    const after = deltaBullingtonLoss(withHeight(p, 1, 300));
    expect(after.Lbulla).toBeGreaterThanOrEqual(before.Lbulla);
    expect(after.hts_prime_m).toBeGreaterThan(before.hts_prime_m);
    expect(after.Ld).toBeLessThan(before.Ld - 10);
  });
});
