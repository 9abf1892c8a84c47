import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { expectClose } from "../helpers/expect-close.ts";
import { readP1812Cases, readP1812Profile } from "../helpers/itu-p1812-fixtures.ts";
import { readP452Cases, readP452Profile } from "../helpers/itu-p452-fixtures.ts";
import { runCli } from "../helpers/run-cli.ts";

// `ridgeline path --method p1812|p452` (issue 12 §3, issue 14 §3): a published validation case
// written as a surveyed profile CSV with the clutter_class / clutter_height_m / zone columns,
// run through the command as a user would, gives the published Lb (and Ep) within 0.01 dB.
// Sources: test/fixtures/itu/p1812/README.md, test/fixtures/itu/p452/README.md.

let dir: string;
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), "ridgeline-itu-path-"));
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const CLASS = ["", "water", "open", "suburban", "urban", "dense_urban"];
const ZONE: Record<number, string> = { 1: "sea", 3: "coastal", 4: "inland" };

function csvOf(d_km: Float64Array, h_m: Float64Array, R: Float64Array, zone: Uint8Array, classCode?: Uint8Array): string {
  const rows = ["distance_m,elevation_m,clutter_class,clutter_height_m,zone"];
  for (let i = 0; i < d_km.length; i++) rows.push(`${d_km[i] * 1000},${h_m[i]},${CLASS[classCode ? classCode[i] : 2]},${R[i]},${ZONE[zone[i]]}`);
  return rows.join("\n") + "\n";
}

describe("ridgeline path --method p1812", () => {
  // b2iseac_rural_land_10km: 10 km, uneven spacing, clutter 0–15 m, inland; p = 1, 10, 50 %
  const cases = readP1812Cases().filter((c) => c.profile === "b2iseac_rural_land_10km.csv");
  const prof = readP1812Profile("b2iseac_rural_land_10km.csv");

  it.each(cases.map((c) => [c.name, c]))("%s: the published Lb and Ep within 0.01 dB", (_n, c) => {
    const v = (k: string) => (c as (typeof cases)[number]).values.get(k)!;
    const csv = join(dir, "p1812.csv");
    writeFileSync(csv, csvOf(prof.d_km, prof.h_m, prof.clutter_height_m, prof.zone, prof.clutter_code));
    const r = runCli([
      "path", "--from", `${v("phi_t (deg)")},${v("lam_t (deg)")}`, "--to", `${v("phi_r (deg)")},${v("lam_r (deg)")}`, "--profile", csv,
      "--frequency-ghz", String(v("f (GHz)")), "--from-antenna-m", String(v("htg (m)")), "--to-antenna-m", String(v("hrg (m)")), "--polarization", v("pol") === 2 ? "v" : "h",
      "--method", "p1812", "--time-pct", String(v("p (%)")), "--dn", String(v("DN")), "--n0", String(v("N0")), "--json",
    ]);
    expect(r.status, r.stderr).toBe(0);
    const link = JSON.parse(r.stdout);
    expectClose(link.basic_transmission_loss_db, v("Lb (dB)"), { abs: 0.01 }, "Lb");
    expectClose(link.field_strength_dbuv_m, v("Ep (dBuV/m)"), { abs: 0.01 }, "Ep");
    expect(link.propagation_method.recommendation).toBe("ITU-R P.1812-6");
    expect(link.propagation_method.defaults_used.join(" ")).not.toMatch(/ΔN|N0 =|zone inland/);
  });

  it("states the defaults it used: ΔN 45, N0 325, inland, open", () => {
    const r = runCli(["path", "--from", "50,-4", "--to", "50.02,-3.97", "--terrain", "constant:50", "--frequency-ghz", "0.6", "--from-antenna-m", "30", "--to-antenna-m", "10", "--method", "p1812", "--time-pct", "50", "--json"]);
    expect(r.status, r.stderr).toBe(0);
    const link = JSON.parse(r.stdout);
    const text = link.propagation_method.defaults_used.join("; ");
    for (const s of ["ΔN = 45", "N0 = 325", "inland", "open"]) expect(text).toContain(s);
    expect(link.basic_transmission_loss_db).toBeGreaterThan(90);
    const plain = runCli(["path", "--from", "50,-4", "--to", "50.02,-3.97", "--terrain", "constant:50", "--frequency-ghz", "0.6", "--from-antenna-m", "30", "--to-antenna-m", "10", "--method", "p1812", "--time-pct", "50"]);
    expect(plain.stdout).toMatch(/Basic transmission loss\s+\d+\.\d\d dB/);
    expect(plain.stdout).toMatch(/Defaults used .*ΔN = 45/);
  });
});

describe("ridgeline path --method p452", () => {
  // flat_land_100km and land_70km, a few frequencies and time percentages each
  const pick = readP452Cases().filter((c) => (c.profile_file === "test_profile_land_70km.csv" && ["0.01", "1", "50"].includes(c["p (%)"]) && c["f (GHz)"] === "2") || (c.profile_file === "test_profile_flat_land_100km.csv" && c["p (%)"] === "10" && ["0.5", "20"].includes(c["f (GHz)"])));

  it.each(pick.map((row) => ({ file: row.profile_file, f: row["f (GHz)"], p: row["p (%)"], row })))("$file, $f GHz, $p %: the published Lb within 0.01 dB", ({ file, row }) => {
    const prof = readP452Profile(file);
    const csv = join(dir, "p452.csv");
    writeFileSync(csv, csvOf(prof.d_km, prof.h_m, prof.clutter_height_m, prof.zone));
    const r = runCli([
      "path", "--from", `${row["phit_n (deg)"]},${row["phit_e (deg)"]}`, "--to", `${row["phir_n (deg)"]},${row["phir_e (deg)"]}`, "--profile", csv,
      "--frequency-ghz", row["f (GHz)"], "--from-antenna-m", row["htg (m)"], "--to-antenna-m", row["hrg (m)"], "--polarization", row["pol (1-h/2-v)"] === "2" ? "v" : "h",
      "--from-gain-dbi", row["Gt (dBi)"], "--to-gain-dbi", row["Gr (dBi)"], "--method", "p452", "--time-pct", row["p (%)"],
      "--coast-km", `${row["dct (km)"]},${row["dcr (km)"]}`, "--pressure-hpa", row["press (hPa)"], "--temperature-c", row["temp (deg C)"], "--dn", row.DN, "--n0", row.N0, "--json",
    ]);
    expect(r.status, r.stderr).toBe(0);
    const link = JSON.parse(r.stdout);
    expectClose(link.basic_transmission_loss_db, Number(row.Lb), { abs: 0.01 }, "Lb");
    expect(link.field_strength_dbuv_m).toBeUndefined();
    expect(link.propagation_method.recommendation).toBe("ITU-R P.452-18");
  });
});

describe("ridgeline path --method: bad input exits 2 naming the flag and the allowed range", () => {
  const base = ["path", "--from", "50,-4", "--to", "50.02,-3.97", "--terrain", "constant:50", "--from-antenna-m", "30", "--to-antenna-m", "10"];
  it.each([
    { case: "p1812 above 6 GHz", args: ["--frequency-ghz", "7", "--method", "p1812", "--time-pct", "10"], want: /--frequency-ghz: received "7"; expected 0\.03–6 GHz/ },
    { case: "p1812 below 30 MHz", args: ["--frequency-ghz", "0.02", "--method", "p1812", "--time-pct", "10"], want: /--frequency-ghz.*0\.03–6 GHz/ },
    { case: "p1812 p above 50 %", args: ["--frequency-ghz", "0.6", "--method", "p1812", "--time-pct", "60"], want: /--time-pct: received "60"; expected a time percentage from 1 to 50 %/ },
    { case: "p1812 p below 1 %", args: ["--frequency-ghz", "0.6", "--method", "p1812", "--time-pct", "0.5"], want: /--time-pct.*1 to 50 %/ },
    { case: "p1812 pL outside 1–99 %", args: ["--frequency-ghz", "0.6", "--method", "p1812", "--time-pct", "10", "--location-pct", "99.5"], want: /--location-pct: received "99.5"; expected a location percentage from 1 to 99 %/ },
    { case: "p1812 without --time-pct", args: ["--frequency-ghz", "0.6", "--method", "p1812"], want: /--time-pct is required/ },
    { case: "p452 above 50 GHz", args: ["--frequency-ghz", "60", "--method", "p452", "--time-pct", "10"], want: /--frequency-ghz: received "60"; expected 0\.1–50 GHz/ },
    { case: "p452 p below 0.001 %", args: ["--frequency-ghz", "6", "--method", "p452", "--time-pct", "0.0001"], want: /--time-pct.*0\.001 to 50 %/ },
    { case: "p452 bad coast distances", args: ["--frequency-ghz", "6", "--method", "p452", "--time-pct", "1", "--coast-km", "5"], want: /--coast-km: received "5"; expected TX,RX/ },
    { case: "location % with p452", args: ["--frequency-ghz", "6", "--method", "p452", "--time-pct", "1", "--location-pct", "90"], want: /--location-pct applies only with --method p1812/ },
    { case: "time % without a method", args: ["--frequency-ghz", "6", "--time-pct", "1"], want: /--time-pct applies only with --method p1812 or p452/ },
    { case: "unknown method", args: ["--frequency-ghz", "6", "--method", "p9999", "--time-pct", "1"], want: /--method: received "p9999"; expected one of .*p1812, p452/ },
  ])("$case", (c) => {
    const r = runCli([...base, ...c.args]);
    expect(r.status, r.stdout).toBe(2);
    expect(r.stderr).toMatch(c.want);
    expect(r.stderr).not.toMatch(/\n\s+at /);
  });

  it("a profile CSV with an unknown clutter class names the file, line and column", () => {
    const csv = join(dir, "bad.csv");
    writeFileSync(csv, "distance_m,elevation_m,clutter_class\n0,10,open\n500,12,forest\n1000,10,open\n");
    const r = runCli(["path", "--from", "50,-4", "--to", "50.006,-3.995", "--profile", csv, "--frequency-ghz", "0.6", "--from-antenna-m", "30", "--to-antenna-m", "10", "--method", "p1812", "--time-pct", "10"]);
    expect(r.status).toBe(2);
    expect(r.stderr).toContain(`${csv}:3:3: unknown value (column clutter_class), received "forest"; expected one of water, open, suburban, urban, dense_urban`);
  });
});
