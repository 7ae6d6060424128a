/** The sweep solver: every point's outputs equal the full solve of the swept circuit; refusals stay in their row. */
import { describe, expect, it } from 'vitest';
import { createSweepSolver, demoCircuits, InvalidCircuitError, solveCircuit, sweepCircuit, sweepOutputValue, sweepPoints, type CircuitInput, type SweepOutputSpec } from '../../../../shared/engine/index.ts';

const openNeutral = demoCircuits.find((d) => d.key === 'open-neutral-208y120')!.circuit as CircuitInput;
const outputs: SweepOutputSpec[] = [
  { kind: 'load', load: 'KITCHEN', branch: 'an' },
  { kind: 'bus', bus: 'HOUSE', conductor: 'c' },
  { kind: 'shift', bus: 'HOUSE' },
  { kind: 'unbalance', bus: 'HOUSE' },
];

describe('createSweepSolver', () => {
  it('two parameters: each point equals solveCircuit of the circuit with both values written (P: same engine, two paths)', () => {
    const solve = createSweepSolver();
    const paths = ['ROD.ohms', 'HEATER.each.kw'];
    const points = sweepPoints([{ from: 0.1, to: 1e5, steps: 4, scale: 'log' }, { from: 1, to: 4, steps: 3 }]);
    const rows = solve(openNeutral, paths, points, outputs);
    expect(rows).toHaveLength(12);
    points.forEach((p, i) => {
      const direct = solveCircuit(sweepCircuit(openNeutral, paths, p));
      outputs.forEach((o, k) => {
        const want = sweepOutputValue(direct, o)!;
        expect(Math.abs(rows[i].outputs[k]! - want)).toBeLessThanOrEqual(1e-9 * Math.max(1, Math.abs(want)));
      });
    });
  });

  it('a value the format refuses is reported in its row with the engine words, the next point solves', () => {
    const rows = createSweepSolver()(openNeutral, ['KITCHEN.each.kw'], [[-5], [2]], outputs);
    expect(rows[0].error).toMatch(/KITCHEN/);
    expect(rows[0].outputs).toEqual([null, null, null, null]);
    expect(rows[1].error).toBeUndefined();
    expect(rows[1].outputs[0]).toBeCloseTo(sweepOutputValue(solveCircuit(sweepCircuit(openNeutral, ['KITCHEN.each.kw'], [2])), outputs[0])!, 9);
  });

  it('a parameter naming no element is refused for the whole batch', () => {
    expect(() => createSweepSolver()(openNeutral, ['NOPE.kw'], [[1]], outputs)).toThrow(InvalidCircuitError);
  });
});
