/**
 * A source of ground elevation (m above mean sea level) at WGS84 latitude/longitude.
 * Implementations: SRTM .hgt tiles (hgt.ts), GeoTIFF DEMs (geotiff.ts), a constant
 * height (constant.ts) and seeded synthetic demo terrain (synthetic.ts).
 */
export interface Terrain {
  readonly kind: "hgt" | "geotiff" | "constant" | "synthetic";
  /** e.g. "SRTM 1″ tiles in dem/ (2 tiles)", "synthetic (seed 7) — not real terrain" */
  readonly description: string;
  readonly synthetic: boolean;
  /** Native sample spacing (m) at latitude lat; Infinity for constant. */
  resolutionM(lat_deg: number): number;
  /** Bilinear elevation (m amsl) at WGS84 lat/lon (deg); NaN outside the data. */
  elevation(lat_deg: number, lon_deg: number): number;
  /**
   * Sample many points; returns new arrays. voidFilled counts samples whose bilinear
   * cell touched a filled void; outside counts samples that came back NaN.
   */
  sample(
    lat_deg: ArrayLike<number>,
    lon_deg: ArrayLike<number>,
  ): { h_m: Float64Array; voidFilled: number; outside: number };
  /** null when inside; otherwise a sentence naming the missing tile or the extent. */
  whyOutside(lat_deg: number, lon_deg: number): string | null;
  /** sha256 (hex) over the bytes of every file this terrain reads (or its parameters) — for caching. */
  fingerprint(): string;
  /** For single-raster sources: the raster grid (for coverage maps on the DEM's own grid). */
  raster?: RasterGrid;
}

/** One georeferenced elevation raster. */
export interface RasterGrid {
  width: number;
  height: number;
  /** affine geotransform like GDAL: [x0, dx, 0, y0, 0, dy] in the CRS units (pixel-corner origin) */
  geoTransform: [number, number, number, number, number, number];
  /** 4326 or 326xx/327xx */
  epsg: number;
  /** row-major elevations (m), NaN for nodata */
  data: Float32Array;
  /** project lat/lon → CRS x,y and back */
  toCrs(lat_deg: number, lon_deg: number): [number, number];
  /** returns [lat, lon] */
  fromCrs(x: number, y: number): [number, number];
}
