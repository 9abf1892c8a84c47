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
