import { isIP } from "node:net";
import { Redis, type RedisOptions } from "ioredis";
import { RidgelineError } from "../errors.ts";
import type { RedisTarget } from "./redis-url.ts";

/** Redis cannot be reached or refuses us (exit 2): the message names the URL (password masked) and the reason. */
export class QueueConnectionError extends RidgelineError {}

/** ioredis options for a target (TLS for rediss://). `blocking`: for BullMQ's workers and event readers, which wait on the server. */
export function redisOptions(t: RedisTarget): RedisOptions {
  return {
    host: t.host,
    port: t.port,
    db: t.db,
    username: t.username,
    password: t.password,
    tls: t.tls ? (isIP(t.host) ? {} : { servername: t.host }) : undefined, // SNI takes host names only
    maxRetriesPerRequest: null, // BullMQ's requirement: commands wait for a reconnection rather than fail
    connectionName: "ridgeline",
  };
}

/** The reason of a connection failure in words, without the password (ioredis messages hold none). */
function reason(e: unknown): string {
  const err = e as NodeJS.ErrnoException & { message?: string };
  const m = (err?.message ?? String(e)).trim();
  if (/WRONGPASS|invalid password|invalid username-password/i.test(m)) return `the server refused the password (${m})`;
  if (/NOAUTH/i.test(m)) return `the server requires a password: give it in the URL as redis://:PASSWORD@HOST:PORT (${m})`;
  if (err?.code === "ECONNREFUSED") return `nothing listens there (${m}); is redis-server running and bound to that interface?`;
  if (err?.code === "ENOTFOUND" || err?.code === "EAI_AGAIN") return `the host name does not resolve (${m})`;
  return m;
}

/**
 * Connect once, without retrying, and check that the server answers (PING) and is a Redis of
 * version 5 or later (BullMQ needs streams). Returns a connection for plain commands.
 * @throws QueueConnectionError naming the URL (masked) and why
 */
export async function connectRedis(t: RedisTarget, timeoutMs = 5000): Promise<Redis> {
  const redis = new Redis({ ...redisOptions(t), lazyConnect: true, connectTimeout: timeoutMs, retryStrategy: () => null, enableOfflineQueue: false, maxRetriesPerRequest: 1 });
  let lastError: unknown = null;
  redis.on("error", (e) => (lastError = e)); // reported below; without a listener ioredis prints it
  try {
    await redis.connect();
    await redis.ping();
    const info = await redis.info("server");
    const v = /redis_version:(\d+)/.exec(info);
    if (v && Number(v[1]) < 5) throw new Error(`the server runs Redis ${v[1]}; the job queue needs Redis 5 or later`);
  } catch (e) {
    redis.disconnect();
    throw new QueueConnectionError(`cannot use Redis at ${t.display}: ${reason(lastError ?? e)}.`, { cause: e });
  }
  // From here on, reconnect after a network hiccup (commands wait for it) like BullMQ's own connections.
  redis.options.retryStrategy = (times: number) => Math.min(times * 200, 5000);
  redis.options.maxRetriesPerRequest = null;
  redis.options.enableOfflineQueue = true;
  return redis;
}
