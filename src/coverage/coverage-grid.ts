import geographiclib from "geographiclib-geodesic";
import { utmEpsgFor } from "../geo/utm-zone.ts";
import { crsFromEpsg, type Crs } from "../geo/crs-from-epsg.ts";
import { metresPerDegree } from "../terrain/metres-per-degree.ts";
import type { Terrain } from "../terrain/terrain.ts";
import { formatNumber } from "../format/quantity.ts";
import { CoverageError } from "./coverage-error.ts";

const { Geodesic } = geographiclib as unknown as typeof import("geographiclib-geodesic");

/** Largest coverage raster computed (cells). */
export const MAX_COVERAGE_CELLS = 200_000_000;

/**
 * The raster a coverage is computed on: a north-up grid in EPSG:4326 or a WGS84 UTM zone,
 * with the ground metric the radial sweep needs. Everything here is plain numbers and typed
 * arrays (it is sent to the worker threads).
 */
export interface CoverageGrid {
  epsg: number;
  width: number;
  height: number;
  /** GDAL-style [x0, dx, 0, y0, 0, dy], pixel-corner origin, CRS units */
  geoTransform: [number, number, number, number, number, number];
  /** site in pixel-centre coordinates (col 0 = centre of the first column) */
  site_col: number;
  site_row: number;
  /**
   * Ground metres east per column step and north per row step, per row. Projected grids:
   * the CRS step divided by the point scale factor at the site (exact for the distances of
   * a transverse Mercator grid to about 1e-4 over 100 km). Geographic grids: metres per degree
   * at the latitude midway between the site and the row (the mid-latitude form of plane
   * sailing; see `distanceNote`).
   */
  east_per_col_m: Float64Array;
  north_per_row_m: Float64Array;
  /** ground area of one cell of each row (m²) */
  cell_area_m2: Float64Array;
  /** add to an azimuth measured from grid north to get the true azimuth (deg) */
  azimuth_offset_deg: number;
  /** the coverage radius (m) */
  radius_m: number;
  /** where the elevations come from: a window of the terrain's own raster, or resampled */
  source: { kind: "raster"; col0: number; row0: number } | { kind: "resample" };
  /** one sentence on how distances and radials are formed on this grid */
  distanceNote: string;
}

/**
 * Choose the grid of a coverage.
 * - Single-raster terrain (GeoTIFF, one .hgt tile, synthetic): that raster's own grid and CRS,
 *   cropped to the box holding the circle (and to the raster).
 * - Otherwise (a folder of .hgt tiles, constant height): a UTM grid of the site's zone with
 *   square cells of `resolution_m`, aligned to whole multiples of it, holding the circle.
 * @throws CoverageError when the site is off the terrain or the grid exceeds MAX_COVERAGE_CELLS
 */
export function planCoverageGrid(
  terrain: Terrain,
  site: { lat_deg: number; lon_deg: number },
  radius_m: number,
  resolution_m: number,
  options: { maxCells?: number } = {},
): { grid: CoverageGrid; warnings: string[] } {
  const maxCells = options.maxCells ?? MAX_COVERAGE_CELLS;
  const warnings: string[] = [];
  const why = terrain.whyOutside(site.lat_deg, site.lon_deg);
  if (why !== null) throw new CoverageError(`the site is not on the terrain: ${why}`, "site", { received: `${site.lat_deg}, ${site.lon_deg}`, expected: `a site on the terrain: ${why}` });
  const raster = terrain.raster;
  let epsg: number;
  let gt: CoverageGrid["geoTransform"];
  let col0 = 0;
  let row0 = 0;
  let width: number;
  let height: number;
  let crs: Crs;
  if (raster !== undefined) {
    epsg = raster.epsg;
    crs = crsFromEpsg(epsg)!;
    const [x0, dx, , y0, , dy] = raster.geoTransform;
    const [X, Y] = crs.toCrs(site.lat_deg, site.lon_deg);
    let halfX: number;
    let halfY: number;
    if (crs.geographic) {
      const [ns] = metresPerDegree(site.lat_deg);
      const dLat = radius_m / ns;
      const polewardLat = Math.min(89.9, Math.abs(site.lat_deg) + dLat);
      halfX = radius_m / metresPerDegree(polewardLat)[1];
      halfY = dLat;
    } else {
      const k = pointScale(crs, site.lat_deg, site.lon_deg);
      halfX = halfY = radius_m * k;
    }
    // cells whose centres may lie within the circle, plus one
    const ca = Math.floor((X - halfX - x0) / dx - 0.5) - 1;
    const cb = Math.ceil((X + halfX - x0) / dx - 0.5) + 1;
    const ra = Math.floor((Y - halfY - y0) / dy - 0.5) - 1;
    const rb = Math.ceil((Y + halfY - y0) / dy - 0.5) + 1;
    col0 = Math.max(0, Math.min(ca, cb));
    const col1 = Math.min(raster.width - 1, Math.max(ca, cb));
    row0 = Math.max(0, Math.min(ra, rb));
    const row1 = Math.min(raster.height - 1, Math.max(ra, rb));
    if (col0 > Math.min(ca, cb) + 1 || row0 > Math.min(ra, rb) + 1 || col1 < Math.max(ca, cb) - 1 || row1 < Math.max(ra, rb) - 1) {
      warnings.push("The terrain raster covers only part of the coverage circle; the coverage stops at its edge.");
    }
    width = col1 - col0 + 1;
    height = row1 - row0 + 1;
    checkCells(width, height, maxCells, `the terrain raster's own grid (${fmtCell(raster.geoTransform, crs)} cells)`);
    gt = [x0 + col0 * dx, dx, 0, y0 + row0 * dy, 0, dy];
    const native = crs.geographic ? Math.abs(dy) * metresPerDegree(site.lat_deg)[0] : Math.abs(dx);
    if (Math.abs(native - resolution_m) > 0.05 * native) {
      warnings.push(
        `The coverage lies on the terrain raster's own grid (${fmtCell(raster.geoTransform, crs)} cells, about ${native.toFixed(1)} m); the requested resolution of ${resolution_m} m is not used.`,
      );
    }
  } else {
    epsg = utmEpsgFor(site.lat_deg, site.lon_deg);
    crs = crsFromEpsg(epsg)!;
    const [X, Y] = crs.toCrs(site.lat_deg, site.lon_deg);
    const k = pointScale(crs, site.lat_deg, site.lon_deg);
    const res = resolution_m;
    const xa = Math.floor((X - radius_m * k) / res) * res;
    const xb = Math.ceil((X + radius_m * k) / res) * res;
    const ya = Math.floor((Y - radius_m * k) / res) * res;
    const yb = Math.ceil((Y + radius_m * k) / res) * res;
    width = Math.round((xb - xa) / res);
    height = Math.round((yb - ya) / res);
    checkCells(width, height, maxCells, `a ${res} m grid`);
    gt = [xa, res, 0, yb, 0, -res];
  }
  const [X, Y] = crs.toCrs(site.lat_deg, site.lon_deg);
  // A site meant to stand on a cell centre comes back from the projection round trip a few
  // 1e-11 cells off; snap it so that cell is the site's own.
  const snap = (v: number) => (Math.abs(v - Math.round(v)) < 1e-6 ? Math.round(v) : v);
  const site_col = snap((X - gt[0]) / gt[1] - 0.5);
  const site_row = snap((Y - gt[3]) / gt[5] - 0.5);
  const east = new Float64Array(height);
  const north = new Float64Array(height);
  const area = new Float64Array(height);
  let azimuth_offset_deg = 0;
  let distanceNote: string;
  if (crs.geographic) {
    for (let r = 0; r < height; r++) {
      const lat = gt[3] + (r + 0.5) * gt[5];
      const [nsMid, ewMid] = metresPerDegree((lat + site.lat_deg) / 2);
      east[r] = gt[1] * ewMid;
      north[r] = gt[5] * nsMid;
      const [ns, ew] = metresPerDegree(lat);
      area[r] = Math.abs(gt[1] * ew * gt[5] * ns);
    }
    distanceNote =
      `Radials run straight on the latitude/longitude grid; within this radius they depart from the geodesic by ${geodesicDepartureText(radius_m, site.lat_deg)}.`;
  } else {
    const k = pointScale(crs, site.lat_deg, site.lon_deg);
    east.fill(gt[1] / k);
    north.fill(gt[5] / k);
    area.fill(Math.abs((gt[1] * gt[5]) / (k * k)));
    azimuth_offset_deg = -gridBearingOfTrueNorth(crs, site.lat_deg, site.lon_deg);
    distanceNote = `Radials are straight lines on the ${crs.name} grid; distances are grid distances divided by the point scale factor at the site (${k.toFixed(6)}).`;
  }
  return {
    grid: {
      epsg,
      width,
      height,
      geoTransform: gt,
      site_col,
      site_row,
      east_per_col_m: east,
      north_per_row_m: north,
      cell_area_m2: area,
      azimuth_offset_deg,
      radius_m,
      source: raster !== undefined ? { kind: "raster", col0, row0 } : { kind: "resample" },
      distanceNote,
    },
    warnings,
  };
}

/** Point scale factor of a projected CRS at a point: grid length of a 1 km geodesic step / 1 km (conformal, so any azimuth). */
export function pointScale(crs: Crs, lat_deg: number, lon_deg: number): number {
  const p = Geodesic.WGS84.Direct(lat_deg, lon_deg, 90, 1000);
  const [x0, y0] = crs.toCrs(lat_deg, lon_deg);
  const [x1, y1] = crs.toCrs(p.lat2!, p.lon2!);
  return Math.hypot(x1 - x0, y1 - y0) / 1000;
}

/** Grid bearing (deg, clockwise from grid north) of true north at a point. */
function gridBearingOfTrueNorth(crs: Crs, lat_deg: number, lon_deg: number): number {
  const p = Geodesic.WGS84.Direct(lat_deg, lon_deg, 0, 100);
  const [x0, y0] = crs.toCrs(lat_deg, lon_deg);
  const [x1, y1] = crs.toCrs(p.lat2!, p.lon2!);
  return (Math.atan2(x1 - x0, y1 - y0) * 180) / Math.PI;
}

function checkCells(width: number, height: number, maxCells: number, what: string): void {
  const cells = width * height;
  if (!(cells <= maxCells)) {
    const expected = `at most ${maxCells / 1e6} M cells; reduce the radius or coarsen the resolution (cells grow with (2·radius/resolution)²)`;
    throw new CoverageError(`the coverage needs ${width} × ${height} = ${(cells / 1e6).toFixed(1)} M cells on ${what}, more than the limit of ${maxCells / 1e6} M; reduce the radius or coarsen the resolution (cells grow with (2·radius/resolution)²)`, "radius_km", {
      received: `a request of ${width} × ${height} = ${(cells / 1e6).toFixed(1)} M cells on ${what}`,
      expected,
    });
  }
}

function fmtCell(gt: readonly number[], crs: Crs): string {
  return crs.geographic ? `${Number((Math.abs(gt[1]) * 3600).toPrecision(4))}″` : `${Number(Math.abs(gt[1]).toPrecision(4))} m`;
}

/** Centre of cell (col, row) of a grid in WGS84 [lat, lon] (deg). */
export function cellCentreLatLon(grid: Pick<CoverageGrid, "epsg" | "geoTransform">, col: number, row: number): [number, number] {
  const gt = grid.geoTransform;
  const crs = crsFromEpsg(grid.epsg)!;
  return crs.fromCrs(gt[0] + (col + 0.5) * gt[1], gt[3] + (row + 0.5) * gt[5]);
}

/**
 * How far a straight radial on the latitude/longitude grid departs from the geodesic at the
 * coverage radius: about d²·tan(lat)/(8·6371 km) (small-angle estimate of the rhumb/geodesic
 * separation, from memory, within ~10 % below 60°), as text for the report.
 */
function geodesicDepartureText(radius_m: number, lat_deg: number): string {
  const dev_m = (radius_m * radius_m * Math.abs(Math.tan((lat_deg * Math.PI) / 180))) / (8 * 6_371_000);
  return dev_m < 1 ? "less than 1 m" : `about ${formatNumber(dev_m, 0)} m`;
}
