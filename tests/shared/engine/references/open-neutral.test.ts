/** Open neutral on a 208Y/120 V service: Millman's theorem and the demo circuit. */
import { describe, expect, it } from 'vitest';
import { demoCircuits, polar, type CircuitInput } from '../../../../shared/engine/index.ts';
import { solveChecked } from '../solve-checked.ts';

describe('open neutral, unequal resistive loads 10, 20, 30 Ω on an ideal 120 V source', () => {
  const circuit = (open: boolean): CircuitInput => ({
    format: 'wyeward-circuit',
    version: 1,
    frequencyHz: 60,
    elements: [
      { type: 'source', id: 'S', bus: 'SVC', kvLL: 0.12 * Math.sqrt(3) },
      { type: 'line', id: 'DROP', from: 'SVC', to: 'H', length: 1, impedance: { kind: 'perConductor', ohmsPerLength: { a: 0.001, b: 0.001, c: 0.001, n: 0.001 } }, open: open ? ['n'] : [] },
      { type: 'load', id: 'LD', bus: 'H', connection: 'wye', phases: { a: { ohms: 10 }, b: { ohms: 20 }, c: { ohms: 30 } } },
    ],
  });
  it("star-point voltage = Σ(Vk·Yk)/ΣYk = 38.18 − j9.45 V (39.33∠−13.9°) (P: Millman's theorem; values C)", () => {
    const r = solveChecked(circuit(true));
    const vln = 120;
    const [va, vb, vc] = [polar(vln, 0), polar(vln, -120), polar(vln, 120)];
    // each load in series with its 0.001 Ω phase conductor
    const y = [1 / 10.001, 1 / 20.001, 1 / 30.001];
    const ysum = y[0] + y[1] + y[2];
    const vn = { re: (va.re * y[0] + vb.re * y[1] + vc.re * y[2]) / ysum, im: (va.im * y[0] + vb.im * y[1] + vc.im * y[2]) / ysum };
    // hand value for 120 V: (7 − j1.732)/0.18333
    expect(vn.re).toBeCloseTo(38.18, 1);
    expect(vn.im).toBeCloseTo(-9.45, 1);
    const h = r.buses.find((b) => b.bus === 'H')!;
    // the house star point sits at Vn minus nothing (no neutral current flows): compare to 1e-9 relative
    expect(Math.hypot(h.neutralToEarth!.re - vn.re, h.neutralToEarth!.im - vn.im)).toBeLessThan(1e-9 * vln);
    expect(h.neutralShiftPercent!).toBeCloseTo((100 * Math.hypot(vn.re, vn.im)) / vln, 3);
  });
  it('with the neutral intact the star point stays at earth and the neutral carries Ia + Ib + Ic (P)', () => {
    const r = solveChecked(circuit(false));
    const h = r.buses.find((b) => b.bus === 'H')!;
    expect(h.neutralToEarth!.mag).toBeLessThan(0.01); // 0.001 Ω neutral × a few amperes
    const [ia, ib, ic, inN] = r.elements.LD.currents;
    expect(Math.hypot(ia.re + ib.re + ic.re + inN.re, ia.im + ib.im + ic.im + inN.im)).toBeLessThan(1e-9);
    expect(inN.mag).toBeGreaterThan(5);
  });
});

describe('demo "open-neutral-208y120"', () => {
  const r = solveChecked(demoCircuits.find((d) => d.key === 'open-neutral-208y120')!.circuit);
  const house = r.buses.find((b) => b.bus === 'HOUSE')!;
  it('the lightly loaded phases rise above Range B and the heavy one sags: flagged as violations (P)', () => {
    expect(house.lineToNeutral.c.mag).toBeGreaterThan(127);
    expect(house.lineToNeutral.b.mag).toBeLessThan(110);
    const v = r.flags.filter((f) => f.bus === 'HOUSE' && f.severity === 'violation');
    expect(v.map((f) => f.conductor).sort()).toEqual(['a', 'b', 'c']);
    expect(r.flags.some((f) => f.code === 'neutral-shift' && f.bus === 'HOUSE')).toBe(true);
  });
  it('the earth rod carries the whole neutral return (P)', () => {
    const rod = r.elements.ROD;
    const drop = r.elements.DROP.ports![1];
    const sum = [0, 1, 2].reduce((s, k) => ({ re: s.re + drop.currents[k].re, im: s.im + drop.currents[k].im }), { re: 0, im: 0 });
    // phase currents arriving at the house (= −into the line at its far end) return through the rod
    expect(Math.abs(rod.earthCurrent!.mag - Math.hypot(sum.re, sum.im))).toBeLessThan(1e-9);
  });
  it('the IEC/EN limit set flags the same phases (±10 %) (P)', () => {
    const iec = solveChecked(demoCircuits.find((d) => d.key === 'open-neutral-208y120')!.circuit, { set: 'iec-en' });
    expect(iec.limits.id).toBe('iec-en');
    expect(iec.flags.filter((f) => f.bus === 'HOUSE' && f.severity === 'violation').length).toBe(3);
  });
});
