/**
 * Complex values as people type them: rectangular `R + jX` ("0.8+j1.5", "3-j4", "j2", "1.2 - 0.4j")
 * or polar `magnitude∠angle` in degrees ("120∠-30", "120@-30", "120 /_ 30"). A plain number is real.
 * An optional trailing Ω (ohm, ohms) is accepted; anything else — expressions ("208/sqrt(3)"),
 * other units ("5 mΩ", "0.19 Ω/km" on per-length data) — goes to the unit-aware evaluator, which
 * converts it or refuses a unit of another kind (a volt is never read as an ohm).
 */
import type { ComplexInput, PerLengthUnit } from '../../../../shared/engine/index.ts';
import { evaluateComplex } from './expression.ts';

export type ParseResult<T> = { ok: true; value: T } | { ok: false; message: string };

const NUM = String.raw`[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?`;
const UNIT = /\s*(?:Ω|ohms?)\s*$/;
const RE_POLAR = new RegExp(String.raw`^(${NUM})\s*(?:∠|@|/_)\s*(${NUM})\s*°?$`);
const RE_REAL = new RegExp(String.raw`^(${NUM})$`);
// j before or after the imaginary magnitude; an optional real part in front.
const RE_RECT = new RegExp(String.raw`^(?:(${NUM})\s*)?([+-])?\s*(?:[ij]\s*(${NUM.replace('[+-]?', '')})?|(${NUM.replace('[+-]?', '')})\s*[ij])$`);

/**
 * Parses a complex value; polar input stays polar ({ mag, angleDeg }), rectangular becomes { re, im },
 * a real stays a number. `perLength`: the field holds data per that length unit (a typed "Ω/km" converts).
 */
export function parseComplex(text: string, perLength?: PerLengthUnit): ParseResult<ComplexInput> {
  const s = text.trim().replace(UNIT, '').replace(/−/g, '-').replace(/,(?=\d{3}\b)/g, '');
  if (s === '') return { ok: false, message: 'Enter a value, for example 0.8+j1.5 or 120∠-30.' };
  let m = RE_REAL.exec(s);
  if (m) return { ok: true, value: Number(m[1]) };
  m = RE_POLAR.exec(s);
  if (m) {
    const mag = Number(m[1]);
    if (mag < 0) return { ok: false, message: 'A magnitude cannot be negative; add 180° to the angle instead.' };
    return { ok: true, value: { mag, angleDeg: Number(m[2]) } };
  }
  const compact = s.replace(/\s+/g, '');
  m = RE_RECT.exec(compact);
  if (m && (m[2] !== undefined || m[1] === undefined)) {
    const re = m[1] !== undefined ? Number(m[1]) : 0;
    const imAbs = m[3] !== undefined ? Number(m[3]) : m[4] !== undefined ? Number(m[4]) : 1;
    const im = m[2] === '-' ? -imAbs : imAbs;
    return { ok: true, value: { re, im } };
  }
  return evaluateComplex(text, perLength);
}

function trim(x: number): string {
  if (x === 0) return '0';
  const a = Math.abs(x);
  if (a >= 1e6 || a < 1e-4) return x.toExponential(4).replace(/\.?0+e/, 'e');
  return String(Number(x.toPrecision(6)));
}

/** Writes a complex value back the way it is stored (polar stays polar). */
export function formatComplex(v: ComplexInput | undefined): string {
  if (v === undefined) return '';
  if (typeof v === 'number') return trim(v);
  if ('mag' in v) return `${trim(v.mag)}∠${trim(v.angleDeg)}`;
  const sign = v.im < 0 || Object.is(v.im, -0) ? '-' : '+';
  return `${trim(v.re)}${sign}j${trim(Math.abs(v.im))}`;
}
