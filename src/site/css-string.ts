/**
 * Text as a CSS string literal that is safe inside a <style> element: every character other
 * than ASCII letters, digits and spaces becomes a CSS hex escape ("\3c " for "<"), so no
 * quote, backslash or "</style" can end the string or the element.
 */
export function cssString(text: unknown): string {
  const body = Array.from(String(text ?? ""))
    .map((ch) => (/^[A-Za-z0-9 ]$/.test(ch) ? ch : `\\${ch.codePointAt(0)!.toString(16)} `))
    .join("");
  return `"${body}"`;
}
