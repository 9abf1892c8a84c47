import { resolve } from "node:path";
import { readEnvelopeCsv } from "./envelope-csv.ts";
import { fieldPath, showValue, type InputProblem } from "./input-error.ts";
import { ENVELOPE_CSV_MAX_BYTES, inputPathProblem } from "./input-file.ts";
import type { StudyInput } from "./schema.ts";
import type { YamlSource } from "./yaml-source.ts";

/**
 * How far a frequency-plan channel centre may lie from the radio's carrier (fraction): the go
 * and return channels of one band sit within a few per cent of its centre (common practice:
 * duplex spacings are a few per cent of the carrier); 20 % leaves room for a nominal carrier
 * at one edge of a wide band and still catches MHz typed for GHz or a channel of another band.
 */
export const CHANNEL_CARRIER_TOLERANCE = 0.2;

const fmtMhz = (mhz: number) => String(Number(mhz.toPrecision(4)));

/**
 * Checks of the frequency plan and interference inputs that the schema cannot express:
 * overlapping go and return channels on one link; channels far from the radio's carrier; with an `interference` section, a
 * frequency_plan on every link and a protection requirement on every radio a link uses; one
 * way of giving adjacent-channel protection; references of external transmitters; envelope
 * CSV files that exist and span 0–180°: regular files inside the study folder (or `roots`),
 * checked before they are read (a named pipe would block for ever, /dev/zero never ends).
 */
export function interferenceProblems(src: YamlSource, s: StudyInput, dir: string, roots: string[] = []): InputProblem[] {
  const problems: InputProblem[] = [];
  const add = (path: PropertyKey[], received: unknown, expected: string) => problems.push({ file: src.file, ...src.locate(path), field: fieldPath(path), received: showValue(received), expected });
  const asked = s.interference !== undefined;
  s.links.forEach((l, i) => {
    const fp = l.frequency_plan;
    if (fp) {
      const gap = Math.abs(fp.go_mhz - fp.return_mhz);
      if (gap < fp.bandwidth_mhz) {
        add(["links", i, "frequency_plan", "return_mhz"], fp.return_mhz, `a return channel that does not overlap the go channel (${fp.go_mhz} MHz, ${fp.bandwidth_mhz} MHz wide): centres at least ${fp.bandwidth_mhz} MHz apart (they are ${gap} MHz apart)`);
      }
      // The link's losses (gases, rain, diffraction) are computed at the radio's carrier; a
      // channel far from it is a typing slip in one of the two (MHz for GHz, another band).
      const carrierMhz = s.radios.find((r) => r.id === l.radio)?.frequency_ghz;
      if (carrierMhz !== undefined) {
        for (const key of ["go_mhz", "return_mhz"] as const) {
          const f = fp[key];
          const carrier = carrierMhz * 1000;
          if (Math.abs(f - carrier) > CHANNEL_CARRIER_TOLERANCE * carrier) {
            add(["links", i, "frequency_plan", key], f, `a channel centre within ${CHANNEL_CARRIER_TOLERANCE * 100} % of radio ${l.radio}'s carrier (frequency_ghz ${carrierMhz} GHz, so ${fmtMhz(carrier * (1 - CHANNEL_CARRIER_TOLERANCE))}–${fmtMhz(carrier * (1 + CHANNEL_CARRIER_TOLERANCE))} MHz): the link's losses are computed at the radio's frequency, so correct the channel or give the link a radio of its band`);
          }
        }
      }
    } else if (asked) {
      add(["links", i], `link ${l.id} without frequency_plan`, "a frequency_plan {go_mhz, return_mhz, bandwidth_mhz}: the interference analysis needs every link's channels");
    }
  });
  s.radios.forEach((r, i) => {
    const p = r.interference;
    if (!p) {
      if (asked && s.links.some((l) => l.radio === r.id)) add(["radios", i], `radio ${r.id} with no interference requirement`, "radios[].interference {co_channel_ci_db, noise_figure_db, …}: every receiver needs its C/I requirement when the study asks for interference");
      return;
    }
    if (p.adjacent_ci_db && p.nfd_db) add(["radios", i, "interference", "nfd_db"], "both adjacent_ci_db and nfd_db", "one of adjacent_ci_db (C/I by offset) or nfd_db (net filter discrimination by offset)");
    for (const key of ["adjacent_ci_db", "nfd_db"] as const) {
      const t = p[key];
      t?.forEach((row, j) => {
        if (j > 0 && !(row.offset_mhz > t[j - 1].offset_mhz)) add(["radios", i, "interference", key, j, "offset_mhz"], row.offset_mhz, `offsets rising strictly (after ${t[j - 1].offset_mhz} MHz)`);
      });
    }
  });
  if (asked) {
    const sites = new Set(s.sites.map((x) => x.id));
    const externalIds = new Map<string, number>();
    s.interference!.external.forEach((e, i) => {
      // ids name the transmitter in tables and results; file systems and readers ignore case
      const first = externalIds.get(e.id.toLowerCase());
      if (first !== undefined) add(["interference", "external", i, "id"], e.id, `an id not used before in interference.external (external[${first}] already has it, perhaps in other letter case)`);
      else externalIds.set(e.id.toLowerCase(), i);
      if (!sites.has(e.site)) add(["interference", "external", i, "site"], e.site, "the id of a site in sites");
      if (e.toward_site !== undefined && !sites.has(e.toward_site)) add(["interference", "external", i, "toward_site"], e.toward_site, "the id of a site in sites");
      if (e.toward_site === undefined && e.azimuth_deg === undefined) add(["interference", "external", i], `external transmitter ${e.id} with no pointing`, "toward_site (a site id) or azimuth_deg");
      if (e.toward_site === e.site) add(["interference", "external", i, "toward_site"], e.toward_site, "a site other than the transmitter's own");
    });
  }
  // Envelope files: every one named, whether or not interference is asked (a bad file is bad input).
  const ends: { path: PropertyKey[]; pattern: unknown }[] = [];
  s.links.forEach((l, i) => (["from", "to"] as const).forEach((end) => ends.push({ path: ["links", i, end, "pattern"], pattern: l[end].pattern })));
  s.interference?.external.forEach((e, i) => ends.push({ path: ["interference", "external", i, "pattern"], pattern: e.pattern }));
  const seen = new Set<string>();
  for (const e of ends) {
    if (typeof e.pattern !== "object" || e.pattern === null) continue;
    const file = (e.pattern as { envelope_csv: string }).envelope_csv;
    const abs = resolve(dir, file);
    if (seen.has(abs)) continue;
    seen.add(abs);
    const path = [...e.path, "envelope_csv"];
    const bad = inputPathProblem(dir, file, { want: "file", maxBytes: ENVELOPE_CSV_MAX_BYTES, roots, what: "an antenna envelope CSV file" });
    if (bad) {
      problems.push({ file: src.file, ...src.locate(path), field: fieldPath(path), received: bad.received, expected: bad.expected });
      continue;
    }
    problems.push(...readEnvelopeCsv(abs, fieldPath(path), { file: src.file, ...src.locate(path) }).problems);
  }
  return problems;
}
