/**
 * A bounded map that evicts the least recently used entry when full. `get` and `set`
 * both count as use. Insertion order of the underlying Map is the recency order.
 */
export class LruCache<K, V> {
  private readonly map = new Map<K, V>();

  /** @param capacity maximum number of entries kept (≥ 1) */
  constructor(readonly capacity: number) {
    if (!(capacity >= 1)) throw new RangeError(`LRU capacity must be at least 1, received ${capacity}`);
  }

  get size(): number {
    return this.map.size;
  }

  has(key: K): boolean {
    return this.map.has(key);
  }

  get(key: K): V | undefined {
    const v = this.map.get(key);
    if (v === undefined) return undefined;
    this.map.delete(key);
    this.map.set(key, v);
    return v;
  }

  set(key: K, value: V): void {
    this.map.delete(key);
    this.map.set(key, value);
    while (this.map.size > this.capacity) {
      const oldest = this.map.keys().next().value as K;
      this.map.delete(oldest);
    }
  }
}
