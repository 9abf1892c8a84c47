import { describe, expect, it } from "vitest";
import { runFuzz, summaryLine } from "./fuzz.ts";

// 1000 generated hostile and degenerate studies (test/fuzz/generate.ts), mostly run as
// `ridgeline check` does and 4 through the full site build, each in a worker process with a
// time (20 s) and memory (1.5 GB) budget. None may crash, hang or give a physically impossible
// result (NaN, Infinity, a negative loss, a level above the EIRP, outputs overwriting each
// other), and none may leave a temporary folder. The 10 000-case run is `npm run fuzz` (README).

describe("fuzzer", () => {
  it("1000 hostile studies: no crash, hang or impossible result, no temporary folder left", async () => {
    const s = await runFuzz({ count: 1000, seed: 20261204, jobs: 2, timeoutMs: 20_000, memoryMb: 1536, buildEvery: 250 });
    const bad = s.bad.slice(0, 10).map((b) => `case ${b.index} [${b.mutations.join(", ")}]: ${b.outcome}: ${b.detail}`);
    expect({ crash: s.counts.crash, hang: s.counts.hang, impossible: s.counts.impossible, leftovers: s.leftovers, bad }, summaryLine(s)).toEqual({ crash: 0, hang: 0, impossible: 0, leftovers: 0, bad: [] });
    // the generator must reach the pipeline, not only the schema: both outcomes are common
    expect(s.counts.success).toBeGreaterThan(200);
    expect(s.counts["clean-error"]).toBeGreaterThan(200);
    expect(s.builds).toBe(4);
  }, 300_000);
});
