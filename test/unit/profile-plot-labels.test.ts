import { describe, expect, it } from "vitest";
import { crossesPolyline, placeLabel, type Box } from "../../src/render/svg/label-placement.ts";
import { profilePlotSvg } from "../../src/render/svg/profile-plot.ts";

// Profile figures (issue 18 §6): labels kept off the drawn lines, obstructions marked, and a
// detail panel when a blockage of metres would vanish on an axis of hundreds of metres.

describe("crossesPolyline", () => {
  const line = [[0, 0], [100, 100]] as const;
  it.each([
    [{ x: 40, y: 40, w: 20, h: 5 }, true],
    [{ x: 40, y: 70, w: 10, h: 5 }, false],
    [{ x: 200, y: 0, w: 10, h: 10 }, false],
    [{ x: 45, y: 46, w: 2, h: 2 }, true], // between vertices: interpolated at the box edges
  ] as [Box, boolean][])("%j → %s", (box, hit) => expect(crossesPolyline(box, line)).toBe(hit));
  it("placeLabel prefers a candidate clear of the lines", () => {
    const frame = { x: 0, y: 0, w: 200, h: 200 };
    const cands = [{ x: 40, y: 40, w: 20, h: 5 }, { x: 40, y: 80, w: 20, h: 5 }];
    expect(placeLabel(cands, [], frame, [line])).toBe(1);
    expect(placeLabel(cands, [], frame)).toBe(0);
  });
});

/** A 10 km path climbing 700 m whose ridge near the far end rises 3.5 m into the ray. */
function blockedPath() {
  const n = 201;
  const D = 10_000;
  const d_m = Array.from({ length: n }, (_, i) => (i * D) / (n - 1));
  const ray = (d: number) => 360 + (700 * d) / D;
  const terrain_m = d_m.map((d) => (Math.abs(d - 9500) < 150 ? ray(d) + 3.5 - Math.abs(d - 9500) / 20 : ray(d) - 60 - 20 * Math.sin(d / 700)));
  return { d_m, terrain_m, ray };
}

describe("profilePlotSvg on an obstructed path", () => {
  const { d_m, terrain_m } = blockedPath();
  const svg = profilePlotSvg({
    id: "t",
    title: "t",
    d_m,
    terrain_m,
    obstruction_m: d_m.map(() => 0),
    from: { name: "West", ground_m: 340, antenna_m: 20 },
    to: { name: "East", ground_m: 1050, antenna_m: 10 },
    lambda_m: 0.016,
    ks: [{ label: "4/3", ae_m: Infinity, worst: { at_distance_m: 9500, clearance_f1: -1.5 } }],
  });
  it("regression: a clear path's detail panel draws no empty path (d=\"null\" was a console error)", () => {
    const clear = profilePlotSvg({
      id: "c",
      title: "c",
      d_m,
      terrain_m: d_m.map((d) => 300 + 200 * Math.sin(d / 3000)),
      obstruction_m: d_m.map(() => 0),
      from: { name: "West", ground_m: 300, antenna_m: 30 },
      to: { name: "East", ground_m: 1100, antenna_m: 30 },
      lambda_m: 0.016,
      ks: [{ label: "4/3", ae_m: Infinity, worst: { at_distance_m: 2000, clearance_f1: 3 } }],
    });
    expect(clear).not.toMatch(/d="null"|d=""/);
  });
  it("regression: a 3.5 m blockage on a 700 m axis is marked and shown in a detail panel", () => {
    expect(svg).toMatch(/class="blocked"/);
    expect(svg).toMatch(/class="blocked-mark"/);
    expect(svg).toMatch(/class="detail"/);
    expect(svg).toMatch(/Detail at 9\.50 km, heights from the line of sight/);
    expect(svg).toMatch(/Obstructs the line of sight at k = 4\/3/);
  });
  it("regression: the clearance label does not print over the line of sight", () => {
    const m = /<g class="worst[^"]*"><line x1="([\d.]+)"[^>]*\/>.*?<text class="halo" x="([\d.]+)" y="([\d.]+)"[^>]*>([^<]+)<\/text>/.exec(svg)!;
    expect(m).toBeTruthy();
    const ray = /<line class="ray" x1="([\d.]+)" y1="([\d.]+)" x2="([\d.]+)" y2="([\d.]+)"/.exec(svg)!.slice(1).map(Number);
    const [cx, by] = [Number(m[2]), Number(m[3])];
    const w = m[4].length * 11 * 0.6 + 4;
    const box = { x: cx - w / 2, y: by - 10, w, h: 13 };
    expect(crossesPolyline(box, [[ray[0], ray[1]], [ray[2], ray[3]]])).toBe(false);
  });
});
