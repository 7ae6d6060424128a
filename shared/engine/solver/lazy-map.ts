/**
 * A Map filled on first use. The solver keeps its solution in typed arrays and hands callers the
 * Maps of PrimitiveSolution; building them eagerly (one small object per node and per current,
 * ~3·10⁵ on a 20 000-bus feeder) cost more than the factorization, and callers that read a few
 * entries (or none: sweeps, benchmarks, convergence checks) never need the rest.
 * Every read or write first runs the filler once; after that it is an ordinary Map.
 */
export class LazyMap<K, V> extends Map<K, V> {
  #fill: ((set: (k: K, v: V) => void) => void) | null;

  /** `fill` receives a setter and writes every entry; it runs at most once, on first use. */
  constructor(fill: (set: (k: K, v: V) => void) => void) {
    super();
    this.#fill = fill;
  }

  #ready(): void {
    const f = this.#fill;
    if (f === null) return;
    this.#fill = null;
    f((k, v) => {
      super.set(k, v);
    });
  }

  override get(key: K): V | undefined {
    this.#ready();
    return super.get(key);
  }
  override has(key: K): boolean {
    this.#ready();
    return super.has(key);
  }
  override set(key: K, value: V): this {
    this.#ready();
    return super.set(key, value);
  }
  override delete(key: K): boolean {
    this.#ready();
    return super.delete(key);
  }
  override clear(): void {
    this.#fill = null;
    super.clear();
  }
  override get size(): number {
    this.#ready();
    return super.size;
  }
  override forEach(cb: (value: V, key: K, map: Map<K, V>) => void, thisArg?: unknown): void {
    this.#ready();
    super.forEach(cb, thisArg);
  }
  override keys(): MapIterator<K> {
    this.#ready();
    return super.keys();
  }
  override values(): MapIterator<V> {
    this.#ready();
    return super.values();
  }
  override entries(): MapIterator<[K, V]> {
    this.#ready();
    return super.entries();
  }
  override [Symbol.iterator](): MapIterator<[K, V]> {
    this.#ready();
    return super.entries();
  }
}

// Callers see a Map: deep-equality helpers (vitest's toEqual, node:assert) compare constructors,
// and a solution's Maps should compare equal to plain Maps with the same entries.
Object.defineProperty(LazyMap.prototype, 'constructor', { value: Map, writable: true, configurable: true });
