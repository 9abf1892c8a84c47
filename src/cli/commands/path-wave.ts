import { writeFileSync } from "node:fs";
import sharp from "sharp";
import type { LinkFigureData } from "../../analysis/analyze-link.ts";
import type { LinkResult } from "../../analysis/results.ts";
import { linkWave } from "../../analysis/link-wave.ts";
import { obstructedHeights } from "../../analysis/link-losses.ts";
import { PE_DEFAULT_MEMORY_LIMIT_BYTES } from "../../physics/parabolic-equation/pe-grid.ts";
import { rgbaPngDataUri, WAVE_FIELD_PNG } from "../../render/raster/rgba-png.ts";
import { waveFieldRgba } from "../../render/raster/wave-field-raster.ts";
import { waveFieldLayout, waveFieldSvg, WAVE_FIGURE_STANDALONE_STYLE } from "../../render/svg/wave-field-figure.ts";
import type { Study } from "../../study/study.ts";
import { numberArg, UsageError } from "../args.ts";

/** Options of `ridgeline path --method wave`. */
export interface PathWaveOptions {
  /** --field: write the field figure as a PNG here */
  field?: string;
  /** --wave-memory-mib */
  memoryMib?: string;
}

export const PATH_WAVE_USAGE = `[--method wave [--field OUT.png] [--wave-memory-mib M]]`;

/**
 * `ridgeline path --method wave`: the wave solution (parabolic equation) over the link the
 * path command analysed. Adds `wave`, `basic_transmission_loss_db` and `excess_loss_db`
 * (relative to free space) to the link object; with --field, writes the field figure as a PNG.
 * A grid above the memory limit (default 256 MiB; --wave-memory-mib) is a usage error.
 */
export async function pathWave(study: Study, result: LinkResult, figure: LinkFigureData, o: PathWaveOptions): Promise<LinkResult & { basic_transmission_loss_db: number; excess_loss_db: number }> {
  const limitMib = o.memoryMib === undefined ? PE_DEFAULT_MEMORY_LIMIT_BYTES / 1048576 : numberArg("wave-memory-mib", o.memoryMib, (x) => x > 0 && x <= 65536, "a memory limit in MiB, above 0 and up to 65536");
  const link = study.links[0];
  const w = linkWave(study, figure.profile, result.ends, result.frequency_ghz, link.polarization, result.diffraction_db_by_method ?? {}, { memory_limit_bytes: limitMib * 1048576 });
  const excess_db = w.wave.excess_loss_db;
  const basic_db = w.wave.basic_transmission_loss_db;
  if (w.wave.status !== "ok" || excess_db === null || basic_db === null) {
    throw new UsageError(`the wave solution was refused: ${w.wave.reason}. Raise the limit with --wave-memory-mib (now ${limitMib}), or shorten the path or lower the frequency.`);
  }
  if (o.field !== undefined && w.figure) {
    const input = {
      id: "wave-path",
      title: `Wave solution: field relative to free space, ${result.ends.from.name} – ${result.ends.to.name}`,
      d_m: figure.profile.d_m,
      ground_m: obstructedHeights(figure.profile),
      from: { name: result.ends.from.name, amsl_m: w.figure.tx_amsl_m },
      to: { name: result.ends.to.name, amsl_m: w.figure.rx_amsl_m },
      lambda_m: figure.lambda_m,
      ae_m: w.figure.ae_m,
      k_label: w.wave.k_label,
      top_m: w.figure.field.z0_m + (w.figure.field.rows - 1) * w.figure.field.dz_m,
      excess_loss_db: excess_db,
      methods: result.diffraction_db_by_method ?? {},
    };
    const layout = waveFieldLayout(input);
    const href = await rgbaPngDataUri(waveFieldRgba(w.figure.field, layout.raster), layout.raster.width, layout.raster.height, WAVE_FIELD_PNG);
    const svg = waveFieldSvg(input, layout, href, { style: WAVE_FIGURE_STANDALONE_STYLE });
    const png = await sharp(Buffer.from(svg), { density: 72 * layout.scale }).flatten({ background: "#ffffff" }).png().toBuffer();
    try {
      writeFileSync(o.field, png);
    } catch (e) {
      throw new UsageError(`--field: cannot write "${o.field}": ${(e as Error).message}`);
    }
  }
  const warnings = [...result.warnings, ...w.warnings];
  return { ...result, warnings, wave: w.wave, basic_transmission_loss_db: basic_db, excess_loss_db: excess_db };
}
