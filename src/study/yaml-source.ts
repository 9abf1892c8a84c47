import { isMap, isPair, isScalar, isSeq, LineCounter, parseDocument, type Document, type Node } from "yaml";
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
  return {
    file,
    doc,
    value: syntaxProblems.length ? undefined : doc.toJS({ maxAliasCount: 100 }),
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
