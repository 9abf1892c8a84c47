import { writeFileSync } from "node:fs";
import { endianness } from "node:os";
import { HGT_VOID } from "./hgt-void-fill.ts";

/**
 * Write an SRTM-format .hgt tile whose south-west corner is (lat, lon), sampling
 * `fn(lat_deg, lon_deg)` at every sample position (whole multiples of `arcsec`, first row
 * on the north edge lat + 1). Values are rounded to whole metres and clamped to the int16
 * range; NaN is written as the void marker −32768. For tests and benchmarks.
 * @param path file to write (name it like N46E007.hgt so readers can place it)
 * @param lat south-west corner latitude (whole degrees)
 * @param lon south-west corner longitude (whole degrees)
 * @param arcsec sample spacing: 1 (3601×3601) or 3 (1201×1201)
 * @param fn elevation (m) at a sample position
 */
export function writeHgtTile(
  path: string,
  lat: number,
  lon: number,
  arcsec: 1 | 3,
  fn: (lat_deg: number, lon_deg: number) => number,
): void {
  if (arcsec !== 1 && arcsec !== 3) throw new RangeError(`arcsec must be 1 or 3, received ${arcsec}`);
  if (!Number.isInteger(lat) || !Number.isInteger(lon)) throw new RangeError(`tile corner must be whole degrees, received ${lat}, ${lon}`);
  const m = 3600 / arcsec;
  const n = m + 1;
  const samples = new Int16Array(n * n);
  for (let r = 0; r < n; r++) {
    const la = lat + 1 - r / m;
    for (let c = 0; c < n; c++) {
      const h = fn(la, lon + c / m);
      samples[r * n + c] = Number.isNaN(h) ? HGT_VOID : Math.max(-32767, Math.min(32767, Math.round(h)));
    }
  }
  const buf = Buffer.from(samples.buffer);
  if (endianness() === "LE") buf.swap16(); // .hgt is big-endian
  writeFileSync(path, buf);
}
