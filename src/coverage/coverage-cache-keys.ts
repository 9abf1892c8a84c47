import { createHash } from "node:crypto";
import sharp from "sharp";
import { toolIdentity } from "../cache/cache-keys.ts";
import { canonicalJson } from "../cache/canonical-json.ts";
import { modulesFingerprint } from "../cache/code-fingerprint.ts";
import { fileDigest } from "../cache/file-digest.ts";
import { resolve } from "node:path";
import type { CoverageInput, Study } from "../study/study.ts";

/**
 * The modules whose code computes a coverage, writes its files and lays out its cache entry;
 * the fingerprint follows their project imports (compute, kernel, render, GeoTIFF writer…).
 * The worker is named on its own: the threads load it by URL, not by an import; so is the
 * render stage that writes the files, which the caller hands in (coverage-output-stage.ts).
 */
const CODE = ["./analyze-coverage.ts", "./coverage-worker.ts", "./study-composite.ts", "./coverage-cache.ts", "../render/coverage-outputs.ts"].map((m) => new URL(m, import.meta.url).href);

/**
 * Versions of the libraries that encode the output files (libvips, libpng, librsvg and the
 * rest that sharp reports; Node's zlib for the GeoTIFF's Deflate strips): a different encoder
 * may write different bytes for the same raster, and a build must give the same bytes with
 * and without the cache.
 */
const encoders = (): Record<string, string> => ({ ...sharp.versions, node_zlib: process.versions.zlib });

const sha256 = (text: string): string => createHash("sha256").update(text).digest("hex");

/** The fingerprint of the coverage code that coverage keys cover (for the job queue's version check). */
export function coverageCodeFingerprint(): string {
  return modulesFingerprint(CODE);
}

/** Cache keys of a study's coverage maps. */
export interface CoverageKeyer {
  /** Key of one coverage entry's result, page figure, files and composite data. */
  entry(entry: CoverageInput): string;
  /** Key of the composite of the level coverages with these entry keys, in study order. */
  composite(memberKeys: readonly string[]): string;
}

/**
 * Cache keys of a study's coverage maps: sha256 over canonical JSON of everything a map's
 * numbers, pictures and files depend on — the tool (format, version, link code fingerprint),
 * the fingerprint of the coverage code, the encoders' versions, the terrain's source key, the
 * study's climate section (ground and atmosphere of the propagation methods), the coverage
 * entry as written (method, radio, radius, resolution, thresholds and their unit, pattern, id
 * — which names the files and titles the map) and its site's id, name (on the map and in the
 * KML) and position. Not its position in the list, other entries, links or other sites.
 * The composite's key is over the keys of its level coverages, in study order.
 */
export function coverageKeyer(study: Study, terrainKey: string): CoverageKeyer {
  const shared = sha256(canonicalJson(["coverage-shared", toolIdentity(), modulesFingerprint(CODE), encoders(), terrainKey, study.climate]));
  const siteOf = (id: string) => {
    const s = study.sites.find((x) => x.id === id);
    return s ? { id: s.id, name: s.name, lat_deg: s.lat_deg, lon_deg: s.lon_deg } : null;
  };
  // every site and link: the maps draw them and a P.1812 coverage tabulates the sites it serves
  const layout = sha256(canonicalJson([study.sites.map((s) => siteOf(s.id)), study.links.map((l) => [l.id, l.from.site, l.to.site])]));
  const digest = (file: string | undefined) => {
    if (!file) return null;
    try {
      return fileDigest(resolve(study.dir, file));
    } catch {
      return "unreadable"; // reported when the coverage is computed
    }
  };
  const inputs = (e: CoverageInput) => [digest(e.p1812?.land_cover?.file), digest(e.service_area)];
  return {
    entry: (entry) => sha256(canonicalJson(["coverage", shared, entry, siteOf(entry.site), layout, inputs(entry)])),
    composite: (memberKeys) => sha256(canonicalJson(["coverage-composite", shared, memberKeys])),
  };
}
