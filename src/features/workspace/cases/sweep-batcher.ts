/**
 * Coalesces a sweep's arriving chunks into at most one redraw per animation frame, and at most one
 * every `minInterval` ms: each chunk's range of points is queued and, at the next frame due, every
 * range queued since the last redraw is handed over at once (none is dropped or handed twice).
 * With `backoff`, a redraw that took long (from handing over to the next frame: the commit and its
 * paint, stretched when the page waits for a core on a busy machine) spaces the next ones out to
 * `backoff` times its cost, up to `maxInterval`, so the page keeps most frames for the user.
 * The frame and clock sources are injectable so tests drive it without timers.
 */

export type Range = [start: number, count: number];

export interface BatcherOptions {
  /** Shortest time between two redraws, ms. */
  minInterval: number;
  /** The interval is at least this many times the last redraw's cost (none when unset). */
  backoff?: number;
  /** Longest interval the backoff may set, ms. */
  maxInterval?: number;
  requestFrame?: (cb: () => void) => unknown;
  setTimer?: (cb: () => void, ms: number) => unknown;
  now?: () => number;
}

export interface Batcher {
  /** The current shortest time between two redraws, ms. */
  readonly interval: number;
  /** Queues points start … start + count − 1. */
  push(start: number, count: number): void;
  /** Hands over whatever is queued now (the sweep ended). */
  flushNow(): void;
  /** Drops what is queued and any redraw asked for (the sweep was cancelled or replaced). */
  cancel(): void;
}

export function createBatcher(flush: (ranges: Range[]) => void, options: BatcherOptions): Batcher {
  const requestFrame = options.requestFrame ?? ((cb: () => void) => (typeof requestAnimationFrame === 'function' ? requestAnimationFrame(() => cb()) : setTimeout(cb, 16)));
  const setTimer = options.setTimer ?? ((cb: () => void, ms: number) => setTimeout(cb, ms));
  const now = options.now ?? (() => performance.now());
  let pending: Range[] = [];
  let last = -Infinity;
  let asked = false;
  let alive = true;
  let generation = 0;
  let interval = options.minInterval;

  const hand = () => {
    if (pending.length === 0) return;
    const ranges = pending;
    pending = [];
    const t0 = now();
    last = t0;
    flush(ranges);
    if (options.backoff) {
      const b = options.backoff;
      requestFrame(() => {
        interval = Math.min(options.maxInterval ?? Infinity, Math.max(options.minInterval, (now() - t0) * b));
      });
    }
  };
  const onFrame = (gen: number) => {
    if (!alive || gen !== generation) return;
    const wait = last + interval - now();
    if (wait > 0) {
      setTimer(() => {
        if (alive && gen === generation) requestFrame(() => onFrame(gen));
      }, wait);
      return;
    }
    asked = false;
    hand();
  };
  return {
    get interval() {
      return interval;
    },
    push(start, count) {
      if (!alive) return;
      pending.push([start, count]);
      if (asked) return;
      asked = true;
      const gen = generation;
      requestFrame(() => onFrame(gen));
    },
    flushNow() {
      if (!alive) return;
      generation++;
      asked = false;
      hand();
    },
    cancel() {
      alive = false;
      pending = [];
    },
  };
}
