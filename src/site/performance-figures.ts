import type { AnalyzedStudy } from "../analysis/analyze-study.ts";
import { seriesChartSvg } from "../render/svg/series-chart.ts";
import { formatNumber, formatSmall, powerOfTen } from "../format/quantity.ts";

const sup = (v: number) => {
  const e = Math.round(Math.log10(v));
  return Math.abs(Math.log10(v) - e) < 1e-9 ? (e >= 0 && e <= 3 ? String(10 ** e) : powerOfTen(e)) : "";
};

function linkOf(s: AnalyzedStudy, linkId: string) {
  const link = s.result.links.find((l) => l.id === linkId);
  if (!link) throw new Error(`Link ${linkId} is not in study ${s.study.id}.`);
  return link;
}

/** Space-diversity improvement against antenna spacing, with the study's spacing marked; "" without space diversity. */
export function diversityCurveSvg(s: AnalyzedStudy, linkId: string): string {
  const l = linkOf(s, linkId);
  const dv = l.diversity;
  if (!dv || !dv.curve) return "";
  const points = dv.curve.spacing_m.map((x, i) => ({ x, y: dv.curve!.improvement[i] }));
  const inRange = dv.spacing >= dv.curve.spacing_m[0] && dv.spacing <= dv.curve.spacing_m[dv.curve.spacing_m.length - 1];
  return seriesChartSvg({
    id: `diversity-${linkId}`,
    title: `Space-diversity improvement, ${l.ends.from.name} – ${l.ends.to.name}`,
    desc: `Improvement factor from ${formatSmall(points[0].y, 3)} at ${points[0].x} m to ${formatSmall(points[points.length - 1].y, 3)} at ${points[points.length - 1].x} m spacing; ${formatSmall(dv.improvement, 3)} at the study's ${dv.spacing} m${inRange ? "" : " (outside the method's range)"}.`,
    xLabel: "Vertical spacing of the receive antennas (m)",
    yLabel: "Improvement factor I_ns",
    points,
    logY: true,
    yFormat: sup,
    marker: inRange ? { x: dv.spacing, y: dv.improvement, label: `study: ${dv.spacing} m, I = ${formatSmall(dv.improvement, 3)}` } : null,
  });
}

/** Capacity against the percentage of the year with less capacity (steps); "" without modes. */
export function capacityCurveSvg(s: AnalyzedStudy, linkId: string): string {
  const l = linkOf(s, linkId);
  const am = l.adaptive_modulation;
  if (!am || am.modes.length === 0) return "";
  // Capacity available for all but x % of the year: the best mode whose time below threshold
  // is at most x, a step rising with x (modes in rising order: x rises with them).
  const steps = am.modes.map((m) => ({ x: Math.max(100 - m.available_pct, 1e-7), y: m.capacity_mbps }));
  const pts = [{ x: steps[0].x / 10, y: 0 }, ...steps, { x: 100, y: steps[steps.length - 1].y }];
  return seriesChartSvg({
    id: `capacity-${linkId}`,
    title: `Capacity against time, ${l.ends.from.name} – ${l.ends.to.name}`,
    desc: am.modes.map((m) => `${m.name} (${m.capacity_mbps} Mbit/s) or better for ${formatNumber(m.available_pct, 5)} % of the year.`).join(" "),
    xLabel: "Percentage of the year allowed below this capacity (%)",
    yLabel: "Capacity available (Mbit/s)",
    points: pts,
    logX: true,
    steps: true,
    xFormat: sup,
    reference: { x: 100 - am.availability_pct, label: `target ${am.availability_pct} %` },
  });
}
