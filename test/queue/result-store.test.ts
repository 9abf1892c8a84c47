// Values sent through Redis by the queue (result-store.ts): chunked, read back whole, removed
// on request, deleted in bulk. A real redis-server on a free loopback port (redis-server.ts).
import { Redis } from "ioredis";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { redisOptions } from "../../src/queue/connect.ts";
import { parseRedisUrl } from "../../src/queue/redis-url.ts";
import { CHUNK_BYTES, deleteChunked, getChunked, putChunked } from "../../src/queue/result-store.ts";
import { startRedis, type TestRedis } from "./redis-server.ts";

let server: TestRedis;
let redis: Redis;
beforeAll(async () => {
  server = await startRedis();
  redis = new Redis(redisOptions(parseRedisUrl(server.url)));
});
afterAll(async () => {
  redis?.disconnect();
  await server?.stop();
});

/** Bytes that differ from chunk to chunk (a mix-up of chunks shows). */
const pattern = (n: number, seed: number) => Buffer.from(Uint8Array.from({ length: n }, (_, i) => (i * 31 + seed + Math.floor(i / CHUNK_BYTES) * 7) & 255));

describe("chunked values in Redis", () => {
  const cases = [
    { name: "empty", bytes: 0 },
    { name: "one byte", bytes: 1 },
    { name: "exactly one chunk", bytes: CHUNK_BYTES },
    { name: "two chunks and a byte", bytes: 2 * CHUNK_BYTES + 1 },
  ];
  it.each(cases)("$name: read back byte for byte, twice, then removed", async ({ bytes }) => {
    const key = `test:value:${bytes}`;
    const value = pattern(bytes, bytes % 251);
    await putChunked(redis, [[key, value]]);
    expect((await getChunked(redis, [key])).get(key)?.equals(value)).toBe(true);
    expect((await getChunked(redis, [key], { remove: true })).get(key)?.equals(value)).toBe(true);
    expect((await getChunked(redis, [key])).has(key)).toBe(false);
    expect(await redis.keys(`${key}:*`)).toEqual([]);
  });

  it("several values at once; an absent one is left out; a value missing a chunk is left out", async () => {
    const a = pattern(1000, 1);
    const b = pattern(CHUNK_BYTES + 5, 2);
    await putChunked(redis, [["test:a", a], ["test:b", b]]);
    const got = await getChunked(redis, ["test:a", "test:absent", "test:b"]);
    expect([...got.keys()].sort()).toEqual(["test:a", "test:b"]);
    expect(got.get("test:b")?.equals(b)).toBe(true);
    await redis.del("test:b:1");
    expect((await getChunked(redis, ["test:b"])).has("test:b")).toBe(false);
  });

  it("deleteChunked removes every chunk and head of the values named, and nothing else", async () => {
    await putChunked(redis, [["test:d1", pattern(2 * CHUNK_BYTES + 3, 3)], ["test:d2", pattern(10, 4)], ["test:keep", pattern(10, 5)]]);
    await deleteChunked(redis, ["test:d1", "test:d2", "test:never-stored"]);
    expect((await redis.keys("test:d*")).length).toBe(0);
    expect((await getChunked(redis, ["test:keep"])).get("test:keep")?.equals(pattern(10, 5))).toBe(true);
  });
});
