import { contours } from "d3-contour";
import { crsFromEpsg } from "./crs-from-epsg.ts";

/** A GeoJSON (RFC 7946) feature collection of threshold regions. */
export interface IsobandCollection {
  type: "FeatureCollection";
  features: {
    type: "Feature";
    properties: Record<string, unknown>;
    geometry: { type: "MultiPolygon"; coordinates: number[][][][] };
  }[];
}

export interface IsobandOptions {
  /** ascending thresholds; one feature per threshold: the region where value ≥ threshold */
  thresholds: number[];
  /** properties of each feature (same order as thresholds) */
  properties: Record<string, unknown>[];
  /** trace on at most this many cells per side (every s-th cell), default 1500 */
  maxSide?: number;
  /** values equal to this are outside the data */
  nodata: number;
}

/**
 * Regions where a raster is at or above each threshold, as GeoJSON MultiPolygons in WGS84
 * longitude/latitude (RFC 7946), traced by marching squares (d3-contour, linear interpolation
 * between cell centres; nodata counts as below every threshold).
 *
 * Large rasters are traced on every s-th cell (s = ceil(max(width, height)/maxSide)), which
 * keeps files small and smooths boundaries at the scale of s cells; `step_cells` in each
 * feature's properties records s. Vertices are converted from the grid's CRS (crsFromEpsg) and
 * rounded to 1e-6° (about 0.1 m).
 * @param geoTransform GDAL-style, pixel-corner origin
 * @param epsg 4326 or a WGS84 UTM zone
 */
export function isobandsGeoJson(
  values: ArrayLike<number>,
  width: number,
  height: number,
  geoTransform: readonly number[],
  epsg: number,
  options: IsobandOptions,
): IsobandCollection {
  const s = Math.max(1, Math.ceil(Math.max(width, height) / (options.maxSide ?? 1500)));
  const w = Math.ceil(width / s);
  const h = Math.ceil(height / s);
  const grid = new Float64Array(w * h);
  for (let r = 0; r < h; r++) {
    for (let c = 0; c < w; c++) {
      const v = values[r * s * width + c * s];
      grid[r * w + c] = v === options.nodata ? NaN : v;
    }
  }
  const crs = crsFromEpsg(epsg)!;
  const [x0, dx, , y0, , dy] = geoTransform;
  const round6 = (v: number) => Math.round(v * 1e6) / 1e6;
  const toLonLat = (p: number[]): number[] => {
    const [lat, lon] = crs.fromCrs(x0 + p[0] * s * dx, y0 + p[1] * s * dy);
    return [round6(lon), round6(lat)];
  };
  const gen = contours().size([w, h]);
  const features = options.thresholds.map((t, i) => {
    const mp = gen.contour(grid as unknown as number[], t);
    // Screen coordinates (y down) reverse the winding when y points north; reverse back so
    // exterior rings run counter-clockwise as RFC 7946 recommends.
    const coordinates = mp.coordinates.map((poly) => poly.map((ring) => ring.map(toLonLat).reverse()));
    return {
      type: "Feature" as const,
      properties: { ...options.properties[i], step_cells: s },
      geometry: { type: "MultiPolygon" as const, coordinates },
    };
  });
  return { type: "FeatureCollection", features };
}
