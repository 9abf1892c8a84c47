import { RidgelineError } from "../errors.ts";

/**
 * A coverage request that cannot be computed as given: too many cells, a site off the DEM,
 * thresholds out of order, an antenna pattern that does not cover its angles. `field` names
 * the input (a study field such as `thresholds`, or a command-line option such as
 * `radius-km`) so the caller can point at it; the message says what was received and the fix.
 */
export class CoverageError extends RidgelineError {
  constructor(
    message: string,
    readonly field: string,
    /** the value received and what would be accepted, when the message is of that form */
    readonly detail: { received?: string; expected?: string } = {},
    options?: { cause?: unknown },
  ) {
    super(message, options);
  }
}
