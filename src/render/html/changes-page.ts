import { showFixed, showNumber } from "../../diff/diff-format.ts";
import { thresholdsText } from "../../diff/diff-text.ts";
import type { InputChange, LinkResultDiff, ResultChange, StudiesDiff, StudyDiff } from "../../diff/study-diff.ts";
import { escapeXml as esc } from "../svg/escape.ts";

export interface ChangesPageOptions {
  /** Ridgeline's version, for the colophon. */
  tool_version: string;
  /** Href of the site's style sheet from the page (default "../assets/ridgeline.css", for changes/index.html). */
  cssHref?: string;
  /** Href of the site root from the page (default "../"). */
  rootHref?: string;
}

const KIND_NAMES: Record<InputChange["kind"], string> = {
  study: "Study",
  meta: "Title block",
  terrain: "Terrain",
  design: "Design",
  target: "Target",
  climate: "Climate",
  radio: "Radio",
  site: "Site",
  "site-moved": "Site moved",
  link: "Link",
  antenna: "Antenna",
  profile: "Profile",
  chain: "Chain",
  coverage: "Coverage",
  interference: "Interference",
};

const cell = (v: unknown): string => (v === null || v === undefined ? "—" : typeof v === "number" ? showNumber(v) : String(v));
const num = (v: number | null, digits: number, signed = false): string => (v === null ? "—" : showNumber(v, digits, signed));
const fixed = (v: number | null, digits: number, signed = false): string => (v === null ? "—" : showFixed(v, digits, signed));

function inputsTable(s: StudyDiff, linkHref: (id: string) => string | null): string {
  if (!s.inputs.length) return "<p>No input changes.</p>";
  const rows = s.inputs.map((c) => {
    const delta = c.delta === null ? "—" : `${num(c.delta, c.kind === "site-moved" ? 1 : 6, c.kind !== "site-moved")}${c.unit ? ` ${c.unit}` : ""}`;
    const links = c.links.length > 8 ? `${c.links.length} links` : c.links.map((id) => (linkHref(id) ? `<a href="${esc(linkHref(id))}">${esc(id)}</a>` : esc(id))).join(", ");
    return `<tr><td>${esc(KIND_NAMES[c.kind])}</td><th scope="row">${esc(c.subject)}</th><td>${esc(c.field || "—")}</td><td class="num">${esc(cell(c.before))}</td><td class="num">${esc(cell(c.after))}</td><td class="num">${esc(delta)}</td><td>${links || "—"}</td></tr>`;
  });
  return `<table class="data">
<caption>Input changes in ${esc(s.id)}</caption>
<thead><tr><th scope="col">Kind</th><th scope="col">Subject</th><th scope="col">Field</th><th scope="col">Before</th><th scope="col">After</th><th scope="col">Change</th><th scope="col">Feeds links</th></tr></thead>
<tbody>
${rows.join("\n")}
</tbody>
</table>`;
}

function resultCell(c: ResultChange | undefined, digits: number): string {
  if (!c) return `<td class="num">·</td>`;
  if (typeof c.before === "boolean" || typeof c.after === "boolean" || (c.before === null && c.after === null)) {
    const v = (x: unknown) => (x === null ? "—" : x ? `<span class="verdict pass">✓</span>` : `<span class="verdict fail">✗</span>`);
    return `<td>${v(c.before)} → ${v(c.after)}</td>`;
  }
  return `<td class="num">${esc(fixed(c.before as number | null, digits))} → ${esc(fixed(c.after as number | null, digits))}${c.delta === null ? "" : ` (${esc(fixed(c.delta, digits, true))})`}</td>`;
}

function resultsTable(s: StudyDiff, linkHref: (id: string) => string | null): string {
  if (!s.results.length) return "<p>No link's results moved beyond the thresholds.</p>";
  const ks = [...new Set(s.results.flatMap((r) => r.changes.filter((c) => c.quantity === "min_clearance_f1").map((c) => c.k_label!)))];
  const row = (r: LinkResultDiff) => {
    const q = (quantity: ResultChange["quantity"], k: string | null = null) => r.changes.find((c) => c.quantity === quantity && c.k_label === k);
    const href = linkHref(r.link);
    const name = href ? `<a href="${esc(href)}">${esc(r.link)}</a>` : esc(r.link);
    return `<tr><th scope="row">${name}${r.status === "changed" ? "" : ` (${r.status})`}</th>${resultCell(q("target_met"), 0)}${resultCell(q("fade_margin_db"), 2)}${resultCell(q("performance_pct"), 5)}${resultCell(q("availability_pct"), 5)}${resultCell(q("clearance_met"), 0)}${ks.map((k) => resultCell(q("min_clearance_f1", k), 3)).join("")}</tr>`;
  };
  return `<table class="data">
<caption>Links of ${esc(s.id)} whose results moved (· = within the threshold)</caption>
<thead><tr><th scope="col">Link</th><th scope="col">Targets</th><th scope="col">Fade margin (dB)</th><th scope="col">Performance, worst month (%)</th><th scope="col">Availability, year (%)</th><th scope="col">Clearance</th>${ks.map((k) => `<th scope="col">Least clearance at k = ${esc(k)} (F1)</th>`).join("")}</tr></thead>
<tbody>
${s.results.map(row).join("\n")}
</tbody>
</table>`;
}

/**
 * The changes page: a self-contained HTML page (it needs only the site's style sheet, linked
 * relatively) listing, per study, the input changes between two revisions and the links whose
 * results moved beyond the thresholds. Same diff in, same bytes out (no clock, no random ids).
 */
export function changesPageHtml(d: StudiesDiff, options: ChangesPageOptions): string {
  const css = options.cssHref ?? "../assets/ridgeline.css";
  const root = options.rootHref ?? "../";
  const short = (r: StudiesDiff["from"]) => (r.commit ? r.label.split(" ")[0] : r.label);
  const title = `Changes ${short(d.from)} → ${short(d.to)}`;
  const sections = d.studies.map((s) => {
    const linkHref = (id: string) => (s.status === "removed" ? null : `${root}studies/${encodeURIComponent(s.id)}/links/${encodeURIComponent(id)}/index.html`);
    const heading = s.status === "removed" ? esc(s.id) : `<a href="${esc(`${root}studies/${encodeURIComponent(s.id)}/index.html`)}">${esc(s.id)}</a>`;
    if (s.status === "unchanged") return `<h2>${heading}</h2>\n<p>Unchanged: no input changes and no result beyond the thresholds.</p>`;
    const ifx = s.interference?.length
      ? `\n<h3>Interference</h3>\n<ul class="changes-interference">${s.interference.map((c) => `<li><strong>${esc(c.receiver)}</strong>${c.status === "changed" ? "" : ` (${esc(c.status)})`}: ${esc(c.text)}</li>`).join("")}</ul>`
      : "";
    return `<h2>${heading} <small>(${esc(s.status)})</small></h2>\n<h3>Inputs</h3>\n${inputsTable(s, linkHref)}\n<h3>Results</h3>\n${resultsTable(s, linkHref)}${ifx}`;
  });
  const commit = (c: string | null) => (c ? `<code>${esc(c.slice(0, 12))}</code>` : "uncommitted files");
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>${esc(title)} — Ridgeline</title>
<link rel="stylesheet" href="${esc(css)}">
</head>
<body>
<header class="masthead">
  <a class="brand" href="${esc(`${root}index.html`)}">Ridgeline</a>
  <span class="running-head">${esc(title)}</span>
</header>
<main>
<h1>Changes between revisions</h1>
<dl class="title-block">
<dt>From</dt><dd>${esc(d.from.label)} (${esc(d.from.rev)})</dd>
<dt>To</dt><dd>${esc(d.to.label)}${d.to.commit ? ` (${esc(d.to.rev)})` : ""}</dd>
<dt>Thresholds</dt><dd>result changes are shown when they exceed ${esc(thresholdsText(d.thresholds))}; verdict changes always</dd>
</dl>
${d.notes.map((n) => `<p class="notice">⚠ ${esc(n)}</p>`).join("\n")}
${sections.join("\n") || "<p>No studies at either revision.</p>"}
</main>
<footer class="colophon">
  <p>Compared by Ridgeline ${esc(options.tool_version)} · from ${commit(d.from.commit)} · to ${commit(d.to.commit)}</p>
</footer>
</body>
</html>
`;
}
