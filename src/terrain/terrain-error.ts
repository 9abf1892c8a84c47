import { RidgelineError } from "../errors.ts";

/**
 * Bad terrain input: a missing or unreadable DEM file, an unsupported raster, a bad
 * terrain argument. The message says what failed, what was received and how to fix it;
 * `detail.path` names the file (when there is one) and `detail.hint` the fix, so the
 * study loader can wrap it into a user-facing message with the study file and line.
 */
export class TerrainError extends RidgelineError {
  constructor(
    message: string,
    readonly detail: { path?: string; hint?: string },
    options?: { cause?: unknown },
  ) {
    super(message, options);
    this.name = "TerrainError";
  }
}
