import type { AnalyzedStudy } from "../analysis/analyze-study.ts";
import { rgbaPngDataUri, WAVE_FIELD_PNG } from "../render/raster/rgba-png.ts";
import { waveFieldRgba } from "../render/raster/wave-field-raster.ts";
import { waveFieldLayout, waveFieldSvg } from "../render/svg/wave-field-figure.ts";
import { waveHeightGainSvg } from "../render/svg/height-gain-chart.ts";

/** The wave solution's field figure of a link (SVG with an embedded PNG), or "" when it was not computed. */
export async function linkWaveFieldSvg(s: AnalyzedStudy, linkId: string): Promise<string> {
  const link = s.result.links.find((l) => l.id === linkId);
  const fig = s.figures.get(linkId);
  if (!link || !fig?.wave || link.wave?.status !== "ok" || link.wave.excess_loss_db === null) return "";
  const w = fig.wave;
  const n = fig.profile.d_m.length;
  const ground = new Float64Array(n);
  for (let i = 0; i < n; i++) ground[i] = fig.profile.terrain_m[i] + fig.profile.obstruction_m[i];
  let top = -Infinity;
  for (let i = 0; i < w.field.rows; i++) top = w.field.z0_m + i * w.field.dz_m;
  const input = {
    id: `wave-${linkId}`,
    title: `Wave solution: field relative to free space, ${link.ends.from.name} – ${link.ends.to.name}`,
    d_m: fig.profile.d_m,
    ground_m: ground,
    from: { name: link.ends.from.name, amsl_m: w.tx_amsl_m },
    to: { name: link.ends.to.name, amsl_m: w.rx_amsl_m },
    lambda_m: fig.lambda_m,
    ae_m: w.ae_m,
    k_label: link.wave.k_label,
    top_m: top,
    excess_loss_db: link.wave.excess_loss_db,
    methods: link.diffraction_db_by_method ?? {},
  };
  const layout = waveFieldLayout(input);
  const href = await rgbaPngDataUri(waveFieldRgba(w.field, layout.raster), layout.raster.width, layout.raster.height, WAVE_FIELD_PNG);
  return waveFieldSvg(input, layout, href);
}

/** The receiver's height-gain curve from the wave solution beside the two-ray one, or "". */
export function linkWaveHeightGainSvg(s: AnalyzedStudy, linkId: string): string {
  const link = s.result.links.find((l) => l.id === linkId);
  const fig = s.figures.get(linkId);
  if (!link || !fig?.wave) return "";
  return waveHeightGainSvg({
    id: `wave-height-gain-${linkId}`,
    title: `Height gain at ${link.ends.to.name}: wave solution and two-ray`,
    wave: fig.wave.height_gain,
    twoRay: fig.height_gain,
    design_m: link.ends.to.antenna_m,
    site: link.ends.to.name,
  });
}
