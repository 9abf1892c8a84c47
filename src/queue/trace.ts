import { appendFileSync } from "node:fs";

const FILE = process.env.RIDGELINE_QUEUE_TRACE;

/** RIDGELINE_QUEUE_TRACE=FILE: append "epoch-ms who what" lines (coordinator and workers), to see where a task's time goes. */
export function trace(who: string, what: string): void {
  if (FILE) appendFileSync(FILE, `${(performance.timeOrigin + performance.now()).toFixed(1)} ${who} ${what}\n`);
}
