import { createHash } from "node:crypto";
import { TOOL_VERSION } from "../analysis/provenance.ts";
import type { Study } from "../study/study.ts";
import { canonicalJson } from "./canonical-json.ts";
import { codeFingerprint } from "./code-fingerprint.ts";

/** Bump when the cache entry layout or what a key covers changes. */
export const CACHE_FORMAT = 5;

const sha256 = (text: string): string => createHash("sha256").update(text).digest("hex");

/** What every key starts with: format, tool version and the code fingerprint. */
function toolPart(): unknown[] {
  return [CACHE_FORMAT, TOOL_VERSION, codeFingerprint()];
}

/** The tool part of every key as one string (for keys built elsewhere). */
export function toolIdentity(): string {
  return canonicalJson(toolPart());
}

/**
 * Cache keys of a study's links: sha256 over everything a link's numbers depend on — the tool
 * (format, version, code fingerprint), the design and climate sections, the link's own input
 * (ends, radio id, polarisation, profile file name, availability override; not its position
 * in the list), its radio, its two sites, and either the terrain's source key (a link sampled
 * from the terrain) or the sha256 of its surveyed profile CSV's bytes (a link with a surveyed
 * profile, which never reads the terrain). The parts shared by every link are hashed once, and
 * each radio and site once: a link's key hashes their digests, not their text again.
 */
export function linkKeyer(study: Study, terrainKey: string): (link: Study["links"][number], profileCsvSha256: string | null) => string {
  const shared = canonicalJson(sha256(canonicalJson(["study-part", ...toolPart(), study.design, study.climate])));
  // Each radio and site as the sha256 of its canonical JSON, made once rather than once per
  // link; the key is the sha256 of ["link", shared, input, sha256(radio), sha256(from),
  // sha256(to), ground] in JSON.
  const digest = (v: unknown) => canonicalJson(sha256(canonicalJson(v)));
  const radios = new Map(study.radios.map((r) => [r.id, digest(r)]));
  const sites = new Map(study.sites.map((s) => [s.id, digest(s)]));
  return (link, profileCsvSha256) => {
    const { index: _index, ...input } = link;
    const ground = canonicalJson(link.profile_csv ? ["profile", profileCsvSha256] : ["terrain", terrainKey]);
    // The link's own input as JSON.stringify writes it: validated input holds only finite
    // numbers, strings and booleans, and its keys come in the schema's order (zod builds each
    // object from its shape), so equal inputs give equal text — at a third of canonicalJson's
    // cost, for every link on every build.
    const parts = [canonicalJson("link"), shared, JSON.stringify(input), radios.get(link.radio) ?? "null", sites.get(link.from.site) ?? "null", sites.get(link.to.site) ?? "null", ground];
    return sha256(`[${parts.join(",")}]`);
  };
}

/**
 * The cache key of a study's terrain facts (terrain description and the ground height under
 * each site): the tool, the terrain's source key, every site, and which sites terrain-sampled
 * links use (only those must lie on the terrain).
 */
export function terrainFactsKey(study: Study, terrainKey: string): string {
  const used = [...new Set(study.links.filter((l) => !l.profile_csv).flatMap((l) => [l.from.site, l.to.site]))].sort();
  return sha256(canonicalJson(["terrain-facts", ...toolPart(), terrainKey, study.sites, used]));
}
