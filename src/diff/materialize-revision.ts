import { cpSync, existsSync, mkdirSync, readdirSync, readFileSync, symlinkSync, writeFileSync } from "node:fs";
import { dirname, isAbsolute, join, relative, resolve, sep } from "node:path";
import { parse as parseYaml } from "yaml";
import { catBlobs, lsTree, type TreeEntry } from "./git.ts";
import type { StudiesLocation } from "./revision.ts";

/**
 * Write the studies folder as it was at `commit` into `into`, which mirrors the repository's
 * layout (so `<into>/<studiesRel>/<study-id>/study.yaml`). Files each study names that lie
 * outside its folder — a terrain folder or profile CSV elsewhere in the repository — are
 * written too when git holds them at that commit. Large terrain files are often kept out of
 * git: a named file git does not hold at that commit is linked to the working tree's copy,
 * and a note says so. Returns the materialised studies folder and those notes.
 */
export async function materializeRevision(loc: StudiesLocation, commit: string, shortId: string, into: string): Promise<{ studiesDir: string; notes: string[] }> {
  const notes: string[] = [];
  const studiesDir = join(into, ...loc.studiesRel.split("/").filter(Boolean));
  mkdirSync(studiesDir, { recursive: true });
  await writeEntries(loc.root, lsTree(loc.root, commit, loc.studiesRel ? [loc.studiesRel] : []), into);

  for (const id of readdirSync(studiesDir).sort()) {
    const yamlFile = join(studiesDir, id, "study.yaml");
    if (!existsSync(yamlFile)) continue;
    for (const named of namedFiles(yamlFile)) {
      if (isAbsolute(named)) continue;
      const target = resolve(studiesDir, id, named);
      if (existsSync(target)) continue;
      const repoRel = relative(into, target);
      const working = resolve(loc.root, repoRel);
      if (!repoRel.startsWith("..") && !isAbsolute(repoRel)) {
        const entries = lsTree(loc.root, commit, [repoRel.split(sep).join("/")]);
        if (entries.length) {
          await writeEntries(loc.root, entries, into);
          continue;
        }
      }
      if (existsSync(working)) {
        linkOrCopy(working, target);
        notes.push(`${id}: ${named} is not in git at ${shortId}; the working tree's copy was used for that revision.`);
      }
    }
  }
  return { studiesDir, notes };
}

/** The terrain file, profile CSVs and antenna envelope CSVs a study.yaml names (empty when it cannot be parsed: loading reports that). */
function namedFiles(yamlFile: string): string[] {
  let doc: unknown;
  try {
    doc = parseYaml(readFileSync(yamlFile, "utf8"));
  } catch {
    return [];
  }
  if (!doc || typeof doc !== "object") return [];
  const d = doc as { terrain?: { file?: unknown }; links?: { profile_csv?: unknown }[] };
  const out: string[] = [];
  if (typeof d.terrain?.file === "string") out.push(d.terrain.file);
  if (Array.isArray(d.links)) for (const l of d.links) if (l && typeof l.profile_csv === "string") out.push(l.profile_csv);
  // antenna envelope CSVs of link ends and external transmitters
  const envelope = (x: unknown) => {
    const p = (x as { pattern?: { envelope_csv?: unknown } } | null)?.pattern;
    if (p && typeof p === "object" && typeof p.envelope_csv === "string") out.push(p.envelope_csv);
  };
  if (Array.isArray(d.links)) {
    for (const l of d.links as ({ from?: unknown; to?: unknown } | null)[]) {
      envelope(l?.from);
      envelope(l?.to);
    }
  }
  const ext = (doc as { interference?: { external?: unknown } }).interference?.external;
  if (Array.isArray(ext)) ext.forEach(envelope);
  return [...new Set(out)];
}

async function writeEntries(root: string, entries: TreeEntry[], into: string): Promise<void> {
  const blobs = entries.filter((e) => e.type === "blob");
  const contents = await catBlobs(root, blobs.map((e) => e.object));
  blobs.forEach((e, i) => {
    const file = join(into, ...e.path.split("/"));
    mkdirSync(dirname(file), { recursive: true });
    if (e.mode === "120000") {
      const link = contents[i].toString("utf8");
      try {
        symlinkSync(link, file);
      } catch {
        /* a symbolic link the system cannot create: leave it out, loading reports the missing file */
      }
    } else {
      writeFileSync(file, contents[i]);
    }
  });
}

function linkOrCopy(from: string, to: string): void {
  mkdirSync(dirname(to), { recursive: true });
  try {
    symlinkSync(from, to);
  } catch {
    cpSync(from, to, { recursive: true });
  }
}
