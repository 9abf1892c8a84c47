import { relative } from "node:path";
import { RidgelineError } from "../errors.ts";

/** One thing wrong with an input file. Lines and columns count from 1. */
export interface InputProblem {
  file: string;
  line?: number;
  col?: number;
  /** Field path such as `links[3].to.site`, or "" for the file as a whole. */
  field: string;
  /** What the file holds there, already formatted (e.g. `"PUMP9"`, `95`, `missing`). */
  received: string;
  /** What would be accepted, phrased as a fix. */
  expected: string;
}

/** Format a path of keys and indices as `links[3].to.site`. */
export function fieldPath(path: ReadonlyArray<PropertyKey>): string {
  let out = "";
  for (const p of path) {
    if (typeof p === "number") out += `[${p}]`;
    else out += out === "" ? String(p) : `.${String(p)}`;
  }
  return out;
}

/** Show a received value briefly: strings quoted, long values cut. */
export function showValue(v: unknown): string {
  if (v === undefined) return "nothing (the field is missing)";
  let s: string;
  try {
    s = typeof v === "string" ? JSON.stringify(v) : JSON.stringify(v) ?? String(v);
  } catch {
    s = String(v);
  }
  return s.length > 80 ? `${s.slice(0, 77)}...` : s;
}

/**
 * Bad input: one or more problems, each with its file, line, column, field, what was
 * received and what is expected. The CLI prints `message` and exits 2, without a stack.
 */
export class InputError extends RidgelineError {
  readonly problems: InputProblem[];
  constructor(problems: InputProblem[], options?: { cause?: unknown }) {
    super(formatProblems(problems), options);
    this.problems = problems;
  }
}

function where(p: InputProblem): string {
  const rel = relative(process.cwd(), p.file);
  const file = rel && !rel.startsWith("..") ? rel : p.file;
  if (p.line === undefined) return file;
  return `${file}:${p.line}${p.col !== undefined ? `:${p.col}` : ""}`;
}

/** The text shown to the user: at most 12 problems, each on two or three lines. */
export function formatProblems(problems: InputProblem[]): string {
  const shown = problems.slice(0, 12);
  const lines = [`${problems.length} problem${problems.length === 1 ? "" : "s"} in the input:`];
  for (const p of shown) {
    lines.push(`  ${where(p)}${p.field ? `  ${p.field}` : ""}`);
    lines.push(`    received ${p.received}; expected ${p.expected}`);
  }
  if (problems.length > shown.length) lines.push(`  … and ${problems.length - shown.length} more`);
  return lines.join("\n");
}
