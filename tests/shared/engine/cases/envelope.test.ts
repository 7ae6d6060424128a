/**
 * The lost-neutral envelope against Millman's theorem (J. Millman, "A useful network theorem",
 * Proc. IRE 28 (1940); evaluated independently in lost-neutral-fixture.ts): every combination of
 * the three loads' levels, the star-point locus, each load's worst voltages and the share of
 * combinations outside ANSI C84.1 Range B (110–127 V on 120 V: (M) the standard's service range B).
 */
import { describe, expect, it } from 'vitest';
import { InvalidCircuitError, lostNeutralEnvelope, sweepValues } from '../../../../shared/engine/index.ts';
import { cabs, LOADS, millman, serviceCircuit, VLN } from './lost-neutral-fixture.ts';

describe('lost-neutral envelope', () => {
  const steps = 4;
  const env = lostNeutralEnvelope(serviceCircuit(LOADS, null, ['n']), { bus: 'HOUSE', fromFraction: 0.1, toFraction: 1, steps });
  const f = sweepValues({ from: 0.1, to: 1, steps });
  // the same combinations, first load slowest, solved by Millman
  const expected: { star: { re: number; im: number }; volts: number[] }[] = [];
  for (const fa of f)
    for (const fb of f)
      for (const fc of f) {
        const scale = (l: { kw: number; kvar: number }, x: number) => ({ kw: l.kw * x, kvar: l.kvar * x });
        const m = millman({ a: scale(LOADS.a, fa), b: scale(LOADS.b, fb), c: scale(LOADS.c, fc) }, null);
        expected.push({ star: m.star, volts: (['a', 'b', 'c'] as const).map((k) => cabs({ re: m.house[k].re - m.star.re, im: m.house[k].im - m.star.im })) });
      }

  it('solves every combination; the star-point locus is Millman’s at each (C)', () => {
    expect(env.solved).toBe(64);
    expect(env.failed).toBe(0);
    env.locus.forEach((p, k) => expect(cabs({ re: p.re - expected[k].star.re, im: p.im - expected[k].star.im }), `combination ${k}`).toBeLessThan(1e-9 * VLN));
  });

  it('each load’s worst over- and under-voltage, in V and pu of 120 V (C)', () => {
    expect(env.loads.map((l) => l.id)).toEqual(['KITCHEN', 'HEATER', 'ELECTRONICS']);
    env.loads.forEach((l, j) => {
      const v = expected.map((e) => e.volts[j]);
      expect(l.maxVolts).toBeCloseTo(Math.max(...v), 6);
      expect(l.minVolts).toBeCloseTo(Math.min(...v), 6);
      expect(l.maxPu).toBeCloseTo(Math.max(...v) / VLN, 6);
    });
    // the floating star point puts some load far above 127 V somewhere in the envelope
    expect(Math.max(...env.loads.map((l) => l.maxVolts))).toBeGreaterThan(140);
  });

  it('the share of combinations with any load outside Range B (M: 110–127 V)', () => {
    const outside = expected.filter((e) => e.volts.some((v) => v < 110 || v > 127)).length;
    expect(env.violationPu[0]).toBeCloseTo(110 / 120, 12);
    expect(env.outsideShare).toBeCloseTo(outside / 64, 12);
    expect(env.outsideShare).toBeGreaterThan(0);
    // equal loads varied a little keep the star point near earth in some combinations
    const equal = { kw: 2, kvar: 0 };
    const near = lostNeutralEnvelope(serviceCircuit({ a: equal, b: equal, c: equal }, null, ['n']), { bus: 'HOUSE', fromFraction: 0.9, toFraction: 1, steps: 2 });
    expect(near.solved).toBe(8);
    expect(near.outsideShare).toBeLessThan(1);
  });

  it('a bus without single-phase kW loads to the neutral is a clear error', () => {
    expect(() => lostNeutralEnvelope(serviceCircuit(), { bus: 'PAD' })).toThrow(InvalidCircuitError);
    expect(() => lostNeutralEnvelope(serviceCircuit(), { bus: 'PAD' })).toThrow('bus PAD: no single-phase kW loads between a phase and the neutral to vary');
  });
});
