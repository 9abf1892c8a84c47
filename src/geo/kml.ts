import type { IsobandCollection } from "./isobands.ts";

export interface KmlOptions {
  /** document name */
  name: string;
  description?: string;
  /** one style per feature: fill colour "#rrggbb" and opacity 0–1 */
  styles: { label: string; fill: string; opacity: number }[];
  /** points to mark (sites) */
  points: { name: string; lat_deg: number; lon_deg: number }[];
}

/**
 * KML 2.2 (OGC 07-147r2) document of threshold regions: one Placemark per feature with a
 * MultiGeometry of Polygons (first ring outer, the rest inner boundaries), a PolyStyle per
 * threshold (KML colours are aabbggrr), and a Placemark per site.
 * @param regions GeoJSON regions in longitude/latitude (isobandsGeoJson)
 */
export function coverageKml(regions: IsobandCollection, o: KmlOptions): string {
  const styles = o.styles
    .map(
      (s, i) =>
        `<Style id="t${i}"><LineStyle><color>${kmlColor(s.fill, 1)}</color><width>1</width></LineStyle><PolyStyle><color>${kmlColor(s.fill, s.opacity)}</color></PolyStyle></Style>`,
    )
    .join("\n");
  const ring = (r: number[][]) => r.map(([lon, lat]) => `${lon},${lat},0`).join(" ");
  const placemarks = regions.features
    .map((f, i) => {
      const polys = f.geometry.coordinates
        .map((poly) => {
          const [outer, ...inner] = poly;
          return `<Polygon><outerBoundaryIs><LinearRing><coordinates>${ring(outer)}</coordinates></LinearRing></outerBoundaryIs>${inner
            .map((r) => `<innerBoundaryIs><LinearRing><coordinates>${ring(r)}</coordinates></LinearRing></innerBoundaryIs>`)
            .join("")}</Polygon>`;
        })
        .join("");
      return `<Placemark><name>${esc(o.styles[i]?.label ?? `region ${i + 1}`)}</name><styleUrl>#t${i}</styleUrl><MultiGeometry>${polys}</MultiGeometry></Placemark>`;
    })
    .join("\n");
  const points = o.points.map((p) => `<Placemark><name>${esc(p.name)}</name><Point><coordinates>${p.lon_deg},${p.lat_deg},0</coordinates></Point></Placemark>`).join("\n");
  return `<?xml version="1.0" encoding="UTF-8"?>
<kml xmlns="http://www.opengis.net/kml/2.2">
<Document>
<name>${esc(o.name)}</name>${o.description ? `\n<description>${esc(o.description)}</description>` : ""}
${styles}
${placemarks}
${points}
</Document>
</kml>
`;
}

/** "#rrggbb" and opacity → KML aabbggrr. */
function kmlColor(hex: string, opacity: number): string {
  const h = hex.replace("#", "");
  const a = Math.round(Math.max(0, Math.min(1, opacity)) * 255)
    .toString(16)
    .padStart(2, "0");
  return `${a}${h.slice(4, 6)}${h.slice(2, 4)}${h.slice(0, 2)}`;
}

function esc(s: string): string {
  return s.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;");
}
