import { UsageError } from "../../args.ts";
import { ITU_PATH_METHODS, ITU_PATH_OPTIONS, ITU_PATH_USAGE, prepareItuMethod, type PreparedPathMethod } from "./itu.ts";

export type { PathMethodContext, PathMethodOutput, PreparedPathMethod } from "./itu.ts";

/** Propagation methods `ridgeline path --method` accepts besides the default link analysis. */
export const PATH_METHODS: readonly string[] = [...ITU_PATH_METHODS];

/** Option names the methods add to `ridgeline path` (besides --method). */
export const PATH_METHOD_OPTIONS: readonly string[] = ["method", ...ITU_PATH_OPTIONS];

/** Usage lines of the methods. */
export const PATH_METHOD_USAGE = ITU_PATH_USAGE;

/**
 * Check --method and the method options (UsageError on bad input, before any computation);
 * null when no method is asked for.
 */
export function preparePathMethod(values: Map<string, string[]>, frequency_ghz: number): PreparedPathMethod | null {
  const method = values.get("method")?.[0];
  if (method !== undefined && !PATH_METHODS.includes(method)) {
    throw new UsageError(`--method: received "${method}"; expected one of ${PATH_METHODS.join(", ")}.`);
  }
  return prepareItuMethod(method, values, frequency_ghz);
}
