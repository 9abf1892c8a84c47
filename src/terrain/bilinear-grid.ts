/**
 * Bilinear interpolation in a row-major grid whose samples sit at pixel centres.
 *
 * `col`, `row` are continuous pixel-centre coordinates: (0, 0) is the centre of the first
 * sample, (width − 1, height − 1) the centre of the last. The grid covers
 * −0.5 ≤ col ≤ width − 0.5 and −0.5 ≤ row ≤ height − 0.5 (pixel corners); outside that
 * the result is NaN. In the outer half pixel the coordinate is clamped to the edge sample
 * centre, i.e. the edge row/column is extended.
 *
 * Nodata (NaN samples): a point inside a nodata pixel (its nearest sample is NaN) gives
 * NaN; otherwise NaN neighbours are left out and the remaining weights renormalised (NaN
 * when the valid weight is below 1e-6). This is how GDAL's warp kernel treats nodata in
 * bilinear resampling at unit scale — checked against `gdalwarp -r bilinear` in
 * test/reference/terrain-gdal.test.ts, including points in the outer half pixel and
 * around nodata pixels.
 *
 * No allocation; safe to call in tight loops.
 */
export function bilinearGrid(
  data: ArrayLike<number>,
  width: number,
  height: number,
  col: number,
  row: number,
): number {
  if (!(col >= -0.5 && col <= width - 0.5 && row >= -0.5 && row <= height - 0.5)) return NaN;
  const c = col < 0 ? 0 : col > width - 1 ? width - 1 : col;
  const r = row < 0 ? 0 : row > height - 1 ? height - 1 : row;
  let c0 = Math.floor(c);
  let r0 = Math.floor(r);
  if (c0 > width - 2) c0 = width > 1 ? width - 2 : 0;
  if (r0 > height - 2) r0 = height > 1 ? height - 2 : 0;
  const fc = c - c0;
  const fr = r - r0;
  const dc = width > 1 ? 1 : 0;
  const i00 = r0 * width + c0;
  const i10 = height > 1 ? i00 + width : i00;
  const v00 = data[i00];
  const v01 = data[i00 + dc];
  const v10 = data[i10];
  const v11 = data[i10 + dc];
  const w00 = (1 - fc) * (1 - fr);
  const w01 = fc * (1 - fr);
  const w10 = (1 - fc) * fr;
  const w11 = fc * fr;
  const h = v00 * w00 + v01 * w01 + v10 * w10 + v11 * w11;
  if (h === h) return h;
  // At least one neighbour is nodata. The pixel holding the point must be valid…
  const cn = c - c0 < 0.5 ? 0 : dc;
  const nearest = r - r0 < 0.5 ? data[i00 + cn] : data[i10 + cn];
  if (nearest !== nearest) return NaN;
  // …then renormalise over the valid neighbours.
  let sum = 0;
  let wsum = 0;
  if (v00 === v00) (sum += v00 * w00), (wsum += w00);
  if (v01 === v01) (sum += v01 * w01), (wsum += w01);
  if (v10 === v10) (sum += v10 * w10), (wsum += w10);
  if (v11 === v11) (sum += v11 * w11), (wsum += w11);
  return wsum < 1e-6 ? NaN : sum / wsum;
}
