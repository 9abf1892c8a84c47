// Writes the demo study's invented land cover (content/studies/kestrel-vale/land-cover.tif):
// a seeded class raster, not a survey of any place. Run: npx tsx scripts/make-demo-land-cover.ts
import { join } from "node:path";
import { writeGeoTiff } from "../src/geo/geotiff-writer.ts";
import { mulberry32 } from "../src/terrain/mulberry32.ts";

const SEED = 4242;
const WEST = -32.6;
const NORTH = -40.75;
const STEP = 0.001; // deg
const W = 800;
const H = 650;
// classes: 1 open farmland, 2 forest, 3 village, 4 lake, 5 town centre
const rnd = mulberry32(SEED);

/** Smooth value noise in [0, 1] on a coarse lattice (cells of `cell` pixels), bilinear. */
function noise(cell: number): (c: number, r: number) => number {
  const nx = Math.ceil(W / cell) + 2;
  const ny = Math.ceil(H / cell) + 2;
  const v = Float64Array.from({ length: nx * ny }, () => rnd());
  return (c, r) => {
    const x = c / cell;
    const y = r / cell;
    const i = Math.floor(x);
    const j = Math.floor(y);
    const fx = x - i;
    const fy = y - j;
    const s = (t: number) => t * t * (3 - 2 * t);
    const a = v[j * nx + i] + (v[j * nx + i + 1] - v[j * nx + i]) * s(fx);
    const b = v[(j + 1) * nx + i] + (v[(j + 1) * nx + i + 1] - v[(j + 1) * nx + i]) * s(fx);
    return a + (b - a) * s(fy);
  };
}

const forest = noise(60);
const detail = noise(12);
const lakes = noise(90);
const towns = Array.from({ length: 9 }, () => ({ c: rnd() * W, r: rnd() * H, rad: 6 + rnd() * 14 }));
const data = new Uint8Array(W * H);
for (let r = 0; r < H; r++) {
  for (let c = 0; c < W; c++) {
    let cls = 1;
    if (0.7 * forest(c, r) + 0.3 * detail(c, r) > 0.6) cls = 2;
    if (lakes(c, r) > 0.86) cls = 4;
    for (const t of towns) {
      const d = Math.hypot(c - t.c, r - t.r);
      if (d < t.rad * 0.45) cls = 5;
      else if (d < t.rad) cls = 3;
    }
    data[r * W + c] = cls;
  }
}
const out = join(import.meta.dirname, "../content/studies/kestrel-vale/land-cover.tif");
writeGeoTiff(out, { width: W, height: H, data, geoTransform: [WEST, STEP, 0, NORTH, 0, -STEP], epsg: 4326, nodata: 0, description: "invented land cover (seed 4242): 1 open, 2 forest, 3 village, 4 lake, 5 town centre", unit: "", compression: "deflate" });
console.log(`wrote ${out}`);
