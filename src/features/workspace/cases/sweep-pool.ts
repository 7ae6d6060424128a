/**
 * A pool of sweep Web Workers, one per logical core (`navigator.hardwareConcurrency`, at least 1).
 * A sweep is cut into chunks that go to whichever worker is free, so the page's thread only
 * posts and receives; rows arrive per chunk (`onRows`) with the count done. Cancel terminates the
 * busy workers (a chunk in flight cannot be interrupted otherwise) and they are started afresh for
 * the next run; warm() starts them ahead of the first run. Where Workers do not exist (component tests), chunks run on the page's thread one
 * macrotask apart, through the same handler.
 */
import type { EnvelopeOptions, LostNeutralEnvelope } from '../../../../shared/engine/index.ts';
import { createSweepHandler } from './sweep-handler.ts';
import type { SweepRequest, SweepResponse } from './sweep-protocol.ts';
import type { PackedRows } from './sweep-store.ts';
import type { OutputSpec } from '../../../../shared/review/sweep-outputs.ts';

interface Slot {
  post(req: SweepRequest): void;
  terminate(): void;
  busy: boolean;
  /** The job whose setup this worker has (sent with its first chunk of that job). */
  job?: number;
}

export interface SweepJob {
  circuit: unknown;
  paths: string[];
  points: number[][];
  outputs: OutputSpec[];
}

export interface SweepCallbacks {
  /** Points `start`… packed (in point order inside the chunk); `done` counts every point answered so far. */
  onRows(start: number, rows: PackedRows, done: number): void;
  onDone(): void;
  onFailure(message: string): void;
}

export interface RunningSweep {
  cancel(): void;
}

/** Workers in a pool: one per logical core the browser reports, at least one. */
export function poolSize(): number {
  const n = typeof navigator !== 'undefined' ? navigator.hardwareConcurrency : undefined;
  return Math.max(1, Number.isFinite(n) && n ? Math.floor(n) : 1);
}

/** Points per chunk: a few chunks per worker (progress and balance), at most 200 (answers stay small). */
export function chunkSize(points: number, workers: number): number {
  return Math.max(1, Math.min(200, Math.ceil(points / (workers * 6))));
}

export class SweepPool {
  private slots: (Slot | null)[];
  private job = 0;
  private listener: ((res: SweepResponse, slot: Slot) => void) | null = null;

  constructor(readonly size: number = poolSize()) {
    this.slots = Array.from({ length: size }, () => null);
  }

  private slot(i: number): Slot {
    const existing = this.slots[i];
    if (existing) return existing;
    let s: Slot;
    if (typeof Worker !== 'undefined') {
      const w = new Worker(new URL('./sweep.worker.ts', import.meta.url), { type: 'module', name: `wyeward-sweep-${i + 1}` });
      s = { busy: false, post: (req) => w.postMessage(req), terminate: () => w.terminate() };
      w.onmessage = (e: MessageEvent<SweepResponse>) => this.listener?.(e.data, s);
      w.onerror = (e: ErrorEvent) => {
        e.preventDefault();
        this.fail(e.message || 'a sweep worker could not start');
      };
    } else {
      const handle = createSweepHandler();
      let alive = true;
      s = {
        busy: false,
        post: (req) =>
          setTimeout(() => {
            if (!alive) return;
            const res = handle(req);
            if (alive) this.listener?.(res, s);
          }, 0),
        terminate: () => void (alive = false),
      };
    }
    this.slots[i] = s;
    return s;
  }

  private failure: ((m: string) => void) | null = null;
  private fail(message: string) {
    const f = this.failure;
    this.stopBusy();
    f?.(message);
  }

  /** Terminates the workers running a chunk (they restart on the next run). */
  private stopBusy() {
    this.slots.forEach((s, i) => {
      if (s?.busy) {
        s.terminate();
        this.slots[i] = null;
      }
    });
    this.listener = null;
    this.failure = null;
  }

  /** Starts the workers ahead of a run (their code loaded and evaluated while the user fills in the form). */
  warm() {
    for (let i = 0; i < this.size; i++) this.slot(i);
  }

  /** Runs a sweep; only one at a time (a new run cancels the previous one). */
  run(job: SweepJob, cb: SweepCallbacks): RunningSweep {
    this.stopBusy();
    const id = ++this.job;
    const size = chunkSize(job.points.length, this.size);
    let next = 0;
    let done = 0;
    let finished = false;
    const feed = (s: Slot) => {
      if (next >= job.points.length) {
        s.busy = false;
        return;
      }
      const start = next;
      next = Math.min(job.points.length, next + size);
      s.busy = true;
      // the circuit goes to each worker once per sweep, with its first chunk
      const setup = s.job === id ? undefined : { circuit: job.circuit, paths: job.paths, outputs: job.outputs };
      s.job = id;
      s.post({ kind: 'chunk', job: id, start, points: job.points.slice(start, next), ...(setup ? { setup } : {}) });
    };
    this.failure = (m) => {
      finished = true;
      cb.onFailure(m);
    };
    this.listener = (res, s) => {
      if (res.kind !== 'chunk' || res.job !== id || finished) return;
      done += res.rows.count;
      s.busy = false;
      feed(s);
      cb.onRows(res.start, res.rows, done);
      if (done >= job.points.length) {
        finished = true;
        this.listener = null;
        this.failure = null;
        cb.onDone();
      }
    };
    if (job.points.length === 0) {
      finished = true;
      cb.onDone();
    } else for (let i = 0; i < this.size; i++) feed(this.slot(i));
    return {
      cancel: () => {
        if (finished || id !== this.job) return;
        finished = true;
        this.stopBusy();
      },
    };
  }

  /** The lost-neutral envelope in one worker of the pool. */
  envelope(circuit: unknown, options: EnvelopeOptions): { promise: Promise<LostNeutralEnvelope>; cancel(): void } {
    this.stopBusy();
    const id = ++this.job;
    const s = this.slot(0);
    let cancel = () => {};
    const promise = new Promise<LostNeutralEnvelope>((resolve, reject) => {
      this.failure = (m) => reject(new Error(m));
      this.listener = (res, slot) => {
        if (res.kind !== 'envelope' || res.job !== id) return;
        slot.busy = false;
        this.listener = null;
        this.failure = null;
        if (res.ok) resolve(res.envelope);
        else reject(new Error(res.error));
      };
      cancel = () => {
        if (id === this.job) this.stopBusy();
        reject(new Error('cancelled'));
      };
      s.busy = true;
      s.post({ kind: 'envelope', job: id, circuit, options });
    });
    return { promise, cancel };
  }

  /** Stops every worker. */
  dispose() {
    this.listener = null;
    this.failure = null;
    this.slots.forEach((s) => s?.terminate());
    this.slots = this.slots.map(() => null);
  }
}
