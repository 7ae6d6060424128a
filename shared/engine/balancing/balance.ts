/**
 * Phase balancing of single-phase customers on a feeder: the customers' present phases (before),
 * the rotating rule (A, B, C, … along the feeder) for comparison, and the optimised assignment:
 * a MILP over the linearised unbalanced model (milp.ts, solved by HiGHS, its proven gap
 * reported), then local search with the exact engine (local-search.ts). Every figure returned
 * comes from an exact solve of that assignment. Pure and synchronous: run it in a worker (a Web
 * Worker in the browser, the server's worker-thread pool) and pass `shouldStop` to cancel.
 */
import type { Customer } from './customers.ts';
import { analyseFeeder, checkCustomers, currentAssignment, rotatingRule, allowedPhases, type Assignment } from './feeder.ts';
import { exactFigures, neutralPoint, pointCurrents, type BalanceFigures, type CustomerVoltage } from './figures.ts';
import type { Cx } from '../types.ts';
import { buildLinearModel, type LinearModel } from './linear-model.ts';
import { exactState, localSearch, type SearchState } from './local-search.ts';
import { solveMilp, type HighsRuntime, type MilpResult } from './milp.ts';
import { mixNormalisers, score, type ObjectiveSpec } from './objectives.ts';

export interface BalanceOptions {
  objective: ObjectiveSpec;
  /** Bus where the neutral current is measured (default: the source). */
  bus?: string;
  /** Most customers that may change phase (default: no limit). */
  maxMoves?: number;
  /** HiGHS time for all MILP rounds together, s (default 4; the first round may take half). */
  milpTimeLimitS?: number;
  /** Linearise-and-solve rounds at most (default 3): each re-linearises about the last MILP answer. The gap reported is the last round's. */
  relinearise?: number;
  /** Exact solves the local search may spend (default 400). */
  maxEvaluations?: number;
  onProgress?: (p: BalanceProgress) => void;
  shouldStop?: () => boolean;
}

export interface BalanceProgress {
  stage: 'solving' | 'linearising' | 'milp' | 'local-search' | 'done';
  /** Exact solves so far. */
  solves: number;
}

/** One reconnection for the crew. */
export interface BalanceMove {
  customer: string;
  bus: string;
  from: string;
  to: string;
}

export interface BalanceResult {
  objective: ObjectiveSpec;
  assignment: Assignment;
  moves: BalanceMove[];
  before: BalanceFigures;
  after: BalanceFigures;
  rotatingRule: BalanceFigures;
  rotatingAssignment: Assignment;
  scores: { before: number; after: number; rotatingRule: number };
  /** The gap HiGHS proves on the linearised MILP, %. */
  gapPercent: number;
  milp: Omit<MilpResult, 'assignment'>;
  voltages: { before: CustomerVoltage[]; after: CustomerVoltage[]; rotatingRule: CustomerVoltage[] };
  neutralMeasuredAt: { bus: string; direction: 'out' | 'in' };
  /** Phase and neutral currents at the measuring point before and after (for phasor diagrams), A. */
  currents: { before: Record<'a' | 'b' | 'c' | 'n', Cx>; after: Record<'a' | 'b' | 'c' | 'n', Cx> };
  /** Exact solves spent. */
  solves: number;
  maxMoves: number;
}

/** Balance the customers on the feeder (see the file header). Throws CustomerListError, the engine's errors, or BalanceCancelled. */
export function balancePhases(highs: HighsRuntime, feederInput: unknown, customers: Customer[], options: BalanceOptions): BalanceResult {
  const spec = options.objective;
  const progress = (stage: BalanceProgress['stage'], solves: number) => options.onProgress?.({ stage, solves });
  const feeder = analyseFeeder(feederInput);
  checkCustomers(feeder, customers);
  const movableCount = customers.filter((c) => !c.fixed && allowedPhases(feeder, c).length > 1).length;
  const maxMoves = Math.max(0, Math.min(options.maxMoves ?? movableCount, movableCount));
  const original = currentAssignment(customers);
  let solves = 1; // analyseFeeder
  progress('solving', solves);

  const beforeState0 = exactState(feeder, customers, original, { bus: '', direction: 'out', edges: [] }, { objective: 'losses' });
  const point = neutralPoint(feeder, beforeState0.result, options.bus);
  const beforeExact = exactFigures(beforeState0.result, customers, point);
  const norm = spec.objective === 'mix' ? mixNormalisers(beforeExact.figures, spec) : undefined;
  const before = { ...beforeState0, figures: beforeExact.figures, score: score(beforeExact.figures, spec, norm) };
  const rotatingAssignment = rotatingRule(feeder, customers);
  const rotating = exactState(feeder, customers, rotatingAssignment, point, spec, norm);
  solves += 2;

  // successive linearisation: linearise about the best exact state, solve the MILP, repeat from
  // its assignment while that improves the exact score (at most `relinearise` rounds)
  let start = before;
  let base = before;
  let model: LinearModel | undefined;
  let milp: MilpResult | undefined;
  const seen = new Set<string>();
  const key = (a: Assignment) => customers.map((c) => a[c.customer]).join('');
  const rounds = options.relinearise ?? 3;
  let milpTime = options.milpTimeLimitS ?? 4;
  for (let round = 0; round < rounds; round++) {
    progress('linearising', solves);
    const built = buildLinearModel(feeder, customers, base.assignment, base.result, point, options.shouldStop);
    model = built.model;
    solves += model.solves;
    progress('milp', solves);
    const share = round === rounds - 1 ? milpTime : Math.max(milpTime / 2, 0.05);
    const started = Date.now();
    const m = solveMilp(highs, feeder, customers, model, built.anchor, spec, maxMoves, share, original);
    milpTime = Math.max(0.05, milpTime - (Date.now() - started) / 1000);
    milp = m;
    const k = key(m.assignment);
    if (seen.has(k) || k === key(base.assignment)) break;
    seen.add(k);
    let s: SearchState;
    try {
      s = exactState(feeder, customers, m.assignment, point, spec, norm);
      solves++;
    } catch {
      solves++; // the MILP's assignment does not solve exactly: keep the state in hand
      break;
    }
    if (s.score < start.score) start = s;
    base = s;
  }

  progress('local-search', solves);
  const searched = localSearch(feeder, customers, model!, point, original, start, {
    spec,
    norm,
    maxMoves,
    maxEvaluations: options.maxEvaluations,
    shouldStop: options.shouldStop,
    onEvaluation: (n) => progress('local-search', solves + n),
  });
  solves += searched.evaluations;
  const after = searched.best;
  progress('done', solves);

  const rank = new Map(feeder.order.map((b, i) => [b, i]));
  const moves = customers
    .map((c, i) => ({ c, i }))
    .filter(({ c }) => after.assignment[c.customer] !== original[c.customer])
    .sort((x, y) => rank.get(x.c.bus)! - rank.get(y.c.bus)! || x.i - y.i)
    .map(({ c }) => ({ customer: c.customer, bus: c.bus, from: original[c.customer], to: after.assignment[c.customer] }));
  const { assignment: _a, ...milpInfo } = milp!;
  return {
    objective: spec,
    assignment: after.assignment,
    moves,
    before: before.figures,
    after: after.figures,
    rotatingRule: rotating.figures,
    rotatingAssignment,
    scores: { before: before.score, after: after.score, rotatingRule: rotating.score },
    gapPercent: milp!.gapPercent,
    milp: milpInfo,
    voltages: {
      before: beforeExact.voltages,
      after: exactFigures(after.result, customers, point).voltages,
      rotatingRule: exactFigures(rotating.result, customers, point).voltages,
    },
    neutralMeasuredAt: { bus: point.bus, direction: point.direction },
    currents: { before: pointCurrents(before.result, point), after: pointCurrents(after.result, point) },
    solves,
    maxMoves,
  };
}
