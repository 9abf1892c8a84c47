/** SRTM void marker (DTED/SRTM convention). */
export const HGT_VOID = -32768;

/** Result of filling the voids of one tile. */
export interface FilledVoids {
  /** elevations (m) with voids replaced; NaN where a void could not be filled */
  data: Float32Array;
  /** 1 where the source sample was a void */
  voidMask: Uint8Array;
  /** number of void samples */
  voids: number;
  /** voids left NaN because no valid sample lies in any of the four grid directions */
  unfilled: number;
}

/**
 * Fill the voids (−32768) of a square n×n row-major tile.
 *
 * Method: each void sample gets the inverse-distance-weighted mean of the nearest valid
 * sample in each of the four grid directions — left and right along its row, up and down
 * along its column — with weights 1/d, d counted in samples. Directions that reach the
 * tile edge without a valid sample are left out; a void with none in any direction stays
 * NaN. A lone void in a plane is filled exactly (its four neighbours at d = 1 average to
 * the plane); any filled value lies between the smallest and largest neighbour used.
 *
 * Cost O(n²): one pass per direction, recording for each void (by its row-major ordinal)
 * the weighted sums; no per-void search.
 *
 * @returns null when the tile has no voids
 */
export function fillHgtVoids(src: Int16Array, n: number): FilledVoids | null {
  const N = n * n;
  const rowStart = new Int32Array(n + 1); // ordinal of the first void in each row
  let V = 0;
  for (let r = 0; r < n; r++) {
    rowStart[r] = V;
    const base = r * n;
    for (let c = 0; c < n; c++) if (src[base + c] === HGT_VOID) V++;
  }
  rowStart[n] = V;
  if (V === 0) return null;

  const sumW = new Float64Array(V);
  const sumWH = new Float64Array(V);
  const add = (k: number, d: number, h: number): void => {
    const w = 1 / d;
    sumW[k] += w;
    sumWH[k] += w * h;
  };

  // --- Along rows: nearest valid to the left, then to the right ---
  for (let r = 0; r < n; r++) {
    if (rowStart[r + 1] === rowStart[r]) continue;
    const base = r * n;
    let k = rowStart[r];
    let last = -1;
    for (let c = 0; c < n; c++) {
      if (src[base + c] !== HGT_VOID) last = c;
      else if (last >= 0) add(k++, c - last, src[base + last]);
      else k++;
    }
    k = rowStart[r + 1] - 1;
    last = -1;
    for (let c = n - 1; c >= 0; c--) {
      if (src[base + c] !== HGT_VOID) last = c;
      else if (last >= 0) add(k--, last - c, src[base + last]);
      else k--;
    }
  }

  // --- Along columns: nearest valid above (top-down pass), then below (bottom-up pass) ---
  const lastRow = new Int32Array(n).fill(-1);
  for (let r = 0; r < n; r++) {
    const base = r * n;
    let k = rowStart[r];
    for (let c = 0; c < n; c++) {
      if (src[base + c] !== HGT_VOID) lastRow[c] = r;
      else {
        if (lastRow[c] >= 0) add(k, r - lastRow[c], src[lastRow[c] * n + c]);
        k++;
      }
    }
  }
  lastRow.fill(-1);
  for (let r = n - 1; r >= 0; r--) {
    const base = r * n;
    let k = rowStart[r];
    for (let c = 0; c < n; c++) {
      if (src[base + c] !== HGT_VOID) lastRow[c] = r;
      else {
        if (lastRow[c] >= 0) add(k, lastRow[c] - r, src[lastRow[c] * n + c]);
        k++;
      }
    }
  }

  const data = new Float32Array(N);
  const voidMask = new Uint8Array(N);
  let k = 0;
  let unfilled = 0;
  for (let i = 0; i < N; i++) {
    const v = src[i];
    if (v !== HGT_VOID) {
      data[i] = v;
      continue;
    }
    voidMask[i] = 1;
    if (sumW[k] > 0) data[i] = sumWH[k] / sumW[k];
    else {
      data[i] = NaN;
      unfilled++;
    }
    k++;
  }
  return { data, voidMask, voids: V, unfilled };
}
