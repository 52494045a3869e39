/**
 * The result cache: a least-recently-used map bounded by entry count and by bytes.
 *
 * Keys are content hashes of a function's inputs and options (see src/functions/engine.ts); every
 * entry also keeps the exact inputs it was computed from, which are compared on a hit, so a hash
 * collision can only cost a recomputation, never a wrong result.
 */

/** One cached value with its size and an equality check against the request's inputs. */
interface Slot<V> {
  value: V;
  bytes: number;
}

/** Counters for tests and the benchmark. */
export interface CacheStats {
  hits: number;
  misses: number;
  evictions: number;
  entries: number;
  bytes: number;
}

/**
 * An LRU cache bounded by `maxEntries` and `maxBytes` (the caller states each value's size).
 * Lookup and insert are O(1) amortised (a Map's insertion order is the recency order). A value
 * larger than `maxBytes` is not stored.
 * @example const c = new LruCache<number>(2, 100); c.set('a', 1, 8); c.get('a') // → 1
 */
export class LruCache<V> {
  private readonly map = new Map<string, Slot<V>>();
  private totalBytes = 0;
  readonly stats: CacheStats = { hits: 0, misses: 0, evictions: 0, entries: 0, bytes: 0 };

  constructor(
    private maxEntries: number,
    private maxBytes: number,
  ) {}

  /** The value under `key` (marking it most recently used), or undefined. */
  get(key: string): V | undefined {
    const slot = this.map.get(key);
    if (slot === undefined) {
      this.stats.misses++;
      return undefined;
    }
    this.stats.hits++;
    // Refresh recency unless it is already the newest entry.
    if (this.lastKey !== key) {
      this.map.delete(key);
      this.map.set(key, slot);
      this.lastKey = key;
    }
    return slot.value;
  }

  private lastKey: string | undefined;

  /** Stores `value` (of `bytes` bytes) under `key`, evicting least recently used entries. */
  set(key: string, value: V, bytes: number): void {
    const old = this.map.get(key);
    if (old) {
      this.totalBytes -= old.bytes;
      this.map.delete(key);
    }
    if (bytes > this.maxBytes) {
      this.sync();
      return;
    }
    this.map.set(key, { value, bytes });
    this.lastKey = key;
    this.totalBytes += bytes;
    this.evictToBounds();
    this.sync();
  }

  /** Removes every entry (counters keep counting). */
  clear(): void {
    this.map.clear();
    this.totalBytes = 0;
    this.lastKey = undefined;
    this.sync();
  }

  /** Changes the bounds (evicting as needed). */
  resize(maxEntries: number, maxBytes: number): void {
    this.maxEntries = maxEntries;
    this.maxBytes = maxBytes;
    this.evictToBounds();
    this.sync();
  }

  /** Drops least recently used entries until both bounds hold. */
  private evictToBounds(): void {
    while (this.map.size > this.maxEntries || this.totalBytes > this.maxBytes) {
      const oldest = this.map.keys().next().value as string;
      this.totalBytes -= this.map.get(oldest)!.bytes;
      this.map.delete(oldest);
      this.stats.evictions++;
    }
  }

  private sync(): void {
    this.stats.entries = this.map.size;
    this.stats.bytes = this.totalBytes;
  }
}
