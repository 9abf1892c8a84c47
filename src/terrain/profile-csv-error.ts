import { TerrainError } from "./terrain-error.ts";

/** Where and why a surveyed profile CSV was rejected. */
export interface ProfileCsvDetail {
  path: string;
  /** 1-based line number in the file (the header is line 1 unless comments precede it) */
  line: number;
  /** 1-based column number */
  column: number;
  /** header name of that column, e.g. "distance_m" */
  field: string;
  /** the text received in that cell (or the header line, or the row count) */
  value: string;
  /** what would have been accepted */
  expected: string;
  hint?: string;
}

/** A bad surveyed profile CSV: names the file, line, column, the value received and what was expected. */
export class ProfileCsvError extends TerrainError {
  declare readonly detail: ProfileCsvDetail;

  constructor(problem: string, detail: ProfileCsvDetail) {
    super(
      `${detail.path}:${detail.line}:${detail.column}: ${problem} (column ${detail.field}), received "${detail.value}"; expected ${detail.expected}`,
      detail,
    );
    this.name = "ProfileCsvError";
  }
}
