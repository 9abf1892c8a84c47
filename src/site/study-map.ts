import type { GeoProjection } from "d3-geo";
import type { AnalyzedStudy } from "../analysis/analyze-study.ts";
import { widened, type LatLonBox } from "../cache/terrain-extent.ts";
import { shadedRelief, TINT_STOPS } from "../render/raster/elevation-tint.ts";
import { hillshade } from "../render/raster/hillshade.ts";
import { projectedElevationGrid } from "../render/raster/projected-grid.ts";
import { rgbaPngDataUri } from "../render/raster/rgba-png.ts";
import { fitMapProjection, mapHeightFor } from "../render/svg/map-projection.ts";
import { overviewMapSvg, type MapBackdrop, type MapSite } from "../render/svg/overview-map.ts";
import { mapEntries } from "./interference-report.ts";

const MAP_W = 880;
/** Map pixels per hillshade cell: the image is drawn at 1.5× its cell size, smooth and small. */
const SHADE_STEP_PX = 1.5;

const cache = new WeakMap<AnalyzedStudy, Promise<string>>();

/**
 * The study's overview map (SVG string): sites and links in a transverse Mercator projection
 * fitted to the sites, over a hillshade of the study's own terrain (sun from 315° at 45°)
 * sampled on the map's pixel grid. Computed once per analysed study.
 */
export function studyMapSvg(s: AnalyzedStudy): Promise<string> {
  let p = cache.get(s);
  if (!p) {
    p = drawMap(s);
    cache.set(s, p);
  }
  return p;
}

async function drawMap(s: AnalyzedStudy): Promise<string> {
  const sites: MapSite[] = s.result.sites.map((x) => ({ id: x.id, name: x.name, lat_deg: x.lat_deg, lon_deg: x.lon_deg }));
  const byId = new Map(sites.map((x) => [x.id, x]));
  const MAP_H = mapHeightFor(sites, MAP_W, 56, [440, 720]);
  const projection = fitMapProjection(sites, MAP_W, MAP_H, 56);
  let backdrop: MapBackdrop | undefined;
  if (!("constant_m" in s.study.terrain)) {
    // The relief grid only depends on the terrain and the map frame: keep it in the result
    // cache so that a rebuild with unchanged sites does not open the terrain at all.
    const modules = [import.meta.url, new URL("../render/raster/projected-grid.ts", import.meta.url).href, new URL("../render/svg/map-projection.ts", import.meta.url).href];
    const stored = await s.remember(
      "study-map-relief",
      { sites, MAP_W, MAP_H, SHADE_STEP_PX },
      modules,
      (terrain) => {
        const g = projectedElevationGrid((lat, lon) => terrain.elevation(lat, lon), projection, MAP_W, MAP_H, SHADE_STEP_PX);
        return { ...g, z: Array.from(g.z, (v) => (Number.isFinite(v) ? v : null)) };
      },
      [frameExtent(projection, MAP_W, MAP_H)], // the relief reads the whole frame, beyond the sites
    );
    const grid = { ...stored, z: Float64Array.from(stored.z, (v) => (v === null ? NaN : v)) };
    const { shade, valid } = hillshade(grid.z, grid.width, grid.height, { dx_m: grid.dx_m, dy_m: grid.dy_m, azimuth_deg: 315, altitude_deg: 45 });
    let lo = Infinity;
    let hi = -Infinity;
    grid.z.forEach((v, i) => {
      if (valid[i]) {
        lo = Math.min(lo, v);
        hi = Math.max(hi, v);
      }
    });
    if (Number.isFinite(lo)) {
      const href = await rgbaPngDataUri(shadedRelief(grid.z, shade, valid, lo, hi), grid.width, grid.height);
      const what = s.result.terrain.synthetic ? "synthetic terrain" : "terrain";
      backdrop = { href, label: `Shaded relief of the ${what}, ${Math.round(lo)}–${Math.round(hi)} m`, ramp: TINT_STOPS.map(([r, g, b]) => `rgb(${r},${g},${b})`) };
    }
  }
  return overviewMapSvg({
    id: `map-${s.study.id}`,
    title: `Overview map of ${s.result.title}`,
    sites,
    links: s.result.links.map((l) => ({ id: l.id, from: byId.get(l.from)!, to: byId.get(l.to)!, met: l.target_met })),
    projection,
    width: MAP_W,
    height: MAP_H,
    backdrop,
    interference: s.result.interference
      ? mapEntries(s.result.interference).map((e) => ({
          from: byId.get(e.transmitter_site)!,
          to: byId.get(e.receiver_site)!,
          failing: !e.met,
          label: `${e.transmitter} into ${e.receiver}: ${e.met ? "within the limits" : "over the limit"}`,
        }))
      : undefined,
  });
}

/**
 * The latitude/longitude box of the map's frame: the inverse projection along its border
 * (16 points a side; a transverse Mercator frame's extremes lie on its border), widened by
 * terrain-extent.ts's margin.
 */
function frameExtent(projection: GeoProjection, width: number, height: number): LatLonBox {
  const pts: [number, number][] = [];
  for (let i = 0; i <= 16; i++) {
    const fx = (width * i) / 16;
    const fy = (height * i) / 16;
    pts.push([fx, 0], [fx, height], [0, fy], [width, fy]);
  }
  const ll = pts.map((p) => projection.invert!(p) as [number, number]);
  return widened({ lat_min: Math.min(...ll.map((q) => q[1])), lat_max: Math.max(...ll.map((q) => q[1])), lon_min: Math.min(...ll.map((q) => q[0])), lon_max: Math.max(...ll.map((q) => q[0])) });
}
