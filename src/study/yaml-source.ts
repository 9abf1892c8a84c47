import { isMap, isPair, isScalar, isSeq, LineCounter, parseDocument, visit, type Document, type Node } from "yaml";
import type { InputProblem } from "./input-error.ts";

/** A parsed YAML file that can say where any field path sits in the text. */
export interface YamlSource {
  file: string;
  doc: Document;
  value: unknown;
  syntaxProblems: InputProblem[];
  /** Line and column (1-based) of the value at `path`, or of its nearest existing ancestor. */
  locate(path: ReadonlyArray<PropertyKey>): { line: number; col: number };
  /** Line and column of the key `key` inside the mapping at `path`. */
  locateKey(path: ReadonlyArray<PropertyKey>, key: string): { line: number; col: number };
}

/** Parse YAML text, keeping a line counter so every later error can name line and column. */
export function parseYamlSource(file: string, text: string): YamlSource {
  const lineCounter = new LineCounter();
  const doc = parseDocument(text, { lineCounter, prettyErrors: false, uniqueKeys: true });
  // Report the first syntax error only: later ones are usually its echoes.
  const syntaxProblems: InputProblem[] = doc.errors.slice(0, 1).map((e) => {
    const pos = lineCounter.linePos(e.pos[0]);
    if (/call stack/i.test(e.message)) {
      return { file, line: pos.line, col: pos.col, field: "", received: "YAML nested too deeply to read", expected: `a study nested at most ${MAX_DEPTH} levels deep` };
    }
    return {
      file,
      line: pos.line,
      col: pos.col,
      field: "",
      received: `YAML that does not parse (${e.message.split("\n")[0].replace(/ at line \d+, column \d+:?$/, "")})`,
      expected: "valid YAML: check the indentation of this line and the one before, colons after keys and closing quotes",
    };
  });
  const at = (offset: number) => {
    const p = lineCounter.linePos(offset);
    return { line: p.line, col: p.col };
  };
  const nodeAt = (path: ReadonlyArray<PropertyKey>): Node | null => {
    for (let n = path.length; n >= 0; n--) {
      const node = doc.getIn(path.slice(0, n) as unknown[], true) as Node | undefined;
      if (node && typeof node === "object" && "range" in node && node.range) return node;
    }
    return null;
  };
  const value = syntaxProblems.length ? undefined : plainValue(doc, file, syntaxProblems, at);
  return {
    file,
    doc,
    value: syntaxProblems.length ? undefined : value,
    syntaxProblems,
    locate(path) {
      const node = nodeAt(path);
      return node?.range ? at(node.range[0]) : { line: 1, col: 1 };
    },
    locateKey(path, key) {
      const parent = nodeAt(path);
      if (parent && isMap(parent)) {
        const pair = parent.items.find((it) => isPair(it) && isScalar(it.key) && it.key.value === key);
        const k = pair && isScalar(pair.key) ? pair.key : null;
        if (k?.range) return at(k.range[0]);
      }
      return parent?.range ? at(parent.range[0]) : { line: 1, col: 1 };
    },
  };
}

/** Deepest nesting of mappings and lists accepted; a study needs about 6. */
export const MAX_DEPTH = 24;
/** Most aliases expanded: a few hundred bytes of aliases can otherwise expand to gigabytes. */
const MAX_ALIASES = 100;

/**
 * The document as plain data. Alias expansion is bounded (an alias bomb or an alias with no
 * anchor is a problem in the file, not an internal error); nesting deeper than MAX_DEPTH is
 * refused; timestamps that YAML 1.1 documents (`%YAML 1.1`) make of dates are turned back
 * into their text (YYYY-MM-DD at midnight UTC, else ISO 8601), as the core schema reads them.
 */
function plainValue(doc: Document, file: string, problems: InputProblem[], at: (offset: number) => { line: number; col: number }): unknown {
  let value: unknown;
  try {
    value = doc.toJS({ maxAliasCount: MAX_ALIASES });
  } catch (e) {
    const message = e instanceof Error ? e.message : String(e);
    const bomb = /alias count/i.test(message);
    const deep = e instanceof RangeError;
    const firstAlias = /alias/i.test(message) ? findAlias(doc) : null;
    problems.push({
      file,
      ...(firstAlias !== null ? at(firstAlias) : { line: 1, col: 1 }),
      field: "",
      received: bomb ? `aliases that expand more than ${MAX_ALIASES} times` : deep ? "YAML nested too deeply to read" : `YAML that cannot be read (${message.split("\n")[0]})`,
      expected: bomb ? "a study written out, or with few aliases (*name)" : deep ? `a study nested at most ${MAX_DEPTH} levels deep` : "each alias (*name) after an anchor (&name) of that name",
    });
    return undefined;
  }
  // Iterative walk (a recursive one is what a deep file would overflow).
  const stack: [unknown, number, object | null, PropertyKey | null][] = [[value, 0, null, null]];
  while (stack.length) {
    const [v, depth, parent, key] = stack.pop()!;
    if (v instanceof Date) {
      const iso = Number.isNaN(v.getTime()) ? String(v) : v.toISOString();
      const text = iso.endsWith("T00:00:00.000Z") ? iso.slice(0, 10) : iso;
      if (parent) (parent as Record<PropertyKey, unknown>)[key!] = text;
      else value = text;
      continue;
    }
    if (v === null || typeof v !== "object") continue;
    if (depth > MAX_DEPTH) {
      problems.push({ file, line: 1, col: 1, field: "", received: `values nested more than ${MAX_DEPTH} levels deep`, expected: `a study nested at most ${MAX_DEPTH} levels deep` });
      return undefined;
    }
    if (v instanceof Map || v instanceof Set) continue;
    for (const [k, child] of Object.entries(v)) stack.push([child, depth + 1, v, Array.isArray(v) ? Number(k) : k]);
  }
  return value;
}

/** Offset of the first alias node in the document, or null. */
function findAlias(doc: Document): number | null {
  let found: number | null = null;
  visit(doc, {
    Alias(_key, node) {
      found = node.range?.[0] ?? null;
      return visit.BREAK;
    },
  });
  return found;
}

/** Read the plain value at `path` of a parsed object (undefined when absent). */
export function valueAt(root: unknown, path: ReadonlyArray<PropertyKey>): unknown {
  let v: unknown = root;
  for (const p of path) {
    if (v === null || typeof v !== "object") return undefined;
    v = (v as Record<PropertyKey, unknown>)[p];
  }
  return v;
}

export { isSeq };
