/**
 * The optimiser against the truth: on a feeder with six movable customers every assignment
 * (3⁵·2 = 486, one customer limited to two phases, one fixed) is solved with the engine, and for
 * each objective the optimiser's assignment must score the true optimum (to solver tolerance),
 * with and without a move limit (C: the optimum is computed here by exhaustive enumeration).
 */
import loadHighs from 'highs';
import { beforeAll, describe, expect, it } from 'vitest';
import {
  allowedPhases,
  analyseFeeder,
  balancePhases,
  balanceScore,
  exactFigures,
  mixNormalisers,
  neutralPoint,
  solveAssignment,
  type Assignment,
  type BalanceFigures,
  type HighsRuntime,
  type ObjectiveSpec,
} from '../../../../shared/engine/index.ts';
import { smallCustomers, smallFeeder } from './small-feeder.ts';

let highs: HighsRuntime;
const feeder = analyseFeeder(smallFeeder);
const original: Assignment = Object.fromEntries(smallCustomers.map((c) => [c.customer, c.phase]));
const base = solveAssignment(feeder, smallCustomers, original);
const point = neutralPoint(feeder, base);

/** Every assignment with its exact figures. */
function enumerate(): { assignment: Assignment; figures: BalanceFigures; moves: number }[] {
  const out: { assignment: Assignment; figures: BalanceFigures; moves: number }[] = [];
  const walk = (i: number, a: Assignment) => {
    if (i === smallCustomers.length) {
      const r = solveAssignment(feeder, smallCustomers, a);
      const moves = Object.keys(a).filter((k) => a[k] !== original[k]).length;
      out.push({ assignment: { ...a }, figures: exactFigures(r, smallCustomers, point).figures, moves });
      return;
    }
    const c = smallCustomers[i];
    for (const p of allowedPhases(feeder, c)) walk(i + 1, { ...a, [c.customer]: p });
  };
  walk(0, {});
  return out;
}

const all = enumerate();
const beforeFigures = all.find((e) => e.moves === 0)!.figures;

beforeAll(async () => {
  highs = (await loadHighs()) as unknown as HighsRuntime;
});

const specs: ObjectiveSpec[] = [
  { objective: 'neutral' },
  { objective: 'unbalance', definition: 'iec' },
  { objective: 'unbalance', definition: 'nema' },
  { objective: 'unbalance', definition: 'ieee' },
  { objective: 'losses' },
  { objective: 'voltage' },
  { objective: 'mix', definition: 'iec', weights: { neutral: 1, unbalance: 1, losses: 2, voltage: 1 } },
];

describe('balancing finds the enumerated optimum', () => {
  it('enumerates 486 assignments', () => {
    expect(all.length).toBe(3 ** 5 * 2);
  });
  for (const spec of specs)
    for (const maxMoves of [undefined, 2]) {
      const name = `${spec.objective}${spec.definition && spec.objective !== 'mix' ? ` (${spec.definition})` : ''}, ${maxMoves === undefined ? 'any number of moves' : `at most ${maxMoves} moves`}`;
      it(name, () => {
        const norm = spec.objective === 'mix' ? mixNormalisers(beforeFigures, spec) : undefined;
        const allowed = all.filter((e) => maxMoves === undefined || e.moves <= maxMoves);
        const optimum = Math.min(...allowed.map((e) => balanceScore(e.figures, spec, norm)));
        // no wall-clock bound on HiGHS here, so a busy machine cannot cut a round short and change the answer
        const r = balancePhases(highs, smallFeeder, smallCustomers, { objective: spec, maxMoves, milpTimeLimitS: 600 });
        expect(r.moves.length).toBeLessThanOrEqual(maxMoves ?? 6);
        expect(r.assignment.H4).toBe('B'); // fixed
        expect(['A', 'B']).toContain(r.assignment.H6); // limited to A or B
        // the reported figures are those of an exact solve of the assignment
        const again = exactFigures(solveAssignment(feeder, smallCustomers, r.assignment), smallCustomers, point).figures;
        expect(r.after.lossesKw).toBeCloseTo(again.lossesKw, 9);
        expect(r.after.neutralCurrentA).toBeCloseTo(again.neutralCurrentA, 9);
        expect(r.scores.after).toBeGreaterThanOrEqual(optimum - 1e-9 * (1 + Math.abs(optimum)));
        expect(r.scores.after).toBeLessThanOrEqual(optimum + 1e-6 * (1 + Math.abs(optimum)));
        expect(r.scores.after).toBeLessThan(r.scores.before);
        expect(r.gapPercent).toBeGreaterThanOrEqual(0);
      });
    }
});
