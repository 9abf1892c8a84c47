import { closeSync, lstatSync, openSync, readdirSync, readlinkSync, readSync, realpathSync, statSync, type Stats } from "node:fs";
import { delimiter, isAbsolute, join, relative, resolve, sep } from "node:path";

/**
 * Checks on the files a study names, made before any of them is hashed or read: each must be
 * a regular file (not a folder, named pipe or device: a pipe blocks a reader for ever and
 * /dev/zero never ends), below a size limit, and inside the study's folder — or inside a
 * terrain root named by RIDGELINE_TERRAIN_ROOT for terrain — also after following symbolic
 * links, so that a study cannot make the tool read (and quote in its errors) files elsewhere.
 */

/** Largest study.yaml read (bytes). */
export const STUDY_FILE_MAX_BYTES = 8 * 1024 * 1024;
/** Largest surveyed profile CSV read (bytes). */
export const PROFILE_CSV_MAX_BYTES = 64 * 1024 * 1024;
/** Largest antenna envelope CSV read (bytes): 0–180° every 0.01° is under 1 MB. */
export const ENVELOPE_CSV_MAX_BYTES = 4 * 1024 * 1024;
/** Largest GeoTIFF read (bytes). */
export const GEOTIFF_MAX_BYTES = 2 * 1024 * 1024 * 1024;
/** The two sizes an SRTM-style .hgt tile has: 3″ (1201²) and 1″ (3601²) big-endian int16. */
export const HGT_SIZES = [1201 * 1201 * 2, 3601 * 3601 * 2];

/** Folders outside every study that terrain may be read from (RIDGELINE_TERRAIN_ROOT, path-list). */
export function terrainRoots(env: NodeJS.ProcessEnv = process.env): string[] {
  return (env.RIDGELINE_TERRAIN_ROOT ?? "")
    .split(delimiter)
    .filter((s) => s.trim() !== "")
    .map((s) => resolve(s));
}

/** What kind of thing a stat describes, in words. */
export function fileKind(st: Stats): string {
  if (st.isFile()) return "a file";
  if (st.isDirectory()) return "a folder";
  if (st.isFIFO()) return "a named pipe";
  if (st.isCharacterDevice() || st.isBlockDevice()) return "a device";
  if (st.isSocket()) return "a socket";
  return "not a regular file";
}

const within = (root: string, p: string): boolean => p === root || p.startsWith(root.endsWith(sep) ? root : root + sep);

/**
 * Why the path `rel` (as written in a study in `dir`) cannot be read, or null when it can.
 * The text completes "expected …" after "received <rel> (<what>)", so it returns both parts.
 * @param want "file" (a regular file), or "file-or-folder" (terrain: a tile folder is allowed)
 * @param roots further folders the path (after symbolic links) may lie in
 */
export function inputPathProblem(dir: string, rel: string, options: { want: "file" | "file-or-folder"; maxBytes: number; roots?: string[]; what: string }): { received: string; expected: string } | null {
  const { want, maxBytes, what } = options;
  const roots = options.roots ?? [];
  const where = roots.length ? `inside the study folder or ${roots.join(", ")}` : "inside the study folder";
  const path = resolve(dir, rel);
  if (rel.includes("\0")) return { received: "a path holding a NUL character", expected: `${what} ${where}` };
  let realDir: string;
  try {
    realDir = realpathSync(dir);
  } catch {
    realDir = resolve(dir);
  }
  const allowed = [realDir, ...roots.map((r) => safeRealpath(r))];
  if (!within(resolve(dir), path) && !roots.some((r) => within(r, path))) {
    return { received: `a path outside the study folder (${rel})`, expected: `${what} ${where}, named relative to it${options.want === "file-or-folder" ? " (set RIDGELINE_TERRAIN_ROOT for a shared terrain folder)" : ""}` };
  }
  let lst: Stats;
  try {
    lst = lstatSync(path);
  } catch {
    return { received: `${rel} (no such file)`, expected: `${what} that exists, relative to the study folder` };
  }
  if (lst.isSymbolicLink()) {
    let target = "?";
    try {
      target = readlinkSync(path);
    } catch {
      /* unreadable link: shown as ? */
    }
    let st: Stats;
    try {
      st = statSync(path);
    } catch {
      return { received: `${rel}, a symbolic link to ${target}, which does not exist`, expected: `${what} that exists` };
    }
    const real = safeRealpath(path);
    if (!allowed.some((r) => within(r, real))) {
      return { received: `${rel}, a symbolic link to ${target}, outside the study folder`, expected: `${what} ${where} (copy the file in instead of linking to it)` };
    }
    lst = st;
  } else {
    const real = safeRealpath(path);
    if (!allowed.some((r) => within(r, real))) {
      return { received: `${rel}, which lies outside the study folder through a linked folder`, expected: `${what} ${where}` };
    }
  }
  if (lst.isDirectory() && want === "file-or-folder") return null;
  if (!lst.isFile()) return { received: `${rel} (${fileKind(lst)})`, expected: `${what}: a regular file` };
  if (lst.size > maxBytes) return { received: `${rel} (${lst.size} bytes)`, expected: `${what} of at most ${maxBytes} bytes` };
  return null;
}

function safeRealpath(p: string): string {
  try {
    return realpathSync(p);
  } catch {
    return resolve(p);
  }
}

/**
 * Why a terrain file or tile folder cannot be a terrain, judged by type and size only (the
 * format is checked when it is opened): .hgt tiles must have one of the two tile sizes,
 * GeoTIFFs at most GEOTIFF_MAX_BYTES; every .hgt file in a tile folder is checked.
 */
export function terrainFileProblem(path: string, label: string): { received: string; expected: string } | null {
  const st = statSync(path);
  const hgt = (p: string, name: string, s: Stats) => {
    if (!s.isFile()) return { received: `${name} (${fileKind(s)})`, expected: "an SRTM .hgt tile: a regular file" };
    if (!HGT_SIZES.includes(s.size)) return { received: `${name} (${s.size} bytes)`, expected: `an SRTM .hgt tile of ${HGT_SIZES[0]} bytes (3″) or ${HGT_SIZES[1]} bytes (1″)` };
    return null;
  };
  if (st.isDirectory()) {
    for (const name of readdirSync(path).sort()) {
      if (!name.toLowerCase().endsWith(".hgt")) continue;
      let s: Stats;
      try {
        s = statSync(join(path, name));
      } catch {
        return { received: `${join(label, name)}, a symbolic link to nothing`, expected: "an SRTM .hgt tile that exists" };
      }
      const problem = hgt(join(path, name), join(label, name), s);
      if (problem) return problem;
    }
    return null;
  }
  if (label.toLowerCase().endsWith(".hgt")) return hgt(path, label, st);
  if (st.size > GEOTIFF_MAX_BYTES) return { received: `${label} (${st.size} bytes)`, expected: `a GeoTIFF of at most ${GEOTIFF_MAX_BYTES} bytes (cut it to the study area, e.g. gdal_translate -projwin)` };
  if (/\.tiff?$/i.test(label) && !isTiff(path)) return { received: `${label}, which does not start as a TIFF file does`, expected: "a GeoTIFF (export the DEM with gdal_translate -of GTiff)" };
  return null;
}

/** Whether a file starts with a TIFF or BigTIFF header: "II" or "MM", then 42 or 43 in that byte order (TIFF 6.0 §2). */
function isTiff(path: string): boolean {
  const b = Buffer.alloc(4);
  let fd: number | null = null;
  try {
    fd = openSync(path, "r");
    if (readSync(fd, b, 0, 4, 0) < 4) return false;
  } catch {
    return false;
  } finally {
    if (fd !== null) closeSync(fd);
  }
  const le = b[0] === 0x49 && b[1] === 0x49;
  const be = b[0] === 0x4d && b[1] === 0x4d;
  const magic = le ? b.readUInt16LE(2) : be ? b.readUInt16BE(2) : 0;
  return magic === 42 || magic === 43;
}

/** The path of `p` relative to `dir` when inside it, for messages. */
export function shownPath(dir: string, p: string): string {
  const r = relative(dir, p);
  return r && !r.startsWith("..") && !isAbsolute(r) ? r : p;
}
