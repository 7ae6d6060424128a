/**
 * Symmetrical components with a = 1∠120° (Fortescue):
 *   X0 = (Xa + Xb + Xc)/3,  X1 = (Xa + a·Xb + a²·Xc)/3,  X2 = (Xa + a²·Xb + a·Xc)/3.
 * For an ACB system the roles of a and a² are swapped, so that "positive sequence" is always
 * the system's own rotation (an ACB-balanced set gives X1 = Xa, X2 = 0). Documented in
 * docs/circuit-format.md.
 */
import type { Cx } from '../types.ts';
import { add, mul, polar, scale } from '../phasor.ts';

const A = polar(1, 120);
const A2 = polar(1, 240);

/** Zero, positive and negative sequence of a three-phase set (same unit as the input). */
export interface SequenceComponents {
  zero: Cx;
  positive: Cx;
  negative: Cx;
}

/** Sequence components of (xa, xb, xc); `sequence` is the system's phase rotation (default ABC). */
export function sequenceComponents(xa: Cx, xb: Cx, xc: Cx, sequence: 'ABC' | 'ACB' = 'ABC'): SequenceComponents {
  const [p, q] = sequence === 'ABC' ? [A, A2] : [A2, A];
  return {
    zero: scale(add(add(xa, xb), xc), 1 / 3),
    positive: scale(add(add(xa, mul(p, xb)), mul(q, xc)), 1 / 3),
    negative: scale(add(add(xa, mul(q, xb)), mul(p, xc)), 1 / 3),
  };
}

/** Phase values from sequence components: Xa = X0+X1+X2, Xb = X0+a²X1+aX2, Xc = X0+aX1+a²X2 (ABC). */
export function phasesFromSequence(s: SequenceComponents, sequence: 'ABC' | 'ACB' = 'ABC'): [Cx, Cx, Cx] {
  const [p, q] = sequence === 'ABC' ? [A, A2] : [A2, A];
  return [add(add(s.zero, s.positive), s.negative), add(add(s.zero, mul(q, s.positive)), mul(p, s.negative)), add(add(s.zero, mul(p, s.positive)), mul(q, s.negative))];
}
