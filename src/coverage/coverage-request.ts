import type { GroundClass } from "../physics/ground-constants.ts";
import type { HataCitySize, HataEnvironment } from "../physics/hata.ts";
import { buildPatternTables, type AntennaPatternInput, type PatternTables } from "./antenna-pattern.ts";
import { CoverageError } from "./coverage-error.ts";
import type { CoverageMethod } from "./coverage-job.ts";
import type { P1812Request } from "./p1812-setup.ts";

/** One coverage to compute, in SI units and dB (the study entry or the command line, resolved). */
export interface CoverageRequest {
  site: { lat_deg: number; lon_deg: number };
  method: CoverageMethod;
  /** antenna centre above ground (m) */
  antenna_m: number;
  /** receiver antenna above ground (m) */
  receiver_m: number;
  radius_m: number;
  /** grid spacing (m) when the grid is not the terrain raster's own */
  resolution_m: number;
  frequency_ghz: number;
  /** effective Earth-radius factor (Infinity allowed) */
  k: number;
  /** visibility: required clearance as a fraction of F1 (0: geometric line of sight) */
  clearance_f1: number;
  tx_power_dbm: number;
  tx_losses_db: number;
  /** antenna gain toward the boresight (dBi) */
  gain_dbi: number;
  rx_gain_dbi: number;
  rx_losses_db: number;
  pattern?: AntennaPatternInput;
  /** received-level thresholds (dBm), strictly ascending */
  thresholds_dbm: number[];
  polarization: "h" | "v";
  ground: GroundClass;
  atmosphere: { pressure_hpa: number; temperature_c: number; water_vapour_g_m3: number };
  hata: { environment: HataEnvironment; city_size: HataCitySize };
  /** p1812: the method's statistics and clutter */
  p1812?: P1812Request;
}

/** The field names used in messages for each request quantity (study keys or CLI options). */
export type FieldNames = Partial<Record<keyof CoverageRequest | "site", string>>;

/**
 * Check a request: finite, physical numbers; thresholds strictly ascending; antennas above
 * ground for delta-Bullington (its smooth-Earth term is 0/0 for an antenna on the surface);
 * a pattern whose tables cover their angles. Returns the pattern lookup tables.
 * @param names how messages name each field (e.g. { radius_m: "--radius-km" })
 * @throws CoverageError naming the field, what was received and the fix
 */
export function validateCoverageRequest(req: CoverageRequest, names: FieldNames = {}, patternField = "pattern"): PatternTables {
  const name = (k: keyof CoverageRequest) => names[k] ?? k;
  const need = (ok: boolean, k: keyof CoverageRequest, received: unknown, expected: string) => {
    if (!ok) throw new CoverageError(`${name(k)}: received ${String(received)}; expected ${expected}`, name(k), { received: String(received), expected });
  };
  need(req.radius_m > 0 && req.radius_m <= 500_000, "radius_m", req.radius_m / 1000, "a radius above 0 and up to 500 km");
  need(req.resolution_m > 0 && Number.isFinite(req.resolution_m), "resolution_m", req.resolution_m, "a cell size above 0 m");
  need(req.frequency_ghz > 0 && req.frequency_ghz <= 1000, "frequency_ghz", req.frequency_ghz, "a frequency above 0 and up to 1000 GHz");
  need(req.k > 0, "k", req.k, "a positive effective Earth-radius factor (e.g. 4/3), or inf");
  need(req.clearance_f1 >= 0 && req.clearance_f1 <= 5, "clearance_f1", req.clearance_f1, "a fraction of the first Fresnel radius from 0 (geometric line of sight) to 5");
  const above = req.method === "delta-bullington" || req.method === "p1812";
  const minHeight = above ? 0 : -1;
  for (const k of ["antenna_m", "receiver_m"] as const) {
    need(req[k] > minHeight && req[k] <= 1000, k, req[k], above ? "a height above ground greater than 0 and up to 1000 m (the method needs the antenna above the surface)" : "a height above ground from 0 to 1000 m");
  }
  if (req.method === "p1812") {
    need(req.frequency_ghz >= 0.03 && req.frequency_ghz <= 6, "frequency_ghz", req.frequency_ghz, "a frequency from 0.03 to 6 GHz (the range of ITU-R P.1812-6)");
    const q = req.p1812;
    if (q) {
      const nm = (k: string) => names[k as keyof CoverageRequest] ?? `p1812.${k}`;
      const needP = (ok: boolean, k: string, v: number, expected: string) => {
        if (!ok) throw new CoverageError(`${nm(k)}: received ${v}; expected ${expected}`, nm(k), { received: String(v), expected });
      };
      needP(q.time_pct >= 1 && q.time_pct <= 50, "time_pct", q.time_pct, "a percentage of time from 1 to 50 %");
      needP(q.location_pct >= 1 && q.location_pct <= 99, "location_pct", q.location_pct, "a percentage of locations from 1 to 99 %");
      needP(q.dn > 0 && q.dn < 157, "dn", q.dn, "a lapse rate ΔN above 0 and below 157 N-units/km");
    }
  }
  for (const k of ["tx_power_dbm", "tx_losses_db", "gain_dbi", "rx_gain_dbi", "rx_losses_db"] as const) need(Number.isFinite(req[k]), k, req[k], "a finite number of dB");
  const t = req.thresholds_dbm;
  for (let i = 0; i < t.length; i++) {
    need(Number.isFinite(t[i]), "thresholds_dbm", `[${t.join(", ")}]`, "finite levels");
    if (i > 0 && !(t[i] > t[i - 1])) {
      const expected = `levels in strictly ascending order (entry ${i}, ${t[i]}, is not above ${t[i - 1]}), e.g. [${[...t].sort((a, b) => a - b).join(", ")}]`;
      throw new CoverageError(`${name("thresholds_dbm")}: received [${t.join(", ")}]; expected ${expected}`, name("thresholds_dbm"), { received: `[${t.join(", ")}]`, expected });
    }
  }
  return buildPatternTables(req.pattern, patternField);
}
