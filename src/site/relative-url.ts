import { posix } from "node:path";
import { urlPathSegment } from "../render/svg/escape.ts";

/**
 * A URL from the page at `fromUrl` to the site path `target` (both root-relative, as
 * Eleventy's page.url), written relative so that the site works opened from disk and
 * under any path prefix. Folders get an explicit index.html for file:// browsing. Each path
 * segment and the fragment are percent-encoded (svg/escape.ts).
 */
export function relativeUrl(fromUrl: string, target: string): string {
  const fromDir = fromUrl.endsWith("/") ? fromUrl : posix.dirname(fromUrl) + "/";
  const [pathPart, hash = ""] = target.split("#");
  let to = pathPart.endsWith("/") ? `${pathPart}index.html` : pathPart;
  if (to === "") to = fromUrl.endsWith("/") ? `${fromUrl}index.html` : fromUrl;
  let rel = posix.relative(fromDir, to);
  if (rel === "") rel = posix.basename(to);
  // every segment percent-encoded (the template then escapes the attribute): the one URL rule
  const encoded = rel.split("/").map((seg) => (seg === ".." || seg === "." ? seg : urlPathSegment(seg))).join("/");
  return hash ? `${encoded}#${urlPathSegment(hash)}` : encoded;
}
