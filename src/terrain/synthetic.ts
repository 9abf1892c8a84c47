import { createHash } from "node:crypto";
import { mulberry32 } from "./mulberry32.ts";
import { makeRasterGrid, RasterTerrain } from "./raster-terrain.ts";
import { TerrainError } from "./terrain-error.ts";
import { RotatedFractalNoise, thermalErosion } from "./gradient-noise.ts";
import { FractalNoise } from "./value-noise.ts";

/** Parameters of a synthetic terrain (all angles in degrees, WGS84). */
export interface SyntheticTerrainParams {
  seed: number;
  south_deg: number;
  west_deg: number;
  north_deg: number;
  east_deg: number;
  /** grid spacing (arc-seconds), default 1 (≈ 30 m) */
  spacing_arcsec?: number;
}

/** Largest grid generated (cells); 25 M cells is 100 MB of Float32. */
const MAX_CELLS = 25_000_000;
/** Bump when the generator changes, so cached results keyed on the fingerprint are not reused. */
const GENERATOR_VERSION = "synthetic-v2";

/**
 * Seeded, deterministic synthetic terrain for demos and tests — NOT real terrain.
 *
 * The box gets an EPSG:4326 grid with nodes on west + j·s, north − i·s (s = spacing), so
 * the box corners are sample centres; it is generated once and `elevation()` interpolates
 * it bilinearly, exactly as a GeoTIFF would be. With (u, v) ∈ [0, 1]² the position across
 * the box (west→east, south→north) the height (m) is
 *   h = h0 + Δh·v + R·walls·(0.6 + 0.8·ridged(u, v)) + 40·(detail(u, v) − 0.5)
 * with walls = 1 − exp(−((u − centre(v))/w)²): a valley along a meandering axis centre(v),
 * its floor rising by Δh to the north, walls of relief R and half-width w. ridged is 0.85 of a
 * coarse ridged lattice (3 and 6 cells, interpolated bicubically so no lattice line shows)
 * and 0.15 of ridged multifractal gradient noise (four octaves from 24 cells, each turned by
 * its own angle); detail is four octaves of turned gradient noise from 40 cells. Thermal
 * erosion then sheds slopes steeper than about 35° into the valleys (4 passes). h0, Δh, R, w,
 * every lattice, angle and offset come from one mulberry32(seed) stream, so the same seed and
 * box give identical heights on any platform; a different seed gives a different landscape.
 * @throws TerrainError for a bad box, spacing or seed, or a grid over 25 M cells
 */
export function syntheticTerrain(params: SyntheticTerrainParams): RasterTerrain {
  const { seed, south_deg: S, west_deg: W, north_deg: N, east_deg: E } = params;
  const spacing = params.spacing_arcsec ?? 1;
  const bad = (what: string, hint: string): TerrainError => new TerrainError(`synthetic terrain: ${what}; ${hint}`, { hint });
  if (!Number.isInteger(seed)) throw bad(`seed must be a whole number, received ${seed}`, "use e.g. seed: 7");
  if (!(S >= -90 && N <= 90 && S < N)) throw bad(`south/north must satisfy −90 ≤ south < north ≤ 90, received ${S}, ${N}`, "fix the bounding box");
  if (!(W >= -180 && E <= 180 && W < E)) throw bad(`west/east must satisfy −180 ≤ west < east ≤ 180, received ${W}, ${E}`, "fix the bounding box");
  if (!(spacing > 0 && Number.isFinite(spacing))) throw bad(`spacing must be a positive number of arc-seconds, received ${spacing}`, "use e.g. 1 (≈ 30 m)");

  const s = spacing / 3600;
  const width = Math.floor((E - W) / s + 1e-9) + 1;
  const height = Math.floor((N - S) / s + 1e-9) + 1;
  if (width * height > MAX_CELLS) {
    throw bad(
      `a ${width}×${height} grid (${((width * height) / 1e6).toFixed(1)} M cells) is too large (limit ${MAX_CELLS / 1e6} M)`,
      "shrink the box or raise spacing_arcsec",
    );
  }

  // --- Landscape parameters and noise fields, all from one seeded stream ---
  const random = mulberry32(seed);
  const floor0 = 200 + 600 * random(); // valley floor at the south edge (m)
  const floorRise = 100 + 300 * random(); // rise of the floor to the north edge (m)
  const relief = 500 + 900 * random(); // height of the valley walls (m)
  const halfWidth = 0.12 + 0.12 * random(); // valley half-width (fraction of box width)
  // The landform (valley axis, walls, the broad crests) from coarse lattices; everything finer
  // than ~8 km from gradient noise turned off the grid, so no lattice shows in a hillshade.
  const meander = new FractalNoise(2, 3, 0.5, random, true);
  const broad = new FractalNoise(3, 2, 0.55, random, true);
  const crests = new RotatedFractalNoise(24, 4, 0.5, random);
  const detail = new RotatedFractalNoise(40, 4, 0.5, random);

  const data = new Float32Array(width * height);
  for (let i = 0; i < height; i++) {
    const v = height > 1 ? 1 - i / (height - 1) : 0.5;
    const centre = 0.5 + 0.5 * (meander.at(0.5, v) - 0.5);
    for (let j = 0; j < width; j++) {
      const u = width > 1 ? j / (width - 1) : 0.5;
      const d = (u - centre) / halfWidth;
      const walls = 1 - Math.exp(-d * d);
      const ridged = 0.85 * broad.ridged(u, v) + 0.15 * crests.ridged(u, v);
      const h = floor0 + floorRise * v + relief * walls * (0.6 + 0.8 * ridged) + 40 * (detail.at(u, v) - 0.5);
      data[i * width + j] = h;
    }
  }

  // Erosion-like smoothing: slopes steeper than about 35° between 1″ cells shed into the valleys.
  const cell_m = spacing * 30.87;
  thermalErosion(data, width, height, { talus_m: 0.7 * cell_m, rate: 0.5, passes: 4 });

  const raster = makeRasterGrid(width, height, [W - s / 2, s, 0, N + s / 2, 0, -s], 4326, data);
  const fingerprint = createHash("sha256")
    .update(JSON.stringify([GENERATOR_VERSION, seed, S, W, N, E, spacing]))
    .digest("hex");
  return new RasterTerrain(raster, {
    kind: "synthetic",
    description: `synthetic (seed ${seed}) — not real terrain`,
    synthetic: true,
    label: `the synthetic terrain (seed ${seed})`,
    fingerprint,
  });
}
