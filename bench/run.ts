// `npm run bench`: runs every benchmark and prints one JSON document (date, Node, CPU and
// the figures). The README's performance table is filled from this output.
import { cpus, totalmem } from "node:os";
import { benchCoverage } from "./coverage.ts";
import { benchLinks } from "./links.ts";
import { benchRebuild } from "./rebuild.ts";

const report: Record<string, unknown> = {
  date: new Date().toISOString(),
  node: process.version,
  cpu: `${cpus()[0]?.model ?? "unknown"} × ${cpus().length}`,
  memory_gib: Math.round((totalmem() / 2 ** 30) * 10) / 10,
};
report.links_200 = await benchLinks();
report.rebuild_one_link = await benchRebuild();
report.coverage = await benchCoverage();
process.stdout.write(`${JSON.stringify(report, null, 2)}\n`);
