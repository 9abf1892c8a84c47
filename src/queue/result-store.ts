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
 * size, `key:0`, `key:1` … the chunks), with a time to live, in one round trip (a pipeline;
 * each value's head written after its chunks, so a reader never sees a partial value).
 * Throws when a value exceeds MAX_VALUE_BYTES.
 */
export async function putChunked(redis: Redis, values: Iterable<readonly [string, Uint8Array]>): Promise<void> {
  const p = redis.pipeline();
  for (const [key, bytes] of values) {
    if (bytes.byteLength > MAX_VALUE_BYTES) {
      throw new Error(`a result of ${(bytes.byteLength / 2 ** 20).toFixed(0)} MiB exceeds the queue's limit of ${MAX_VALUE_BYTES / 2 ** 20} MiB per cache entry; build this study without --queue`);
    }
    const count = Math.max(1, Math.ceil(bytes.byteLength / CHUNK_BYTES));
    const buf = Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength);
    for (let i = 0; i < count; i++) p.set(`${key}:${i}`, buf.subarray(i * CHUNK_BYTES, (i + 1) * CHUNK_BYTES), "EX", STORE_TTL_S);
    p.set(`${key}:n`, `${count} ${bytes.byteLength}`, "EX", STORE_TTL_S);
  }
  const results = (await p.exec()) ?? [];
  const failed = results.find(([e]) => e);
  if (failed) throw failed[0];
}

/**
 * Values stored by putChunked, by key (absent or incomplete ones left out), read in two round
 * trips (the heads, then every chunk); with `remove`, deleted from Redis once read.
 */
export async function getChunked(redis: Redis, keys: string[], options: { remove?: boolean } = {}): Promise<Map<string, Buffer>> {
  const out = new Map<string, Buffer>();
  if (keys.length === 0) return out;
  const heads = await redis.mget(...keys.map((k) => `${k}:n`));
  const sizes = keys.map((key, j) => {
    const m = heads[j] ? /^(\d+) (\d+)$/.exec(heads[j]!) : null;
    return m ? { key, count: Number(m[1]), size: Number(m[2]) } : null;
  });
  const p = redis.pipeline();
  for (const s of sizes) if (s) for (let i = 0; i < s.count; i++) p.getBuffer(`${s.key}:${i}`);
  if (options.remove) for (const s of sizes) if (s) p.del(`${s.key}:n`, ...Array.from({ length: s.count }, (_, i) => `${s.key}:${i}`));
  const results = (await p.exec()) ?? [];
  let at = 0;
  for (const s of sizes) {
    if (!s) continue;
    const parts = results.slice(at, at + s.count).map(([e, v]) => (e ? null : (v as Buffer | null)));
    at += s.count;
    if (parts.some((x) => !x)) continue;
    const bytes = parts.length === 1 ? parts[0]! : Buffer.concat(parts as Buffer[]);
    if (bytes.byteLength === s.size) out.set(s.key, bytes);
  }
  return out;
}

/** Delete a value stored by putChunked. */
export async function deleteChunked(redis: Redis, key: string): Promise<void> {
  const head = await redis.get(`${key}:n`);
  const count = head ? Number(head.split(" ")[0]) : 0;
  const keys = [`${key}:n`, ...Array.from({ length: Number.isFinite(count) ? count : 0 }, (_, i) => `${key}:${i}`)];
  await redis.del(...keys);
}

/** Where a task's result entry is kept: kind of cache entry and key. */
export const resultKey = (kind: string, key: string): string => `${KEY_PREFIX}:result:${kind}:${key}`;

/** Where a study sent to the workers is kept, by the sha256 of its bytes. */
export const studyKey = (sha: string): string => `${KEY_PREFIX}:study:${sha}`;
