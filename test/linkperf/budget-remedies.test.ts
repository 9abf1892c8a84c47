import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { analyzeStudy } from "../../src/analysis/analyze-study.ts";
import { loadStudy } from "../../src/study/load-study.ts";
import { expectClose } from "../helpers/expect-close.ts";
import { TINY_STUDY, writeStudy } from "../helpers/tiny-study.ts";

const root = mkdtempSync(join(tmpdir(), "ridgeline-budget-"));
afterAll(() => rmSync(root, { recursive: true, force: true }));

async function firstLink(id: string, yaml: string) {
  return (await analyzeStudy(loadStudy(writeStudy(root, id, yaml)))).result.links[0];
}

describe("budget details per end", () => {
  it("radome, connectors and the waveguide run (length × dB/100 m) come off the received level; wet radomes only off the rain margin", async () => {
    const plain = await firstLink("plain", TINY_STUDY);
    const detailed = await firstLink(
      "detailed",
      TINY_STUDY.replace("from: { site: A, antenna_m: 30, gain_dbi: 34, feeder_loss_db: 1 }", "from: { site: A, antenna_m: 30, gain_dbi: 34, feeder_loss_db: 1, radome_loss_db: 0.4, wet_radome_loss_db: 2, connector_loss_db: 0.3, waveguide_m: 60, waveguide_loss_db_per_100m: 4.5 }").replace(
        "to: { site: B, antenna_m: 30, gain_dbi: 34, feeder_loss_db: 1 }",
        "to: { site: B, antenna_m: 30, gain_dbi: 34, feeder_loss_db: 1, radome_loss_db: 0.6, wet_radome_loss_db: 1.5, waveguide_m: 20, waveguide_loss_db_per_100m: 4.5 }",
      ),
    );
    const tx = 0.4 + 0.3 + (60 * 4.5) / 100;
    const rx = 0.6 + (20 * 4.5) / 100;
    expectClose(plain.received_dbm! - detailed.received_dbm!, tx + rx, { abs: 1e-9 }, "received level");
    expectClose(detailed.budget!.tx_waveguide_loss_db as number, 2.7, { abs: 1e-12 }, "60 m × 4.5 dB/100 m");
    expectClose(detailed.budget!.rain_fade_margin_db as number, detailed.fade_margin_db! - 3.5, { abs: 1e-9 }, "rain margin");
    expectClose(plain.ends.from.eirp_dbm - detailed.ends.from.eirp_dbm, tx, { abs: 1e-9 }, "EIRP");
  });
});

describe("remedies and capacity targets", () => {
  it("a link short of its availability gets a remedy sized in dB; one that meets its targets gets none", async () => {
    const ok = await firstLink("ok", TINY_STUDY);
    expect(ok.target_met).toBe(true);
    expect(ok.remedies).toEqual([]);
    const rainy = await firstLink("rainy", `${TINY_STUDY.replace("frequency_ghz: 6", "frequency_ghz: 38")}climate:\n  rain_rate_mm_h: 120\n`);
    expect(rainy.objectives!.availability.met).toBe(false);
    const fix = rainy.remedies!.find((r) => r.issue.startsWith("long outage"));
    expect(fix?.fix).toMatch(/about \d+\.\d dB more rain fade margin/);
  });

  it("a capacity target may name a mode: met when that mode or a better one is available that long", async () => {
    const modes = "    modes:\n      - { name: QPSK, capacity_mbps: 40, rx_threshold_dbm: -84 }\n      - { name: 64-QAM, capacity_mbps: 120, rx_threshold_dbm: -75 }\n      - { name: 4096-QAM, capacity_mbps: 250, rx_threshold_dbm: -20 }\n";
    const base = TINY_STUDY.replace("    rx_threshold_dbm: -75\n", `    rx_threshold_dbm: -84\n${modes}`);
    const met = await firstLink("mode-met", base.replace("    radio: r1\n", "    radio: r1\n    capacity_target: { mode: 64-QAM, availability_pct: 99.9 }\n"));
    expect(met.adaptive_modulation!.target).toMatchObject({ capacity_mbps: 120, mode: "64-QAM", met: true });
    const missed = await firstLink("mode-missed", base.replace("    radio: r1\n", "    radio: r1\n    capacity_target: { mode: 4096-QAM, availability_pct: 99.9 }\n"));
    expect(missed.adaptive_modulation!.target!.met).toBe(false);
    expect(missed.target_met).toBe(false);
    expect(missed.remedies!.some((r) => r.issue.includes("Mbit/s"))).toBe(true);
  });
});
