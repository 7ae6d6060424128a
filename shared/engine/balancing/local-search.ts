/**
 * Improvement with the exact engine: from a start assignment, repeatedly try single moves
 * (one customer to another phase it may take) and swaps (two customers on different phases
 * exchange phases), never exceeding the move limit counted against the original assignment.
 * Candidates are ranked by the linearised model anchored on the exact state in hand; the best
 * ranked are solved exactly and the best exact improvement is taken; it stops when no evaluated
 * candidate improves (all candidates are evaluated each round when there are few of them) or the
 * evaluation budget is spent. Every accepted step is a real solve.
 */
import type { CircuitResult } from '../results/types.ts';
import type { BalancePhase, Customer } from './customers.ts';
import { allowedPhases, type Assignment, type BalanceFeeder } from './feeder.ts';
import { exactFigures, solveAssignment, type BalanceFigures, type NeutralPoint } from './figures.ts';
import { BalanceCancelled, observe, predictedFigures, shift, type Anchor, type LinearModel } from './linear-model.ts';
import { score, type ObjectiveSpec, type SingleObjective } from './objectives.ts';

export interface SearchState {
  assignment: Assignment;
  result: CircuitResult;
  figures: BalanceFigures;
  score: number;
}

export interface SearchOptions {
  spec: ObjectiveSpec;
  norm?: Record<SingleObjective, number>;
  maxMoves: number;
  /** Exact solves this search may spend (default 400). */
  maxEvaluations?: number;
  /** Candidates solved exactly per round when there are many (default 12). */
  perRound?: number;
  /** Up to this many candidates, every one is solved each round (default 80). */
  exhaustiveBelow?: number;
  shouldStop?: () => boolean;
  onEvaluation?: (evaluations: number) => void;
}

type Change = [Customer, BalancePhase][];

const movesOf = (a: Assignment, original: Assignment) => Object.keys(original).reduce((n, k) => n + (a[k] !== original[k] ? 1 : 0), 0);

/** Exact state of an assignment (one solve). */
export function exactState(feeder: BalanceFeeder, customers: Customer[], assignment: Assignment, point: NeutralPoint, spec: ObjectiveSpec, norm?: Record<SingleObjective, number>): SearchState {
  const result = solveAssignment(feeder, customers, assignment);
  const figures = exactFigures(result, customers, point).figures;
  return { assignment, result, figures, score: score(figures, spec, norm) };
}

/** Run the search (see the file header); returns the best state found and the solves spent. */
export function localSearch(
  feeder: BalanceFeeder,
  customers: Customer[],
  model: LinearModel,
  point: NeutralPoint,
  original: Assignment,
  start: SearchState,
  opts: SearchOptions,
): { best: SearchState; evaluations: number } {
  const { spec, norm, maxMoves } = opts;
  const budget = opts.maxEvaluations ?? 400;
  const perRound = opts.perRound ?? 12;
  const exhaustiveBelow = opts.exhaustiveBelow ?? 80;
  const movable = customers.filter((c) => !c.fixed && allowedPhases(feeder, c).length > 1);
  let current = start;
  let evaluations = 0;
  for (;;) {
    if (opts.shouldStop?.()) throw new BalanceCancelled();
    const anchor: Anchor = { assignment: current.assignment, q: observe(current.result, model.layout), figures: current.figures };
    const a = current.assignment;
    const moved = movesOf(a, original);
    const predict = (change: Change): number => {
      const q = anchor.q.slice();
      const next = { ...a };
      for (const [c, p] of change) {
        shift(model, q, c, a[c.customer], -1);
        shift(model, q, c, p, 1);
        next[c.customer] = p;
      }
      return score(predictedFigures(q, model.layout, customers, next, anchor), spec, norm);
    };
    const within = (change: Change) => {
      let n = moved;
      for (const [c, p] of change) n += (p !== original[c.customer] ? 1 : 0) - (a[c.customer] !== original[c.customer] ? 1 : 0);
      return n <= maxMoves;
    };
    const candidates: { change: Change; predicted: number }[] = [];
    const singleGain = new Map<string, number>();
    for (const c of movable)
      for (const p of allowedPhases(feeder, c)) {
        if (p === a[c.customer]) continue;
        const change: Change = [[c, p]];
        if (!within(change)) continue;
        const predicted = predict(change);
        candidates.push({ change, predicted });
        singleGain.set(c.customer, Math.min(singleGain.get(c.customer) ?? Infinity, predicted));
      }
    // swaps among the most promising customers (all of them when there are few)
    const pool = movable.length <= 60 ? movable : [...movable].sort((x, y) => (singleGain.get(x.customer) ?? Infinity) - (singleGain.get(y.customer) ?? Infinity)).slice(0, 60);
    for (let i = 0; i < pool.length; i++)
      for (let k = i + 1; k < pool.length; k++) {
        const c1 = pool[i];
        const c2 = pool[k];
        const p1 = a[c1.customer];
        const p2 = a[c2.customer];
        if (p1 === p2 || !allowedPhases(feeder, c1).includes(p2) || !allowedPhases(feeder, c2).includes(p1)) continue;
        const change: Change = [[c1, p2], [c2, p1]];
        if (!within(change)) continue;
        candidates.push({ change, predicted: predict(change) });
      }
    candidates.sort((x, y) => x.predicted - y.predicted);
    const take = candidates.length <= exhaustiveBelow ? candidates.length : perRound;
    let best: SearchState | undefined;
    for (const cand of candidates.slice(0, take)) {
      if (evaluations >= budget) break;
      if (opts.shouldStop?.()) throw new BalanceCancelled();
      const next = { ...a };
      for (const [c, p] of cand.change) next[c.customer] = p;
      let s: SearchState;
      try {
        s = exactState(feeder, customers, next, point, spec, norm);
      } catch {
        evaluations++;
        continue; // an assignment the engine cannot solve is never taken
      }
      evaluations++;
      opts.onEvaluation?.(evaluations);
      if (s.score < (best?.score ?? current.score) - 1e-9 * (1 + Math.abs(current.score))) best = s;
    }
    if (!best) return { best: current, evaluations };
    current = best;
  }
}
