/** Transformer banks: phase shift (REFERENCES.md R10), ratios, zero-sequence blocking, an unbalanced D–Yg bank. */
import { describe, expect, it } from 'vitest';
import { demoCircuits, sequenceComponents, type CircuitInput } from '../../../../shared/engine/index.ts';
import { solveChecked } from '../solve-checked.ts';

const base = { format: 'wyeward-circuit', version: 1, frequencyHz: 60 } as const;
const angleClose = (a: number, b: number, tol: number) => expect(Math.abs(((a - b + 540) % 360) - 180)).toBeLessThanOrEqual(tol);

function bank(shift: { vectorGroup: string } | { connection: string }, extra: object[] = [], phases?: object): CircuitInput {
  return {
    ...base,
    elements: [
      { type: 'source', id: 'S', bus: 'HV', kvLL: 12.47, ...(phases ? { phases } : {}) },
      { type: 'transformer', id: 'T', from: 'HV', to: 'LV', kva: 500, kvHigh: 12.47, kvLow: 0.48, percentR: 1, percentX: 5, ...shift } as CircuitInput['elements'][number],
      ...(extra as CircuitInput['elements']),
    ],
  };
}
const lv = (r: ReturnType<typeof solveChecked>) => r.buses.find((b) => b.bus === 'LV')!;

describe('R10: 12.47 kV delta / 480Y/277 V bank at no load, HV VAN 1∠0° pu', () => {
  // IEEE C57.12.00 angular displacement (clause M); IEC 60076-1 clock notation (V)
  it('North American rule (D-Yg): LV Van 277.1∠−30° V', () => {
    const r = solveChecked(bank({ connection: 'D-Yg' }));
    expect(lv(r).lineToNeutral.a.mag).toBeCloseTo(277.128, 3);
    angleClose(lv(r).lineToNeutral.a.angleDeg, -30, 1e-9);
    expect(r.elements.T.phaseShift).toEqual({ convention: 'northAmerican', vectorGroup: 'D-Yg', lvLagsHvDeg: 30 });
  });
  it('IEC Dyn1: Van 277.1∠−30° V; Dyn11: Van 277.1∠+30° V', () => {
    const r1 = solveChecked(bank({ vectorGroup: 'Dyn1' }));
    angleClose(lv(r1).lineToNeutral.a.angleDeg, -30, 1e-9);
    const r11 = solveChecked(bank({ vectorGroup: 'Dyn11' }));
    expect(lv(r11).lineToNeutral.a.mag).toBeCloseTo(277.128, 3);
    angleClose(lv(r11).lineToNeutral.a.angleDeg, 30, 1e-9);
  });
  it('every IEC clock number gives LV lagging by clock × 30° (P: IEC 60076-1 clock notation)', () => {
    const groups = ['YNyn0', 'Dyn1', 'YNd1', 'Dd2', 'Dyn5', 'YNyn6', 'Yd7', 'Dd8', 'Dyn11', 'YNd11'];
    for (const g of groups) {
      const clock = Number(/\d+$/.exec(g)![0]);
      // a delta LV side floats (no earth path), so compare line-to-line voltages: Vab sits at 30° − clock × 30°
      const r = solveChecked(bank({ vectorGroup: g }));
      const b = lv(r);
      const vab = b.lineToLine.ab;
      angleClose(vab.angleDeg, 30 - 30 * clock, 1e-6);
      expect(vab.mag).toBeCloseTo(480, 6);
    }
  });
  it('zero sequence does not pass: an HV set with V0 leaves the LV side without V0 (P)', () => {
    // Unequal HV EMFs with a large zero-sequence part.
    const r = solveChecked(bank({ connection: 'D-Yg' }, [], { a: { pu: 1.3 }, b: { pu: 0.8 } }));
    const hv = r.buses.find((b) => b.bus === 'HV')!;
    expect(hv.sequence!.zero.mag).toBeGreaterThan(100);
    expect(lv(r).sequence!.zero.mag).toBeLessThan(1e-9 * lv(r).sequence!.positive.mag);
  });
  it('a delta secondary with nothing earthed is reported floating, not a crash (P)', () => {
    const r = solveChecked(bank({ vectorGroup: 'YNd1' }));
    expect(r.floating.length).toBe(1);
    expect(lv(r).floating).toBe(true);
    expect(lv(r).lineToLine.ab.mag).toBeCloseTo(480, 6);
  });
});

describe('Yg–Yg bank: ratio and zero sequence passes (P)', () => {
  it('an LV earth fault draws zero-sequence current on the HV side', () => {
    const r = solveChecked(bank({ connection: 'Yg-Yg' }, [{ type: 'fault', id: 'F', bus: 'LV', kind: 'lineEarth' }]));
    const hvPort = r.elements.T.ports![0];
    const [ia, ib, ic] = [0, 1, 2].map((k) => hvPort.currents[k]);
    const s = sequenceComponents(ia, ib, ic);
    expect(Math.hypot(s.zero.re, s.zero.im)).toBeGreaterThan(1);
  });
});

describe('D–Yg bank with unbalanced loads (demo "delta-wye-bank")', () => {
  const demo = demoCircuits.find((d) => d.key === 'delta-wye-bank')!;
  const r = solveChecked(demo.circuit);
  const t = r.elements['PM-BANK'];
  const [hvPort, lvPort] = t.ports!;
  it('delta-side line currents carry no zero sequence (P)', () => {
    const s = sequenceComponents(hvPort.currents[0], hvPort.currents[1], hvPort.currents[2]);
    expect(Math.hypot(s.zero.re, s.zero.im)).toBeLessThan(1e-9 * hvPort.currents[0].mag);
  });
  it('HV line current I_A = (I_a − I_b)/n for the D-Y (LV lags 30°) wiring, n = 12 470/(208/√3) (P: ampere-turn balance)', () => {
    const n = 12470 / (208 / Math.sqrt(3));
    // LV currents delivered to the loads = −(currents into the bank at the LV port)
    const out = (k: number) => ({ re: -lvPort.currents[k].re, im: -lvPort.currents[k].im });
    for (const [k, j] of [[0, 1], [1, 2], [2, 0]]) {
      const expected = { re: (out(k).re - out(j).re) / n, im: (out(k).im - out(j).im) / n };
      expect(Math.hypot(hvPort.currents[k].re - expected.re, hvPort.currents[k].im - expected.im)).toBeLessThan(1e-9 * hvPort.currents[k].mag);
    }
  });
  it('LV neutral current equals the sum of the LV phase currents and is not zero (KCL, P)', () => {
    const sum = [0, 1, 2].reduce((s, k) => ({ re: s.re + lvPort.currents[k].re, im: s.im + lvPort.currents[k].im }), { re: 0, im: 0 });
    const inN = lvPort.currents[3];
    expect(Math.hypot(sum.re + inN.re, sum.im + inN.im) - (t.earthCurrent?.mag ?? 0)).toBeLessThan(1e-6);
    expect(inN.mag).toBeGreaterThan(10);
  });
  it('loading and losses are reported: loading between 0 and 100 %, losses > 0 (P)', () => {
    expect(t.loadingPercent!).toBeGreaterThan(20);
    expect(t.loadingPercent!).toBeLessThan(100);
    expect(t.losses!.re).toBeGreaterThan(0);
  });
});
