/**
 * Rules for the names a study gives its parts. Ids (study folders, sites, radios, links,
 * chains, coverage maps) become folder and file names of the site and of the coverage
 * outputs, so they must be valid paths on Linux, macOS and Windows, short enough that the
 * longest output path stays far below every file system's name limit (255 bytes a name), and
 * safe to put into URLs, HTML and SVG without changing meaning. Free texts (titles, names,
 * notes) are shown escaped, but must be well-formed Unicode without control characters (a
 * NUL cannot pass through SVG rasterisers, file systems or PDF text) and of a size a page
 * can show.
 */

/** Longest id (characters); the longest output file name adds at most ~40 to it. */
export const ID_MAX_LENGTH = 64;

/** Ids: a letter or digit first, then letters, digits, '-', '_' or '.'; no trailing '.'. */
export const ID_PATTERN = /^[A-Za-z0-9](?:[A-Za-z0-9_.-]*[A-Za-z0-9_-])?$/;

/** Names Windows reserves for devices, with or without an extension (CON, NUL.txt, COM1 …). */
const WINDOWS_RESERVED = /^(con|prn|aux|nul|com[0-9¹²³]|lpt[0-9¹²³])(\..*)?$/i;

/** The id rule in words, for error messages. */
export const ID_RULE = `1–${ID_MAX_LENGTH} characters: letters, digits, '-', '_' or '.', starting with a letter or digit, not ending with '.', and not a name Windows reserves (CON, PRN, AUX, NUL, COM1–9, LPT1–9)`;

/** null when `s` is a valid id, else why not (a phrase for "received …; expected …"). */
export function idProblem(s: string): string | null {
  if (s.length === 0 || s.length > ID_MAX_LENGTH) return ID_RULE;
  if (!ID_PATTERN.test(s)) return ID_RULE;
  if (WINDOWS_RESERVED.test(s)) return ID_RULE;
  return null;
}

/** Control characters other than tab, line feed and carriage return; also U+FFFE/U+FFFF. */
// eslint-disable-next-line no-control-regex
const CONTROL = /[\u0000-\u0008\u000B\u000C\u000E-\u001F\u007F-\u009F\uFFFE\uFFFF]/;
const LONE_SURROGATE = /[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/;
/** Line breaks: not allowed in one-line texts (titles, names). */
const LINE_BREAK = /[\r\n\u2028\u2029]/;

/** Longest one-line text (title, name) and longest multi-line text (summary, notes), characters. */
export const NAME_MAX_LENGTH = 200;
export const NOTE_MAX_LENGTH = 4000;

/** null when `s` is an acceptable free text, else what would be accepted. */
export function textProblem(s: string, multiline: boolean): string | null {
  const max = multiline ? NOTE_MAX_LENGTH : NAME_MAX_LENGTH;
  if (s.length > max) return `a text of at most ${max} characters`;
  if (LONE_SURROGATE.test(s)) return "well-formed Unicode text (no lone surrogate halves)";
  if (CONTROL.test(s)) return "text without control characters (NUL, escape codes and the like)";
  if (!multiline && LINE_BREAK.test(s)) return "text on one line";
  return null;
}
