/**
 * Base class of every error Ridgeline reports to a user. `message` is written for the
 * person running the command: what failed, where, what was received and how to fix it.
 */
export class RidgelineError extends Error {
  constructor(message: string, options?: { cause?: unknown }) {
    super(message, options);
    this.name = new.target.name;
  }
}

/**
 * An unexpected failure (a bug, not bad input) while working on one study: carries the study
 * id so the one-line report can name it. Deliberately not a RidgelineError: the CLI exits 70.
 */
export class InternalError extends Error {
  constructor(
    readonly studyId: string,
    cause: unknown,
  ) {
    super(cause instanceof Error ? `${cause.name}: ${cause.message}` : String(cause), { cause });
    this.name = "InternalError";
  }
}
