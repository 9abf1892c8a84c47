import { createReadStream, existsSync, statSync } from "node:fs";
import { createServer, type Server } from "node:http";
import type { AddressInfo } from "node:net";
import { extname, join, normalize } from "node:path";

const TYPES: Record<string, string> = {
  ".html": "text/html; charset=utf-8",
  ".css": "text/css; charset=utf-8",
  ".json": "application/json; charset=utf-8",
  ".svg": "image/svg+xml",
  ".png": "image/png",
  ".pdf": "application/pdf",
  ".js": "text/javascript; charset=utf-8",
};

/**
 * A static file server for a built site on 127.0.0.1 and an ephemeral port, serving `root`
 * under `prefix` (e.g. "/reports/ridgeline/") so the tests exercise a site under a sub-path.
 * Everything outside the prefix is 404. Folders serve their index.html.
 */
export async function serveStatic(root: string, prefix: string): Promise<{ url: string; close: () => Promise<void> }> {
  const server: Server = createServer((req, res) => {
    const path = decodeURIComponent(new URL(req.url ?? "/", "http://x").pathname);
    if (!path.startsWith(prefix)) {
      res.writeHead(404).end("outside the site prefix");
      return;
    }
    let file = normalize(join(root, path.slice(prefix.length)));
    if (!file.startsWith(root)) {
      res.writeHead(403).end();
      return;
    }
    if (existsSync(file) && statSync(file).isDirectory()) file = join(file, "index.html");
    if (!existsSync(file)) {
      res.writeHead(404).end("not found");
      return;
    }
    res.writeHead(200, { "content-type": TYPES[extname(file)] ?? "application/octet-stream" });
    createReadStream(file).pipe(res);
  });
  await new Promise<void>((ok) => server.listen(0, "127.0.0.1", ok));
  const { port } = server.address() as AddressInfo;
  return { url: `http://127.0.0.1:${port}${prefix}`, close: () => new Promise<void>((ok) => server.close(() => ok())) };
}
