// Worker-thread entry of the coverage pool (coverage-pool.ts): receives a job, then computes
// chunks of it on request and answers with each chunk's tally.
import { closeSync, openSync } from "node:fs";
import { parentPort } from "node:worker_threads";
import { decodeBands, type PixelWindow, type TiffBandSource } from "../terrain/tiff-band-reader.ts";
import type { CoverageJob } from "./coverage-job.ts";
import { createChunkRunner } from "./coverage-kernel.ts";
import { fillHorizonTileTable, horizonTileTableOf, warmUpHorizonSweep } from "./horizon-sweep.ts";
import type { SweepGeometry } from "./radial-sweep.ts";

/** Messages from the pool to a worker. */
export type ToWorker =
  | { type: "job"; job: CoverageJob }
  | { type: "chunk"; from: number; to: number }
  | { type: "warm-up"; elements?: "int16" | "float32" }
  | { type: "fill"; values: Float32Array | Uint8Array; value: number; from: number; to: number }
  | { type: "decode"; src: TiffBandSource; window: PixelWindow; out: Float32Array | Int16Array; ctrl: Int32Array }
  | { type: "tile-table"; tiles: SharedArrayBuffer; dem: Float32Array | Int16Array; geometry: SweepGeometry };

const port = parentPort!;
let runner: ReturnType<typeof createChunkRunner> | null = null;
port.on("message", (m: ToWorker) => {
  if (m.type === "decode") {
    // shares of a GeoTIFF window (a failed band is flagged in ctrl and read again by the
    // caller); a file that cannot be opened here leaves every band to the others
    let fd: number | null = null;
    try {
      fd = openSync(m.src.path, "r");
      decodeBands(fd, m.src, m.window, m.out, m.ctrl);
      if (process.env.RIDGELINE_TIMINGS === "1") process.stderr.write(`[timing] ${((performance.timeOrigin + performance.now()) / 1000).toFixed(3)} (epoch s) thread decoded its shares\n`);
    } catch {
      // nothing taken
    } finally {
      if (fd !== null) closeSync(fd);
    }
  } else if (m.type === "tile-table") {
    fillHorizonTileTable(horizonTileTableOf(m.tiles), m.dem, m.geometry);
    if (process.env.RIDGELINE_TIMINGS === "1") process.stderr.write(`[timing] ${((performance.timeOrigin + performance.now()) / 1000).toFixed(3)} (epoch s) thread filled its tile rows\n`);
  } else if (m.type === "warm-up") {
    warmUpHorizonSweep(undefined, m.elements ?? "int16");
  } else if (m.type === "fill") {
    m.values.fill(m.value, m.from, m.to);
    port.postMessage({ type: "filled" });
  } else if (m.type === "job") {
    runner = createChunkRunner(m.job);
  } else {
    const tally = runner!.run(m.from, m.to);
    port.postMessage({ type: "done", units: m.to - m.from, tally });
  }
});
if (process.env.RIDGELINE_TIMINGS === "1") process.stderr.write(`[timing] ${((performance.timeOrigin + performance.now()) / 1000).toFixed(3)} (epoch s) thread ready\n`);
port.postMessage({ type: "ready" });
