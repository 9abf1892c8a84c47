import { createHash } from "node:crypto";
import { readFile } from "node:fs/promises";
import { fromArrayBuffer } from "geotiff";
import { makeRasterGrid, RasterTerrain } from "./raster-terrain.ts";
import type { RasterGrid } from "./terrain.ts";
import { TerrainError } from "./terrain-error.ts";

/** GeoTIFF GTRasterTypeGeoKey values (GeoTIFF 1.1, §7.4.2 / OGC 19-008r4). */
const RASTER_PIXEL_IS_POINT = 2;

/**
 * Open a GeoTIFF DEM (first band, elevations in metres) in EPSG:4326 or a WGS84 UTM zone
 * (EPSG:326zz / 327zz). The file is read once: its bytes are hashed for the fingerprint
 * and parsed with geotiff.js (`fromArrayBuffer`, one `readRasters` of band 1 into a
 * Float32Array).
 *
 * Georeferencing follows GDAL's reading of the same tags, so `raster.geoTransform` equals
 * what `gdalinfo` reports:
 * - ModelPixelScale + ModelTiepoint (any tiepoint pixel I, J), or a non-rotated
 *   ModelTransformation;
 * - PixelIsArea: the tiepoint is the corner of pixel (0, 0);
 *   PixelIsPoint: it is that pixel's centre, so the corner origin is shifted back by half a
 *   pixel (GDAL's default, GTIFF_POINT_GEO_IGNORE=FALSE).
 * - The GDAL_NODATA tag: samples equal to it become NaN (compared in the band's own type).
 * Scale/offset metadata and vertical datums are not applied.
 *
 * @param path file path (absolute or relative to the working directory)
 * @param options.label how messages name the file (default: the path)
 * @throws TerrainError when the file is missing, unreadable, not georeferenced or in another CRS
 */
export async function openGeoTiff(path: string, options: { label?: string } = {}): Promise<RasterTerrain> {
  const label = options.label ?? path;
  let bytes: Buffer;
  try {
    bytes = await readFile(path);
  } catch (e) {
    throw new TerrainError(
      `GeoTIFF ${label} could not be read (${(e as NodeJS.ErrnoException).code ?? (e as Error).message}); ` +
        "check the path in the study's terrain setting",
      { path, hint: "check the terrain path" },
      { cause: e },
    );
  }
  const fingerprint = createHash("sha256").update(bytes).digest("hex");
  const raster = await parseGeoTiff(bytes, path, label);
  const res = `${fmtRes(raster)}`;
  return new RasterTerrain(raster, {
    kind: "geotiff",
    description: `GeoTIFF ${label} (EPSG:${raster.epsg}, ${raster.width}×${raster.height}, ${res})`,
    synthetic: false,
    label,
    fingerprint,
  });
}

async function parseGeoTiff(bytes: Buffer, path: string, label: string): Promise<RasterGrid> {
  const fail = (what: string, hint: string, cause?: unknown): TerrainError =>
    new TerrainError(`GeoTIFF ${label}: ${what}; ${hint}`, { path, hint }, { cause });
  const ab =
    bytes.byteOffset === 0 && bytes.byteLength === bytes.buffer.byteLength
      ? (bytes.buffer as ArrayBuffer)
      : (bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength) as ArrayBuffer);
  let image;
  try {
    const tiff = await fromArrayBuffer(ab);
    image = await tiff.getImage(0);
  } catch (e) {
    throw fail(`not a readable TIFF (${(e as Error).message})`, "export the DEM as a GeoTIFF, e.g. gdal_translate -of GTiff in out.tif", e);
  }
  const width = image.getWidth();
  const height = image.getHeight();
  const keys = image.getGeoKeys() ?? {};
  const dir = image.fileDirectory;
  const scale = (await dir.loadValue("ModelPixelScale")) as number[] | undefined;
  const tie = (await dir.loadValue("ModelTiepoint")) as number[] | undefined;
  const mt = (await dir.loadValue("ModelTransformation")) as number[] | undefined;

  // --- Geotransform (pixel-corner origin, as GDAL) ---
  let gt: RasterGrid["geoTransform"];
  if (scale && tie && tie.length >= 6) {
    const [I, J, , X, Y] = tie;
    gt = [X - I * scale[0], scale[0], 0, Y + J * scale[1], 0, -scale[1]];
  } else if (mt && mt.length >= 8) {
    gt = [mt[3], mt[0], mt[1], mt[7], mt[4], mt[5]];
  } else {
    throw fail("no georeferencing (ModelPixelScale/ModelTiepoint or ModelTransformation tags)", "assign it, e.g. gdal_translate -a_srs EPSG:4326 -a_ullr ulx uly lrx lry in.tif out.tif");
  }
  if (keys.GTRasterTypeGeoKey === RASTER_PIXEL_IS_POINT) {
    gt[0] -= 0.5 * gt[1] + 0.5 * gt[2];
    gt[3] -= 0.5 * gt[4] + 0.5 * gt[5];
  }

  // --- CRS ---
  const model = keys.GTModelTypeGeoKey as number | undefined;
  const epsg = (model === 1 ? keys.ProjectedCSTypeGeoKey : model === 2 ? keys.GeographicTypeGeoKey : undefined) as number | undefined;
  if (epsg === undefined || epsg === 32767) {
    throw fail(
      `its coordinate reference system is ${model === undefined ? "missing" : "not given as an EPSG code"}`,
      "assign or reproject to EPSG:4326 or a WGS84 UTM zone, e.g. gdalwarp -t_srs EPSG:4326 in.tif out.tif",
    );
  }

  // --- Band 1 → Float32Array with NaN for nodata ---
  let band: ArrayLike<number>;
  try {
    const rasters = await image.readRasters({ samples: [0], interleave: false });
    band = (rasters as unknown as ArrayLike<number>[])[0];
  } catch (e) {
    throw fail(`its pixels could not be decoded (${(e as Error).message})`, "rewrite it with gdal_translate -co COMPRESS=DEFLATE in.tif out.tif", e);
  }
  const data = band instanceof Float32Array ? new Float32Array(band) : Float32Array.from(band);
  const nodata = image.getGDALNoData();
  if (nodata !== null && !Number.isNaN(nodata)) {
    // Compare in the band's own type, as GDAL does (a float32 band stores fround(nodata)).
    const nd = band instanceof Float64Array ? nodata : Math.fround(nodata);
    for (let i = 0; i < data.length; i++) if (band[i] === nd) data[i] = NaN;
  }
  return makeRasterGrid(width, height, gt, epsg, data, path);
}

function fmtRes(r: RasterGrid): string {
  const dx = Math.abs(r.geoTransform[1]);
  return r.epsg === 4326 ? `${Number((dx * 3600).toPrecision(4))}″` : `${Number(dx.toPrecision(4))} m`;
}
