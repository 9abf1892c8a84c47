import { spawn, type ChildProcessWithoutNullStreams } from "node:child_process";
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { PROJECT_ROOT } from "../helpers/run-cli.ts";
import { smallStudyYaml, writeSmallStudy } from "./small-study.ts";

// Issue 6: `serve` builds, serves the site on 127.0.0.1, rebuilds on change using the cache and
// tells open pages to reload; the reload script is added to responses only, never to the files.

let tmp: string;
let child: ChildProcessWithoutNullStreams;
let stderr = "";
let url = "";

const waitFor = async (what: () => boolean, ms: number, label: string) => {
  const t0 = Date.now();
  while (!what()) {
    if (Date.now() - t0 > ms) throw new Error(`timed out waiting for ${label}; serve said:\n${stderr}`);
    await new Promise((r) => setTimeout(r, 50));
  }
};

beforeAll(async () => {
  tmp = mkdtempSync(join(tmpdir(), "ridgeline-serve-"));
  writeSmallStudy(join(tmp, "studies"), "ridge");
  child = spawn(process.execPath, [join(PROJECT_ROOT, "bin/ridgeline.js"), "serve", "--port", "0", "--studies-dir", join(tmp, "studies"), "--out", join(tmp, "site"), "--cache-dir", join(tmp, "cache")], { cwd: PROJECT_ROOT });
  let stdout = "";
  child.stdout.on("data", (c) => (stdout += c));
  child.stderr.on("data", (c) => (stderr += c));
  await waitFor(() => /http:\/\/127\.0\.0\.1:\d+\//.test(stdout), 60_000, "the server address");
  url = /http:\/\/127\.0\.0\.1:\d+\//.exec(stdout)![0];
}, 90_000);
afterAll(() => {
  if (child.exitCode === null) child.kill("SIGKILL");
  rmSync(tmp, { recursive: true, force: true });
});

describe("ridgeline serve", () => {
  it("serves the built site with the live-reload script added to responses only", async () => {
    expect(stderr).toMatch(/0 of 3 links from cache/);
    const res = await fetch(`${url}studies/ridge/links/a-b/`);
    expect(res.status).toBe(200);
    const html = await res.text();
    expect(html).toContain("ridgeline serve: live reload");
    expect(readFileSync(join(tmp, "site", "studies", "ridge", "links", "a-b", "index.html"), "utf8")).not.toContain("live reload");
    expect((await fetch(`${url}studies/ridge/results.json`)).headers.get("content-type")).toMatch(/application\/json/);
    expect((await fetch(`${url}..%2f..%2fetc/passwd`)).status).toBeGreaterThanOrEqual(400);
  });

  it("rebuilds on change from the cache and tells the browser to reload", async () => {
    const res = await fetch(`${url}__ridgeline/events`);
    const reader = res.body!.getReader();
    let events = "";
    const reading = (async () => {
      for (;;) {
        const { value, done } = await reader.read();
        if (done) return;
        events += new TextDecoder().decode(value);
      }
    })();
    await waitFor(() => events.includes(": connected"), 10_000, "the event stream");
    writeFileSync(join(tmp, "studies", "ridge", "study.yaml"), smallStudyYaml({ antennaAB: 33 }));
    await waitFor(() => events.includes("event: reload"), 60_000, "a reload event");
    expect(stderr).toMatch(/2 of 3 links from cache/);
    const html = await (await fetch(`${url}studies/ridge/links/a-b/`)).text();
    expect(html).toMatch(/>33(\.0)?</); // the new antenna height is on the page
    await reader.cancel();
    await reading.catch(() => undefined);
  }, 90_000);

  it("stops on SIGTERM with exit code 0", async () => {
    const exited = new Promise<number | null>((r) => child.on("exit", (code) => r(code)));
    child.kill("SIGTERM");
    expect(await exited).toBe(0);
  }, 30_000);
});
