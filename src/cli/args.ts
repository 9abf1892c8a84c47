import { RidgelineError } from "../errors.ts";

/** A command-line usage error: exit code 2 with the message and the usage line. */
export class UsageError extends RidgelineError {}

export interface ArgSpec {
  /** Options that take a value; `repeat` ones collect every occurrence. */
  values?: string[];
  repeat?: string[];
  /** Options without a value. */
  flags?: string[];
}

export interface ParsedArgs {
  positional: string[];
  values: Map<string, string[]>;
  flags: Set<string>;
}

/**
 * Parse `--name value`, `--name=value` and `--flag`. The token after an option that takes a
 * value is always its value, even when it begins with "-" (southern latitudes, western
 * longitudes: `--from -33.45,-70.66`).
 */
export function parseArgs(argv: string[], spec: ArgSpec): ParsedArgs {
  const valueNames = new Set([...(spec.values ?? []), ...(spec.repeat ?? [])]);
  const flagNames = new Set(spec.flags ?? []);
  const out: ParsedArgs = { positional: [], values: new Map(), flags: new Set() };
  for (let i = 0; i < argv.length; i++) {
    const tok = argv[i];
    if (!tok.startsWith("--") || tok === "--") {
      out.positional.push(tok);
      continue;
    }
    const eq = tok.indexOf("=");
    const name = tok.slice(2, eq < 0 ? undefined : eq);
    if (flagNames.has(name)) {
      if (eq >= 0) throw new UsageError(`--${name} takes no value (received "${tok.slice(eq + 1)}").`);
      out.flags.add(name);
    } else if (valueNames.has(name)) {
      let v: string | undefined;
      if (eq >= 0) v = tok.slice(eq + 1);
      else v = argv[++i];
      if (v === undefined) throw new UsageError(`--${name} needs a value.`);
      const list = out.values.get(name) ?? [];
      if (list.length && !(spec.repeat ?? []).includes(name)) throw new UsageError(`--${name} is given twice.`);
      list.push(v);
      out.values.set(name, list);
    } else {
      const known = [...valueNames, ...flagNames].map((n) => `--${n}`).join(", ");
      throw new UsageError(`Unknown option ${tok}. Known options: ${known}.`);
    }
  }
  return out;
}

/** A number from an option value, or a UsageError naming the option and the value. */
export function numberArg(name: string, v: string | undefined, check: (x: number) => boolean = Number.isFinite, what = "a number"): number {
  const x = v === undefined || v.trim() === "" ? NaN : Number(v);
  if (!Number.isFinite(x) || !check(x)) throw new UsageError(`--${name}: received "${v}"; expected ${what}.`);
  return x;
}

/** "LAT,LON" in decimal degrees. */
export function latLonArg(name: string, v: string | undefined): [number, number] {
  const parts = (v ?? "").split(",");
  const lat = Number(parts[0]);
  const lon = Number(parts[1]);
  if (parts.length !== 2 || parts.some((p) => p.trim() === "") || !(Math.abs(lat) <= 90) || !(Math.abs(lon) <= 180)) {
    throw new UsageError(`--${name}: received "${v}"; expected LAT,LON in decimal degrees, e.g. -33.45,-70.66 (latitude −90…90, longitude −180…180).`);
  }
  return [lat, lon];
}
