/**
 * Balanced networks through every block kind give V0 = V2 = 0 and no neutral current (P), and
 * the phase sequence setting rotates the other way.
 */
import { describe, expect, it } from 'vitest';
import type { CircuitInput } from '../../../../shared/engine/index.ts';
import { expectBalanced, solveChecked } from '../solve-checked.ts';

const network = (sequence: 'ABC' | 'ACB'): CircuitInput => ({
  format: 'wyeward-circuit',
  version: 1,
  frequencyHz: 50,
  sequence,
  elements: [
    { type: 'source', id: 'GRID', bus: 'HV', kvLL: 11, impedance: { shortCircuitMva: 250, xOverR: 10, z0OverZ1: 0.8 } },
    { type: 'line', id: 'CABLE', from: 'HV', to: 'HV2', length: 2.5, impedance: { kind: 'sequence', z1PerLength: { re: 0.16, im: 0.11 }, z0PerLength: { re: 0.6, im: 0.35 } }, shunt: { siemensPerLength: [[{ re: 0, im: 9e-5 }, { re: 0, im: 0 }, { re: 0, im: 0 }], [{ re: 0, im: 0 }, { re: 0, im: 9e-5 }, { re: 0, im: 0 }], [{ re: 0, im: 0 }, { re: 0, im: 0 }, { re: 0, im: 9e-5 }]] } },
    { type: 'transformer', id: 'TX', from: 'HV2', to: 'LV', kva: 1000, kvHigh: 11, kvLow: 0.4, vectorGroup: 'Dyn11', percentZ: 6, xOverR: 5 },
    { type: 'switch3', id: 'CB', from: 'LV', to: 'LV2' },
    { type: 'line', id: 'FEEDER', from: 'LV2', to: 'END', length: 200, lengthUnit: 'm', impedance: { kind: 'matrix', conductors: ['a', 'b', 'c', 'n'], ohmsPerLength: [0, 1, 2, 3].map((i) => [0, 1, 2, 3].map((j) => (i === j ? { re: 3.1e-4, im: 8e-5 } : { re: 0, im: 2e-5 }))) } },
    { type: 'load', id: 'MOTORS', bus: 'END', connection: 'delta', total: { kw: 300, kvar: 150, model: 'power' } },
    { type: 'load', id: 'LIGHTING', bus: 'END', connection: 'wye', each: { kw: 40, kvar: 5, model: { z: 0.5, i: 0.3, p: 0.2 } } },
    { type: 'load', id: 'HEAT', bus: 'LV2', connection: 'wye', each: { rOhms: 2, lHenry: 0.001 } },
    { type: 'capacitorBank', id: 'PFC', bus: 'LV2', kvar: 100, connection: 'delta' },
    { type: 'earthing', id: 'END-E', node: 'END.n', ohms: 10 },
  ],
});

describe('balanced network through sources, lines, a Dyn11 bank, switches, ZIP loads and capacitors', () => {
  it('ABC: V0 = V2 = 0 at every bus and no neutral current (P)', () => {
    const r = solveChecked(network('ABC'));
    expectBalanced(r);
    const end = r.buses.find((b) => b.bus === 'END')!;
    expect(end.iecUnbalancePercent!).toBeLessThan(1e-9);
    expect(r.iterations).toBeGreaterThan(1); // constant-power parts iterate
    expect(end.lineToNeutral.a.angleDeg).toBeGreaterThan(20); // Dyn11: LV leads by 30° minus drops
  });
  it('ACB: still balanced under the ACB convention (positive sequence = system rotation) (P)', () => {
    const r = solveChecked(network('ACB'));
    expectBalanced(r);
    const end = r.buses.find((b) => b.bus === 'END')!;
    // the same wiring in an ACB system displaces the other way: LV lags by about 30°
    expect(end.lineToNeutral.a.angleDeg).toBeLessThan(-20);
    expect(end.lineToNeutral.b.angleDeg - end.lineToNeutral.a.angleDeg).toBeCloseTo(120, 6);
  });
});
