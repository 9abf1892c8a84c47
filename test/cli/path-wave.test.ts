import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import sharp from "sharp";
import { afterAll, describe, expect, it } from "vitest";
import { writeGeoTiff } from "../../src/geo/geotiff-writer.ts";
import { freeSpaceLossDb } from "../../src/physics/free-space-loss.ts";
import { expectClose } from "../helpers/expect-close.ts";
import { runCliInProcess as runCli } from "../helpers/run-cli.ts";

const dir = mkdtempSync(join(tmpdir(), "ridgeline-path-wave-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const common = ["--frequency-ghz", "11", "--from-antenna-m", "30", "--to-antenna-m", "20", "--from-gain-dbi", "36", "--method", "wave", "--json"];

describe("ridgeline path --method wave", () => {
  it("works over a constant sea and writes the field image with --field", async () => {
    const png = join(dir, "field.png");
    const r = await runCli(["path", "--from", "-41.0,-32.0", "--to", "-41.08,-32.05", "--terrain", "constant:0", ...common, "--field", png]);
    expect(r.code, r.stderr).toBe(0);
    const link = JSON.parse(r.stdout);
    expect(link.wave.status).toBe("ok");
    expectClose(link.basic_transmission_loss_db, freeSpaceLossDb(link.distance_m, 11) + link.excess_loss_db, { abs: 1e-9 });
    expect(Number.isFinite(link.excess_loss_db)).toBe(true);
    const meta = await sharp(readFileSync(png)).metadata();
    expect(meta.format).toBe("png");
    expect(meta.width).toBeGreaterThan(800);
  });

  it("works on a terrain file (a GeoTIFF with a ridge across the path)", async () => {
    const n = 200;
    const cell = 1 / 1200; // 3″
    const data = new Float32Array(n * n);
    for (let r = 0; r < n; r++) for (let c = 0; c < n; c++) data[r * n + c] = 100 + 140 * Math.exp(-(((c - 100) / 6) ** 2));
    const tif = join(dir, "ridge.tif");
    writeGeoTiff(tif, { width: n, height: n, data, geoTransform: [-32.1, cell, 0, -40.9, 0, -cell], epsg: 4326, nodata: -9999 });
    const r = await runCli(["path", "--from", "-40.98,-32.09", "--to", "-40.98,-31.95", "--terrain", tif, ...common]);
    expect(r.code, r.stderr).toBe(0);
    const link = JSON.parse(r.stdout);
    expect(link.excess_loss_db).toBeGreaterThan(5);
    expect(Number.isFinite(link.basic_transmission_loss_db)).toBe(true);
  });

  it("works on a surveyed profile", async () => {
    const csv = join(dir, "profile.csv");
    const rows = ["distance_m,elevation_m"];
    for (let i = 0; i <= 300; i++) rows.push(`${i * 30},${(50 + 30 * Math.sin(i / 20)).toFixed(2)}`);
    writeFileSync(csv, rows.join("\n"));
    const r = await runCli(["path", "--from", "-41.0,-32.0", "--to", "-41.08,-32.05", "--profile", csv, ...common]);
    expect(r.code, r.stderr).toBe(0);
    const link = JSON.parse(r.stdout);
    expect(link.wave.status).toBe("ok");
    expect(Number.isFinite(link.excess_loss_db)).toBe(true);
  });

  it("refuses a grid above the memory limit, naming the limit and the flag that changes it (exit 2)", async () => {
    const r = await runCli(["path", "--from", "-41.0,-32.0", "--to", "-41.08,-32.05", "--terrain", "constant:0", ...common, "--wave-memory-mib", "0.1"]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/needs [\d.]+ MiB, above the limit of 0\.1 MiB/);
    expect(r.stderr).toContain("--wave-memory-mib");
    expect(r.stderr).not.toMatch(/\n\s+at /);
  });

  it("warns when the geometry needs angles beyond the parabolic approximation's 15° limit", async () => {
    const csv = join(dir, "steep.csv");
    const rows = ["distance_m,elevation_m"];
    for (let i = 0; i <= 40; i++) rows.push(`${i * 25},${i < 20 ? 0 : 400}`);
    writeFileSync(csv, rows.join("\n"));
    const r = await runCli(["path", "--from", "-41.0,-32.0", "--to", "-41.009,-32.0", "--profile", csv, "--frequency-ghz", "2", "--from-antenna-m", "10", "--to-antenna-m", "10", "--method", "wave", "--json"]);
    expect(r.code, r.stderr).toBe(0);
    const link = JSON.parse(r.stdout);
    expect(link.warnings.join("\n")).toMatch(/beyond the 15° limit of the wide-angle parabolic approximation/);
  });
});
