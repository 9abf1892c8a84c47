import type { Redis } from "ioredis";

/** Redis keys of this tool begin with this, as do BullMQ's for its queue ("ridgeline:tasks:…"). */
export const KEY_PREFIX = "ridgeline";

/** Bytes of one chunk of a stored value: Redis strings may hold 512 MB, but large values block the server while copied. */
export const CHUNK_BYTES = 8 * 1024 * 1024;

/** Largest value (one cache entry) a task may send back through Redis: 1 GiB. */
export const MAX_VALUE_BYTES = 1024 * 1024 * 1024;

/** How long stored inputs and results live in Redis if nobody deletes them (seconds). */
export const STORE_TTL_S = 24 * 3600;

/**
 * Store values under their keys, each in chunks of CHUNK_BYTES (`key:n` holds the count and
 * size, `key:0`, `key:1` … the chunks), with a time to live, in one round trip: the commands
 * go out one after the other on the connection without waiting for each answer, and Redis
 * runs them in that order (each value's head after its chunks, so a reader never sees a
 * partial value). They are sent as single commands rather than an ioredis pipeline, which
 * copies every command's bytes into one more buffer before writing it: for a 7.6 MB map
 * entry that copy (fresh memory, page faults) took longer than the transfer.
 * Throws when a value exceeds MAX_VALUE_BYTES.
 */
export async function putChunked(redis: Redis, values: Iterable<readonly [string, Uint8Array]>): Promise<void> {
  const sent: Promise<unknown>[] = [];
  for (const [key, bytes] of values) {
    if (bytes.byteLength > MAX_VALUE_BYTES) {
      throw new Error(`a result of ${(bytes.byteLength / 2 ** 20).toFixed(0)} MiB exceeds the queue's limit of ${MAX_VALUE_BYTES / 2 ** 20} MiB per cache entry; build this study without --queue`);
    }
    const count = Math.max(1, Math.ceil(bytes.byteLength / CHUNK_BYTES));
    const buf = Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength);
    for (let i = 0; i < count; i++) sent.push(redis.set(`${key}:${i}`, buf.subarray(i * CHUNK_BYTES, (i + 1) * CHUNK_BYTES), "EX", STORE_TTL_S));
    sent.push(redis.set(`${key}:n`, `${count} ${bytes.byteLength}`, "EX", STORE_TTL_S));
  }
  const results = await Promise.allSettled(sent);
  const failed = results.find((r) => r.status === "rejected");
  if (failed) throw (failed as PromiseRejectedResult).reason;
}

/**
 * Values stored by putChunked, by key (absent or incomplete ones left out). Each value's head
 * and first chunk are asked for together, so a value of one chunk (every tile, and entries up
 * to CHUNK_BYTES) takes one round trip, a larger one two; with `remove`, the value is deleted
 * from Redis by commands sent in the same round trips (Redis runs them after the reads).
 */
export async function getChunked(redis: Redis, keys: string[], options: { remove?: boolean } = {}): Promise<Map<string, Buffer>> {
  const out = new Map<string, Buffer>();
  const first = keys.map((key) => {
    const head = redis.get(`${key}:n`);
    const chunk0 = redis.getBuffer(`${key}:0`);
    if (options.remove) void redis.del(`${key}:n`, `${key}:0`).catch(() => 0);
    return { key, head, chunk0 };
  });
  const rest: { key: string; size: number; parts: Promise<Buffer | null>[] }[] = [];
  for (const { key, head, chunk0 } of first) {
    const [h, c0] = await Promise.all([head, chunk0]);
    const m = h ? /^(\d+) (\d+)$/.exec(h) : null;
    if (!m || !c0) continue;
    const count = Number(m[1]);
    const parts: Promise<Buffer | null>[] = [Promise.resolve(c0)];
    for (let i = 1; i < count; i++) parts.push(redis.getBuffer(`${key}:${i}`));
    if (options.remove && count > 1) void redis.del(...Array.from({ length: count - 1 }, (_, i) => `${key}:${i + 1}`)).catch(() => 0);
    rest.push({ key, size: Number(m[2]), parts });
  }
  for (const { key, size, parts } of rest) {
    const got = await Promise.all(parts);
    if (got.some((x) => !x)) continue;
    const bytes = got.length === 1 ? got[0]! : Buffer.concat(got as Buffer[]);
    if (bytes.byteLength === size) out.set(key, bytes);
  }
  return out;
}

/** Delete values stored by putChunked: two round trips however many (their heads, then every key). */
export async function deleteChunked(redis: Redis, keys: string[]): Promise<void> {
  if (keys.length === 0) return;
  const heads = await redis.mget(...keys.map((k) => `${k}:n`));
  const all = keys.flatMap((key, j) => {
    const count = heads[j] ? Number(heads[j]!.split(" ")[0]) : 0;
    return [`${key}:n`, `${key}:0`, ...Array.from({ length: Number.isFinite(count) ? count : 0 }, (_, i) => `${key}:${i}`).slice(1)];
  });
  await redis.del(...all);
}

/** Where a task's result entry is kept: kind of cache entry and key. */
export const resultKey = (kind: string, key: string): string => `${KEY_PREFIX}:result:${kind}:${key}`;

/** Where a study sent to the workers is kept, by the sha256 of its bytes. */
export const studyKey = (sha: string): string => `${KEY_PREFIX}:study:${sha}`;
