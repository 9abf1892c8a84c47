import { createHash } from "node:crypto";
import type { Terrain } from "./terrain.ts";
import { TerrainError } from "./terrain-error.ts";

/**
 * Smooth Earth at a fixed height above mean sea level (`constant:<m>`), e.g. 0 for a sea
 * path. Every valid lat/lon gives `height_m`; there is no "outside".
 */
export class ConstantTerrain implements Terrain {
  readonly kind = "constant" as const;
  readonly synthetic = false;
  readonly description: string;

  constructor(readonly height_m: number) {
    if (!Number.isFinite(height_m)) {
      throw new TerrainError(`constant terrain height must be a finite number of metres, received ${height_m}`, {
        hint: "write e.g. constant:0 for a sea path",
      });
    }
    this.description = `smooth Earth at ${height_m} m (constant)`;
  }

  resolutionM(_lat_deg: number): number {
    return Infinity;
  }

  elevation(lat_deg: number, lon_deg: number): number {
    return validPoint(lat_deg, lon_deg) ? this.height_m : NaN;
  }

  sample(lat_deg: ArrayLike<number>, lon_deg: ArrayLike<number>): { h_m: Float64Array; voidFilled: number; outside: number } {
    const n = Math.min(lat_deg.length, lon_deg.length);
    const h_m = new Float64Array(n);
    let outside = 0;
    for (let i = 0; i < n; i++) {
      if (validPoint(lat_deg[i], lon_deg[i])) h_m[i] = this.height_m;
      else (h_m[i] = NaN), outside++;
    }
    return { h_m, voidFilled: 0, outside };
  }

  whyOutside(lat_deg: number, lon_deg: number): string | null {
    return validPoint(lat_deg, lon_deg) ? null : `point (${lat_deg}, ${lon_deg}) is not a valid WGS84 latitude/longitude`;
  }

  fingerprint(): string {
    return createHash("sha256").update(`constant:${this.height_m}`).digest("hex");
  }
}

function validPoint(lat: number, lon: number): boolean {
  return lat >= -90 && lat <= 90 && Number.isFinite(lon);
}
