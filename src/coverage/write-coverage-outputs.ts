import { elevationsFloat32 } from "./elevation-window.ts";
import { mkdirSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { writeGeoTiff } from "../geo/geotiff-writer.ts";
import { isobandsGeoJson } from "../geo/isobands.ts";
import { coverageKml } from "../geo/kml.ts";
import { crsFromEpsg } from "../geo/crs-from-epsg.ts";
import { coverageMapSvg, type CoverageMapData } from "../render/coverage-map.ts";
import { coverageMapData, coverageMapPng } from "../render/raster/coverage-map-data.ts";
import { overlayPng } from "../render/raster/coverage-overlay.ts";
import { thresholdColors, VISIBLE_COLOR } from "../render/raster/coverage-palette.ts";
import type { ComputedCoverage } from "./compute-coverage.ts";
import { LEVEL_NODATA, VISIBILITY_NODATA } from "./coverage-job.ts";
import type { ThresholdArea } from "./coverage-result.ts";

/** The raster and drawing a coverage is written as (or the multi-site composite). */
export interface CoverageRaster {
  title: string;
  values: Float32Array | Uint8Array;
  /** elevations on the same grid (for the map's hillshade) */
  dem: Float32Array;
  width: number;
  height: number;
  geoTransform: [number, number, number, number, number, number];
  epsg: number;
  /** ground metres per cell across and down */
  cell_m: [number, number];
  kind: "level" | "visibility";
  areas: ThresholdArea[];
  sites: { name: string; col: number; row: number; lat_deg: number; lon_deg: number }[];
}

export interface WriteOptions {
  /** folder to write into (created) */
  dir: string;
  /** file name stem, e.g. the coverage id */
  stem: string;
  /** GeoTIFF compression, default "deflate" */
  compression?: "none" | "deflate";
}

/**
 * Write a coverage's files: `<stem>.tif` (GeoTIFF: float32 received level in dBm with nodata
 * −9999, or uint8 visibility 1/0 with nodata 255), `<stem>-overlay.png` (threshold bands,
 * transparent elsewhere), `<stem>-map.png` (hillshade, bands, sites, legend, scale bar),
 * `<stem>.geojson` (regions at or above each threshold, WGS84) and `<stem>.kml`.
 * @returns file names relative to dir, and the map data for the report page
 */
export async function writeCoverageOutputs(r: CoverageRaster, o: WriteOptions): Promise<{ files: Record<string, string>; figure: CoverageMapData; svg: string }> {
  mkdirSync(o.dir, { recursive: true });
  const files: Record<string, string> = {};
  const isLevel = r.kind === "level";
  const nodata = isLevel ? LEVEL_NODATA : VISIBILITY_NODATA;
  files.geotiff = `${o.stem}.tif`;
  writeGeoTiff(join(o.dir, files.geotiff), {
    width: r.width,
    height: r.height,
    data: r.values,
    geoTransform: r.geoTransform,
    epsg: r.epsg,
    nodata,
    description: isLevel ? "received level" : "radio line of sight (1 visible, 0 not)",
    unit: isLevel ? "dBm" : "",
    compression: o.compression ?? "deflate",
  });
  const thresholds = isLevel ? r.areas.map((a) => a.level_dbm as number) : [1];
  const colors = isLevel ? thresholdColors(thresholds.length) : [VISIBLE_COLOR];
  const style = { thresholds, colors, nodata };
  files.overlay_png = `${o.stem}-overlay.png`;
  writeFileSync(join(o.dir, files.overlay_png), await overlayPng(r.values, r.width, r.height, style, 2048));

  const legend = r.areas.map((a, i) => ({ color: colors[i], label: `${a.label}: ${fmtArea(a.area_km2)} (${a.pct.toFixed(1)} %)` }));
  const figure = await coverageMapData({
    title: r.title,
    values: r.values,
    dem: r.dem,
    width: r.width,
    height: r.height,
    cell_m: r.cell_m,
    style,
    legend,
    sites: r.sites,
    crs_note: `${crsFromEpsg(r.epsg)?.name ?? `EPSG:${r.epsg}`}, grid north up`,
  });
  const svg = coverageMapSvg(figure);
  files.map_png = `${o.stem}-map.png`;
  writeFileSync(join(o.dir, files.map_png), await coverageMapPng(svg));

  const regions = isobandsGeoJson(r.values, r.width, r.height, r.geoTransform, r.epsg, {
    thresholds: isLevel ? thresholds : [0.5],
    nodata,
    properties: r.areas.map((a, i) => ({ label: a.label, level_dbm: a.level_dbm, field_dbuv_m: a.field_dbuv_m, area_km2: a.area_km2, pct: a.pct, fill: colors[i] })),
  });
  files.geojson = `${o.stem}.geojson`;
  writeFileSync(join(o.dir, files.geojson), JSON.stringify(regions));
  files.kml = `${o.stem}.kml`;
  writeFileSync(
    join(o.dir, files.kml),
    coverageKml(regions, {
      name: r.title,
      styles: r.areas.map((a, i) => ({ label: a.label, fill: colors[i], opacity: 0.45 })),
      points: r.sites.map((s) => ({ name: s.name, lat_deg: s.lat_deg, lon_deg: s.lon_deg })),
    }),
  );
  return { files, figure, svg };
}

/** The raster description of one computed coverage. */
export function coverageRaster(c: ComputedCoverage, title: string, areas: ThresholdArea[], site: { name: string; lat_deg: number; lon_deg: number }): CoverageRaster {
  const g = c.grid;
  const row = Math.min(g.height - 1, Math.max(0, Math.round(g.site_row)));
  return {
    title,
    values: c.values,
    dem: elevationsFloat32(c.dem),
    width: g.width,
    height: g.height,
    geoTransform: g.geoTransform,
    epsg: g.epsg,
    cell_m: [Math.abs(g.east_per_col_m[row]), Math.abs(g.north_per_row_m[row])],
    kind: c.request.method === "visibility" ? "visibility" : "level",
    areas,
    sites: [{ ...site, col: g.site_col, row: g.site_row }],
  };
}

function fmtArea(km2: number): string {
  return km2 >= 100 ? `${km2.toFixed(0)} km²` : km2 >= 1 ? `${km2.toFixed(1)} km²` : `${km2.toFixed(3)} km²`;
}
