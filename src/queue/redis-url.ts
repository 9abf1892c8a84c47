import { RidgelineError } from "../errors.ts";

/** A Redis address given on the command line, checked, with its password kept out of every message. */
export interface RedisTarget {
  host: string;
  port: number;
  db: number;
  username?: string;
  password?: string;
  /** rediss:// — TLS to the server */
  tls: boolean;
  /** The URL with any password replaced by "****": the only form ever printed or stored. */
  display: string;
}

/** A Redis URL that cannot be used (exit 2). */
export class QueueUrlError extends RidgelineError {}

/**
 * Parse `redis://[[user]:password@]host[:port][/db]` or `rediss://…` (TLS). The password may be
 * percent-encoded. Messages show the URL with the password masked.
 */
export function parseRedisUrl(text: string): RedisTarget {
  let u: URL;
  const masked = maskRedisUrl(text);
  try {
    u = new URL(text);
  } catch {
    throw new QueueUrlError(`--queue: received "${masked}"; expected a Redis URL such as redis://:PASSWORD@10.0.0.5:6379/0 or rediss://… for TLS.`);
  }
  if (u.protocol !== "redis:" && u.protocol !== "rediss:") {
    throw new QueueUrlError(`--queue: received "${masked}"; the URL must start with redis:// (or rediss:// for TLS).`);
  }
  if (!u.hostname) throw new QueueUrlError(`--queue: received "${masked}"; the URL names no host (redis://HOST:PORT).`);
  const port = u.port ? Number(u.port) : 6379;
  const dbText = u.pathname.replace(/^\//, "");
  const db = dbText === "" ? 0 : Number(dbText);
  if (!Number.isInteger(db) || db < 0 || db > 1_000_000 || !/^\d*$/.test(dbText)) {
    throw new QueueUrlError(`--queue: received "${masked}"; the path must be a database number (/0, /1 …), not "/${dbText}".`);
  }
  const host = u.hostname.startsWith("[") ? u.hostname.slice(1, -1) : u.hostname;
  const username = u.username ? decodeURIComponent(u.username) : undefined;
  const password = u.password ? decodeURIComponent(u.password) : undefined;
  const tls = u.protocol === "rediss:";
  const display = `${u.protocol}//${u.username || u.password ? `${u.username}${u.password ? ":****" : ""}@` : ""}${u.host}${db ? `/${db}` : ""}`;
  return { host, port, db, username, password, tls, display };
}

/** The URL as it may be printed: a password (the part between ":" and "@") replaced by "****"; in text that is no URL, all before an "@". */
export function maskRedisUrl(text: string): string {
  const url = /^([a-z][a-z0-9+.-]*:\/\/[^:@/]*:)[^@/]*@/i;
  if (url.test(text)) return text.replace(url, "$1****@");
  // Not a URL we can read: whatever comes before an "@" may be a password.
  const at = text.lastIndexOf("@");
  return at < 0 ? text : `****${text.slice(at)}`;
}
