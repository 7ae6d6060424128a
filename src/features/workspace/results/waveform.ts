/** Instantaneous values over one cycle from RMS phasors: v(t) = √2·|V|·cos(ωt + θ), ω = 2πf. */
import type { Phasor } from '../../../../shared/engine/index.ts';

/** Samples of one cycle (t in seconds from 0 to 1/f inclusive, `points` samples). */
export function sampleWaveform(p: Pick<Phasor, 'mag' | 'angleDeg'>, frequencyHz: number, points = 121): { t: number[]; y: number[] } {
  const period = 1 / frequencyHz;
  const w = 2 * Math.PI * frequencyHz;
  const theta = (p.angleDeg * Math.PI) / 180;
  const peak = Math.SQRT2 * p.mag;
  const t: number[] = [];
  const y: number[] = [];
  for (let i = 0; i < points; i++) {
    const ti = (period * i) / (points - 1);
    t.push(ti);
    y.push(peak * Math.cos(w * ti + theta));
  }
  return { t, y };
}
