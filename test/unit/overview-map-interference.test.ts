import { describe, expect, it } from "vitest";
import { fitMapProjection } from "../../src/render/svg/map-projection.ts";
import { overviewMapSvg, type MapSite } from "../../src/render/svg/overview-map.ts";

const sites: MapSite[] = [
  { id: "A", name: "Alpha", lat_deg: -41.0, lon_deg: -32.3 },
  { id: "B", name: "Bravo", lat_deg: -41.1, lon_deg: -32.2 },
  { id: "C", name: "Charlie", lat_deg: -41.2, lon_deg: -32.35 },
];
const [A, B, C] = sites;
const W = 600;
const H = 500;
const draw = (interference: Parameters<typeof overviewMapSvg>[0]["interference"]) =>
  overviewMapSvg({ id: "m", title: "t", sites, links: [{ id: "a-b", from: A, to: B, met: true }], projection: fitMapProjection(sites, W, H, 56), width: W, height: H, interference });

describe("interference paths on the overview map", () => {
  it("draws one arrow per pair of sites, the failing one when a pair has both, heavier and named in its tooltip", () => {
    const svg = draw([
      { from: C, to: B, failing: false, label: "c-x go into a-b go: within the limits" },
      { from: C, to: B, failing: true, label: "c-y go into a-b go: over the limit" },
      { from: A, to: C, failing: false, label: "a-b go into c-x return: within the limits" },
    ]);
    expect(svg.match(/class="map-interference-path( failing)?" d=/g)).toHaveLength(2);
    expect(svg).toMatch(/class="map-interference-path failing" d="[^"]+" marker-end="url\(#m-arrow\)"><title>c-y go into a-b go: over the limit<\/title>/);
    expect(svg).toContain("Interference into a receiver");
  });
  it("draws nothing and no legend row without interference paths", () => {
    const svg = draw(undefined);
    expect(svg).not.toContain("map-interference");
    expect(svg).not.toContain("Interference into a receiver");
  });
});
