import type { z } from "zod";
import { fieldPath, showValue, type InputProblem } from "./input-error.ts";
import { renamedKey } from "./renamed-keys.ts";
import { valueAt, type YamlSource } from "./yaml-source.ts";

/** Turn zod issues into input problems that name line, column, field, value and fix. */
export function zodProblems(src: YamlSource, issues: z.core.$ZodIssue[]): InputProblem[] {
  const out: InputProblem[] = [];
  for (const issue of issues) {
    const path = issue.path as PropertyKey[];
    if (issue.code === "unrecognized_keys") {
      for (const key of issue.keys) {
        const renamed = renamedKey(path, key);
        out.push({
          file: src.file,
          ...src.locateKey(path, key),
          field: fieldPath([...path, key]),
          received: `an unknown field "${key}"`,
          expected: renamed
            ? `"${renamed.key}" instead (${renamed.why}): rename the key, keeping its value`
            : "no such field here: check its spelling against schema/study.schema.json, or remove it",
        });
      }
      continue;
    }
    const received = valueAt(src.value, path);
    out.push({
      file: src.file,
      ...src.locate(path),
      field: fieldPath(path),
      received: showValue(received),
      expected: expectedText(issue, received),
    });
  }
  return out;
}

function expectedText(issue: z.core.$ZodIssue, received: unknown): string {
  switch (issue.code) {
    case "invalid_type":
      if (received === undefined) return `this required field (${issue.expected})`;
      if (issue.expected === "int") return "a whole number";
      return `a ${issue.expected}${issue.expected === "number" ? " (without units or quotes; the unit is in the key name)" : ""}`;
    case "too_small":
      if (issue.origin === "array") return `at least ${issue.minimum} entr${Number(issue.minimum) === 1 ? "y" : "ies"}`;
      if (issue.origin === "string") return "a non-empty text";
      return `a number ${issue.inclusive ? "≥" : ">"} ${issue.minimum}`;
    case "too_big":
      if (issue.origin === "array") return `at most ${issue.maximum} entries`;
      if (issue.origin === "string") return issue.message.startsWith("Too big") ? `a text of at most ${issue.maximum} characters` : issue.message;
      return `a number ${issue.inclusive ? "≤" : "<"} ${issue.maximum}`;
    case "invalid_value":
      return `one of ${issue.values.map((v) => JSON.stringify(v)).join(", ")}`;
    case "invalid_format":
      return issue.message.replace(/^Invalid string: /, "");
    case "invalid_union": {
      const msgs = issue.errors.flat().map((e) => e.message);
      const uniq = [...new Set(msgs)].slice(0, 3);
      return `one of the accepted forms (${uniq.join("; ")})`;
    }
    default:
      return issue.message;
  }
}
