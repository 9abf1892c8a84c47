import { decodeEntry } from "../cache/entry-codec.ts";
import type { LinkFigureData } from "./analyze-link.ts";

/**
 * The figure data of a study's links (profiles, height-gain curves: what the page's plots are
 * drawn from), by link id, in study order. A link computed in this build holds its data; a
 * link read from the cache holds only its cache key, and its data (a cache entry of its own,
 * see entry-codec.ts) is read and decoded when first asked for. Only the site build draws
 * figures, so `check`, `diff` and a rebuild's analysis never read the figure data of the
 * links they did not compute — about six sevenths of what the cache holds for a link.
 */
export class LinkFigureMap implements ReadonlyMap<string, LinkFigureData> {
  private readonly data = new Map<string, LinkFigureData | { key: string }>();

  /** @param stored the bytes of the figure entry stored under a cache key, or undefined when there are none */
  constructor(private readonly stored: (key: string) => Buffer | undefined = () => undefined) {}

  /** The figure data of a link computed now. */
  set(linkId: string, figure: LinkFigureData): void {
    this.data.set(linkId, figure);
  }

  /** A link whose figure data is stored in the cache under `key`, read when first asked for. */
  setStored(linkId: string, key: string): void {
    this.data.set(linkId, { key });
  }

  /**
   * @throws Error when the cached figure data of the link is gone or cannot be decoded (the
   *   cache was changed during the build, or is damaged: build again, or with --no-cache)
   */
  get(linkId: string): LinkFigureData | undefined {
    const v = this.data.get(linkId);
    if (v === undefined || !("key" in v)) return v;
    const bytes = this.stored(v.key);
    // typed arrays are read in place (views of the bytes just read), not copied
    const figure = bytes ? (decodeEntry(bytes, { views: true }) as LinkFigureData | null) : null;
    if (!(figure?.profile?.d_m instanceof Float64Array)) throw new Error(`The cached figure data of link ${linkId} is gone or cannot be read: build again (with --no-cache if this persists).`);
    this.data.set(linkId, figure);
    return figure;
  }

  has(linkId: string): boolean {
    return this.data.has(linkId);
  }

  get size(): number {
    return this.data.size;
  }

  *keys(): MapIterator<string> {
    yield* this.data.keys();
  }

  *values(): MapIterator<LinkFigureData> {
    for (const id of this.data.keys()) yield this.get(id)!;
  }

  *entries(): MapIterator<[string, LinkFigureData]> {
    for (const id of this.data.keys()) yield [id, this.get(id)!];
  }

  [Symbol.iterator](): MapIterator<[string, LinkFigureData]> {
    return this.entries();
  }

  forEach(f: (value: LinkFigureData, key: string, map: ReadonlyMap<string, LinkFigureData>) => void, thisArg?: unknown): void {
    for (const [id, fig] of this.entries()) f.call(thisArg, fig, id, this);
  }
}
