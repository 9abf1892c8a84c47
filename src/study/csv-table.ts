/** A CSV table (RFC 4180): header names and rows of cells, each row with its line number. */
export interface CsvTable {
  header: string[];
  rows: { line: number; cells: Record<string, string> }[];
}

/**
 * Parse CSV text: comma-separated, fields optionally in double quotes ("" for a quote inside,
 * line breaks allowed inside quotes), first row the header. A byte-order mark and blank lines
 * are skipped. Returns null for an unterminated quote (the caller reports the file).
 */
export function parseCsvTable(text: string): CsvTable | null {
  const records: { line: number; cells: string[] }[] = [];
  let line = 1;
  let startLine = 1;
  let cells: string[] = [];
  let cell = "";
  let quoted = false;
  let any = false;
  const s = text.replace(/^\uFEFF/, "");
  for (let i = 0; i < s.length; i++) {
    const c = s[i];
    if (quoted) {
      if (c === '"' && s[i + 1] === '"') (cell += '"'), i++;
      else if (c === '"') quoted = false;
      else {
        if (c === "\n") line++;
        cell += c;
      }
    } else if (c === '"') (quoted = true), (any = true);
    else if (c === ",") cells.push(cell), (cell = ""), (any = true);
    else if (c === "\n" || c === "\r") {
      if (c === "\r" && s[i + 1] === "\n") i++;
      if (any || cell !== "") cells.push(cell), records.push({ line: startLine, cells });
      cells = [];
      cell = "";
      any = false;
      line++;
      startLine = line;
    } else (cell += c), (any = true);
  }
  if (quoted) return null;
  if (any || cell !== "") cells.push(cell), records.push({ line: startLine, cells });
  if (!records.length) return { header: [], rows: [] };
  const header = records[0].cells.map((h) => h.trim());
  return {
    header,
    rows: records.slice(1).map((r) => ({ line: r.line, cells: Object.fromEntries(header.map((h, i) => [h, (r.cells[i] ?? "").trim()])) })),
  };
}
