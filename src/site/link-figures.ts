import type { AnalyzedStudy } from "../analysis/analyze-study.ts";
import { earthBulgeM } from "../physics/earth-bulge.ts";
import { fresnelSectionSvg, type FresnelSectionPanel } from "../render/svg/fresnel-section.ts";
import { heightGainSvg } from "../render/svg/height-gain-chart.ts";
import { profilePlotSvg } from "../render/svg/profile-plot.ts";

function linkOf(s: AnalyzedStudy, linkId: string) {
  const link = s.result.links.find((l) => l.id === linkId);
  const fig = s.figures.get(linkId);
  if (!link || !fig) throw new Error(`Link ${linkId} is not in study ${s.study.id}.`);
  return { link, fig };
}

function nearestIndex(d: ArrayLike<number>, v: number): number {
  let best = 0;
  for (let i = 1; i < d.length; i++) if (Math.abs(d[i] - v) < Math.abs(d[best] - v)) best = i;
  return best;
}

/** The path profile of a link, with reflection points at the first k. */
export function linkProfileSvg(s: AnalyzedStudy, linkId: string): string {
  const { link, fig } = linkOf(s, linkId);
  const first = link.reflection?.per_k[0];
  return profilePlotSvg({
    id: `profile-${linkId}`,
    title: `Path profile ${link.ends.from.name} – ${link.ends.to.name}`,
    d_m: fig.profile.d_m,
    terrain_m: fig.profile.terrain_m,
    obstruction_m: fig.profile.obstruction_m,
    from: { name: link.ends.from.name, ground_m: link.ends.from.ground_m, antenna_m: link.ends.from.antenna_m },
    to: { name: link.ends.to.name, ground_m: link.ends.to.ground_m, antenna_m: link.ends.to.antenna_m },
    lambda_m: fig.lambda_m,
    ks: fig.ks,
    // Mark the reflections that matter: effective coefficient (|Γ| × divergence × roughness) ≥ 0.1.
    reflections: (first?.points ?? []).filter((p) => p.effective_coefficient >= 0.1).map((p) => ({
      at_distance_m: p.distance_m,
      label: `Reflection point at ${(p.distance_m / 1000).toFixed(2)} km (k = ${first!.k_label}), grazing ${p.grazing_angle_mrad.toFixed(1)} mrad`,
    })),
    reflectionLegend: first ? `Reflection point, effective coefficient ≥ 0.1 (k = ${first.k_label})` : undefined,
  });
}

/** The Fresnel-zone cross-section at the point of least clearance, one panel per k. */
export function linkFresnelSvg(s: AnalyzedStudy, linkId: string): string {
  const { link, fig } = linkOf(s, linkId);
  const d = fig.profile.d_m;
  const D = d[d.length - 1];
  const hts = link.ends.from.antenna_amsl_m;
  const hrs = link.ends.to.antenna_amsl_m;
  const panels: FresnelSectionPanel[] = link.clearance.map((c, j) => {
    const i = nearestIndex(d, c.at_distance_m);
    const x = d[i];
    const ae = fig.ks[j]?.ae_m ?? Number.POSITIVE_INFINITY;
    const ray_m = hts + ((hrs - hts) * x) / D;
    return {
      k_label: c.k_label,
      at_distance_m: x,
      ray_m,
      ground_m: fig.profile.terrain_m[i] + earthBulgeM(x, D - x, ae),
      obstruction_m: fig.profile.obstruction_m[i],
      f1_m: c.f1_m,
      required_f1: c.required_f1,
    };
  });
  return fresnelSectionSvg({ id: `fresnel-${linkId}`, title: `Fresnel zone at the point of least clearance, ${link.ends.from.name} – ${link.ends.to.name}`, from: link.ends.from.name, panels });
}

/** The height-gain figure at the receiving end, or "" when the link has no curve. */
export function linkHeightGainSvg(s: AnalyzedStudy, linkId: string): string {
  const { link, fig } = linkOf(s, linkId);
  const curve = fig.height_gain;
  const hg = Array.from(curve.rx_antenna_m, (rx_antenna_m, i) => ({ rx_antenna_m, relative_db: curve.relative_db[i] })).filter((p) => Number.isFinite(p.relative_db));
  if (hg.length < 2) return "";
  return heightGainSvg({
    id: `height-gain-${linkId}`,
    title: `Height gain at ${link.ends.to.name} (k = ${link.reflection?.per_k[0]?.k_label ?? "first"})`,
    points: hg,
    design_m: link.ends.to.antenna_m,
    site: link.ends.to.name,
  });
}
