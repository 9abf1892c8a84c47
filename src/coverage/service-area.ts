import { area as turfArea } from "@turf/area";
import { kinks } from "@turf/kinks";
import type { Feature, MultiPolygon, Polygon } from "geojson";
import { crsFromEpsg } from "../geo/crs-from-epsg.ts";
import { CoverageError } from "./coverage-error.ts";
import type { CoverageGrid } from "./coverage-grid.ts";

/** A service area: WGS84 polygons (rings of [lon, lat], outer ring first), its name and area. */
export interface ServiceArea {
  name: string;
  /** polygons, each a list of rings [lon, lat][] (first = outer, closed) */
  polygons: [number, number][][][];
  area_km2: number;
}

/**
 * Read a service-area polygon from GeoJSON (Polygon, MultiPolygon, Feature or
 * FeatureCollection of them) or KML (<Polygon> outer and inner boundaries) text, and check it
 * is a valid polygon: closed rings of at least four positions, longitudes −180…180, latitudes
 * −90…90, no self-intersection (Turf `kinks`), positive area.
 * @param text file contents
 * @param label how messages name the file
 * @throws CoverageError (field `service_area`) naming the file and what is wrong
 */
export function parseServiceArea(text: string, label: string): ServiceArea {
  const bad = (why: string): never => {
    const expected = "a GeoJSON or KML polygon: closed rings (first position repeated last, at least 4 positions) of longitude, latitude in degrees that do not cross themselves";
    throw new CoverageError(`service area ${label}: ${why}; expected ${expected}`, "service_area", { received: `${label}: ${why}`, expected });
  };
  let polygons: [number, number][][][] = [];
  let name = label;
  const t = text.trimStart();
  if (t.startsWith("<")) {
    const nm = /<name>([^<]*)<\/name>/.exec(t);
    if (nm) name = nm[1].trim();
    for (const pm of t.matchAll(/<Polygon[\s\S]*?<\/Polygon>/g)) {
      const rings: [number, number][][] = [];
      for (const b of pm[0].matchAll(/<(outerBoundaryIs|innerBoundaryIs)>[\s\S]*?<coordinates>([\s\S]*?)<\/coordinates>/g)) {
        const ring = b[2]
          .trim()
          .split(/\s+/)
          .map((tuple) => tuple.split(",").map(Number))
          .map((v) => [v[0], v[1]] as [number, number]);
        if (b[1] === "outerBoundaryIs") rings.unshift(ring);
        else rings.push(ring);
      }
      polygons.push(rings);
    }
    if (polygons.length === 0) bad("no <Polygon> with <coordinates> found");
  } else {
    let g: unknown;
    try {
      g = JSON.parse(text);
    } catch (e) {
      bad(`not valid JSON (${(e as Error).message})`);
    }
    const take = (geom: { type?: string; coordinates?: unknown } | null | undefined): void => {
      if (geom?.type === "Polygon") polygons.push(geom.coordinates as [number, number][][]);
      else if (geom?.type === "MultiPolygon") polygons.push(...(geom.coordinates as [number, number][][][]));
      else bad(`a ${geom?.type ?? "missing"} geometry where a Polygon or MultiPolygon is needed`);
    };
    const o = g as { type?: string; features?: { geometry?: { type?: string }; properties?: { name?: string } }[]; geometry?: { type?: string }; properties?: { name?: string } };
    if (o?.type === "FeatureCollection") {
      if (!Array.isArray(o.features) || o.features.length === 0) bad("an empty FeatureCollection");
      for (const f of o.features!) take(f.geometry);
      name = o.features![0].properties?.name ?? name;
    } else if (o?.type === "Feature") {
      take(o.geometry);
      name = o.properties?.name ?? name;
    } else take(o as { type?: string });
  }
  polygons = polygons.map((rings) => rings.map((ring) => ring.map((p) => [Number(p[0]), Number(p[1])] as [number, number])));
  for (const [i, rings] of polygons.entries()) {
    if (!Array.isArray(rings) || rings.length === 0) bad(`polygon ${i + 1} has no rings`);
    for (const [j, ring] of rings.entries()) {
      const where = `polygon ${i + 1}, ring ${j + 1}`;
      if (!Array.isArray(ring) || ring.length < 4) bad(`${where} has ${Array.isArray(ring) ? ring.length : 0} positions (a closed ring needs at least 4)`);
      for (const [k, p] of ring.entries()) {
        if (!(Math.abs(p[0]) <= 180 && Math.abs(p[1]) <= 90)) bad(`${where}, position ${k + 1} (${p[0]}, ${p[1]}) is not a longitude, latitude in degrees`);
      }
      const a = ring[0];
      const b = ring[ring.length - 1];
      if (a[0] !== b[0] || a[1] !== b[1]) bad(`${where} is not closed (first position ${a.join(", ")}, last ${b.join(", ")})`);
    }
    const feature: Feature<Polygon> = { type: "Feature", properties: {}, geometry: { type: "Polygon", coordinates: rings } };
    const k = kinks(feature);
    if (k.features.length > 0) {
      const [x, y] = k.features[0].geometry.coordinates;
      bad(`polygon ${i + 1} crosses itself near ${y.toFixed(5)}, ${x.toFixed(5)}`);
    }
  }
  const mp: Feature<MultiPolygon> = { type: "Feature", properties: {}, geometry: { type: "MultiPolygon", coordinates: polygons } };
  const area_km2 = turfArea(mp) / 1e6;
  if (!(area_km2 > 0)) bad("its area is zero");
  return { name, polygons, area_km2 };
}

/**
 * Which cells of a coverage grid have their centre inside the service area: the polygons'
 * vertices are taken to the grid's CRS and filled row by row (even–odd rule, so holes stay
 * out). Edges are straight in the grid's CRS.
 * @returns Uint8 mask (1 inside), row-major
 */
export function serviceAreaMask(sa: ServiceArea, grid: Pick<CoverageGrid, "epsg" | "geoTransform" | "width" | "height">): Uint8Array {
  const { width: W, height: H } = grid;
  const [x0, dx, , y0, , dy] = grid.geoTransform;
  const crs = crsFromEpsg(grid.epsg)!;
  const mask = new Uint8Array(W * H);
  const edges: [number, number, number, number][] = [];
  for (const rings of sa.polygons) {
    for (const ring of rings) {
      const px = ring.map(([lon, lat]) => {
        const [x, y] = crs.geographic ? [lon, lat] : crs.toCrs(lat, lon);
        return [(x - x0) / dx - 0.5, (y - y0) / dy - 0.5] as [number, number];
      });
      for (let i = 0; i + 1 < px.length; i++) edges.push([px[i][0], px[i][1], px[i + 1][0], px[i + 1][1]]);
    }
  }
  const xs: number[] = [];
  for (let r = 0; r < H; r++) {
    xs.length = 0;
    for (const [ax, ay, bx, by] of edges) {
      if (ay <= r === by <= r) continue; // edge does not cross the row's centre line
      xs.push(ax + ((r - ay) * (bx - ax)) / (by - ay));
    }
    xs.sort((a, b) => a - b);
    for (let i = 0; i + 1 < xs.length; i += 2) {
      const c0 = Math.max(0, Math.ceil(xs[i]));
      const c1 = Math.min(W - 1, Math.floor(xs[i + 1]));
      for (let c = c0; c <= c1; c++) mask[r * W + c] = 1;
    }
  }
  return mask;
}
