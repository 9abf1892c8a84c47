import { execFileSync } from "node:child_process";
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { chromium, type BrowserContext } from "playwright-core";
import { RidgelineError } from "../../errors.ts";

/** Flags for a quiet, offline, headless Chromium in containers and CI. */
export const CHROMIUM_ARGS = [
  "--headless",
  "--no-sandbox",
  "--disable-gpu",
  "--disable-quic",
  "--no-first-run",
  "--disable-background-networking",
  "--disable-component-update",
  "--disable-sync",
  "--disable-dev-shm-usage",
];

/** The system Chromium (`command -v chromium`); never a downloaded browser. */
export function chromiumPath(): string {
  try {
    const p = execFileSync("sh", ["-c", "command -v chromium"], { encoding: "utf8" }).trim();
    if (p) return p;
  } catch {
    // fall through to the error below
  }
  throw new RidgelineError("Chromium was not found on PATH. Install the system package, e.g. sudo apt-get install -y chromium, then run the command again.");
}

/** A Chromium context on a throw-away profile; `close()` ends the browser and deletes the profile. */
export async function launchChromium(options: { viewport?: { width: number; height: number } } = {}): Promise<{ context: BrowserContext; close: () => Promise<void> }> {
  const profile = mkdtempSync(join(tmpdir(), "ridgeline-chromium-"));
  const context = await chromium.launchPersistentContext(profile, { executablePath: chromiumPath(), args: CHROMIUM_ARGS, viewport: options.viewport ?? { width: 1280, height: 900 } });
  return {
    context,
    close: async () => {
      await context.close();
      rmSync(profile, { recursive: true, force: true });
    },
  };
}
