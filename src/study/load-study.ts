import { createHash } from "node:crypto";
import { existsSync, readFileSync, statSync } from "node:fs";
import { basename, dirname, resolve } from "node:path";
import { fieldPath, InputError, showValue, type InputProblem } from "./input-error.ts";
import { studySchema, type KValueInput, type StudyInput } from "./schema.ts";
import type { KFactor, Study } from "./study.ts";
import { parseYamlSource, type YamlSource } from "./yaml-source.ts";
import { zodProblems } from "./zod-problems.ts";
import { kFactorFromGradient } from "../physics/k-factor.ts";

/**
 * Read and validate `<dir>/study.yaml`. Every problem in the file is reported at once as an
 * InputError naming file:line:col, field, value received and what is expected.
 * @param file path of a study.yaml (the study id is its folder's name)
 */
export function loadStudy(file: string): Study {
  const abs = resolve(file);
  if (!existsSync(abs)) {
    throw new InputError([{ file: abs, field: "", received: "no such file", expected: "a study.yaml in the study folder" }]);
  }
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
  const problems = crossCheck(src, input, dir);
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
    document: input.document,
    terrain: input.terrain,
    design: { ...input.design, k_factors, clearance_criteria },
    climate: input.climate,
    radios: input.radios,
    sites: input.sites,
    links: input.links.map((l, index) => ({ ...l, index })),
    chains: input.chains,
    coverage: input.coverage,
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
function crossCheck(src: YamlSource, s: StudyInput, dir: string): InputProblem[] {
  const problems: InputProblem[] = [];
  const add = (path: PropertyKey[], received: unknown, expected: string) =>
    problems.push({ file: src.file, ...src.locate(path), field: fieldPath(path), received: showValue(received), expected });
  const uniqueIds = (section: "sites" | "radios" | "links" | "chains") => {
    const seen = new Map<string, number>();
    (s[section] as { id: string }[]).forEach((item, i) => {
      const first = seen.get(item.id);
      if (first !== undefined) add([section, i, "id"], item.id, `an id not used before in ${section} (${section}[${first}] already has it)`);
      else seen.set(item.id, i);
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
    if (l.profile_csv !== undefined && !isFile(resolve(dir, l.profile_csv))) {
      add(["links", i, "profile_csv"], l.profile_csv, "a CSV file that exists, relative to the study folder");
    }
  });
  s.chains.forEach((c, i) =>
    c.links.forEach((id, j) => {
      if (!links.has(id)) add(["chains", i, "links", j], id, "the id of a link in links");
    }),
  );
  if ("file" in s.terrain && !existsSync(resolve(dir, s.terrain.file))) {
    add(["terrain", "file"], s.terrain.file, "a terrain file or folder that exists, relative to the study folder");
  }
  if ("synthetic" in s.terrain) {
    const t = s.terrain.synthetic;
    if (!(t.north_deg > t.south_deg)) add(["terrain", "synthetic", "north_deg"], t.north_deg, `a latitude north of south_deg (${t.south_deg})`);
    if (!(t.east_deg > t.west_deg)) add(["terrain", "synthetic", "east_deg"], t.east_deg, `a longitude east of west_deg (${t.west_deg})`);
  }
  return problems;
}

function isFile(p: string): boolean {
  try {
    return statSync(p).isFile();
  } catch {
    return false;
  }
}
