/** Every unbalance definition against its own limit; sequence components to neutral and of port currents. */
import { describe, expect, it } from 'vitest';
import { demoCircuits, resolveLimits, type Cx } from '../../../../shared/engine/index.ts';
import { solveChecked } from '../solve-checked.ts';

const openNeutral = demoCircuits.find((d) => d.key === 'open-neutral-208y120')!.circuit;

/** Fortescue with a = 1∠120°, written out here (M: X0 = (Xa+Xb+Xc)/3, X1 = (Xa+aXb+a²Xc)/3, X2 = (Xa+a²Xb+aXc)/3). */
function fortescue(xa: Cx, xb: Cx, xc: Cx) {
  const rot = (x: Cx, deg: number): Cx => {
    const t = (deg * Math.PI) / 180;
    return { re: x.re * Math.cos(t) - x.im * Math.sin(t), im: x.re * Math.sin(t) + x.im * Math.cos(t) };
  };
  const sum = (...xs: Cx[]): Cx => ({ re: xs.reduce((s, x) => s + x.re, 0) / 3, im: xs.reduce((s, x) => s + x.im, 0) / 3 });
  return { zero: sum(xa, xb, xc), positive: sum(xa, rot(xb, 120), rot(xc, 240)), negative: sum(xa, rot(xb, 240), rot(xc, 120)) };
}

describe('unbalance: each definition against its own limit', () => {
  it('the open-neutral demo: line-voltage unbalance is small, phase-voltage unbalance is large and flagged (P)', () => {
    const r = solveChecked(openNeutral);
    const h = r.buses.find((b) => b.bus === 'HOUSE')!;
    expect(h.nemaUnbalancePercent!).toBeLessThan(3);
    expect(h.ieeeUnbalancePercent!).toBeGreaterThan(40);
    const u = r.flags.filter((f) => f.code === 'unbalance' && f.bus === 'HOUSE');
    expect(u.map((f) => [f.metric, f.limit])).toEqual([['ieee', 3]]);
    expect(u[0].message).toBe(`bus HOUSE: phase-voltage (IEEE) unbalance ${h.ieeeUnbalancePercent!.toFixed(2)} % exceeds 3 %`);
  });
  it('limits per definition: the set figure for each unless given its own', () => {
    expect(resolveLimits().unbalanceLimits).toEqual({ iec: 3, nema: 3, ieee: 3 });
    expect(resolveLimits({ set: 'iec-en' }).unbalanceLimits).toEqual({ iec: 2, nema: 2, ieee: 2 });
    const l = resolveLimits({ unbalancePercent: 2.5, unbalancePercentByMetric: { ieee: 60 } });
    expect(l.unbalanceLimits).toEqual({ iec: 2.5, nema: 2.5, ieee: 60 });
    expect(l.unbalancePercent).toBe(2.5);
    const r = solveChecked(openNeutral, { unbalancePercentByMetric: { ieee: 60 } });
    expect(r.flags.filter((f) => f.code === 'unbalance')).toEqual([]);
  });
});

describe('sequence components', () => {
  it('of the line-to-neutral set: V1 and V2 as to earth, V0 less the neutral shift (M: Fortescue; values C)', () => {
    const r = solveChecked(openNeutral);
    const h = r.buses.find((b) => b.bus === 'HOUSE')!;
    const ln = fortescue(h.lineToNeutral.a, h.lineToNeutral.b, h.lineToNeutral.c);
    const s = h.sequenceToNeutral!;
    for (const k of ['zero', 'positive', 'negative'] as const) {
      expect(Math.hypot(s[k].re - ln[k].re, s[k].im - ln[k].im)).toBeLessThan(1e-9);
    }
    expect(Math.hypot(s.positive.re - h.sequence!.positive.re, s.positive.im - h.sequence!.positive.im)).toBeLessThan(1e-9);
    expect(Math.hypot(s.negative.re - h.sequence!.negative.re, s.negative.im - h.sequence!.negative.im)).toBeLessThan(1e-9);
    const v0 = { re: h.sequence!.zero.re - h.neutralToEarth!.re, im: h.sequence!.zero.im - h.neutralToEarth!.im };
    expect(Math.hypot(s.zero.re - v0.re, s.zero.im - v0.im)).toBeLessThan(1e-9);
    // To earth the set looks balanced (V2 ≈ 0.2 V); to the shifted neutral V0 is the whole shift (C).
    expect(h.sequence!.negative.mag).toBeLessThan(1);
    expect(s.zero.mag).toBeGreaterThan(50);
  });
  it('of port currents on both sides of a delta–wye bank: no zero sequence on the delta side (P)', () => {
    const r = solveChecked(demoCircuits.find((d) => d.key === 'delta-wye-bank')!.circuit);
    const bank = Object.values(r.elements).find((e) => e.type === 'transformer')!;
    const [hv, lv] = bank.ports!;
    expect(hv.sequence && lv.sequence).toBeTruthy();
    const ix = (p: typeof hv, c: string) => p.currents[p.conductors.indexOf(c)];
    const own = fortescue(ix(lv, 'a'), ix(lv, 'b'), ix(lv, 'c'));
    expect(Math.hypot(lv.sequence!.zero.re - own.zero.re, lv.sequence!.zero.im - own.zero.im)).toBeLessThan(1e-9);
    expect(hv.sequence!.zero.mag).toBeLessThan(1e-9 * hv.sequence!.positive.mag);
    expect(lv.sequence!.zero.mag).toBeGreaterThan(1e-3 * lv.sequence!.positive.mag); // unbalanced wye loads (C)
  });
});
