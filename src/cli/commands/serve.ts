import { existsSync, watch, type FSWatcher } from "node:fs";
import type { AddressInfo } from "node:net";
import { isAbsolute, relative, resolve } from "node:path";
import { RidgelineError } from "../../errors.ts";
import { LiveReloadHub } from "../../serve/live-reload.ts";
import { staticServer } from "../../serve/static-server.ts";
import { numberArg, parseArgs, UsageError } from "../args.ts";
import { buildSummary, runBuild, type BuildReport } from "./build.ts";

export const SERVE_USAGE = `Usage: ridgeline serve [--port N] [--studies-dir DIR] [--out DIR] [--cache-dir DIR] [--no-cache]
Builds the site, serves it on http://127.0.0.1:N (default 8080), watches content/ and the studies
folder and rebuilds on change (unchanged links come from the cache), reloading open pages.`;

export interface ServeOptions {
  /** TCP port on 127.0.0.1; 0 picks a free one. Default 8080. */
  port?: number;
  studiesDir?: string;
  outDir?: string;
  /** Cache folder, or null to compute everything on each rebuild. */
  cacheDir?: string | null;
  /** Where messages go (default stderr). */
  log?: (line: string) => void;
}

export interface ServeHandle {
  url: string;
  /** Rebuild now (queued behind a running build); resolves when the site is current. */
  rebuild(): Promise<void>;
  /** Stop watching and serving. */
  close(): Promise<void>;
}

/** Build, serve and watch; see SERVE_USAGE. A failed build keeps the last good site and says why in the browser. */
export async function startServe(options: ServeOptions = {}): Promise<ServeHandle> {
  const log = options.log ?? ((l: string) => process.stderr.write(`${l}\n`));
  const studiesDir = resolve(options.studiesDir ?? "content/studies");
  const outDir = resolve(options.outDir ?? "_site");
  const hub = new LiveReloadHub();

  const buildOnce = async (): Promise<BuildReport | null> => {
    try {
      const report = await runBuild({ studiesDir, outDir, cacheDir: options.cacheDir });
      log(buildSummary(report));
      hub.send("reload", "");
      return report;
    } catch (e) {
      const msg = e instanceof RidgelineError ? e.message : `internal error: ${(e as Error)?.stack ?? String(e)}`;
      log(`Build failed; still serving the last good site.\n${msg}`);
      hub.send("failed", msg);
      return null;
    }
  };

  // One build at a time; changes during a build trigger one more afterwards.
  let running: Promise<void> | null = null;
  let pending = false;
  const rebuild = (): Promise<void> => {
    if (running) {
      pending = true;
      return running;
    }
    running = (async () => {
      do {
        pending = false;
        await buildOnce();
      } while (pending);
      running = null;
    })();
    return running;
  };

  await rebuild();

  const server = staticServer(outDir, hub);
  await new Promise<void>((ok, fail) => {
    server.once("error", (e: NodeJS.ErrnoException) =>
      fail(e.code === "EADDRINUSE" ? new UsageError(`port ${options.port ?? 8080} on 127.0.0.1 is in use; choose another with --port.`) : e),
    );
    server.listen(options.port ?? 8080, "127.0.0.1", () => ok());
  });
  const url = `http://127.0.0.1:${(server.address() as AddressInfo).port}/`;

  // Watch the site's sources; ignore editor scratch files.
  let timer: NodeJS.Timeout | null = null;
  const onChange = (_event: string, name: string | Buffer | null) => {
    const base = String(name ?? "").split(/[\\/]/).pop() ?? "";
    if (base.startsWith(".") || base.endsWith("~") || base.endsWith(".swp")) return;
    if (timer) clearTimeout(timer);
    timer = setTimeout(() => void rebuild(), 150);
  };
  const content = resolve("content");
  const inContent = !relative(content, studiesDir).startsWith("..") && !isAbsolute(relative(content, studiesDir));
  const roots = (inContent ? [content] : [content, studiesDir]).filter((d) => existsSync(d));
  const watchers: FSWatcher[] = roots.map((d) => watch(d, { recursive: true }, onChange));
  log(`Serving ${url} — watching ${roots.map((r) => relative(process.cwd(), r) || r).join(", ")}; Ctrl-C stops.`);

  return {
    url,
    rebuild,
    async close() {
      if (timer) clearTimeout(timer);
      for (const w of watchers) w.close();
      hub.close();
      await new Promise<void>((ok) => server.close(() => ok()));
      await running;
    },
  };
}

/** `ridgeline serve …`: runs until interrupted; 0 on Ctrl-C, 2 on bad options. */
export async function serveCommand(argv: string[]): Promise<number> {
  if (argv.includes("--help")) {
    process.stdout.write(`${SERVE_USAGE}\n`);
    return 0;
  }
  const a = parseArgs(argv, { values: ["port", "studies-dir", "out", "cache-dir"], flags: ["no-cache"] });
  if (a.positional.length) throw new UsageError(`unexpected argument "${a.positional[0]}".\n${SERVE_USAGE}`);
  const portArg = a.values.get("port")?.[0];
  const port = portArg === undefined ? 8080 : numberArg("port", portArg, (x) => Number.isInteger(x) && x >= 0 && x <= 65535, "a TCP port 0–65535");
  const handle = await startServe({
    port,
    studiesDir: a.values.get("studies-dir")?.[0],
    outDir: a.values.get("out")?.[0],
    cacheDir: a.flags.has("no-cache") ? null : a.values.get("cache-dir")?.[0],
  });
  process.stdout.write(`${handle.url}\n`);
  await new Promise<void>((ok) => {
    process.once("SIGINT", ok);
    process.once("SIGTERM", ok);
  });
  await handle.close();
  return 0;
}
