import { parseArgs } from "../args.ts";
import { buildSite } from "../build-site.ts";
import { loadAllStudies } from "../load-all.ts";
import { progressReporter } from "../progress.ts";

/** `ridgeline build [study-id…] [--out DIR] [--path-prefix /sub/]` */
export async function buildCommand(argv: string[]): Promise<number> {
  const args = parseArgs(argv, { values: ["out", "path-prefix", "studies-dir"] });
  const t0 = performance.now();
  const progress = progressReporter("links");
  const studies = await loadAllStudies(args.values.get("studies-dir")?.[0] ?? "content/studies", {
    ids: args.positional,
    onProgress: (_s, d, t) => progress.update(d, t),
  });
  progress.stop();
  const t1 = performance.now();
  const { outDir } = await buildSite(studies, { outDir: args.values.get("out")?.[0], pathPrefix: args.values.get("path-prefix")?.[0] });
  const links = studies.reduce((n, s) => n + s.result.links.length, 0);
  process.stderr.write(
    `Built ${studies.length} stud${studies.length === 1 ? "y" : "ies"}, ${links} links into ${outDir} (compute ${((t1 - t0) / 1000).toFixed(2)} s, render ${((performance.now() - t1) / 1000).toFixed(2)} s).\n`,
  );
  return 0;
}
