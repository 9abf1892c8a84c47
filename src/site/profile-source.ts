/**
 * Where a link's profile came from, for a caption: results.json's `profile.source`
 * ("terrain: synthetic (seed 1729) — not real terrain", "surveyed: profiles/a-b.csv") as a phrase
 * ("sampled from the terrain, synthetic (seed 1729) — not real terrain").
 */
export function profileSourceText(source: string): string {
  if (source.startsWith("terrain: ")) return `sampled from the terrain, ${source.slice("terrain: ".length)}`;
  if (source.startsWith("surveyed: ")) return `surveyed (${source.slice("surveyed: ".length)})`;
  return source;
}
