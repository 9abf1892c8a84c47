import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { InputError } from "../../src/study/input-error.ts";
import { loadStudy } from "../../src/study/load-study.ts";
import { TINY_STUDY, writeStudy } from "../helpers/tiny-study.ts";

// Bad input for the microwave-performance fields (issue 13): each problem names the field,
// the value received and what would fix it.

const root = mkdtempSync(join(tmpdir(), "ridgeline-linkperf-input-"));
afterAll(() => rmSync(root, { recursive: true, force: true }));

function problemsOf(id: string, yaml: string): InputError["problems"] {
  try {
    loadStudy(writeStudy(root, id, yaml));
  } catch (e) {
    if (e instanceof InputError) return e.problems;
    throw e;
  }
  return [];
}

describe("renamed design allowance", () => {
  it("a study still using field_margin_db gets an error naming design_allowance_db", () => {
    const p = problemsOf("old-key", `${TINY_STUDY}design:\n  field_margin_db: 2\n`);
    expect(p).toHaveLength(1);
    expect(p[0].field).toBe("design.field_margin_db");
    expect(p[0].expected).toMatch(/"design_allowance_db" instead/);
    expect(p[0].line).toBeGreaterThan(1);
  });

  it("design_allowance_db is read and defaults to 0 dB", () => {
    expect(loadStudy(writeStudy(root, "new-key", `${TINY_STUDY}design:\n  design_allowance_db: 2\n`)).design.design_allowance_db).toBe(2);
    expect(loadStudy(writeStudy(root, "no-key", TINY_STUDY)).design.design_allowance_db).toBe(0);
  });
});
