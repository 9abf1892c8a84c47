// The links' wave solutions on threads (src/analysis/wave-pool.ts) give what this thread gives:
// the same results, figure data and cache entries, byte for byte, and the same failure.
// linkWave is pure, so any difference is a bug of the pool (order, a lost warning, a dropped
// field). The ground is invented (rolling hills from a fixed formula at S44W031).
import { mkdtempSync, readdirSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { analyzeLink } from "../../src/analysis/analyze-link.ts";
import { analyzeStudy, openStudyTerrain } from "../../src/analysis/analyze-study.ts";
import { solveLinkWave, type LinkWaveJob } from "../../src/analysis/link-wave-job.ts";
import { WAVE_THREADS_MIN_LINKS, WavePool, waveThreads } from "../../src/analysis/wave-pool.ts";
import { ResultCache } from "../../src/cache/result-cache.ts";
import { loadStudy } from "../../src/study/load-study.ts";
import type { Study } from "../../src/study/study.ts";
import { writeHgtTile } from "../../src/terrain/write-hgt.ts";
import { hillsM } from "../queue/queue-study.ts";
import { studyHead, writeStudy } from "../helpers/tiny-study.ts";

const root = mkdtempSync(join(tmpdir(), "ridgeline-wave-threads-"));
afterAll(() => rmSync(root, { recursive: true, force: true }));

/** Five links over hills (2-9 km, 6 GHz, both polarisations); the last is refused for its grid's work (a 120 km path at 80 GHz, 20 dBi antennas: a wide beam). */
function hillStudy(): Study {
  const file = writeStudy(
    root,
    "hills",
    `${studyHead("Wave threads test (synthetic terrain)", "file: S44W031.hgt")}  - id: r80
    frequency_ghz: 80
    tx_power_dbm: 15
    rx_threshold_dbm: -70
sites:
  - { id: A, name: Alpha, lat_deg: -43.90, lon_deg: -30.90 }
  - { id: B, name: Bravo, lat_deg: -43.93, lon_deg: -30.84 }
  - { id: C, name: Charlie, lat_deg: -43.86, lon_deg: -30.80 }
  - { id: D, name: Delta, lat_deg: -43.95, lon_deg: -30.95 }
  - { id: E, name: Echo, lat_deg: -43.05, lon_deg: -30.05 }
links:
  - { id: a-b, from: { site: A, antenna_m: 20, gain_dbi: 34, feeder_loss_db: 1 }, to: { site: B, antenna_m: 15, gain_dbi: 34, feeder_loss_db: 1 }, radio: r1 }
  - { id: a-c, from: { site: A, antenna_m: 12, gain_dbi: 30, feeder_loss_db: 1 }, to: { site: C, antenna_m: 25, gain_dbi: 30, feeder_loss_db: 1 }, radio: r1, polarization: h }
  - { id: b-d, from: { site: B, antenna_m: 30, gain_dbi: 36, feeder_loss_db: 1 }, to: { site: D, antenna_m: 10, gain_dbi: 36, feeder_loss_db: 1 }, radio: r1 }
  - { id: c-d, from: { site: C, antenna_m: 18, gain_dbi: 34, feeder_loss_db: 1 }, to: { site: D, antenna_m: 18, gain_dbi: 34, feeder_loss_db: 1 }, radio: r1 }
  - { id: d-e, from: { site: D, antenna_m: 30, gain_dbi: 20, feeder_loss_db: 1 }, to: { site: E, antenna_m: 30, gain_dbi: 20, feeder_loss_db: 1 }, radio: r80 }
`,
  );
  writeHgtTile(join(root, "hills", "S44W031.hgt"), -44, -31, 3, hillsM);
  return loadStudy(file);
}

/** The link entries of a cache folder (results, figure data, the study's packs): relative name → bytes. */
function linkEntriesOf(dir: string): Map<string, Buffer> {
  const out = new Map<string, Buffer>();
  for (const kind of ["link", "link-figure", "pack"]) {
    for (const e of readdirSync(join(dir, kind), { recursive: true, withFileTypes: true })) {
      const path = join(e.parentPath, e.name);
      if (e.isFile()) out.set(path.slice(dir.length), readFileSync(path));
    }
  }
  return out;
}

describe("wave solutions on threads", () => {
  it("gives the results and figure data of this thread, byte for byte, on a study with five wave links (one refused)", async () => {
    const study = hillStudy();
    const serial = await analyzeStudy(study, { waveWorkers: 0 });
    const pooled = await analyzeStudy(study, { waveWorkers: 2 });
    const waves = serial.result.links.map((l) => l.wave?.status);
    expect(waves).toEqual(["ok", "ok", "ok", "ok", "refused"]); // the study exercises both outcomes
    expect(serial.result.links[4].warnings.some((w) => w.startsWith("Wave solution not computed"))).toBe(true);
    expect(JSON.stringify(pooled.result)).toBe(JSON.stringify(serial.result));
    for (const l of study.links) expect(pooled.figures.get(l.id)).toStrictEqual(serial.figures.get(l.id));
  }, 60_000);

  it("stores the same cache entries (results, figure data, packs) as this thread", async () => {
    const study = hillStudy();
    const dirs = [0, 2].map((n) => [n, mkdtempSync(join(root, `cache-${n}-`))] as const);
    for (const [n, dir] of dirs) await analyzeStudy(study, { waveWorkers: n, cache: new ResultCache(dir) });
    const [a, b] = dirs.map(([, dir]) => linkEntriesOf(dir));
    expect(a.size).toBe(2 * 5 + 2);
    expect([...b.keys()].sort()).toEqual([...a.keys()].sort());
    for (const [name, bytes] of a) expect(b.get(name)!.equals(bytes), name).toBe(true);
  }, 60_000);

  it("rejects a job whose linkWave throws with the error linkWave throws in this thread", async () => {
    const study = hillStudy();
    const { wave } = analyzeLink(study, study.links[0], await openStudyTerrain(study), { deferWave: true });
    const job = { ...wave!, ends: {} } as unknown as LinkWaveJob; // no ends: linkWave reads ends.from.gain_dbi
    const here = (() => {
      try {
        solveLinkWave(study, job);
      } catch (e) {
        return e as Error;
      }
    })();
    expect(here).toBeInstanceOf(TypeError);
    const pool = WavePool.start(study, 1);
    try {
      const there = await pool.solve(job).then(
        () => null,
        (e: Error) => e,
      );
      expect([there?.constructor, there?.message]).toEqual([here!.constructor, here!.message]);
      // the thread goes on with the next job
      expect(JSON.stringify(await pool.solve(wave!))).toBe(JSON.stringify(solveLinkWave(study, wave!)));
    } finally {
      await pool.close();
    }
  }, 60_000);

  it("solves in this thread the jobs of a thread that dies (here: stopped while solving)", async () => {
    const study = hillStudy();
    const terrain = await openStudyTerrain(study);
    const jobs = study.links.slice(0, 3).map((l) => analyzeLink(study, l, terrain, { deferWave: true }).wave!);
    const pool = WavePool.start(study, 1);
    try {
      const solving = jobs.map((j) => pool.solve(j));
      void pool["threads"][0].worker.terminate(); // as if it had run out of memory
      const outcomes = await Promise.all(solving);
      expect(pool.size).toBe(0);
      expect(outcomes.map((o) => JSON.stringify(o))).toEqual(jobs.map((j) => JSON.stringify(solveLinkWave(study, j))));
    } finally {
      await pool.close();
    }
  }, 60_000);

  it("starts threads only for enough wave solutions, one a core at most one a job, or as many as asked", () => {
    expect(waveThreads(WAVE_THREADS_MIN_LINKS - 1)).toBe(0);
    expect(waveThreads(0, 2)).toBe(0);
    expect(waveThreads(5, 0)).toBe(0);
    expect(waveThreads(5, 2)).toBe(2);
    expect(waveThreads(1, 4)).toBe(1);
    const auto = waveThreads(100);
    expect(auto === 0 || auto >= 2).toBe(true); // none on a single core
  });
});
