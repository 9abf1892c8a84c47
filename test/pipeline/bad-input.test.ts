import { existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync, statSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { writeHgtTile } from "../../src/terrain/write-hgt.ts";
import { runCli } from "../helpers/run-cli.ts";
import { TINY_STUDY, writeStudy } from "../helpers/tiny-study.ts";

// Each bad study must give a one-screen message naming file:line, the field, the value
// received and what is expected; exit code 2; no stack trace. (Issue: foundation, acceptance.)

let root: string;
beforeAll(() => {
  root = mkdtempSync(join(tmpdir(), "ridgeline-bad-"));
});
afterAll(() => rmSync(root, { recursive: true, force: true }));

const sub = (from: string, to: string) => {
  if (!TINY_STUDY.includes(from)) throw new Error(`test fixture does not contain ${from}`);
  return TINY_STUDY.replace(from, to);
};

interface Case {
  name: string;
  yaml: string;
  extra?: Record<string, string | Buffer>;
  /** Text the message must contain (besides file:line). */
  expect: (string | RegExp)[];
  line?: number;
}

const cases: Case[] = [
  { name: "YAML syntax", yaml: sub("  - id: B\n    name: Bravo", "  - id: B\n   name: Bravo: x"), expect: [/YAML/] },
  { name: "missing field", yaml: sub("client: Test client\n", ""), expect: ["client", "required"] },
  { name: "wrong type or unit", yaml: sub("from: { site: A, antenna_m: 30,", 'from: { site: A, antenna_m: "30 m",'), expect: ["links[0].from.antenna_m", '"30 m"', "number"], line: 24 },
  { name: "latitude 95", yaml: sub("lat_deg: -33.4500", "lat_deg: 95"), expect: ["sites[0].lat_deg", "95", "≤ 90"], line: 16 },
  { name: "negative antenna height", yaml: sub("to: { site: B, antenna_m: 30", "to: { site: B, antenna_m: -5"), expect: ["links[0].to.antenna_m", "-5", "≥ 0"], line: 25 },
  { name: "unknown site in a link", yaml: sub("to: { site: B,", "to: { site: C,"), expect: ["links[0].to.site", '"C"', "A, B"], line: 25 },
  { name: "duplicate ids", yaml: sub("  - id: B\n", "  - id: A\n"), expect: ["sites[1].id", '"A"', "sites[0] already has it"], line: 18 },
  {
    name: "bad row in a profile CSV",
    yaml: sub("    radio: r1\n", "    radio: r1\n    profile_csv: profile.csv\n"),
    extra: { "profile.csv": "distance_m,elevation_m\n0,50\n100,5x1\n200,52\n" },
    expect: ["profile.csv:3", "elevation_m", "5x1"],
  },
  { name: "missing terrain file", yaml: sub("  constant_m: 50", "  file: dem/N00W071.hgt"), expect: ["terrain.file", "dem/N00W071.hgt", "exists"], line: 7 },
  { name: "site outside the DEM", yaml: sub("  constant_m: 50", "  file: S34W071.hgt").replace("lon_deg: -70.6000", "lon_deg: -69.5000"), expect: ["sites[1]", "-69.5", "S34W070.hgt"], line: 20 },
  {
    name: "path leaving the DEM",
    // Both sites on tile S34W071 near its southern edge; the geodesic between them bows ~90 m
    // poleward (south) mid-path and crosses into S35W071, which is missing.
    yaml: sub("  constant_m: 50", "  file: dem").replace("lat_deg: -33.4500", "lat_deg: -33.9995").replace("lon_deg: -70.6600", "lon_deg: -70.9500").replace("lat_deg: -33.5000", "lat_deg: -33.9995").replace("lon_deg: -70.6000", "lon_deg: -70.0500"),
    expect: ["links[0] (a-b)", "leaves the terrain", "S35W071.hgt"],
  },
  { name: "frequency 0", yaml: sub("frequency_ghz: 6", "frequency_ghz: 0"), expect: ["radios[0].frequency_ghz", "0", "≥ 0.03"], line: 10 },
  { name: "empty study", yaml: "# nothing here yet\n", expect: ["empty study"] },
  { name: "unknown field", yaml: sub("    radio: r1\n", "    radio: r1\n    polarisation: v\n"), expect: ["links[0].polarisation", "unknown field"], line: 27 },
];

describe("bad study files give a clear message and exit 2", () => {
  beforeAll(() => {
    // A small 3″ DEM tile for the study whose site lies outside it.
    const dir = join(root, "site-outside-the-DEM");
    if (!existsSync(dir)) {
      writeStudy(root, "site-outside-the-DEM", "");
      writeHgtTile(join(dir, "S34W071.hgt"), -34, -71, 3, () => 50);
    }
    const dem = join(root, "path-leaving-the-DEM", "dem");
    if (!existsSync(dem)) {
      mkdirSync(dem, { recursive: true });
      writeHgtTile(join(dem, "S34W071.hgt"), -34, -71, 3, () => 50);
    }
  });

  it.each(cases)("$name", (c) => {
    const id = c.name.replace(/\W+/g, "-");
    writeStudy(root, id, c.yaml, c.extra);
    const r = runCli(["check", "--studies-dir", root, id]);
    expect(r.status, r.stderr).toBe(2);
    const msg = r.stderr;
    expect(msg).toMatch(new RegExp(`${id}/(study\\.yaml|profile\\.csv):\\d+`));
    if (c.line !== undefined) expect(msg).toContain(`study.yaml:${c.line}:`);
    for (const e of c.expect) {
      if (typeof e === "string") expect(msg).toContain(e);
      else expect(msg).toMatch(e);
    }
    expect(msg).not.toMatch(/\n\s+at .+:\d+:\d+\)?\n/); // no stack trace
    expect(msg.split("\n").length).toBeLessThanOrEqual(24); // one screen
  });
});

describe("a failed build leaves the previous site as it was", () => {
  it("keeps _site byte for byte when a study breaks", () => {
    const studies = join(root, "build-root");
    writeStudy(studies, "tiny", TINY_STUDY);
    const out = join(root, "site-out");
    const ok = runCli(["build", "--studies-dir", studies, "--out", out]);
    expect(ok.status, ok.stderr).toBe(0);
    const page = join(out, "studies", "tiny", "index.html");
    const before = readFileSync(page);
    const mtime = statSync(page).mtimeMs;
    writeStudy(studies, "tiny", sub("lat_deg: -33.4500", "lat_deg: 95"));
    const bad = runCli(["build", "--studies-dir", studies, "--out", out]);
    expect(bad.status).toBe(2);
    expect(readFileSync(page).equals(before)).toBe(true);
    expect(statSync(page).mtimeMs).toBe(mtime);
  });
});
