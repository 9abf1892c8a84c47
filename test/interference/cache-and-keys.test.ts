import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { analyzeStudy } from "../../src/analysis/analyze-study.ts";
import { ResultCache } from "../../src/cache/result-cache.ts";
import { loadStudy } from "../../src/study/load-study.ts";
import { writeStudy } from "../helpers/tiny-study.ts";
import { twoLinkYaml } from "./two-link-study.ts";

const root = mkdtempSync(join(tmpdir(), "ridgeline-ifx-cache-"));
afterAll(() => rmSync(root, { recursive: true, force: true }));

describe("interference results", () => {
  it("are the same from the cache, which then needs no terrain", async () => {
    const file = writeStudy(root, "pair", twoLinkYaml());
    const cache = new ResultCache(join(root, "cache"));
    const cold = await analyzeStudy(loadStudy(file), { cache });
    expect(cold.terrain).not.toBeNull();
    const warm = await analyzeStudy(loadStudy(file), { cache });
    expect(warm.terrain).toBeNull();
    expect(warm.result.interference).toEqual(cold.result.interference);
    const none = await analyzeStudy(loadStudy(file), { cache: null });
    expect(none.result.interference).toEqual(cold.result.interference);
  });
  it("carry a unit in every numeric key of results.json's interference section (counts excepted)", async () => {
    const { result } = await analyzeStudy(loadStudy(writeStudy(root, "keys", twoLinkYaml())), { cache: null });
    const counts = new Set(["entries", "receivers_total", "receivers_met", "in_frequency_range", "computed", "below_bound"]);
    const bad: string[] = [];
    const walk = (v: unknown, key: string) => {
      if (typeof v === "number" && !counts.has(key) && !/_(db|dbm|deg|m|mhz|pct)$/.test(key)) bad.push(key);
      else if (Array.isArray(v)) v.forEach((x) => walk(x, key));
      else if (v && typeof v === "object") for (const [k, x] of Object.entries(v)) walk(x, k);
    };
    walk(result.interference, "interference");
    expect([...new Set(bad)]).toEqual([]);
  });
});
