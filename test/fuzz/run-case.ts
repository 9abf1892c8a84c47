import { existsSync, readdirSync, statSync } from "node:fs";
import { join, relative } from "node:path";
import { analyzeStudies, type AnalyzedStudy } from "../../src/analysis/analyze-study.ts";
import { findStudies, loadStudies } from "../../src/analysis/load-all.ts";
import { RidgelineError } from "../../src/errors.ts";
import { removeTempDirs } from "../../src/temp-dirs.ts";
import { loadCoverageOutputStage } from "../../src/render/coverage-output-loader.ts";

/**
 * One fuzz case run in-process, as `ridgeline check` (analysis) or `ridgeline build` (analysis
 * and site) would, and its outcome:
 * - `success`: results, every one of them physically possible;
 * - `clean-error`: a RidgelineError (input, usage, terrain …) with a short message and no stack;
 * - `crash`: any other exception (what the CLI reports as an internal error, exit 70);
 * - `impossible`: results holding NaN, Infinity or "could not be computed", a negative loss,
 *   a received level above the transmitter's EIRP, or outputs that overwrite each other.
 * Hangs and running out of memory are judged by the parent process (fuzz.ts).
 */
export type Outcome = "success" | "clean-error" | "crash" | "impossible" | "hang";

export interface CaseResult {
  outcome: Outcome;
  /** The error message or the impossible finding (first line, cut to 300 characters). */
  detail: string;
}

const cut = (s: string) => s.split("\n").slice(0, 3).join(" | ").slice(0, 1000);

/** Run the study `id` under `studiesDir`; with `outDir`, build the site there too. */
export async function runCase(studiesDir: string, id: string, outDir: string | null): Promise<CaseResult> {
  try {
    const studies = await analyzeStudies(loadStudies(findStudies(studiesDir, [id])), { cache: null, coverageOutputs: loadCoverageOutputStage });
    const problem = impossibleInResults(studies);
    if (problem) return { outcome: "impossible", detail: problem };
    if (outDir) {
      const { buildSite } = await import("../../src/cli/build-site.ts");
      await buildSite(studies, { outDir });
      const clash = outputClash(studies, outDir);
      if (clash) return { outcome: "impossible", detail: clash };
    }
    return { outcome: "success", detail: "" };
  } catch (e) {
    if (e instanceof RidgelineError) {
      const msg = e.message;
      if (/\n\s+at .*:\d+:\d+/.test(msg)) return { outcome: "crash", detail: `stack trace in a user message: ${cut(msg)}` };
      if (msg.split("\n").length > 40) return { outcome: "crash", detail: `message longer than a screen: ${cut(msg)}` };
      return { outcome: "clean-error", detail: cut(msg) };
    }
    const err = e as Error;
    return { outcome: "crash", detail: cut(`${err?.name ?? typeof e}: ${err?.message ?? String(e)} ${err?.stack?.split("\n")[1]?.trim() ?? ""}`) };
  } finally {
    removeTempDirs();
  }
}

/** The first physically impossible value in the analysed studies, or null. */
export function impossibleInResults(studies: AnalyzedStudy[]): string | null {
  for (const s of studies) {
    const r = s.result;
    const bad = findNonFinite(r, "");
    if (bad) return `study ${r.id}: ${bad}`;
    const text = JSON.stringify(r);
    const word = /\b(NaN|Infinity|undefined)\b/.exec(text);
    if (word) return `study ${r.id}: the text "${word[0]}" in results: …${text.slice(Math.max(0, word.index - 80), word.index + 40)}…`;
    const pct = percentOutOfRange(r, "");
    if (pct) return `study ${r.id}: ${pct}`;
    for (const e of (r as { interference?: { entries: { receiver: string; transmitter: string; path_loss_long_term_db: number | null; path_loss_short_term_db: number | null }[] } | null }).interference?.entries ?? []) {
      for (const v of [e.path_loss_long_term_db, e.path_loss_short_term_db]) if (typeof v === "number" && v < 0) return `interference ${e.transmitter} → ${e.receiver}: negative path loss ${v} dB`;
    }
    for (const l of r.links) {
      for (const [k, v] of Object.entries(l.losses_db)) if (typeof v === "number" && v < 0) return `link ${l.id}: negative ${k} loss ${v} dB`;
      const eirp = l.ends.from.eirp_dbm;
      if (typeof l.received_dbm === "number" && l.received_dbm > eirp + l.ends.to.gain_dbi + 1e-9) return `link ${l.id}: received ${l.received_dbm} dBm above EIRP ${eirp} dBm + receive gain ${l.ends.to.gain_dbi} dBi`;
      if (!(l.distance_m > 0)) return `link ${l.id}: distance ${l.distance_m} m`;
    }
    const ids = new Set<string>();
    for (const l of r.links) {
      const k = l.id.toLowerCase();
      if (ids.has(k)) return `two links write to links/${l.id}/`;
      ids.add(k);
    }
    const cov = new Set<string>();
    for (const c of r.coverage) {
      const k = c.id.toLowerCase();
      if (cov.has(k)) return `two coverage maps named ${c.id}`;
      cov.add(k);
      const eirp = (c as { eirp_dbm?: number | null }).eirp_dbm;
      const max = (c as { level_max_dbm?: number | null }).level_max_dbm;
      if (typeof eirp === "number" && typeof max === "number" && max > eirp + 40 + 1e-9) return `coverage ${c.id}: level ${max} dBm above EIRP ${eirp} dBm + the largest receive gain`;
    }
  }
  return null;
}

/** Percentages of time or of a target (keys ending in _pct) outside 0–100 %; p0, an occurrence factor, may exceed 100. */
function percentOutOfRange(v: unknown, key: string): string | null {
  if (typeof v === "number") return /_pct$/.test(key) && key !== "multipath_occurrence_p0_pct" && (v < 0 || v > 100 + 1e-9) ? `${key} = ${v} %, outside 0–100 %` : null;
  if (Array.isArray(v)) {
    for (const x of v) {
      const p = percentOutOfRange(x, key);
      if (p) return p;
    }
    return null;
  }
  if (v && typeof v === "object" && !ArrayBuffer.isView(v)) {
    for (const [k, x] of Object.entries(v)) {
      const p = percentOutOfRange(x, k);
      if (p) return p;
    }
  }
  return null;
}

function findNonFinite(v: unknown, path: string): string | null {
  if (typeof v === "number") return Number.isFinite(v) ? null : `${path} = ${v}`;
  if (typeof v === "string") return /could not be computed/.test(v) ? `${path}: ${v}` : null;
  if (Array.isArray(v)) {
    for (let i = 0; i < v.length; i++) {
      const p = findNonFinite(v[i], `${path}[${i}]`);
      if (p) return p;
    }
    return null;
  }
  if (v && typeof v === "object" && !ArrayBuffer.isView(v)) {
    for (const [k, x] of Object.entries(v)) {
      const p = findNonFinite(x, path ? `${path}.${k}` : k);
      if (p) return p;
    }
  }
  return null;
}

/** Outputs that overwrite each other in a built site: a link page or coverage file too few. */
function outputClash(studies: AnalyzedStudy[], outDir: string): string | null {
  for (const s of studies) {
    const base = join(outDir, "studies", s.study.id);
    if (!existsSync(join(base, "index.html"))) return `no study page at ${relative(outDir, base)}/index.html`;
    const linkDir = join(base, "links");
    const pages = existsSync(linkDir) ? readdirSync(linkDir).filter((d) => statSync(join(linkDir, d)).isDirectory()).length : 0;
    if (pages !== s.result.links.length) return `${s.result.links.length} links but ${pages} link pages`;
    if (s.result.coverage.length) {
      const files = readdirSync(join(base, "coverage"));
      for (const c of s.result.coverage) if (!files.some((f) => f.startsWith(`${c.id}.`))) return `no output files for coverage ${c.id}`;
    }
  }
  return null;
}
