import type { ServerResponse } from "node:http";

/** Where the browser listens for rebuilds (Server-Sent Events). */
export const EVENTS_PATH = "/__ridgeline/events";

/**
 * The script `ridgeline serve` adds to every HTML response — never to the files in the site.
 * It reloads the page after a rebuild and shows a failed build's message in a banner.
 */
export const LIVE_RELOAD_SCRIPT = `<script>/* ridgeline serve: live reload (added when serving only; not in the built site) */
(() => {
  const es = new EventSource(${JSON.stringify(EVENTS_PATH)});
  es.addEventListener("reload", () => location.reload());
  es.addEventListener("failed", (e) => {
    let b = document.getElementById("ridgeline-serve-error");
    if (!b) {
      b = document.createElement("pre");
      b.id = "ridgeline-serve-error";
      b.style.cssText = "position:fixed;left:0;right:0;bottom:0;margin:0;padding:1em;background:#a3261b;color:#fff;white-space:pre-wrap;z-index:9999;max-height:50vh;overflow:auto;font:13px monospace";
      document.body.append(b);
    }
    b.textContent = "Rebuild failed — the page shows the last good build.\\n\\n" + JSON.parse(e.data);
  });
})();
</script>`;

/** Insert the live-reload script before </body> (or at the end). */
export function injectLiveReload(html: string): string {
  const at = html.lastIndexOf("</body>");
  return at < 0 ? html + LIVE_RELOAD_SCRIPT : html.slice(0, at) + LIVE_RELOAD_SCRIPT + html.slice(at);
}

/** The open event streams; `send` writes one event to all of them. */
export class LiveReloadHub {
  private readonly clients = new Set<ServerResponse>();

  /** Turn a response into an event stream and keep it until the browser goes away. */
  attach(res: ServerResponse): void {
    res.writeHead(200, { "content-type": "text/event-stream", "cache-control": "no-store", connection: "keep-alive" });
    res.write(": connected\n\n");
    this.clients.add(res);
    res.on("close", () => this.clients.delete(res));
  }

  send(event: "reload" | "failed", data: string): void {
    for (const res of this.clients) res.write(`event: ${event}\ndata: ${JSON.stringify(data)}\n\n`);
  }

  close(): void {
    for (const res of this.clients) res.end();
    this.clients.clear();
  }
}
