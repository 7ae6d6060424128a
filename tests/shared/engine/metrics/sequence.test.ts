/** Symmetrical components (REFERENCES.md R6–R8). */
import { describe, expect, it } from 'vitest';
import { iecUnbalancePercent, phasesFromSequence, polar, sequenceComponents, toPhasor } from '../../../../shared/engine/index.ts';

const angleClose = (a: number, b: number, tol: number) => expect(Math.abs(((a - b + 540) % 360) - 180)).toBeLessThanOrEqual(tol);

describe('sequenceComponents', () => {
  it('R6: Va 7.3∠12.5°, Vb 0.4∠−100°, Vc 4.4∠154° → V0 1.4655∠45.11°, V1 3.9691∠20.54°, V2 2.5235∠−19.70° (V: Gönen, Example 9.1)', () => {
    const s = sequenceComponents(polar(7.3, 12.5), polar(0.4, -100), polar(4.4, 154));
    const [v0, v1, v2] = [s.zero, s.positive, s.negative].map(toPhasor);
    expect(v0.mag).toBeCloseTo(1.4655, 4);
    angleClose(v0.angleDeg, 45.11, 0.01);
    expect(v1.mag).toBeCloseTo(3.9691, 4);
    angleClose(v1.angleDeg, 20.54, 0.01);
    expect(v2.mag).toBeCloseTo(2.5235, 4);
    angleClose(v2.angleDeg, -19.7, 0.01);
  });

  it('R7: Ia 12+j24, Ib 16−j2, Ic −4−j6 A → I0 8+j5.333, I1 0.845+j15.107, I2 3.155+j3.560 A (V: Chakrabarti et al., Example 3.1)', () => {
    const s = sequenceComponents({ re: 12, im: 24 }, { re: 16, im: -2 }, { re: -4, im: -6 });
    expect(s.zero.re).toBeCloseTo(8, 3);
    expect(s.zero.im).toBeCloseTo(5.333, 3);
    expect(s.positive.re).toBeCloseTo(0.845, 3);
    expect(s.positive.im).toBeCloseTo(15.107, 3);
    expect(s.negative.re).toBeCloseTo(3.155, 3);
    expect(s.negative.im).toBeCloseTo(3.56, 3);
  });

  it('R8: V0 0.02∠−60°, V1 1∠0°, V2 0.05∠30° pu → Va 1.05331∠0.418°, Vb 1.01051∠−121.853°, Vc 0.93698∠121.529°; IEC unbalance 5.000 % (P (C))', () => {
    const [va, vb, vc] = phasesFromSequence({ zero: polar(0.02, -60), positive: polar(1, 0), negative: polar(0.05, 30) }).map(toPhasor);
    // Hand sums give 1.05333, 1.01053, 0.93704 (e.g. Vc = 0.02∠−60° + 1∠120° + 0.05∠270° = −0.49 + j0.79871):
    // the REFERENCES.md magnitudes are within 1e-4 of them (rounding), so the tolerance is 1e-4.
    expect(Math.abs(va.mag - 1.05331)).toBeLessThanOrEqual(1e-4);
    angleClose(va.angleDeg, 0.418, 1e-3);
    expect(Math.abs(vb.mag - 1.01051)).toBeLessThanOrEqual(1e-4);
    angleClose(vb.angleDeg, -121.853, 1e-3);
    expect(Math.abs(vc.mag - 0.93698)).toBeLessThanOrEqual(1e-4);
    angleClose(vc.angleDeg, 121.529, 1e-3);
    const back = sequenceComponents(va, vb, vc);
    expect(iecUnbalancePercent(back.positive, back.negative)).toBeCloseTo(5, 9);
  });

  it('ACB: a balanced ACB set is all positive sequence under the ACB convention, and all negative under the ABC formulas (P)', () => {
    const [a, b, c] = [polar(100, 0), polar(100, 120), polar(100, -120)];
    const acb = sequenceComponents(a, b, c, 'ACB');
    expect(toPhasor(acb.positive).mag).toBeCloseTo(100, 10);
    expect(toPhasor(acb.negative).mag).toBeLessThan(1e-12);
    const abc = sequenceComponents(a, b, c, 'ABC');
    expect(toPhasor(abc.negative).mag).toBeCloseTo(100, 10);
    expect(toPhasor(abc.positive).mag).toBeLessThan(1e-12);
  });
});
