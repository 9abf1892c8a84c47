// `npm run bench`: runs every benchmark and prints one JSON document (date, Node, CPU and
// the figures). The README's performance table is filled from this output.
import { cpus, totalmem } from "node:os";
import { benchLinks } from "./links.ts";

const report: Record<string, unknown> = {
  date: new Date().toISOString(),
  node: process.version,
  cpu: `${cpus()[0]?.model ?? "unknown"} × ${cpus().length}`,
  memory_gib: Math.round((totalmem() / 2 ** 30) * 10) / 10,
};
report.links_200 = await benchLinks();
process.stdout.write(`${JSON.stringify(report, null, 2)}\n`);
