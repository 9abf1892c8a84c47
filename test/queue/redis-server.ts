// Starts Debian's redis-server for a test on a free loopback port, with a password, no
// persistence (--save "" --appendonly no), and stops it.
import { spawn, type ChildProcess } from "node:child_process";
import { createServer } from "node:net";
import { Redis } from "ioredis";

export interface TestRedis {
  port: number;
  password: string;
  /** redis://:PASSWORD@127.0.0.1:PORT/0 */
  url: string;
  stop(): Promise<void>;
}

/** A port no one listens on now (the OS picks it). */
export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const s = createServer();
    s.once("error", reject);
    s.listen(0, "127.0.0.1", () => {
      const port = (s.address() as { port: number }).port;
      s.close(() => resolve(port));
    });
  });
}

export async function startRedis(password = "test-pass-7f3a9"): Promise<TestRedis> {
  const port = await freePort();
  const proc: ChildProcess = spawn("redis-server", ["--port", String(port), "--bind", "127.0.0.1", "--save", "", "--appendonly", "no", "--requirepass", password], { stdio: "ignore" });
  const exited = new Promise<void>((r) => proc.once("exit", () => r()));
  const deadline = Date.now() + 10_000;
  for (;;) {
    const c = new Redis({ port, host: "127.0.0.1", password, lazyConnect: true, retryStrategy: () => null, maxRetriesPerRequest: 0 });
    c.on("error", () => {});
    try {
      await c.connect();
      await c.ping();
      c.disconnect();
      break;
    } catch {
      c.disconnect();
      if (Date.now() > deadline || proc.exitCode !== null) throw new Error(`redis-server did not start on port ${port}`);
      await new Promise((r) => setTimeout(r, 50));
    }
  }
  return {
    port,
    password,
    url: `redis://:${password}@127.0.0.1:${port}/0`,
    async stop() {
      proc.kill("SIGTERM");
      await exited;
    },
  };
}
