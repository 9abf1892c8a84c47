import { bilinearGrid } from "./bilinear-grid.ts";
import { crsFromEpsg, type Crs } from "../geo/crs-from-epsg.ts";
import { metresPerDegree } from "./metres-per-degree.ts";
import type { RasterGrid, Terrain } from "./terrain.ts";
import { TerrainError } from "./terrain-error.ts";

/** What a single-raster terrain needs besides its grid. */
export interface RasterTerrainOptions {
  kind: Terrain["kind"];
  description: string;
  synthetic: boolean;
  /** Short name of the data for messages, e.g. "dem/alps.tif" or "the synthetic terrain". */
  label: string;
  /** sha256 hex of the file bytes or the generating parameters. */
  fingerprint: string;
}

/**
 * Build the RasterGrid for a row-major grid in EPSG:4326 or a WGS84 UTM zone.
 * Throws TerrainError for any other EPSG code.
 */
export function makeRasterGrid(
  width: number,
  height: number,
  geoTransform: RasterGrid["geoTransform"],
  epsg: number,
  data: Float32Array,
  path?: string,
): RasterGrid {
  const crs = crsFromEpsg(epsg);
  if (crs === null) {
    throw new TerrainError(
      `${path ?? "raster"}: coordinate reference system EPSG:${epsg} is not supported; ` +
        "expected EPSG:4326 or a WGS84 UTM zone (EPSG:32601–32660, 32701–32760). " +
        "Reproject it, e.g. gdalwarp -t_srs EPSG:4326 in.tif out.tif",
      { path, hint: "reproject the DEM to EPSG:4326 or a WGS84 UTM zone" },
    );
  }
  return { width, height, geoTransform, epsg, data, toCrs: crs.toCrs, fromCrs: crs.fromCrs };
}

/**
 * A terrain backed by one raster (GeoTIFF, synthetic grid): bilinear interpolation between
 * pixel centres (see bilinear-grid.ts), NaN outside the raster extent.
 */
export class RasterTerrain implements Terrain {
  readonly kind: Terrain["kind"];
  readonly description: string;
  readonly synthetic: boolean;
  readonly raster: RasterGrid;
  private readonly crs: Crs;
  private readonly label: string;
  private readonly hash: string;
  // Inverse geotransform: col = (x − x0)/dx − 0.5, row = (y − y0)/dy − 0.5 (pixel-centre coordinates).
  private readonly x0: number;
  private readonly dx: number;
  private readonly y0: number;
  private readonly dy: number;

  constructor(raster: RasterGrid, options: RasterTerrainOptions) {
    const [x0, dx, rx, y0, ry, dy] = raster.geoTransform;
    if (rx !== 0 || ry !== 0) {
      throw new TerrainError(
        `${options.label}: rotated or sheared rasters are not supported (geotransform ${raster.geoTransform.join(", ")}); ` +
          "warp it to a north-up grid, e.g. gdalwarp in.tif out.tif",
        { hint: "warp the DEM to a north-up grid" },
      );
    }
    this.kind = options.kind;
    this.description = options.description;
    this.synthetic = options.synthetic;
    this.raster = raster;
    this.crs = crsFromEpsg(raster.epsg)!;
    this.label = options.label;
    this.hash = options.fingerprint;
    this.x0 = x0;
    this.dx = dx;
    this.y0 = y0;
    this.dy = dy;
  }

  resolutionM(lat_deg: number): number {
    const dx = Math.abs(this.dx);
    const dy = Math.abs(this.dy);
    if (!this.crs.geographic) return Math.max(dx, dy);
    const [ns, ew] = metresPerDegree(lat_deg);
    return Math.max(dy * ns, dx * ew);
  }

  elevation(lat_deg: number, lon_deg: number): number {
    let x = lon_deg;
    let y = lat_deg;
    if (!this.crs.geographic) [x, y] = this.crs.toCrs(lat_deg, lon_deg);
    const { width, height, data } = this.raster;
    return bilinearGrid(data, width, height, (x - this.x0) / this.dx - 0.5, (y - this.y0) / this.dy - 0.5);
  }

  sample(lat_deg: ArrayLike<number>, lon_deg: ArrayLike<number>): { h_m: Float64Array; voidFilled: number; outside: number } {
    const n = Math.min(lat_deg.length, lon_deg.length);
    const h_m = new Float64Array(n);
    const { width, height, data } = this.raster;
    const { x0, dx, y0, dy } = this;
    const geographic = this.crs.geographic;
    let outside = 0;
    for (let i = 0; i < n; i++) {
      let x = lon_deg[i];
      let y = lat_deg[i];
      if (!geographic) [x, y] = this.crs.toCrs(y, x);
      const h = bilinearGrid(data, width, height, (x - x0) / dx - 0.5, (y - y0) / dy - 0.5);
      h_m[i] = h;
      if (h !== h) outside++;
    }
    return { h_m, voidFilled: 0, outside };
  }

  whyOutside(lat_deg: number, lon_deg: number): string | null {
    const where = `${lat_deg.toFixed(5)}, ${lon_deg.toFixed(5)}`;
    if (!Number.isFinite(lat_deg) || !Number.isFinite(lon_deg) || Math.abs(lat_deg) > 90) {
      return `point (${lat_deg}, ${lon_deg}) is not a valid WGS84 latitude/longitude`;
    }
    if (!Number.isNaN(this.elevation(lat_deg, lon_deg))) return null;
    const { width, height } = this.raster;
    const xa = this.x0;
    const xb = this.x0 + width * this.dx;
    const ya = this.y0;
    const yb = this.y0 + height * this.dy;
    const [x, y] = this.crs.toCrs(lat_deg, lon_deg);
    const inside = x >= Math.min(xa, xb) && x <= Math.max(xa, xb) && y >= Math.min(ya, yb) && y <= Math.max(ya, yb);
    if (inside) return `point ${where} falls on nodata cells of ${this.label}; fill the gaps in the DEM or choose another terrain source`;
    const extent = this.crs.geographic
      ? `lat ${fmt(Math.min(ya, yb))}…${fmt(Math.max(ya, yb))}, lon ${fmt(Math.min(xa, xb))}…${fmt(Math.max(xa, xb))}`
      : `x ${fmt(Math.min(xa, xb))}…${fmt(Math.max(xa, xb))} m, y ${fmt(Math.min(ya, yb))}…${fmt(Math.max(ya, yb))} m in ${this.crs.name}`;
    return `point ${where} is outside ${this.label}, which covers ${extent}; use a DEM that covers it or choose another terrain source`;
  }

  fingerprint(): string {
    return this.hash;
  }
}

function fmt(v: number): string {
  return String(Number(v.toFixed(6)));
}
