import { execFileSync } from "node:child_process";
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { hillshade } from "../../src/render/raster/hillshade.ts";
import { expectClose } from "../helpers/expect-close.ts";

// Reference: GDAL's `gdaldem hillshade` (gdal-bin, Horn gradient, the same common-practice
// formula). gdaldem writes 1 + 254·shade (0 = nodata, edges left as nodata), so its value v
// corresponds to our 255·shade = (v − 1)·255/254. Both round to whole numbers: tolerance 1.5.
const dir = mkdtempSync(join(tmpdir(), "ridgeline-hillshade-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function asciiGrid(z: number[], width: number, height: number, cell_m: number): string {
  const rows = Array.from({ length: height }, (_, r) => z.slice(r * width, (r + 1) * width).map((v) => v.toFixed(3)).join(" "));
  return `ncols ${width}\nnrows ${height}\nxllcorner 0\nyllcorner 0\ncellsize ${cell_m}\n${rows.join("\n")}\n`;
}

function gdalHillshade(z: number[], width: number, height: number, cell_m: number, az: number, alt: number): number[] {
  const src = join(dir, `in-${az}-${alt}.asc`);
  const out = join(dir, `out-${az}-${alt}.asc`);
  writeFileSync(src, asciiGrid(z, width, height, cell_m));
  execFileSync("gdaldem", ["hillshade", src, out, "-of", "AAIGrid", "-az", String(az), "-alt", String(alt), "-q"]);
  const lines = readFileSync(out, "utf8").trim().split(/\r?\n/);
  return lines.filter((l) => /^\s*-?\d/.test(l)).flatMap((l) => l.trim().split(/\s+/).map(Number));
}

describe("hillshade against gdaldem hillshade (GDAL)", () => {
  const width = 24;
  const height = 18;
  const cell = 30;
  // A hill on a tilted plane: every aspect and a range of slopes.
  const z = Array.from({ length: width * height }, (_, k) => {
    const r = Math.floor(k / width);
    const c = k % width;
    return 500 + 220 * Math.exp(-((c - 10) ** 2 + (r - 8) ** 2) / 18) + 3 * c - 2 * r;
  });

  it.each([
    [315, 45],
    [135, 30],
    [270, 60],
  ])("sun azimuth %s°, altitude %s°: every inner cell within 1.5 of GDAL", (az, alt) => {
    const ref = gdalHillshade(z, width, height, cell, az, alt);
    expect(ref.length).toBe(width * height);
    const ours = hillshade(z, width, height, { dx_m: cell, dy_m: cell, azimuth_deg: az, altitude_deg: alt });
    let maxErr = 0;
    for (let r = 1; r < height - 1; r++) {
      for (let c = 1; c < width - 1; c++) {
        const k = r * width + c;
        const expected = ref[k] === 0 ? 0 : ((ref[k] - 1) * 255) / 254;
        expectClose(ours.shade[k], expected, { abs: 1.5 }, { az, alt, row: r, col: c });
        maxErr = Math.max(maxErr, Math.abs(ours.shade[k] - expected));
      }
    }
    expect(maxErr).toBeLessThanOrEqual(1.5);
  });

  it("a flat grid shades to 255·sin(altitude) everywhere; NaN cells are marked invalid", () => {
    const flat = new Array(25).fill(100);
    flat[12] = Number.NaN;
    const { shade, valid } = hillshade(flat, 5, 5, { dx_m: 10, dy_m: 10 });
    expect(shade[0]).toBe(Math.round(255 * Math.sin(Math.PI / 4)));
    expect(valid[12]).toBe(0);
    expect(valid[6]).toBe(0); // its window touches the NaN cell
    expect(valid[0]).toBe(1);
  });
});
