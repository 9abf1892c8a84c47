import type { CoverageResult } from "../coverage/coverage-result.ts";
import { waveCheckFigureSvg } from "../render/svg/wave-check-figure.ts";

/** How the check's figure names the method it compares (see coverage-wave-check.ts for what is compared). */
const METHOD_LABEL: Record<string, string> = {
  "delta-bullington": "delta-Bullington (the map's loss)",
  p1812: "P.1812-6 Lbd on bare terrain",
  hata: "Hata (the map's loss)",
};

/** The coverage page's wave-check figure (small multiples per radial); "" when the coverage has no check. */
export function coverageWaveCheckSvg(c: CoverageResult): string {
  const w = c.wave_check;
  if (!w) return "";
  return waveCheckFigureSvg({
    id: `wave-check-${c.id}`,
    title: `Wave solution against ${METHOD_LABEL[c.method] ?? c.method} along ${w.radials.length} radials, coverage ${c.id}`,
    method: METHOD_LABEL[c.method] ?? c.method,
    frequency_ghz: c.frequency_ghz,
    radius_km: c.radius_m / 1000,
    radials: w.radials,
    overall: w.overall,
  });
}
