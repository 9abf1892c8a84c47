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
 * Store `bytes` under `key` in chunks of CHUNK_BYTES (`key:n` holds the count and size,
 * `key:0`, `key:1` … the chunks), with a time to live. Throws when the value exceeds
 * MAX_VALUE_BYTES.
 */
export async function putChunked(redis: Redis, key: string, bytes: Uint8Array): Promise<void> {
  if (bytes.byteLength > MAX_VALUE_BYTES) {
    throw new Error(`a result of ${(bytes.byteLength / 2 ** 20).toFixed(0)} MiB exceeds the queue's limit of ${MAX_VALUE_BYTES / 2 ** 20} MiB per cache entry; build this study without --queue`);
  }
  const count = Math.max(1, Math.ceil(bytes.byteLength / CHUNK_BYTES));
  const buf = Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  for (let i = 0; i < count; i++) await redis.set(`${key}:${i}`, buf.subarray(i * CHUNK_BYTES, (i + 1) * CHUNK_BYTES), "EX", STORE_TTL_S);
  await redis.set(`${key}:n`, `${count} ${bytes.byteLength}`, "EX", STORE_TTL_S); // last: a reader never sees a partial value
}

/** A value stored by putChunked, or undefined when absent or incomplete. */
export async function getChunked(redis: Redis, key: string): Promise<Buffer | undefined> {
  const head = await redis.get(`${key}:n`);
  const m = head ? /^(\d+) (\d+)$/.exec(head) : null;
  if (!m) return undefined;
  const count = Number(m[1]);
  const size = Number(m[2]);
  const parts: Buffer[] = [];
  for (let i = 0; i < count; i++) {
    const part = await redis.getBuffer(`${key}:${i}`);
    if (!part) return undefined;
    parts.push(part);
  }
  const out = parts.length === 1 ? parts[0] : Buffer.concat(parts);
  return out.byteLength === size ? out : undefined;
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
