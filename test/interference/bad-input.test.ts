import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { runCli } from "../helpers/run-cli.ts";
import { studyHead, writeStudy } from "../helpers/tiny-study.ts";

// Bad frequency-plan and interference input: a clear message (file:line, field, value
// received, what would fix it), exit 2, no stack trace. (Issue 14, acceptance.)

const root = mkdtempSync(join(tmpdir(), "ridgeline-ifx-bad-"));
afterAll(() => rmSync(root, { recursive: true, force: true }));

const HEADER = "angle_deg,h_copolar_db,h_crosspolar_db,v_copolar_db,v_crosspolar_db";
const protection = "    interference: { co_channel_ci_db: 30, noise_figure_db: 5 }\n";
const study = (o: { protection?: boolean; plan?: string; pattern?: string; asked?: boolean }) =>
  `${studyHead("Interference input", "constant_m: 50")}${o.protection === false ? "" : protection}sites:
  - { id: A, name: Alpha, lat_deg: -33.45, lon_deg: -70.66 }
  - { id: B, name: Bravo, lat_deg: -33.50, lon_deg: -70.60 }
links:
  - id: a-b
    from: { site: A, antenna_m: 30, gain_dbi: 34, feeder_loss_db: 1${o.pattern ? `, pattern: ${o.pattern}` : ""} }
    to: { site: B, antenna_m: 30, gain_dbi: 34, feeder_loss_db: 1 }
    radio: r1
    frequency_plan: ${o.plan ?? "{ go_mhz: 6175, return_mhz: 6427, bandwidth_mhz: 28 }"}
${o.asked === false ? "" : "interference:\n  long_term_pct: 20\n"}`;

const cases: { name: string; yaml: string; extra?: Record<string, string>; expect: (string | RegExp)[]; line: number }[] = [
  {
    name: "overlapping go and return channels on one link",
    yaml: study({ plan: "{ go_mhz: 6175, return_mhz: 6190, bandwidth_mhz: 28 }", asked: false }),
    expect: ["links[0].frequency_plan.return_mhz", "6190", "does not overlap", "15 MHz apart"],
    line: 22,
  },
  {
    // the 6 GHz radio r1 with a channel typed in another band: losses would be computed at 6 GHz
    name: "a go channel far from the carrier",
    yaml: study({ plan: "{ go_mhz: 18175, return_mhz: 6427, bandwidth_mhz: 28 }", asked: false }),
    expect: ["links[0].frequency_plan.go_mhz", "18175", "within 20 % of radio r1's carrier", "4800–7200 MHz"],
    line: 22,
  },
  {
    name: "an envelope CSV that does not span 0–180°",
    yaml: study({ pattern: "{ envelope_csv: short.csv }" }),
    extra: { "short.csv": `${HEADER}\n0,0,30,0,30\n10,20,40,20,40\n90,50,60,50,60\n` },
    expect: ["short.csv", "links[0].from.pattern.envelope_csv", "0° to 90°", "spanning 0° to 180°"],
    line: 4,
  },
  {
    name: "a receiver with no C/I requirement while interference is asked",
    yaml: study({ protection: false }),
    expect: ["radios[0]", "no interference requirement", "co_channel_ci_db"],
    line: 9,
  },
];

describe("bad interference input exits 2 with a clear message", () => {
  for (const c of cases) {
    it(c.name, () => {
      const id = c.name.replace(/[^a-z]+/gi, "-");
      writeStudy(root, id, c.yaml, c.extra);
      const r = runCli(["check", "--studies-dir", root, id]);
      expect(r.status, r.stderr + r.stdout).toBe(2);
      for (const e of c.expect) expect(r.stderr).toMatch(typeof e === "string" ? e : e);
      expect(r.stderr).toMatch(new RegExp(`:${c.line}(:\\d+)?\\b`));
      expect(r.stderr).not.toMatch(/\n\s+at .+\(.+:\d+:\d+\)/); // no stack trace
    });
  }
});
