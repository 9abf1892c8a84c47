import { readFileSync, statSync } from "node:fs";
import { createServer, type Server } from "node:http";
import { extname, join, posix, resolve } from "node:path";
import { EVENTS_PATH, injectLiveReload, type LiveReloadHub } from "./live-reload.ts";

const TYPES: Record<string, string> = {
  ".html": "text/html; charset=utf-8",
  ".css": "text/css; charset=utf-8",
  ".js": "text/javascript; charset=utf-8",
  ".json": "application/json; charset=utf-8",
  ".svg": "image/svg+xml",
  ".png": "image/png",
  ".jpg": "image/jpeg",
  ".tif": "image/tiff",
  ".tiff": "image/tiff",
  ".geojson": "application/geo+json",
  ".pdf": "application/pdf",
  ".txt": "text/plain; charset=utf-8",
};

/**
 * A small static file server for the built site: GET/HEAD only, files under `root` only
 * ("/studies/x/" serves its index.html), HTML with the live-reload script added, nothing
 * cached by the browser, and the event stream of `hub` at /__ridgeline/events.
 */
export function staticServer(root: string, hub: LiveReloadHub): Server {
  const base = resolve(root);
  return createServer((req, res) => {
    const url = new URL(req.url ?? "/", "http://localhost");
    if (url.pathname === EVENTS_PATH) return hub.attach(res);
    if (req.method !== "GET" && req.method !== "HEAD") {
      res.writeHead(405, { allow: "GET, HEAD" }).end();
      return;
    }
    let path: string;
    try {
      path = posix.normalize(decodeURIComponent(url.pathname));
    } catch {
      res.writeHead(400).end("bad path");
      return;
    }
    if (path.split("/").includes("..") || path.includes("\0")) {
      res.writeHead(400).end("bad path");
      return;
    }
    let file = join(base, ...path.split("/").filter(Boolean));
    try {
      if (statSync(file).isDirectory()) {
        if (!path.endsWith("/")) {
          res.writeHead(301, { location: `${url.pathname}/${url.search}` }).end();
          return;
        }
        file = join(file, "index.html");
      }
      let body: Buffer | string = readFileSync(file);
      const type = TYPES[extname(file).toLowerCase()] ?? "application/octet-stream";
      if (type.startsWith("text/html")) body = injectLiveReload(body.toString("utf8"));
      res.writeHead(200, { "content-type": type, "cache-control": "no-store", "content-length": Buffer.byteLength(body) });
      res.end(req.method === "HEAD" ? undefined : body);
    } catch {
      res.writeHead(404, { "content-type": "text/html; charset=utf-8", "cache-control": "no-store" });
      res.end(injectLiveReload(`<!doctype html><title>Not found</title><p>No file at ${path.replace(/[<&]/g, "")} in the built site.</p>`));
    }
  });
}
