import { describe, expect, it } from 'vitest';
import { sampleWaveform } from '../../../../../src/features/workspace/results/waveform.ts';

describe('sampleWaveform: v(t) = √2·|V|·cos(ωt + θ)', () => {
  it('a 120 V RMS phasor at 0° peaks at 169.7 V at t = 0 and crosses zero a quarter cycle later (C)', () => {
    const w = sampleWaveform({ mag: 120, angleDeg: 0 }, 60, 121);
    expect(w.t).toHaveLength(121);
    expect(w.y[0]).toBeCloseTo(169.706, 3); // √2·120
    expect(w.y[30]).toBeCloseTo(0, 9); // t = T/4
    expect(w.y[60]).toBeCloseTo(-169.706, 3); // t = T/2
    expect(w.t[120]).toBeCloseTo(1 / 60, 12);
    expect(w.y[120]).toBeCloseTo(w.y[0], 9); // one whole cycle
  });
  it('a lagging angle delays the peak: −120° peaks one third of a cycle later (C)', () => {
    const w = sampleWaveform({ mag: 10, angleDeg: -120 }, 50, 151);
    const iMax = w.y.indexOf(Math.max(...w.y));
    expect(w.t[iMax]).toBeCloseTo(1 / 150, 9); // T/3 at 50 Hz
    expect(w.y[0]).toBeCloseTo(Math.SQRT2 * 10 * Math.cos((-120 * Math.PI) / 180), 9);
  });
});
