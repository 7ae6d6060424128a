/**
 * Unit-aware expressions typed into numeric and complex fields: "208/sqrt(3)", "1500 ft",
 * "13.8 kV / 2", "0.19 ohm/km", "120∠-30", "(0.19+j0.38) Ω/km". mathjs evaluates the arithmetic and
 * the units (case-sensitive, so mW is milli and MW mega); complex.js carries complex results. Both
 * are loaded with the workspace chunk only (the studies list never imports this file).
 */
import Complex from 'complex.js';
import {
  absDependencies,
  addDependencies,
  complexDependencies,
  cosDependencies,
  create,
  createUnitDependencies,
  divideDependencies,
  eDependencies,
  evaluateDependencies,
  expDependencies,
  iDependencies,
  log10Dependencies,
  logDependencies,
  multiplyDependencies,
  piDependencies,
  powDependencies,
  sinDependencies,
  sqrtDependencies,
  subtractDependencies,
  tanDependencies,
  unaryMinusDependencies,
  unaryPlusDependencies,
  unitDependencies,
  type Unit,
} from 'mathjs';
import { METRES_PER, type ComplexInput, type PerLengthUnit } from '../../../../shared/engine/index.ts';

export type ParseResult<T> = { ok: true; value: T } | { ok: false; message: string };

// Only what an input needs (named, so the bundler leaves the rest of mathjs out of the workspace chunk).
const math = create({
  evaluateDependencies,
  unitDependencies,
  createUnitDependencies,
  sqrtDependencies,
  addDependencies,
  subtractDependencies,
  multiplyDependencies,
  divideDependencies,
  powDependencies,
  unaryMinusDependencies,
  unaryPlusDependencies,
  piDependencies,
  eDependencies,
  iDependencies,
  complexDependencies,
  cosDependencies,
  sinDependencies,
  tanDependencies,
  absDependencies,
  expDependencies,
  logDependencies,
  log10Dependencies,
});
math.createUnit('kft', '1000 ft');

/** Typed forms people use that mathjs spells otherwise. */
export function normalise(text: string): string {
  return text
    .trim()
    .replace(/[−–]/g, '-')
    .replace(/×/g, '*')
    .replace(/÷/g, '/')
    .replace(/√\s*\(/g, 'sqrt(')
    .replace(/√\s*([\d.]+)/g, 'sqrt($1)')
    .replace(/,(?=\d{3}\b)/g, '')
    .replace(/Ω/g, 'ohm')
    .replace(/\bohms\b/g, 'ohm')
    .replace(/\bvar\b/g, 'VAR')
    .replace(/([kM])var\b/g, '$1VAR')
    .replace(/\bmiles?\b/g, 'mi')
    .replace(/\b1000\s*ft\b/g, 'kft');
}

/** The value of an expression: a real number, a complex number, or a quantity with a unit. */
function evaluate(expr: string): { kind: 'number'; value: number } | { kind: 'complex'; value: Complex } | { kind: 'unit'; value: Unit } | { kind: 'error'; message: string } {
  try {
    const r = math.evaluate(expr) as unknown;
    if (typeof r === 'number') return Number.isFinite(r) ? { kind: 'number', value: r } : { kind: 'error', message: 'the result is not a finite number' };
    if (r instanceof Complex || (r !== null && typeof r === 'object' && 're' in r && 'im' in r && !('units' in r))) {
      const c = new Complex(r as Complex);
      return c.im === 0 ? { kind: 'number', value: c.re } : { kind: 'complex', value: c };
    }
    if (r !== null && typeof r === 'object' && (r as Unit).units) return { kind: 'unit', value: r as Unit };
    return { kind: 'error', message: 'not a number' };
  } catch (e) {
    return { kind: 'error', message: e instanceof Error ? e.message : String(e) };
  }
}

/** mathjs spelling of each base unit a numeric field stores. */
const MATH_UNIT: Record<string, string> = { V: 'V', kV: 'kV', W: 'W', kW: 'kW', var: 'VAR', kvar: 'kVAR', VA: 'VA', kVA: 'kVA', MVA: 'MVA', 'Ω': 'ohm', m: 'm', km: 'km', mi: 'mi', ft: 'ft', Hz: 'Hz' };
const DIMENSION_WORDS: [string, string][] = [
  ['V', 'a voltage'],
  ['W', 'a real power'],
  ['VAR', 'a reactive power'],
  ['VA', 'an apparent power'],
  ['ohm', 'an impedance'],
  ['m', 'a length'],
  ['Hz', 'a frequency'],
  ['ohm/m', 'an impedance per length'],
];

function dimensionWords(u: Unit): string {
  for (const [unit, words] of DIMENSION_WORDS) if (u.equalBase(math.unit(1, unit))) return words;
  return 'a quantity of another kind';
}

/**
 * A numeric expression in `baseUnit` (one of the field's units, or '' for a plain number, '%' for
 * a percentage): a plain number is in the base unit; a quantity converts to it; a quantity of
 * another kind is refused by name.
 */
export function evaluateQuantity(text: string, baseUnit: string, hint: string): ParseResult<number> {
  let s = normalise(text);
  if (baseUnit === '%') s = s.replace(/\s*%\s*$/, '');
  const r = evaluate(s);
  if (r.kind === 'error') return { ok: false, message: `“${text.trim()}” is not a number or an expression with units (${hint}), e.g. 208/sqrt(3) or 13.8 kV.` };
  if (r.kind === 'complex') return { ok: false, message: `“${text.trim()}” is a complex value; this field takes a real number (${hint}).` };
  if (r.kind === 'number') return { ok: true, value: r.value };
  const target = MATH_UNIT[baseUnit];
  const unit = r.value;
  if (!target) return { ok: false, message: `This field takes a plain number; “${text.trim()}” carries a unit.` };
  if (!unit.equalBase(math.unit(1, target))) return { ok: false, message: `“${text.trim()}” is ${dimensionWords(unit)}; this field takes ${hint}.` };
  const v = unit.toNumber(target);
  return Number.isFinite(v) ? { ok: true, value: v } : { ok: false, message: `“${text.trim()}” is not a finite value.` };
}

/** Rectangular j-notation in mathjs's i-notation: "0.19+j0.38" → "0.19+0.38i", "3-4j" → "3-4i", "j" → "i". */
function jToI(s: string): string {
  return s
    .replace(/(^|[^A-Za-z_])j\s*((?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?)/g, '$1$2i')
    .replace(/((?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?)\s*j\b/g, '$1i')
    .replace(/(^|[^A-Za-z_])j\b/g, '$1i');
}

const LENGTHS = ['kft', 'km', 'mi', 'ft', 'm'] as const;

/**
 * A complex impedance expression, in Ω (or Ω per `perLength` for per-length data): rectangular
 * "0.19+j0.38", polar "120∠-30" (each side may be an expression), an expression "208/sqrt(3)", with an
 * optional impedance unit "Ω", "mΩ", "ohm", and for per-length data "Ω/km", "ohm/mi", "Ω/1000 ft"
 * (converted to the field's own length unit). Polar stays polar, a real stays a number.
 */
export function evaluateComplex(text: string, perLength?: PerLengthUnit): ParseResult<ComplexInput> {
  const raw = text.trim();
  let s = normalise(raw);
  // A trailing impedance unit, with a length for per-length data.
  let factor = 1;
  const u = /\s*\(?\s*\b([kmM]?ohm)\s*(?:\/\s*(kft|km|mi|ft|m)\b)?\s*\)?\s*$/.exec(s);
  if (u && u.index > 0) {
    factor = { ohm: 1, mohm: 1e-3, kohm: 1e3, Mohm: 1e6 }[u[1]] ?? 1;
    const per = u[2] as (typeof LENGTHS)[number] | undefined;
    if (per) {
      if (!perLength) return { ok: false, message: `“${raw}” is an impedance per length; this field takes an impedance (Ω).` };
      factor *= METRES_PER[perLength] / METRES_PER[per];
    }
    s = s.slice(0, u.index).trim();
  } else if (/\b(?:[kmM]?V|A|W|VA|VAR)\s*$/.test(s)) {
    return { ok: false, message: `“${raw}” is not an impedance; write it in Ω (e.g. 0.8+j1.5 or 0.19+j0.38 Ω${perLength ? '/km' : ''}).` };
  }
  if (s === '') return { ok: false, message: 'Enter a value, for example 0.8+j1.5 or 120∠-30.' };
  const polar = /^(.+?)\s*(?:∠|@|\/_)\s*(.+?)\s*°?$/.exec(s);
  if (polar) {
    const mag = evaluate(polar[1]);
    const ang = evaluate(polar[2]);
    if (mag.kind !== 'number' || ang.kind !== 'number') return { ok: false, message: `“${raw}” is not magnitude∠angle in degrees (e.g. 120∠-30).` };
    if (mag.value < 0) return { ok: false, message: 'A magnitude cannot be negative; add 180° to the angle instead.' };
    return { ok: true, value: { mag: mag.value * factor, angleDeg: ang.value } };
  }
  // "3+4" in a complex field is far likelier a forgotten j than the number 7.
  if (/^[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?\s*[+-]\s*(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?$/.test(s))
    return { ok: false, message: `“${raw}” has no j: write the reactance with j (e.g. 3+j4), or the sum as one number.` };
  const r = evaluate(jToI(s));
  if (r.kind === 'number') return { ok: true, value: r.value * factor };
  if (r.kind === 'complex') return { ok: true, value: { re: r.value.re * factor, im: r.value.im * factor } };
  return { ok: false, message: `“${raw}” is not a complex value. Write it as R+jX (e.g. 0.8+j1.5, 3-j4) or magnitude∠angle in degrees (e.g. 120∠-30 or 120@-30), optionally with Ω${perLength ? ' or Ω/km' : ''}.` };
}
