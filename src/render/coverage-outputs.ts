import { mkdirSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { writeGeoTiff } from "../geo/geotiff-writer.ts";
import { isobandsGeoJson } from "../geo/isobands.ts";
import { coverageKml } from "../geo/kml.ts";
import { crsFromEpsg } from "../geo/crs-from-epsg.ts";
import { coverageMapSvg, type CoverageMapData } from "./coverage-map.ts";
import { coverageMapData, coverageMapPng } from "./raster/coverage-map-data.ts";
import { overlayPng } from "./raster/coverage-overlay.ts";
import { thresholdColors, VISIBLE_COLOR } from "./raster/coverage-palette.ts";
import type { CoverageOutputStage, CoverageRaster, WriteOptions } from "../coverage/coverage-output-stage.ts";
import { LEVEL_NODATA, PROBABILITY_NODATA, VISIBILITY_NODATA } from "../coverage/coverage-job.ts";

/**
 * Write a coverage's files: `<stem>.tif` (GeoTIFF: float32 received level in dBm with nodata
 * −9999, or uint8 visibility 1/0 with nodata 255), `<stem>-overlay.png` (threshold bands,
 * transparent elsewhere), `<stem>-map.png` (hillshade, bands, sites, legend, scale bar),
 * `<stem>.geojson` (regions at or above each threshold, WGS84) and `<stem>.kml`.
 * @returns file names relative to dir, and the map data for the report page
 */
export async function writeCoverageOutputs(r: CoverageRaster, o: WriteOptions): Promise<{ files: Record<string, string>; figure: CoverageMapData; svg: string; extra?: { suffix: string; figure: CoverageMapData; svg: string }[] }> {
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
    overlay: r.overlay,
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
  const extra: { suffix: string; figure: CoverageMapData; svg: string }[] = [];
  if (r.probability) {
    const prob = r.probability;
    files.probability_geotiff = `${o.stem}-probability.tif`;
    writeGeoTiff(join(o.dir, files.probability_geotiff), {
      width: r.width,
      height: r.height,
      data: prob.values,
      geoTransform: r.geoTransform,
      epsg: r.epsg,
      nodata: PROBABILITY_NODATA,
      description: `location probability (0-1) of ${prob.label}`,
      unit: "",
      compression: o.compression ?? "deflate",
    });
    const pt = PROBABILITY_BANDS;
    const pc = thresholdColors(pt.length);
    const pstyle = { thresholds: pt, colors: pc, nodata: PROBABILITY_NODATA };
    const pfigure = await coverageMapData({
      title: `${r.title}: location probability of ${prob.label}`,
      values: prob.values,
      dem: r.dem,
      width: r.width,
      height: r.height,
      cell_m: r.cell_m,
      style: pstyle,
      legend: pt.map((t, i) => ({ color: pc[i], label: `${prob.label} at ≥ ${Math.round(t * 100)} % of locations` })),
      sites: r.sites,
      overlay: r.overlay,
      crs_note: `${crsFromEpsg(r.epsg)?.name ?? `EPSG:${r.epsg}`}, grid north up`,
    });
    const psvg = coverageMapSvg(pfigure);
    files.probability_map_png = `${o.stem}-probability-map.png`;
    writeFileSync(join(o.dir, files.probability_map_png), await coverageMapPng(psvg));
    extra.push({ suffix: "probability", figure: pfigure, svg: psvg });
  }
  return { files, figure, svg, ...(extra.length ? { extra } : {}) };
}

/** Location-probability bands of the probability map (fractions). */
const PROBABILITY_BANDS = [0.5, 0.7, 0.9, 0.95];

/** The render stage coverage analysis writes through (coverage never imports render). */
export const coverageOutputStage: CoverageOutputStage = {
  write: (r, o) => writeCoverageOutputs(r, o),
  svg: (figure) => coverageMapSvg(figure as CoverageMapData),
};

function fmtArea(km2: number): string {
  return km2 >= 100 ? `${km2.toFixed(0)} km²` : km2 >= 1 ? `${km2.toFixed(1)} km²` : `${km2.toFixed(3)} km²`;
}
