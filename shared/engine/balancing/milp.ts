/**
 * The phase-assignment MILP over the linearised model (linear-model.ts), solved with HiGHS
 * (the `highs` package: HiGHS compiled to WebAssembly; the caller passes the loaded runtime, so
 * this file stays free of Node and browser specifics).
 *
 * Formulation (binary x[c,p] = customer c on phase p, Σₚ x[c,p] = 1, at most N customers off
 * their present phase; the phase-balancing MILP of J. Zhu, M.-Y. Chow & F. Zhang, "Phase
 * balancing using mixed-integer linear programming", IEEE Trans. Power Systems 13(4), 1998 (M),
 * here over the network's linearised response instead of per-phase sums). Every quantity is an
 * affine function of x (an auxiliary column y tied to it by one equality row); the objectives,
 * all convex in y, enter as epigraphs:
 * - a magnitude |z| (neutral current, negative-sequence voltage) by the 24-sided outer polygon
 *   t ≥ Re(z·e^{−jθₖ}): under-estimates |z| by at most 1 − cos(π/24) ≈ 0.9 % (P);
 * - a voltage magnitude |V| ≈ Re(V·conj(V⁰))/|V⁰| (tangent at the operating point) (P);
 * - line/phase-voltage unbalance: t ≥ ±100·(mₖ − mean m)/mean m⁰ (mean fixed at its operating value);
 * - losses Σ r·|I|²: each square by tangent cuts s ≥ 2a·y − a² on a grid over y's reachable range;
 * - lowest customer voltage: t ≤ V(bus, p)/rated + M·(1 − x[c,p]) (big-M, M = 2 pu).
 * The gap HiGHS proves is for this linearised problem; the figures reported are exact solves.
 */
import type { Cx } from '../types.ts';
import type { BalancePhase, Customer } from './customers.ts';
import { allowedPhases, type Assignment, type BalanceFeeder } from './feeder.ts';
import { coefficient, entry, type Anchor, type LinearModel } from './linear-model.ts';
import { mixNormalisers, type ObjectiveSpec, type SingleObjective } from './objectives.ts';

/** The part of the HiGHS runtime used here (the `highs` package's loaded module). */
export interface HighsRuntime {
  readonly infinity: number;
  createModel(): HighsModel;
}
export interface HighsModel {
  readonly options: { set(options: Record<string, unknown>): unknown };
  readonly info: { get(name: string): number | bigint };
  passModel(model: never): unknown;
  setSolution(solution: never): unknown;
  run(): unknown;
  getModelStatus(): number;
  getSolution(): { colValue: Float64Array };
  getObjectiveValue(): number;
  dispose(): void;
}

export interface MilpResult {
  assignment: Assignment;
  /** HiGHS model status: 'optimal', 'time-limit', or another word. */
  status: string;
  /** Relative gap HiGHS proves between its solution and its bound, %. */
  gapPercent: number;
  /** The same gap in the objective's own units (A, %, kW, pu; a mix: none). */
  absoluteGap: number;
  objective: number;
  bound: number;
  columns: number;
  rows: number;
}

const STATUS: Record<number, string> = { 7: 'optimal', 8: 'infeasible', 13: 'time-limit', 14: 'iteration-limit', 15: 'interrupted' };
const DIRECTIONS = 24;
const BIG_M = 2;
const GRID = 6;

/**
 * The absolute gap at which the MILP may stop: differences below what any reading could tell
 * apart (0.05 A, 0.001 % unbalance, 1 W, 0.0001 pu); a mix is dimensionless (P).
 */
function absoluteTolerance(spec: ObjectiveSpec): number {
  switch (spec.objective) {
    case 'neutral':
      return 0.05;
    case 'unbalance':
      return 0.001;
    case 'losses':
      return 0.001;
    case 'voltage':
      return 1e-4;
    default:
      return 1e-4;
  }
}

const movesFrom = (a: Assignment, original: Assignment, movable: Customer[]) => movable.filter((c) => a[c.customer] !== original[c.customer]).length;

class Lp {
  lo: number[] = [];
  hi: number[] = [];
  cost: number[] = [];
  int: number[] = [];
  rowLo: number[] = [];
  rowHi: number[] = [];
  starts: number[] = [0];
  idx: number[] = [];
  val: number[] = [];
  offset = 0;
  constructor(readonly inf: number) {}
  col(lo: number, hi: number, cost = 0, integer = false): number {
    this.lo.push(lo);
    this.hi.push(hi);
    this.cost.push(cost);
    this.int.push(integer ? 1 : 0);
    return this.lo.length - 1;
  }
  row(terms: [number, number][], lo: number, hi: number): void {
    for (const [j, v] of terms) if (v !== 0) (this.idx.push(j), this.val.push(v));
    this.starts.push(this.idx.length);
    this.rowLo.push(lo);
    this.rowHi.push(hi);
  }
}

/** Solve the MILP; `timeLimitS` bounds HiGHS's time (it then returns its best solution and gap). */
export function solveMilp(
  highs: HighsRuntime,
  feeder: BalanceFeeder,
  customers: Customer[],
  model: LinearModel,
  anchor: Anchor,
  spec: ObjectiveSpec,
  maxMoves: number,
  timeLimitS = 3,
  /** The assignment moves are counted from (default: the anchor's). */
  original: Assignment = anchor.assignment,
): MilpResult {
  const lp = new Lp(highs.infinity);
  const inf = highs.infinity;
  const layout = model.layout;
  const movable = customers.filter((c) => !c.fixed && allowedPhases(feeder, c).length > 1);
  const x = new Map<string, Map<BalancePhase, number>>();
  for (const c of movable) {
    const m = new Map<BalancePhase, number>();
    for (const p of allowedPhases(feeder, c)) m.set(p, lp.col(0, 1, 0, true));
    x.set(c.customer, m);
    lp.row([...m.values()].map((j) => [j, 1] as [number, number]), 1, 1);
  }
  const moveTerms: [number, number][] = [];
  for (const c of movable) for (const [p, j] of x.get(c.customer)!) if (p !== original[c.customer]) moveTerms.push([j, 1]);
  if (moveTerms.length) lp.row(moveTerms, -inf, maxMoves);

  // auxiliary columns: the real and imaginary part of quantity j as an affine function of x
  const aux = new Map<number, [number, number]>();
  const range = new Map<number, [[number, number], [number, number]]>();
  const quantity = (j: number): [number, number] => {
    const have = aux.get(j);
    if (have) return have;
    const base = entry(anchor.q, j);
    const re: [number, number][] = [];
    const im: [number, number][] = [];
    let cr = base.re;
    let ci = base.im;
    const downs: [number[], number[]] = [[], []];
    const ups: [number[], number[]] = [[], []];
    for (const c of movable) {
      const now = coefficient(model, c, anchor.assignment[c.customer], j);
      cr -= now.re;
      ci -= now.im;
      let minR = 0, maxR = 0, minI = 0, maxI = 0;
      for (const [p, col] of x.get(c.customer)!) {
        const k = coefficient(model, c, p, j);
        re.push([col, -k.re]);
        im.push([col, -k.im]);
        minR = Math.min(minR, k.re - now.re), maxR = Math.max(maxR, k.re - now.re);
        minI = Math.min(minI, k.im - now.im), maxI = Math.max(maxI, k.im - now.im);
      }
      downs[0].push(minR), downs[1].push(minI), ups[0].push(maxR), ups[1].push(maxI);
    }
    const yr = lp.col(-inf, inf);
    const yi = lp.col(-inf, inf);
    lp.row([[yr, 1], ...re], cr, cr);
    lp.row([[yi, 1], ...im], ci, ci);
    // reachable range with at most maxMoves customers moved
    const reach = (v: number, d: number[], u: number[]): [number, number] => {
      const moved = movable.filter((c) => anchor.assignment[c.customer] !== original[c.customer]).length;
      const n = Math.min(movable.length, maxMoves + moved); // customers that may differ from the anchor
      const sumN = (a: number[]) => a.sort((s, t) => Math.abs(t) - Math.abs(s)).slice(0, n).reduce((s, t) => s + t, 0);
      return [v + sumN(d), v + sumN(u)];
    };
    range.set(j, [reach(base.re, downs[0], ups[0]), reach(base.im, downs[1], ups[1])]);
    aux.set(j, [yr, yi]);
    return [yr, yi];
  };
  // t ≥ k·|z_j| by the outer polygon
  const magnitudeAtMost = (t: number, j: number, k: number) => {
    const [yr, yi] = quantity(j);
    for (let d = 0; d < DIRECTIONS; d++) {
      const th = (2 * Math.PI * d) / DIRECTIONS;
      lp.row([[t, 1], [yr, -k * Math.cos(th)], [yi, -k * Math.sin(th)]], 0, inf);
    }
  };
  // |V_j| ≈ Re(V_j·conj(u)) with u = V⁰/|V⁰|: terms of that linear form
  const magnitudeTerms = (j: number, k: number): [number, number][] => {
    const v0: Cx = entry(anchor.q, j);
    const m = Math.hypot(v0.re, v0.im) || 1;
    const [yr, yi] = quantity(j);
    return [[yr, (k * v0.re) / m], [yi, (k * v0.im) / m]];
  };

  const epigraph: Partial<Record<SingleObjective, { col: number; sign: 1 | -1; offset: number }>> = {};
  const build = (o: SingleObjective) => {
    if (o === 'neutral') {
      const t = lp.col(0, inf);
      magnitudeAtMost(t, 0, 1);
      return { col: t, sign: 1 as const, offset: 0 };
    }
    if (o === 'unbalance') {
      const t = lp.col(0, inf);
      const def = spec.definition ?? 'iec';
      layout.buses.forEach((_, b) => {
        const at = layout.busAt + 8 * b;
        if (def === 'iec') {
          const v1 = entry(anchor.q, at);
          magnitudeAtMost(t, at + 1, 100 / (Math.hypot(v1.re, v1.im) || 1));
        } else {
          const first = def === 'nema' ? at + 2 : at + 5;
          const js = [first, first + 1, first + 2];
          const mean0 = js.reduce((s, j) => s + Math.hypot(entry(anchor.q, j).re, entry(anchor.q, j).im), 0) / 3 || 1;
          for (const j of js) {
            // 100·(m_j − (m₁+m₂+m₃)/3)/mean0, as terms over the aux columns
            const terms: [number, number][] = [];
            for (const i of js) for (const [col, v] of magnitudeTerms(i, (100 / mean0) * ((i === j ? 1 : 0) - 1 / 3))) terms.push([col, v]);
            lp.row([[t, 1], ...terms.map(([col, v]) => [col, -v] as [number, number])], 0, inf);
            lp.row([[t, 1], ...terms], 0, inf);
          }
        }
      });
      return { col: t, sign: 1 as const, offset: 0 };
    }
    if (o === 'losses') {
      // Σ r·(s_re + s_im)/1000 kW with s ≥ y² by tangents; offset keeps the objective in kW of the whole circuit
      const t = lp.col(-inf, inf);
      const terms: [number, number][] = [[t, 1]];
      let anchorBranches = 0;
      for (const br of layout.branches)
        for (let k = 0; k < br.conductors; k++) {
          const j = br.at + k;
          const [yr, yi] = quantity(j);
          const [rr, ri] = range.get(j)!;
          const v = entry(anchor.q, j);
          anchorBranches += br.r * (v.re * v.re + v.im * v.im);
          for (const [y, [lo, hi], now] of [[yr, rr, v.re], [yi, ri, v.im]] as [number, [number, number], number][]) {
            const s = lp.col(0, inf);
            const points = new Set<number>([now]);
            for (let g = 0; g <= GRID; g++) points.add(lo + ((hi - lo) * g) / GRID);
            for (const a of points) lp.row([[s, 1], [y, -2 * a]], -a * a, inf);
            terms.push([s, -br.r / 1000]);
          }
        }
      lp.row(terms, 0, 0);
      return { col: t, sign: 1 as const, offset: anchor.figures.lossesKw - anchorBranches / 1000 };
    }
    // voltage: maximise t = the lowest customer voltage (score 1 − t)
    const t = lp.col(-inf, inf);
    for (const c of customers) {
      const rated = layout.rated.get(c.customer)!;
      const slotQ = (p: BalancePhase) => layout.slotAt + layout.slotIndex.get(`${c.bus}.${p}`)!;
      const cols = x.get(c.customer);
      if (!cols) {
        lp.row([[t, 1], ...magnitudeTerms(slotQ(anchor.assignment[c.customer]), -1 / rated)], -inf, 0);
        continue;
      }
      for (const [p, col] of cols) lp.row([[t, 1], [col, BIG_M], ...magnitudeTerms(slotQ(p), -1 / rated)], -inf, BIG_M);
    }
    return { col: t, sign: -1 as const, offset: 1 };
  };
  if (spec.objective === 'mix') {
    const norm = mixNormalisers(anchor.figures, spec);
    for (const [o, w] of Object.entries(spec.weights ?? {}) as [SingleObjective, number][]) {
      if (!w) continue;
      const e = (epigraph[o] = build(o));
      lp.cost[e.col] += (e.sign * w) / norm[o];
      lp.offset += (w * e.offset) / norm[o];
    }
  } else {
    const e = build(spec.objective);
    lp.cost[e.col] = e.sign;
    lp.offset = e.offset;
  }

  const numCols = lp.lo.length;
  const numRows = lp.rowLo.length;
  const m = highs.createModel();
  try {
    m.options.set({ output_flag: false, time_limit: timeLimitS, mip_rel_gap: 1e-6, mip_abs_gap: absoluteTolerance(spec) });
    m.passModel({
      numCols,
      numRows,
      offset: lp.offset,
      colCost: Float64Array.from(lp.cost),
      colLower: Float64Array.from(lp.lo),
      colUpper: Float64Array.from(lp.hi),
      rowLower: Float64Array.from(lp.rowLo),
      rowUpper: Float64Array.from(lp.rowHi),
      matrix: { format: 'csr', numRows, numCols, starts: Int32Array.from(lp.starts), indices: Int32Array.from(lp.idx), values: Float64Array.from(lp.val) },
      integrality: Int32Array.from(lp.int),
    } as never);
    // the present connection as the first incumbent (HiGHS completes the continuous columns), so
    // a time-limited run still returns a solution and a gap
    const start: number[] = [];
    const startValues: number[] = [];
    for (const c of movable) for (const [p, j] of x.get(c.customer)!) (start.push(j), startValues.push(p === anchor.assignment[c.customer] ? 1 : 0));
    if (start.length && movesFrom(anchor.assignment, original, movable) <= maxMoves) {
      try {
        m.setSolution({ indices: Int32Array.from(start), values: Float64Array.from(startValues) } as never);
      } catch {
        // a start HiGHS cannot use only costs speed
      }
    }
    m.run();
    const code = m.getModelStatus();
    const status = STATUS[code] ?? `status ${code}`;
    const value = m.getSolution().colValue;
    const assignment: Assignment = { ...anchor.assignment };
    const solved = code === 7 || ((code === 13 || code === 14 || code === 15) && value.length === numCols);
    if (solved) {
      for (const c of movable) {
        let best: BalancePhase = anchor.assignment[c.customer];
        let bestV = -1;
        for (const [p, j] of x.get(c.customer)!) if (value[j] > bestV) (bestV = value[j]), (best = p);
        assignment[c.customer] = best;
      }
    }
    const num = (name: string) => {
      try {
        return Number(m.info.get(name));
      } catch {
        return NaN;
      }
    };
    const gap = num('mip_gap');
    return {
      assignment,
      status,
      // NaN (null in JSON) when HiGHS proved no bound
      gapPercent: solved && Number.isFinite(gap) && Number.isFinite(num('mip_dual_bound')) ? 100 * Math.max(0, gap) : NaN,
      objective: solved ? m.getObjectiveValue() : NaN,
      bound: num('mip_dual_bound'),
      absoluteGap: solved && Number.isFinite(num('mip_dual_bound')) ? Math.abs(m.getObjectiveValue() - num('mip_dual_bound')) : NaN,
      columns: numCols,
      rows: numRows,
    };
  } finally {
    m.dispose();
  }
}
