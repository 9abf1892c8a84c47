import { describe, expect, it } from "vitest";
import { LruCache } from "../../src/terrain/lru-cache.ts";

describe("LruCache", () => {
  it("evicts the least recently used entry; get counts as use", () => {
    const c = new LruCache<string, number>(2);
    c.set("a", 1);
    c.set("b", 2);
    expect(c.get("a")).toBe(1); // a is now newer than b
    c.set("c", 3);
    expect([c.has("a"), c.has("b"), c.has("c"), c.size]).toEqual([true, false, true, 2]);
    c.set("a", 10); // update refreshes
    c.set("d", 4);
    expect([c.get("a"), c.has("c"), c.get("d")]).toEqual([10, false, 4]);
  });

  it("rejects a capacity below 1", () => {
    expect(() => new LruCache(0)).toThrow(RangeError);
  });
});
