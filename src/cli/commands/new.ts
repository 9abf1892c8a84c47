import { existsSync, mkdirSync, writeFileSync } from "node:fs";
import { join, resolve } from "node:path";
import { studyTemplate } from "../../study/study-template.ts";
import { parseArgs, UsageError } from "../args.ts";

export const NEW_USAGE = "Usage: ridgeline new <study-id> [--studies-dir DIR] [--date YYYY-MM-DD]";

/**
 * `ridgeline new <id>`: write `<studies-dir>/<id>/study.yaml` from the commented template. Never
 * overwrites: an existing study folder is an input error (exit 2).
 */
export async function newCommand(argv: string[]): Promise<number> {
  const a = parseArgs(argv, { values: ["studies-dir", "date"] });
  if (a.positional.length !== 1) throw new UsageError(`new needs exactly one study id (received ${a.positional.length}).\n${NEW_USAGE}`);
  const id = a.positional[0];
  if (!/^[A-Za-z0-9][A-Za-z0-9_.-]*$/.test(id)) throw new UsageError(`study id "${id}": use letters, digits, '-', '_' or '.', starting with a letter or digit.`);
  const date = a.values.get("date")?.[0] ?? new Date().toISOString().slice(0, 10);
  if (!/^\d{4}-\d{2}-\d{2}$/.test(date)) throw new UsageError(`--date: received "${date}"; expected YYYY-MM-DD.`);
  const dir = resolve(a.values.get("studies-dir")?.[0] ?? "content/studies", id);
  if (existsSync(dir)) throw new UsageError(`${dir} already exists; choose another id or remove the folder.`);
  mkdirSync(dir, { recursive: true });
  const file = join(dir, "study.yaml");
  writeFileSync(file, studyTemplate({ id, date }));
  process.stderr.write(`Wrote ${file}\n`);
  return 0;
}
