/**
 * What a sweep's line chart draws, kept up to date point by point as the sweep's points arrive
 * (O(1) per point, never a pass over every point): the points are grouped by the pixel column they
 * fall in, and per column only the first, lowest, highest and last point are drawn (and the first
 * point that breaks the limit, where it lies in that column), so every peak, every trough and
 * every limit crossing stays on the drawing while a 10 000-point sweep is a path of at most about
 * four points per pixel column. A column with a point not solved (yet) draws all its points, so a
 * gap is drawn exactly where it is. The values themselves are not touched: the chart reads them
 * from the sweep's store. Pure (no DOM).
 */

/**
 * The points grouped by pixel column (in point order): what every output's series over the same
 * parameter values shares, so a chart per output costs one pass over the points, not one each.
 */
export interface Columns {
  /** First point of each column, and one past the last. */
  readonly starts: Int32Array;
  /** Column of each point. */
  readonly colOf: Int32Array;
  /** The chart's x scale the columns were made with (pixels of the drawing), when known. */
  readonly scale?: (x: number) => number;
}

/**
 * Groups points by the pixel column their parameter value falls in (`column`: the chart's x scale,
 * rounded); up to `keepAll` points, each is its own column (every point drawn).
 */
export function columnsOf(xs: readonly number[], column: (x: number) => number, keepAll: number, scale?: (x: number) => number): Columns {
  const n = xs.length;
  const colOf = new Int32Array(n);
  const starts: number[] = [];
  let last = NaN;
  for (let i = 0; i < n; i++) {
    const c = n <= keepAll ? i : column(xs[i]);
    if (i === 0 || c !== last) starts.push(i);
    last = c;
    colOf[i] = starts.length - 1;
  }
  starts.push(n);
  return { starts: Int32Array.from(starts), colOf, ...(scale ? { scale } : {}) };
}

export type LineSeriesOptions = (
  | {
      /** The pixel column of a parameter value (the chart's x scale, rounded). */
      column: (x: number) => number;
      /** Up to this many points, every point is drawn (each is its own column). */
      keepAll: number;
      columns?: undefined;
    }
  | { columns: Columns }
) & {
  /** Whether a value breaks the output's limit (the first such point is called out). */
  breaks?: (v: number) => boolean;
};

export class LineSeries {
  /** First point of each column (columns in point order), and one past the last. */
  private readonly starts: Int32Array;
  /** Column of each point. */
  private readonly colOf: Int32Array;
  /** The chart's x scale, when the columns were made with one. */
  readonly scale?: (x: number) => number;
  private readonly seen: Uint8Array;
  private readonly arrived: Int32Array;
  private readonly finite: Int32Array;
  private readonly lowest: Int32Array;
  private readonly highest: Int32Array;
  private readonly breaks?: (v: number) => boolean;
  /** Lowest and highest value so far (Infinity / -Infinity while there is none). */
  lo = Infinity;
  hi = -Infinity;
  /** The first point (in point order) whose value breaks the limit; -1 when none so far. */
  firstBreak = -1;
  /** Counts the points added (a chart redraws when it changes). */
  version = 0;

  /** `ys` is read, never written: NaN is a point without a value. */
  constructor(
    readonly xs: readonly number[],
    readonly ys: ArrayLike<number>,
    options: LineSeriesOptions,
  ) {
    const n = xs.length;
    const columns = options.columns ?? columnsOf(xs, options.column, options.keepAll);
    if (columns.colOf.length !== n) throw new RangeError(`columns made for ${columns.colOf.length} points, not ${n}`);
    this.starts = columns.starts;
    this.colOf = columns.colOf;
    this.scale = columns.scale;
    const cols = this.starts.length - 1;
    this.seen = new Uint8Array(n);
    this.arrived = new Int32Array(cols);
    this.finite = new Int32Array(cols);
    this.lowest = new Int32Array(cols).fill(-1);
    this.highest = new Int32Array(cols).fill(-1);
    this.breaks = options.breaks;
  }

  /** Number of pixel columns (groups of points). */
  get columns(): number {
    return this.starts.length - 1;
  }

  /** Takes in points start … start + count − 1, whose values have landed in `ys`. A point already taken in is not counted again. */
  add(start: number, count: number) {
    const end = Math.min(this.xs.length, start + count);
    for (let i = Math.max(0, start); i < end; i++) {
      if (this.seen[i]) continue;
      this.seen[i] = 1;
      const c = this.colOf[i];
      this.arrived[c]++;
      const v = this.ys[i];
      if (!Number.isFinite(v)) continue;
      this.finite[c]++;
      if (this.lowest[c] < 0 || v < this.ys[this.lowest[c]]) this.lowest[c] = i;
      if (this.highest[c] < 0 || v > this.ys[this.highest[c]]) this.highest[c] = i;
      if (v < this.lo) this.lo = v;
      if (v > this.hi) this.hi = v;
      if (this.breaks?.(v) && (this.firstBreak < 0 || i < this.firstBreak)) this.firstBreak = i;
    }
    this.version++;
  }

  /** The points to draw, in point order (a point without a value among them breaks the line). */
  indices(): number[] {
    const out: number[] = [];
    const cols = this.columns;
    for (let c = 0; c < cols; c++) {
      const a = this.starts[c];
      const b = this.starts[c + 1] - 1;
      const size = b - a + 1;
      if (this.arrived[c] === 0) {
        out.push(a); // nothing here yet: one point without a value breaks the line
      } else if (this.finite[c] < size) {
        for (let i = a; i <= b; i++) out.push(i); // a gap inside the column: every point, so it is drawn where it is
      } else {
        const keep = [a, this.lowest[c], this.highest[c], b];
        if (this.firstBreak >= a && this.firstBreak <= b) keep.push(this.firstBreak);
        keep.sort((x, y) => x - y);
        for (let k = 0; k < keep.length; k++) if (k === 0 || keep[k] !== keep[k - 1]) out.push(keep[k]);
      }
    }
    return out;
  }
}
