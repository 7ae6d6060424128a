/** Normalise the complex forms of the file format to `Cx`. */
import type { Cx } from '../types.ts';
import type { ComplexInput } from './common.ts';
import { polar } from '../phasor.ts';

/** `{re,im}`, `{mag,angleDeg}` or a number → `{re,im}` (an `{re,im}` value is returned as is: treat it as read-only). */
export function toCx(v: ComplexInput): Cx {
  if (typeof v === 'number') return { re: v, im: 0 };
  if ('re' in v) return v;
  return polar(v.mag, v.angleDeg);
}
