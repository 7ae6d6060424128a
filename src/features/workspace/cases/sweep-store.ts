/**
 * A sweep's points as they arrive, kept exactly: one Float64Array per recorded output (NaN where a
 * point has no value: not solved yet, failed, or an output that does not exist at that point),
 * whether each point was answered, and the message of each point that could not be solved. Chunks
 * land here as the packed arrays the workers transfer (no object per point on the page's thread).
 * Pure (no DOM); the charts read it through line-series.ts, the CSV and the table through row().
 */
import type { PointRow } from './sweep-protocol.ts';

/** A chunk's values packed point-major (point p, output k at p·outputs + k; NaN for none) and its failed points (offset in the chunk, message). */
export interface PackedRows {
  count: number;
  values: Float64Array;
  errors: [number, string][];
}

/** PointRow[] (the engine's sweep solver's answer) packed for a transfer. */
export function packRows(rows: readonly PointRow[], outputs: number): PackedRows {
  const values = new Float64Array(rows.length * outputs);
  const errors: [number, string][] = [];
  rows.forEach((r, p) => {
    for (let k = 0; k < outputs; k++) {
      const v = r.outputs[k];
      values[p * outputs + k] = v === null || v === undefined ? NaN : v;
    }
    if (r.error) errors.push([p, r.error]);
  });
  return { count: rows.length, values, errors };
}

export class SweepStore {
  /** Per output, per point: the value, NaN for none. */
  readonly values: Float64Array[];
  /** Per point: 0 not answered yet, 1 answered. */
  private readonly answered: Uint8Array;
  private readonly errors = new Map<number, string>();
  /** Points answered so far. */
  done = 0;

  constructor(
    readonly size: number,
    readonly outputs: number,
  ) {
    this.values = Array.from({ length: outputs }, () => new Float64Array(size).fill(NaN));
    this.answered = new Uint8Array(size);
  }

  /** Stores a packed chunk of points from `start`; returns how many of them were new. */
  put(start: number, rows: PackedRows): number {
    const { count, values, errors } = rows;
    if (start < 0 || start + count > this.size) throw new RangeError(`points ${start}…${start + count - 1} are outside a sweep of ${this.size}`);
    let fresh = 0;
    for (let p = 0; p < count; p++) {
      const i = start + p;
      if (!this.answered[i]) {
        this.answered[i] = 1;
        fresh++;
      }
      for (let k = 0; k < this.outputs; k++) this.values[k][i] = values[p * this.outputs + k];
    }
    for (const [p, message] of errors) this.errors.set(start + p, message);
    this.done += fresh;
    return fresh;
  }

  /** Stores rows as PointRow objects (the server's answers). */
  putRows(start: number, rows: readonly PointRow[]): number {
    return this.put(start, packRows(rows, this.outputs));
  }

  has(i: number): boolean {
    return this.answered[i] === 1;
  }

  /** Output k of point i, null when it has none. */
  value(k: number, i: number): number | null {
    const v = this.values[k][i];
    return Number.isNaN(v) ? null : v;
  }

  error(i: number): string | undefined {
    return this.errors.get(i);
  }

  /** Points that could not be solved. */
  get failed(): number {
    return this.errors.size;
  }

  /** Point i as a row (undefined while not answered). */
  row(i: number): PointRow | undefined {
    if (!this.answered[i]) return undefined;
    const outputs = this.values.map((_, k) => this.value(k, i));
    const error = this.errors.get(i);
    return error === undefined ? { outputs } : { outputs, error };
  }

  /** Every point as a row, in point order (for the CSV and the table). */
  rows(): (PointRow | undefined)[] {
    return Array.from({ length: this.size }, (_, i) => this.row(i));
  }
}
