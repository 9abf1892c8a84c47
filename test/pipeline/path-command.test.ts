import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { runCli } from "../helpers/run-cli.ts";
import { expectClose, parseCsv } from "../helpers/expect-close.ts";
import { readFileSync } from "node:fs";

// `ridgeline path` (foundation issue §7, losses issue §8): one link object with the keys of
// a results.json link; southern/western coordinates as values; exit 0 whether or not a target
// is met, 2 on bad input.

let dir: string;
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), "ridgeline-path-"));
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const LINK_KEYS = ["id", "from", "to", "frequency_ghz", "distance_m", "azimuth_from_deg", "azimuth_to_deg", "profile", "clearance", "losses_db", "diffraction_db_by_method", "received_dbm", "fade_margin_db", "availability_pct", "target_met", "warnings"];

describe("ridgeline path", () => {
  it("prints one link object with the results.json keys, for southern and western coordinates", () => {
    const r = runCli(["path", "--from", "-33.45,-70.66", "--to", "-33.52,-70.58", "--terrain", "constant:520", "--frequency-ghz", "18", "--from-antenna-m", "25", "--to-antenna-m", "20", "--k", "4/3", "--k", "inf", "--rain-rate-mm-h", "50", "--tx-power-dbm", "20", "--from-gain-dbi", "38", "--to-gain-dbi", "38", "--rx-threshold-dbm", "-75", "--json"]);
    expect(r.status, r.stderr).toBe(0);
    const link = JSON.parse(r.stdout);
    for (const k of LINK_KEYS) expect(link, k).toHaveProperty(k);
    expect(Object.keys(link.losses_db).sort()).toEqual(["diffraction", "free_space", "gases", "rain_0_01pct"]);
    expect(Object.keys(link.diffraction_db_by_method).sort()).toEqual(["bullington", "delta_bullington", "deygout", "epstein_peterson", "knife_edge"]);
    expect(link.clearance.map((c: { k: unknown }) => c.k)).toEqual([4 / 3, "inf"]);
    // GeographicLib 2.1.2 `echo "-33.45 -70.66 -33.52 -70.58" | GeodSolve -i -p 6`:
    // azi1 136.26147261792°, azi2 136.21733511220°, s12 10749.832721 m.
    expectClose(link.distance_m, 10749.832721, { abs: 1e-3 }, "distance");
    expectClose(link.azimuth_from_deg, 136.26147261792, { abs: 1e-9 }, "azimuth from");
    expectClose(link.azimuth_to_deg, 136.2173351122 + 180, { abs: 1e-9 }, "azimuth to");
    expect(link.losses_db.rain_0_01pct).toBeGreaterThan(0);
    // Free space by P.525-4 eq. (4), exact constant.
    expectClose(link.losses_db.free_space, 20 * Math.log10((4 * Math.PI * link.distance_m * 18e9) / 299_792_458), { abs: 0.01 }, "free space");
  });

  it("without a rain rate there is no rain term and a warning says so", () => {
    const r = runCli(["path", "--from", "-33.45,-70.66", "--to", "-33.52,-70.58", "--terrain", "constant:0", "--frequency-ghz", "11", "--from-antenna-m", "30", "--to-antenna-m", "30", "--json"]);
    expect(r.status).toBe(0);
    const link = JSON.parse(r.stdout);
    expect(link.losses_db.rain_0_01pct).toBeNull();
    expect(link.warnings.join(" ")).toMatch(/rain/i);
  });

  it("uses a surveyed profile exactly as given", () => {
    const rows = ["distance_m,elevation_m,obstruction_m", "0,100,0", "137.5,101.25,0", "900,140,12", "2500,95.5,0", "4000,100,0"];
    const csv = join(dir, "survey.csv");
    writeFileSync(csv, rows.join("\n") + "\n");
    const r = runCli(["path", "--from", "10.0,-84.0", "--to", "10.02,-83.975", "--profile", csv, "--frequency-ghz", "6", "--from-antenna-m", "20", "--to-antenna-m", "20", "--json"]);
    expect(r.status, r.stderr).toBe(0);
    const link = JSON.parse(r.stdout);
    expect(link.profile.samples).toBe(5);
    expect(link.profile.source).toContain("surveyed");
    expect(link.ends.from.ground_m).toBe(100);
    expect(link.ends.to.ground_m).toBe(100);
    // The worst clearance sits on the surveyed sample with the trees (900 m), not a resampled one.
    const parsed = parseCsv(readFileSync(csv, "utf8"));
    expect(parsed.map((p) => Number(p.distance_m))).toContain(link.clearance[0].at_distance_m);
    expect(link.clearance[0].at_distance_m).toBe(900);
  });

  it("exits 0 when a target is missed (a blocked path)", () => {
    const rows = ["distance_m,elevation_m", "0,0", "2000,300", "4000,0"];
    const csv = join(dir, "blocked.csv");
    writeFileSync(csv, rows.join("\n") + "\n");
    const r = runCli(["path", "--from", "0,0", "--to", "0,0.036", "--profile", csv, "--frequency-ghz", "6", "--from-antenna-m", "10", "--to-antenna-m", "10", "--tx-power-dbm", "20", "--from-gain-dbi", "30", "--to-gain-dbi", "30", "--rx-threshold-dbm", "-75", "--json"]);
    expect(r.status).toBe(0);
    expect(JSON.parse(r.stdout).target_met).toBe(false);
  });

  it("regression: without budget inputs it shows losses only, no verdict (it assumed 0 dBm, 0 dBi and printed MISSED)", () => {
    const args = ["path", "--from", "-33.45,-70.66", "--to", "-33.52,-70.58", "--terrain", "constant:0", "--frequency-ghz", "11", "--from-antenna-m", "30", "--to-antenna-m", "30"];
    const json = runCli([...args, "--json"]);
    expect(json.status, json.stderr).toBe(0);
    const link = JSON.parse(json.stdout);
    expect(link.losses_only).toBe(true);
    expect(link.target_met).toBeNull();
    for (const k of ["received_dbm", "fade_margin_db", "availability_pct", "budget"]) expect(link, k).not.toHaveProperty(k);
    expect(link.losses_db.free_space).toBeGreaterThan(100);
    const table = runCli(args);
    expect(table.stdout).not.toMatch(/MISSED|Received level/);
    expect(table.stdout).toMatch(/Verdict\s+none: losses only/);
    expect(table.stdout).toMatch(/Frequency\s+11\.000 GHz/);
  });

  it("with a power but no threshold: received level, no verdict, defaults named", () => {
    const r = runCli(["path", "--from", "-33.45,-70.66", "--to", "-33.52,-70.58", "--terrain", "constant:0", "--frequency-ghz", "0.9", "--from-antenna-m", "30", "--to-antenna-m", "30", "--tx-power-dbm", "40", "--json"]);
    const link = JSON.parse(r.stdout);
    expect(typeof link.received_dbm).toBe("number");
    expect(link.target_met).toBeNull();
    expect(link.warnings.join(" ")).toMatch(/No --from-gain-dbi given: taken as 0 dBi/);
  });

  it.each([
    [["--from", "95,0"], /--from/],
    [["--frequency-ghz", "0"], /--frequency-ghz/],
    [["--k", "-1"], /--k/],
    [["--polarization", "x"], /--polarization/],
    [["--bogus", "1"], /Unknown option --bogus/],
  ])("bad input %j exits 2 with a message", (override, pattern) => {
    const base: Record<string, string> = { "--from": "-33.45,-70.66", "--to": "-33.52,-70.58", "--terrain": "constant:0", "--frequency-ghz": "11", "--from-antenna-m": "30", "--to-antenna-m": "30" };
    const args = Object.entries({ ...base, [override[0]]: override[1] }).flat();
    const r = runCli(["path", ...args]);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(pattern);
    expect(r.stderr).not.toMatch(/\n\s+at /);
  });
});
