/*
 * The one escaping rule of Ridgeline's output. Every piece of study text reaches a page, an
 * SVG or a URL through one of these:
 * - escapeXml: HTML and SVG text and attribute values (quoted with ").
 *   Nunjucks templates autoescape with the same five characters.
 * - svgId: element ids and the references to them (id, aria-labelledby, url(#…)).
 * - urlPathSegment: one path segment of an href, percent-encoded (then escapeXml'd, or
 *   autoescaped by the template, as an attribute value).
 */

/** Escape text for HTML/SVG element content and attribute values. */
export function escapeXml(s: unknown): string {
  return String(s)
    .replace(/&/g, "&amp;")
    .replace(/</g, "&lt;")
    .replace(/>/g, "&gt;")
    .replace(/"/g, "&quot;")
    .replace(/'/g, "&#39;");
}

/** A coordinate rounded to 0.1 px for compact, stable SVG output. */
export function px(v: number): string {
  const r = Math.round(v * 10) / 10;
  return Object.is(r, -0) ? "0" : String(r);
}

/**
 * A string made safe as an XML id token: letters, digits, '_', '.' and '-' kept (so ids made
 * of study ids, which hold only those, are unchanged); any other character written as _hex_.
 * The result never holds a quote, space, '<' or '&', so it cannot end an attribute.
 */
export function svgId(s: string): string {
  return s.replace(/[^A-Za-z0-9_.-]/g, (c) => `_${c.codePointAt(0)!.toString(16)}_`);
}

/** One path segment of a URL, percent-encoded (RFC 3986: everything but unreserved characters). */
export function urlPathSegment(s: string): string {
  return encodeURIComponent(s).replace(/[!'()*]/g, (c) => `%${c.charCodeAt(0).toString(16).toUpperCase()}`);
}
