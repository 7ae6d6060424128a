/** The sweep solver: every point's outputs equal the full solve of the swept circuit; refusals stay in their row. */
import { describe, expect, it } from 'vitest';
import { createSweepSolver, demoCircuits, InvalidCircuitError, solveCircuit, sweepCircuit, sweepOutputValue, sweepPoints, type CircuitInput, type SweepOutputSpec } from '../../../../shared/engine/index.ts';

const openNeutral = demoCircuits.find((d) => d.key === 'open-neutral-208y120')!.circuit as CircuitInput;
const deltaWye = demoCircuits.find((d) => d.key === 'delta-wye-bank')!.circuit as CircuitInput;
const feeder = demoCircuits.find((d) => d.key === 'feeder-earth-fault')!.circuit as CircuitInput;

/** Every point's outputs equal those of solveCircuit on the swept circuit (the same engine: same operations, to 1e-12). */
function expectDirect(circuit: CircuitInput, paths: string[], points: number[][], outs: SweepOutputSpec[], rows: { outputs: (number | null)[]; error?: string }[]) {
  expect(rows).toHaveLength(points.length);
  points.forEach((p, i) => {
    const direct = solveCircuit(sweepCircuit(circuit, paths, p));
    expect(rows[i].error).toBeUndefined();
    outs.forEach((o, k) => {
      const want = sweepOutputValue(direct, o);
      expect(want, `output ${k} exists`).not.toBeNull();
      if (want !== null) expect(Math.abs(rows[i].outputs[k]! - want)).toBeLessThanOrEqual(1e-12 * Math.max(1, Math.abs(want)));
    });
  });
}
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

  it('a line length of a block-built feeder (only that line re-expanded per point): every output equals the direct solve (P: same engine)', () => {
    const outs: SweepOutputSpec[] = [
      { kind: 'load', load: 'END-LOAD', branch: 'a' },
      { kind: 'load', load: 'MILL-LOAD', branch: 'b' },
      { kind: 'bus', bus: 'END', conductor: 'b' },
      { kind: 'shift', bus: 'END' },
      { kind: 'unbalance', bus: 'MILL' },
    ];
    const points = sweepPoints([{ from: 0.2, to: 3, steps: 7 }]);
    expectDirect(feeder, ['KX-SEC2.length'], points, outs, createSweepSolver()(feeder, ['KX-SEC2.length'], points, outs));
  });

  it('an earth electrode swept through 0 Ω (a solid bond: another shape, prepared whole) and back: every point equals the direct solve', () => {
    const points = [[25], [0], [10], [0], [0], [3], [1e4]];
    expectDirect(openNeutral, ['ROD.ohms'], points, outputs, createSweepSolver()(openNeutral, ['ROD.ohms'], points, outputs));
  });

  it('a value that sets bus nominals (a transformer rating; every load rated from it): every point equals the direct solve', () => {
    const outs: SweepOutputSpec[] = [
      { kind: 'load', load: 'OFFICES', branch: 'a' },
      { kind: 'bus', bus: 'PM208', conductor: 'a' },
      { kind: 'unbalance', bus: 'PM208' },
    ];
    const points = sweepPoints([{ from: 0.2, to: 0.24, steps: 3 }]);
    const rows = createSweepSolver()(deltaWye, ['PM-BANK.kvLow'], points, outs);
    expectDirect(deltaWye, ['PM-BANK.kvLow'], points, outs, rows);
    // the secondary voltage follows the rating, and so does the loads' base (their pu stays near)
    expect(rows[2].outputs[1]! / rows[0].outputs[1]!).toBeCloseTo(0.24 / 0.2, 1);
  });

  it('chunks of one sweep share its prepared circuit; another circuit object (an edit) is prepared afresh', () => {
    const solve = createSweepSolver();
    const paths = ['KITCHEN.each.kw'];
    const out = [outputs[0]];
    expectDirect(openNeutral, paths, [[1], [2]], out, solve(openNeutral, paths, [[1], [2]], out));
    expectDirect(openNeutral, paths, [[3], [-5], [4]].filter((p) => p[0] > 0), out, solve(openNeutral, paths, [[3], [4]], out));
    const edited = { ...openNeutral, elements: openNeutral.elements.map((e) => (e.id === 'HEATER' ? { ...e, each: { kw: 1, kvar: 0 } } : e)) } as CircuitInput;
    const rows = solve(edited, paths, [[3]], out);
    expectDirect(edited, paths, [[3]], out, rows);
    expect(rows[0].outputs[0]).not.toBeCloseTo(solve(openNeutral, paths, [[3]], out)[0].outputs[0]!, 4);
  });

  it('a parameter naming no element is refused for the whole batch', () => {
    expect(() => createSweepSolver()(openNeutral, ['NOPE.kw'], [[1]], outputs)).toThrow(InvalidCircuitError);
  });
});
