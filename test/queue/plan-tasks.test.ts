// The tasks a coordinator plans for a study (plan-tasks.ts): link batches, the tiles of each
// coverage map the cache lacks (two maps' tiles alternately), each map's assembly with all its
// tile keys; tiles and maps already in the cache are not planned again. No Redis needed.
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { loadStudies } from "../../src/analysis/load-all.ts";
import { ResultCache } from "../../src/cache/result-cache.ts";
import { coverageTileKey } from "../../src/coverage/coverage-tiles.ts";
import { queueIdentity } from "../../src/queue/identity.ts";
import { planStudy } from "../../src/queue/plan-tasks.ts";
import { writeQueueStudy } from "./queue-study.ts";

const tmp = mkdtempSync(join(tmpdir(), "ridgeline-plan-tasks-"));
afterAll(() => rmSync(tmp, { recursive: true, force: true }));

describe("planStudy", () => {
  const dir = writeQueueStudy(join(tmp, "studies"));
  const [study] = loadStudies([join(dir, "study.yaml")]);

  it("plans 2 link batches, the 2 tiles of each of the two maps alternately, and each map's assembly", () => {
    const plan = planStudy(study, new ResultCache(join(tmp, "cache-empty")), queueIdentity());
    expect(plan.tasks.map((t) => t.label)).toEqual([
      "links l00–l24 of study queue-study",
      "links l25–l43 of study queue-study",
      "coverage cov-a tile 1/2 of study queue-study",
      "coverage cov-b tile 1/2 of study queue-study",
      "coverage cov-a tile 2/2 of study queue-study",
      "coverage cov-b tile 2/2 of study queue-study",
    ]);
    expect(plan.maps.map((m) => [m.task.kind, m.task.ids[0], m.tiles.length])).toEqual([
      ["coverage", "cov-a", 2],
      ["coverage", "cov-b", 2],
    ]);
    for (const m of plan.maps) {
      expect(m.task.tileKeys).toEqual([0, 1].map((k) => coverageTileKey(m.task.keys[0], k, 2)));
      expect(m.tiles.map((t) => t.keys[0])).toEqual(m.task.tileKeys);
      expect(m.tiles.map((t) => t.tile)).toEqual([0, 1].map((index) => ({ index, count: 2, mapKey: m.task.keys[0] })));
    }
  });

  it("leaves out a tile the cache holds (its map still assembled) and a map the cache holds (with its tiles)", () => {
    const cache = new ResultCache(join(tmp, "cache-some"));
    const first = planStudy(study, cache, queueIdentity());
    const [a, b] = first.maps;
    cache.putBytes("coverage-tile", a.task.tileKeys![0], Buffer.from("tile"));
    cache.putBytes("coverage", b.task.keys[0], Buffer.from("map"));
    const plan = planStudy(study, cache, queueIdentity());
    expect(plan.tasks.filter((t) => t.kind === "coverage-tile").map((t) => t.label)).toEqual(["coverage cov-a tile 2/2 of study queue-study"]);
    expect(plan.maps.map((m) => [m.task.ids[0], m.tiles.length, m.task.tileKeys?.length])).toEqual([["cov-a", 1, 2]]);
  });
});
