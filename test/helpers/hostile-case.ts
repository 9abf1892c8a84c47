import { expect } from "vitest";
import type { CaseResult } from "../fuzz/run-case.ts";
import { TINY_STUDY } from "./tiny-study.ts";

/** `text` (default TINY_STUDY) with `from` replaced by `to`; throws when the fixture lacks `from`. */
export const sub = (from: string, to: string, text = TINY_STUDY): string => {
  if (!text.includes(from)) throw new Error(`fixture lacks ${from}`);
  return text.replace(from, to);
};

/** The case ended in a clean input error whose text matches every part. */
export const expectClean = (r: CaseResult, ...parts: (string | RegExp)[]): void => {
  expect(r.outcome, r.detail).toBe("clean-error");
  for (const p of parts) expect(r.detail).toMatch(p);
};
