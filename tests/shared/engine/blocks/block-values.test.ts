/** Building blocks give the values their definitions promise (hand formulas, P unless stated). */
import { describe, expect, it } from 'vitest';
import type { CircuitInput } from '../../../../shared/engine/index.ts';
import { solveChecked } from '../solve-checked.ts';

const header = { format: 'wyeward-circuit', version: 1, frequencyHz: 60 } as const;
const withElements = (elements: object[]): CircuitInput => ({ ...header, elements: elements as CircuitInput['elements'] });

describe('sources', () => {
  it('short-circuit MVA: a bolted three-phase fault draws MVA/(√3·kV) (P: definition of short-circuit level)', () => {
    const r = solveChecked(withElements([
      { type: 'source', id: 'S', bus: 'B', kvLL: 11, impedance: { shortCircuitMva: 250, xOverR: 10 } },
      { type: 'fault', id: 'F', bus: 'B', kind: 'threePhase' },
    ]));
    expect(r.faults[0].phaseCurrents.a.mag).toBeCloseTo(250e6 / (Math.sqrt(3) * 11e3), 6);
    // X/R = 10 → the current lags the EMF by atan(10)
    expect(r.faults[0].phaseCurrents.a.angleDeg).toBeCloseTo(-Math.atan(10) * (180 / Math.PI), 6);
  });
  it('impedance earthing adds 3·Zn to the zero-sequence loop: Ia = 3E/(Z1+Z2+Z0+3Zn) (P: textbook formula)', () => {
    const zn = 2;
    const r = solveChecked(withElements([
      { type: 'source', id: 'S', bus: 'B', kvLL: 11, earthing: { ohms: zn }, impedance: { z1: { re: 0, im: 1.2 }, z0: { re: 0, im: 0.8 } } },
      { type: 'fault', id: 'F', bus: 'B', kind: 'lineEarth' },
    ]));
    const e = 11e3 / Math.sqrt(3);
    expect(r.faults[0].phaseCurrents.a.mag).toBeCloseTo((3 * e) / Math.hypot(3 * zn, 1.2 + 1.2 + 0.8), 6);
    expect(r.elements.S.earthCurrent!.mag).toBeCloseTo(r.faults[0].phaseCurrents.a.mag, 6);
  });
  it('an unearthed source gives no earth-fault current and the healthy phases rise to line voltage (P)', () => {
    const r = solveChecked(withElements([
      { type: 'source', id: 'S', bus: 'B', kvLL: 11, earthing: 'unearthed' },
      { type: 'load', id: 'L', bus: 'B', connection: 'delta', each: { ohms: 100 } },
      { type: 'fault', id: 'F', bus: 'B', kind: 'lineEarth' },
    ]));
    expect(r.faults[0].phaseCurrents.a.mag).toBeLessThan(1e-9);
    expect(r.buses[0].toEarth.b.mag).toBeCloseTo(11e3, 6);
  });
  it('per-phase overrides set unbalanced EMFs (P)', () => {
    const r = solveChecked(withElements([
      { type: 'source', id: 'S', bus: 'B', kvLL: 0.415, phases: { b: { pu: 0.9 }, c: { angleDeg: 115 } } },
      { type: 'load', id: 'L', bus: 'B', connection: 'wye', each: { ohms: 10 } },
    ]));
    const b = r.buses[0];
    expect(b.lineToNeutral.a.mag).toBeCloseTo(415 / Math.sqrt(3), 9);
    expect(b.lineToNeutral.b.mag).toBeCloseTo((0.9 * 415) / Math.sqrt(3), 9);
    expect(b.lineToNeutral.c.angleDeg).toBeCloseTo(115, 9);
  });
});

describe('loads and capacitor banks', () => {
  it('a capacitor bank delivers its rated kvar at rated voltage (Q = −kvar, load convention)', () => {
    const r = solveChecked(withElements([
      { type: 'source', id: 'S', bus: 'B', kvLL: 0.48 },
      { type: 'capacitorBank', id: 'C', bus: 'B', kvar: 150, connection: 'delta' },
      { type: 'capacitorBank', id: 'CY', bus: 'B', kvar: 60 },
    ]));
    expect(r.elements.C.power.im).toBeCloseTo(-150e3, 6);
    expect(r.elements.CY.power.im).toBeCloseTo(-60e3, 6);
    expect(Math.abs(r.elements.C.power.re)).toBeLessThan(1e-6);
  });
  it('constant power draws its rating off nominal voltage; constant current scales with V; constant impedance with V²', () => {
    const make = (model: string) =>
      solveChecked(withElements([
        { type: 'source', id: 'S', bus: 'B', kvLL: 0.208, phases: { a: { pu: 0.9 }, b: { pu: 0.9 }, c: { pu: 0.9 } } },
        { type: 'load', id: 'L', bus: 'B', connection: 'wye', kvLL: 0.208, each: { kw: 10, kvar: 3, model } },
      ]));
    expect(make('power').elements.L.power.re).toBeCloseTo(30e3, 4);
    expect(make('current').elements.L.power.re).toBeCloseTo(0.9 * 30e3, 4);
    expect(make('impedance').elements.L.power.re).toBeCloseTo(0.81 * 30e3, 4);
  });
  it('R, L, C values are evaluated at the study frequency (series and parallel)', () => {
    const r = solveChecked({
      format: 'wyeward-circuit',
      version: 1,
      frequencyHz: 50,
      elements: [
        { type: 'voltageSource', id: 'V', plus: 'X.a', minus: 'earth', volts: 230 },
        { type: 'load', id: 'SER', bus: 'X', connection: 'single', between: ['a', 'n'], each: { rOhms: 10, lHenry: 0.1, cFarad: 100e-6 } },
        { type: 'load', id: 'PAR', bus: 'X', connection: 'single', between: ['a', 'n'], each: { rOhms: 50, cFarad: 20e-6, arrangement: 'parallel' } },
        { type: 'earthing', id: 'E', node: 'X.n', ohms: 0 },
      ],
    });
    const w = 2 * Math.PI * 50;
    const zs = { re: 10, im: w * 0.1 - 1 / (w * 100e-6) };
    expect(r.elements.SER.currents[0].mag).toBeCloseTo(230 / Math.hypot(zs.re, zs.im), 9);
    expect(r.elements.PAR.currents[0].mag).toBeCloseTo(230 * Math.hypot(1 / 50, w * 20e-6), 9);
  });
});

describe('lines', () => {
  it('an open phase leaves its far-end conductor fed only through the load (P)', () => {
    const r = solveChecked(withElements([
      { type: 'source', id: 'S', bus: 'A', kvLL: 0.415 },
      { type: 'line', id: 'L', from: 'A', to: 'B', length: 0.1, impedance: { kind: 'sequence', z1PerLength: { re: 0.2, im: 0.08 }, z0PerLength: { re: 0.8, im: 0.3 }, neutralOhmsPerLength: { re: 0.2, im: 0.08 } }, open: ['b'] },
      { type: 'load', id: 'M', bus: 'B', connection: 'delta', each: { ohms: 20 } },
    ]));
    const port = r.elements.L.ports![0];
    expect(port.currents[port.conductors.indexOf('b')].mag).toBe(0);
    // with phase b open the delta load is fed single-phase from a and c: |Ia| = |Ic|
    expect(port.currents[0].mag).toBeCloseTo(port.currents[2].mag, 9);
    expect(r.buses.find((b) => b.bus === 'B')!.nemaUnbalancePercent!).toBeGreaterThan(10);
  });
  it('shunt admittance: an open-ended cable draws its charging current Y·V (nominal π)', () => {
    const b = 1e-6 * 2 * Math.PI * 50 * 0.3; // 0.3 µF/km
    const y = [0, 1, 2].map((i) => [0, 1, 2].map((j) => (i === j ? { re: 0, im: b } : { re: 0, im: 0 })));
    const r = solveChecked({
      format: 'wyeward-circuit',
      version: 1,
      frequencyHz: 50,
      elements: [
        { type: 'source', id: 'S', bus: 'A', kvLL: 33 },
        { type: 'line', id: 'CBL', from: 'A', to: 'B', length: 10, impedance: { kind: 'sequence', z1PerLength: { re: 0.1, im: 0.12 }, z0PerLength: { re: 0.4, im: 0.3 } }, shunt: { siemensPerLength: y } },
      ],
    });
    const ia = r.elements.CBL.currents[0];
    // at no load the current is very nearly V·B·length (the series drop is tiny)
    expect(ia.mag / ((33e3 / Math.sqrt(3)) * b * 10)).toBeCloseTo(1, 3);
    // balanced charging currents sum to zero: no net current to earth
    expect(r.elements.CBL.earthCurrent!.mag).toBeLessThan(1e-9 * ia.mag);
  });
});

describe('switch3 and earthing', () => {
  it('an open switch3 de-energises the far bus, which is flagged (P)', () => {
    const r = solveChecked(withElements([
      { type: 'source', id: 'S', bus: 'A', kvLL: 0.208 },
      { type: 'switch3', id: 'CB', from: 'A', to: 'B', closed: false },
      { type: 'load', id: 'L', bus: 'B', connection: 'wye', each: { ohms: 5 } },
      { type: 'earthing', id: 'E', node: 'B.n', ohms: 10 },
    ]));
    expect(r.buses.find((b) => b.bus === 'B')!.lineToNeutral.a.mag).toBe(0);
    expect(r.flags.some((f) => f.bus === 'B' && f.code === 'voltage-low' && f.severity === 'violation')).toBe(true);
  });
  it('two solid bonds on one neutral are merged: the first carries the earth current (documented)', () => {
    const r = solveChecked(withElements([
      { type: 'source', id: 'S', bus: 'A', kvLL: 0.208 },
      { type: 'earthing', id: 'E0', node: 'A.n', ohms: 0 },
      { type: 'fault', id: 'F', bus: 'A', kind: 'lineEarth', ohms: 1 },
    ]));
    expect(r.elements.S.earthCurrent!.mag).toBeCloseTo(120.089, 3);
    expect(r.elements.E0.earthCurrent!.mag).toBe(0);
  });
});

describe('nominal voltages', () => {
  it('a split-phase bus reached only through a service line has a 120 V leg nominal, so a kW load is rated at 120 V (P)', () => {
    const r = solveChecked(withElements([
      { type: 'splitPhaseSource', id: 'S', bus: 'POLE' },
      { type: 'line', id: 'SVC', from: 'POLE', to: 'METER', length: 10, lengthUnit: 'm', impedance: { kind: 'perConductor', ohmsPerLength: { '1': 1e-4, '2': 1e-4, n: 1e-4 } } },
      { type: 'switch3', id: 'MAIN', from: 'METER', to: 'PANEL', conductors: ['1', '2', 'n'] },
      { type: 'load', id: 'L', bus: 'PANEL', connection: 'single', between: ['1', 'n'], each: { kw: 1.2 } },
    ]));
    const panel = r.buses.find((b) => b.bus === 'PANEL')!;
    expect(panel.kind).toBe('splitPhase');
    expect(panel.nominalVLN).toBe(120);
    expect(r.elements.L.power.re).toBeGreaterThan(1190); // 1.2 kW at 120 V, minus a small drop
    expect(r.elements.L.power.re).toBeLessThan(1200);
  });
});
