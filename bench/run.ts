// `npm run bench`: runs every benchmark and prints one JSON document (date, Node, CPU and
// the figures). The README's performance table is filled from this output. Each benchmark
// runs in a node process of its own (this file with --part NAME), so that none starts with
// the heap, compiled code or caches another one left behind.
import { spawnSync } from "node:child_process";
import { cpus, totalmem } from "node:os";
import { fileURLToPath } from "node:url";
import { benchCoverage } from "./coverage.ts";
import { benchCoverageWaveCheck } from "./coverage-wave-check.ts";
import { benchInterference } from "./interference.ts";
import { benchLargeCoverage } from "./large-coverage.ts";
import { benchLargeStudy, benchLazyTiles, benchQueue } from "./large-study.ts";
import { benchLinks } from "./links.ts";
import { benchRebuild } from "./rebuild.ts";
import { benchWave } from "./wave.ts";

const parts: Record<string, () => Promise<unknown>> = {
  links_200: benchLinks,
  rebuild_one_link: () => benchRebuild(),
  coverage: () => benchCoverage(),
  interference_200: benchInterference,
  wave: () => benchWave(),
  coverage_wave_check: benchCoverageWaveCheck,
  large_study: benchLargeStudy,
  queue: benchQueue,
  lazy_tiles: benchLazyTiles,
  large_coverage: () => benchLargeCoverage(),
  coverage_p1812: () => benchCoverage({ only: "p1812" }),
  coverage_visibility: () => benchCoverage({ visibilityOnly: true }),
};

/**
 * Parts a plain `npm run bench` leaves out: the 150 km coverage takes minutes (run it with
 * `npm run bench -- --large-coverage`); coverage_p1812 is inside `coverage` (run it alone with
 * `--part coverage_p1812`), and so is the comparison with gdal_viewshed (alone: `--part coverage_visibility`).
 */
const onRequest: Record<string, string | null> = { large_coverage: "--large-coverage", coverage_p1812: null, coverage_visibility: null };

const at = process.argv.indexOf("--part");
if (at >= 0) {
  const name = process.argv[at + 1];
  if (!name || !Object.hasOwn(parts, name)) throw new Error(`bench/run.ts --part: one of ${Object.keys(parts).join(", ")}`);
  process.stdout.write(`${JSON.stringify(await parts[name]())}\n`);
} else {
  const report: Record<string, unknown> = {
    date: new Date().toISOString(),
    node: process.version,
    cpu: `${cpus()[0]?.model ?? "unknown"} × ${cpus().length}`,
    memory_gib: Math.round((totalmem() / 2 ** 30) * 10) / 10,
  };
  for (const name of Object.keys(parts)) {
    if (Object.hasOwn(onRequest, name) && (onRequest[name] === null || !process.argv.includes(onRequest[name]!))) continue;
    const r = spawnSync(process.execPath, ["--import", "tsx", fileURLToPath(import.meta.url), "--part", name], { encoding: "utf8", stdio: ["ignore", "pipe", "inherit"], maxBuffer: 1 << 26 });
    if (r.status !== 0) throw new Error(`bench/run.ts: the ${name} benchmark failed (exit ${r.status ?? r.signal})`);
    // the figures are the last line: a part that renders a site may have printed Eleventy's summary before it
    report[name] = JSON.parse(r.stdout.trim().split("\n").pop()!);
    process.stderr.write(`bench ${name}: ${JSON.stringify(report[name])}\n`); // each part as soon as it is done
  }
  process.stdout.write(`${JSON.stringify(report, null, 2)}\n`);
}
