/**
 * Quantities with units as people type them: "13.8 kV", "13800 V", "4 kW", "1.2 MVA", "5 %",
 * "30 m", "0.5 mile". Each field has a dimension and a base unit; the typed unit (or the base unit
 * when none is typed) converts to the base unit. A unit of another dimension is refused by name.
 */
import type { ParseResult } from './complex-input.ts';
import { evaluateQuantity, normalise } from './expression.ts';

export type Dimension = 'voltage' | 'power' | 'reactive' | 'apparent' | 'impedance' | 'percent' | 'length' | 'frequency' | 'ratio';

/**
 * Units per dimension, as factors to the SI-ish unit of the dimension (V, W, var, VA, Ω, %, m, Hz).
 * Keys are case-sensitive: m is milli and M mega (MΩ is a megaohm, mW a milliwatt).
 */
const UNITS: Record<Dimension, Record<string, number>> = {
  voltage: { V: 1, kV: 1e3, MV: 1e6 },
  power: { W: 1, kW: 1e3, MW: 1e6 },
  reactive: { var: 1, kvar: 1e3, Mvar: 1e6 },
  apparent: { VA: 1, kVA: 1e3, MVA: 1e6 },
  impedance: { 'Ω': 1, ohm: 1, ohms: 1, 'mΩ': 1e-3, 'kΩ': 1e3, 'MΩ': 1e6, mohm: 1e-3, kohm: 1e3, Mohm: 1e6 },
  percent: { '%': 1 },
  length: { m: 1, km: 1e3, ft: 0.3048, mi: 1609.344, mile: 1609.344, miles: 1609.344 },
  frequency: { Hz: 1 },
  ratio: { '': 1 },
};

/**
 * The unit typed, found in `table`: exactly, or ignoring case when that names one unit and does
 * not turn a lower-case m (milli) into M (mega). "kv" is kV; "mw" in a power field is refused.
 */
function findUnit(table: Record<string, number>, typed: string): { key: string } | { ambiguous: string } | null {
  if (typed in table) return { key: typed };
  const matches = Object.keys(table).filter((k) => k.toLowerCase() === typed.toLowerCase());
  if (matches.length !== 1) return null;
  const key = matches[0];
  if (typed.startsWith('m') && key.startsWith('M')) return { ambiguous: key };
  return { key };
}

/** Display names of the units of each dimension, for hints. */
export const UNIT_HINT: Record<Dimension, string> = {
  voltage: 'V or kV',
  power: 'W, kW or MW',
  reactive: 'var, kvar or Mvar',
  apparent: 'VA, kVA or MVA',
  impedance: 'Ω or mΩ',
  percent: '%',
  length: 'm, km, ft or mile',
  frequency: 'Hz',
  ratio: 'a plain number',
};

const RE = /^([+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?)\s*([A-Za-zΩω%]*)$/;

/**
 * Parses `text` in `dimension`, returning the value in `baseUnit` (one of the dimension's units).
 * A number with a unit is read directly; anything else ("208/sqrt(3)", "2 * 13.8 kV") is evaluated
 * as a unit-aware expression.
 */
export function parseQuantity(text: string, dimension: Dimension, baseUnit: string): ParseResult<number> {
  const s = text.trim().replace(/−/g, '-').replace(/,(?=\d{3}\b)/g, '');
  if (s === '') return { ok: false, message: `Enter a value in ${UNIT_HINT[dimension]}.` };
  const m = RE.exec(s);
  if (!m) return evaluateQuantity(text, baseUnit, UNIT_HINT[dimension]);
  const value = Number(m[1]);
  const table = UNITS[dimension];
  const found = findUnit(table, m[2] === '' ? baseUnit : m[2]);
  if (found && 'ambiguous' in found) return { ok: false, message: `“${m[2]}” would be milli-; write ${found.ambiguous} if you mean mega-.` };
  if (!found) return { ok: false, message: `“${m[2]}” is not a unit of ${dimension === 'ratio' ? 'this field' : dimension}; use ${UNIT_HINT[dimension]}.` };
  return { ok: true, value: (value * table[found.key]) / table[baseUnit] };
}

/** Parses a length and keeps the unit typed (the engine stores length and unit together): "30 m" → 30, "m". */
export function parseLength(text: string, defaultUnit: 'km' | 'm' | 'mi' | 'ft'): ParseResult<{ length: number; unit: 'km' | 'm' | 'mi' | 'ft' }> {
  const s = text.trim().toLowerCase();
  const m = /^([+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:e[+-]?\d+)?)\s*(km|m|mi|miles?|ft|feet)?$/.exec(s);
  if (!m) {
    // An expression ("0.5 mi + 200 m", "2*400 m"): its value in the unit it ends with, else the line's unit.
    const unit = (/(km|mi|ft|m)\s*$/.exec(normalise(text))?.[1] as 'km' | 'm' | 'mi' | 'ft' | undefined) ?? defaultUnit;
    const r = evaluateQuantity(text, unit, 'a length in m, km, ft or mile');
    if (!r.ok) return { ok: false, message: `“${text.trim()}” is not a length; write e.g. 30 m, 0.8 km, 1.2 mile or 150 ft.` };
    return { ok: true, value: { length: r.value, unit } };
  }
  const unit = m[2] === undefined ? defaultUnit : m[2].startsWith('mi') ? 'mi' : m[2] === 'feet' ? 'ft' : (m[2] as 'km' | 'm' | 'ft');
  return { ok: true, value: { length: Number(m[1]), unit } };
}

/** Writes a value in its base unit for an input ("0.208 kV"). */
export function formatQuantity(value: number | undefined, unit: string): string {
  if (value === undefined || !Number.isFinite(value)) return '';
  return `${Number(value.toPrecision(6))}${unit === '%' ? ' %' : unit ? ` ${unit}` : ''}`;
}
