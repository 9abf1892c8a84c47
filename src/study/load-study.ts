import { createHash } from "node:crypto";
import { lstatSync, readFileSync, readlinkSync, statSync, type Stats } from "node:fs";
import { basename, dirname, resolve } from "node:path";
import { geodesicDistanceM } from "../geo/geodesic-path.ts";
import { fileKind, inputPathProblem, PROFILE_CSV_MAX_BYTES, STUDY_FILE_MAX_BYTES, terrainFileProblem, terrainRoots } from "./input-file.ts";
import { ID_RULE, idProblem } from "./name-rules.ts";
import { fieldPath, InputError, showValue, type InputProblem } from "./input-error.ts";
import { studySchema, type KValueInput, type StudyInput } from "./schema.ts";
import type { KFactor, Study } from "./study.ts";
import { parseYamlSource, type YamlSource } from "./yaml-source.ts";
import { zodProblems } from "./zod-problems.ts";
import { interferenceProblems } from "./interference-checks.ts";
import { kFactorFromGradient } from "../physics/k-factor.ts";

/**
 * Read and validate `<dir>/study.yaml`. Every problem in the file is reported at once as an
 * InputError naming file:line:col, field, value received and what is expected.
 * @param file path of a study.yaml (the study id is its folder's name)
 * @param options.roots folders besides the study's own (and RIDGELINE_TERRAIN_ROOT) that the
 *   files it names may lie in, also through symbolic links: `ridgeline diff` passes the
 *   repository, whose working-tree copies it links into a materialised revision
 */
export function loadStudy(file: string, options: { roots?: string[] } = {}): Study {
  const abs = resolve(file);
  const fail = (received: string, expected: string): never => {
    throw new InputError([{ file: abs, field: "", received, expected }]);
  };
  const folder = basename(dirname(abs));
  if (idProblem(folder)) fail(`a study folder named ${showValue(folder)}`, `a folder name usable as a study id (it names the study's pages and files): ${ID_RULE}`);
  let lst: Stats | null = null;
  try {
    lst = lstatSync(abs);
  } catch {
    fail("no such file", "a study.yaml in the study folder");
  }
  let st: Stats = lst!;
  if (lst!.isSymbolicLink()) {
    try {
      st = statSync(abs);
    } catch {
      let target = "?";
      try {
        target = readlinkSync(abs);
      } catch {
        /* shown as ? */
      }
      fail(`a symbolic link to ${target}, which does not exist`, "a study.yaml that exists (fix or remove the link)");
    }
  }
  if (!st.isFile()) fail(`${fileKind(st)} named study.yaml`, "a study.yaml that is a regular file");
  if (st.size > STUDY_FILE_MAX_BYTES) fail(`a study.yaml of ${st.size} bytes`, `a study file of at most ${STUDY_FILE_MAX_BYTES} bytes`);
  const bytes = readFileSync(abs);
  const text = bytes.toString("utf8");
  const src = parseYamlSource(abs, text);
  if (src.syntaxProblems.length) throw new InputError(src.syntaxProblems);
  if (src.value === null || src.value === undefined || (typeof src.value === "object" && Object.keys(src.value).length === 0)) {
    throw new InputError([
      { file: abs, line: 1, col: 1, field: "", received: "an empty study", expected: "a study with title, client, prepared_by, revision, date, terrain, radios, sites and links" },
    ]);
  }
  if (typeof src.value !== "object" || Array.isArray(src.value)) {
    throw new InputError([{ file: abs, line: 1, col: 1, field: "", received: showValue(src.value), expected: "a mapping of study fields (title:, sites:, links: …)" }]);
  }
  const parsed = studySchema.safeParse(src.value);
  if (!parsed.success) throw new InputError(zodProblems(src, parsed.error.issues));
  const input = parsed.data;
  const dir = dirname(abs);
  const problems = crossCheck(src, input, dir, options.roots ?? []);
  const kOf = (v: KValueInput, path: PropertyKey[]): KFactor => {
    const k = parseK(v);
    if (!(k > 0)) problems.push({ file: abs, ...src.locate(path), field: fieldPath(path), received: showValue(v), expected: "a positive k such as 4/3, 0.67 or inf" });
    return { k, label: kLabel(v) };
  };
  const k_factors = input.design.k_factors.map((v, i) => kOf(v, ["design", "k_factors", i]));
  const clearance_criteria = input.design.clearance_criteria.map((c, i) => ({ k: kOf(c.k, ["design", "clearance_criteria", i, "k"]), min_f1: c.min_f1 }));
  if (problems.length) throw new InputError(problems);
  return {
    id: basename(dir),
    dir,
    file: abs,
    meta: { title: input.title, client: input.client, prepared_by: input.prepared_by, revision: input.revision, date: input.date, summary: input.summary },
    terrain: input.terrain,
    design: { ...input.design, k_factors, clearance_criteria },
    climate: input.climate,
    radios: input.radios,
    sites: input.sites,
    links: input.links.map((l, index) => ({ ...l, index })),
    chains: input.chains,
    coverage: input.coverage,
    ...(input.interference ? { interference: input.interference } : {}),
    locate: src.locate,
    file_sha256: createHash("sha256").update(bytes).digest("hex"),
  };
}

/** k from its study form: number, "a/b", "inf" or {gradient_n_km}. */
export function parseK(v: KValueInput): number {
  if (typeof v === "number") return v;
  if (typeof v === "object") return kFactorFromGradient(v.gradient_n_km);
  if (v === "inf") return Infinity;
  const [a, b] = v.split("/").map(Number);
  return a / b;
}

function kLabel(v: KValueInput): string {
  if (typeof v === "number") return String(v);
  if (typeof v === "object") return `${parseK(v).toFixed(3)} (P.453, ${v.gradient_n_km} N/km)`;
  return v === "inf" ? "∞" : v;
}

/** References between sections, duplicate ids and files the study names. */
function crossCheck(src: YamlSource, s: StudyInput, dir: string, roots: string[]): InputProblem[] {
  const problems: InputProblem[] = [];
  const add = (path: PropertyKey[], received: unknown, expected: string) =>
    problems.push({ file: src.file, ...src.locate(path), field: fieldPath(path), received: showValue(received), expected });
  const uniqueIds = (section: "sites" | "radios" | "links" | "chains") => {
    // Ids name folders and files, and macOS and Windows file systems ignore case: "A" and "a" clash.
    const seen = new Map<string, number>();
    const folded = new Map<string, number>();
    (s[section] as { id: string }[]).forEach((item, i) => {
      const first = folded.get(item.id.toLowerCase());
      if (first !== undefined) add([section, i, "id"], item.id, `an id not used before in ${section} (${section}[${first}] already has it${(s[section] as { id: string }[])[first].id !== item.id ? ", in other letter case; ids name files, and file systems may ignore case" : ""})`);
      else {
        seen.set(item.id, i);
        folded.set(item.id.toLowerCase(), i);
      }
    });
    return seen;
  };
  const sites = uniqueIds("sites");
  const radios = uniqueIds("radios");
  const links = uniqueIds("links");
  uniqueIds("chains");
  const siteList = [...sites.keys()].slice(0, 8).join(", ");
  s.links.forEach((l, i) => {
    for (const end of ["from", "to"] as const) {
      if (!sites.has(l[end].site)) add(["links", i, end, "site"], l[end].site, `the id of a site in sites (${siteList})`);
    }
    if (l.from.site === l.to.site && sites.has(l.from.site)) add(["links", i, "to", "site"], l.to.site, "a site other than the link's from-site");
    if (!radios.has(l.radio)) add(["links", i, "radio"], l.radio, `the id of a radio in radios (${[...radios.keys()].join(", ")})`);
      if (l.profile_csv !== undefined) {
      const problem = inputPathProblem(dir, l.profile_csv, { want: "file", maxBytes: PROFILE_CSV_MAX_BYTES, roots, what: "a surveyed profile CSV file" });
      if (problem) problems.push({ file: src.file, ...src.locate(["links", i, "profile_csv"]), field: fieldPath(["links", i, "profile_csv"]), received: problem.received, expected: problem.expected });
    }
    const a = s.sites.find((x) => x.id === l.from.site);
    const b = s.sites.find((x) => x.id === l.to.site);
    const radio = s.radios.find((r) => r.id === l.radio);
    if (a && b && radio && a !== b) {
      const d = geodesicDistanceM(a.lat_deg, a.lon_deg, b.lat_deg, b.lon_deg);
      const least = minimumLinkLengthM(radio.frequency_ghz);
      if (!(d >= least)) {
        add(["links", i, "to", "site"], l.to.site, `sites at least ${least.toPrecision(3)} m apart (ten wavelengths and 1 m): ${a.id} and ${b.id} are ${d.toPrecision(3)} m apart, too close for far-field link formulas`);
      } else if (d > MAX_LINK_LENGTH_M) {
        add(["links", i, "to", "site"], l.to.site, `sites at most ${MAX_LINK_LENGTH_M / 1000} km apart: ${a.id} and ${b.id} are ${(d / 1000).toFixed(0)} km apart, beyond the radio horizon of any two masts up to 1000 m (about 260 km at k = 4/3), where the link methods do not apply`);
      }
    }
  });
  s.chains.forEach((c, i) =>
    c.links.forEach((id, j) => {
      if (!links.has(id)) add(["chains", i, "links", j], id, "the id of a link in links");
    }),
  );
  if ("file" in s.terrain) {
    const problem = inputPathProblem(dir, s.terrain.file, { want: "file-or-folder", maxBytes: Infinity, roots: [...terrainRoots(), ...roots], what: "a terrain file or folder" });
    const type = problem ?? terrainFileProblem(resolve(dir, s.terrain.file), s.terrain.file);
    if (type) problems.push({ file: src.file, ...src.locate(["terrain", "file"]), field: "terrain.file", received: type.received, expected: type.expected });
  }
  const coverageIds = new Map<string, number>();
  s.coverage.forEach((c, i) => {
    const first = coverageIds.get(c.id.toLowerCase());
    if (c.id.toLowerCase() === "composite") add(["coverage", i, "id"], c.id, "another id: \"composite\" names the study's combined map");
    else if (first !== undefined) add(["coverage", i, "id"], c.id, `an id not used before in coverage (coverage[${first}] already has it)`);
    else coverageIds.set(c.id.toLowerCase(), i);
  });
  if ("synthetic" in s.terrain) {
    const t = s.terrain.synthetic;
    if (!(t.north_deg > t.south_deg)) add(["terrain", "synthetic", "north_deg"], t.north_deg, `a latitude north of south_deg (${t.south_deg})`);
    if (!(t.east_deg > t.west_deg)) add(["terrain", "synthetic", "east_deg"], t.east_deg, `a longitude east of west_deg (${t.west_deg})`);
  }
  problems.push(...interferenceProblems(src, s, dir, roots));
  return problems;
}

/** Longest link accepted (m): beyond the radio horizon of two 1000 m masts (≈ 2·√(2·kR·h) ≈ 261 km at k = 4/3). */
export const MAX_LINK_LENGTH_M = 300_000;

/**
 * Shortest link accepted (m): ten wavelengths and at least 1 m. Closer than a few wavelengths
 * the free-space formula (far field) gives a loss below 0 dB — a received level above the
 * transmitted one — and Fresnel radii lose their meaning.
 */
export function minimumLinkLengthM(frequency_ghz: number): number {
  return Math.max(1, (10 * 0.299792458) / frequency_ghz);
}
