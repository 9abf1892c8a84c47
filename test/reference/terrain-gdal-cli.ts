import { execFile } from "node:child_process";
import { promisify } from "node:util";

const run = promisify(execFile);

/** Run a GDAL command and return stdout; `input` is piped to stdin. */
export async function gdal(cmd: string, args: string[], input?: string): Promise<string> {
  if (input === undefined) return (await run(cmd, args, { maxBuffer: 64 << 20 })).stdout;
  return new Promise((resolve, reject) => {
    const child = execFile(cmd, args, { maxBuffer: 64 << 20 }, (err, stdout) => (err ? reject(err) : resolve(stdout)));
    child.stdin!.end(input);
  });
}

/** GDAL's geotransform of a raster, from `gdalinfo -json`. */
export async function gdalGeoTransform(file: string): Promise<number[]> {
  return JSON.parse(await gdal("gdalinfo", ["-json", file])).geoTransform;
}

/**
 * Values at many WGS84 points with `gdallocationinfo -valonly -wgs84` (nearest pixel —
 * GDAL 3.6 has no `-r bilinear`; it came in 3.10). Points go in as "lon lat" on stdin.
 */
export async function gdalPixelValues(file: string, pts: { lat: number; lon: number }[]): Promise<number[]> {
  const out = await gdal("gdallocationinfo", ["-valonly", "-wgs84", file], pts.map((p) => `${p.lon} ${p.lat}`).join("\n") + "\n");
  return out.trimEnd().split("\n").map((s) => (s.trim() === "" ? NaN : Number(s)));
}

/** Project WGS84 points to `epsg` with `gdaltransform` (PROJ); returns [x, y] (traditional lon/lat input order). */
export async function gdalTransform(epsg: number, pts: { lat: number; lon: number }[]): Promise<[number, number][]> {
  const out = await gdal("gdaltransform", ["-s_srs", "EPSG:4326", "-t_srs", `EPSG:${epsg}`, "-output_xy"], pts.map((p) => `${p.lon} ${p.lat}`).join("\n") + "\n");
  return out.trimEnd().split("\n").map((l) => {
    const [x, y] = l.trim().split(/\s+/).map(Number);
    return [x, y];
  });
}

/**
 * GDAL's bilinear value at CRS point (x, y): `gdalwarp -r bilinear` onto a single output
 * pixel of the source's own size centred on the point (unit scale, so GDAL's warp kernel
 * uses its 4-sample bilinear formula, renormalising over valid samples), written as
 * Float64 AAIGrid to stdout. NaN when GDAL returns its nodata value.
 */
export async function gdalBilinearAt(file: string, x: number, y: number, dx: number, dy: number): Promise<number> {
  const hx = Math.abs(dx) / 2;
  const hy = Math.abs(dy) / 2;
  const out = await gdal("gdalwarp", [
    "-q", "-r", "bilinear", "-ot", "Float64", "-ts", "1", "1",
    "-te", String(x - hx), String(y - hy), String(x + hx), String(y + hy),
    "-of", "AAIGrid", file, "/vsistdout/",
  ]);
  let nodata = NaN;
  for (const line of out.split("\n")) {
    const t = line.trim();
    const m = /^NODATA_value\s+(\S+)/i.exec(t);
    if (m) nodata = Number(m[1]);
    else if (/^[-+]?[\d.]+(e[-+]?\d+)?$/i.test(t)) {
      const v = Number(t);
      return v === nodata ? NaN : v;
    }
  }
  throw new Error(`no value in gdalwarp output for ${file} at ${x}, ${y}:\n${out}`);
}

/** Run async jobs with at most `limit` at once; results in input order. */
export async function pool<T, R>(items: T[], limit: number, job: (t: T) => Promise<R>): Promise<R[]> {
  const out = new Array<R>(items.length);
  let next = 0;
  const worker = async (): Promise<void> => {
    while (next < items.length) {
      const i = next++;
      out[i] = await job(items[i]);
    }
  };
  await Promise.all(Array.from({ length: Math.min(limit, items.length) }, worker));
  return out;
}
