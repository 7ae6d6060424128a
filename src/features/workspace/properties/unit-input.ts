/**
 * Quantities with units as people type them: "13.8 kV", "13800 V", "4 kW", "1.2 MVA", "5 %",
 * "30 m", "0.5 mile". Each field has a dimension and a base unit; the typed unit (or the base unit
 * when none is typed) converts to the base unit. A unit of another dimension is refused by name.
 */
import type { ParseResult } from './complex-input.ts';

export type Dimension = 'voltage' | 'power' | 'reactive' | 'apparent' | 'impedance' | 'percent' | 'length' | 'frequency' | 'ratio';

/** Units per dimension, as factors to the SI-ish unit of the dimension (V, W, var, VA, Ω, %, m, Hz). */
const UNITS: Record<Dimension, Record<string, number>> = {
  voltage: { v: 1, kv: 1e3, mv: 1e6 },
  power: { w: 1, kw: 1e3, mw: 1e6 },
  reactive: { var: 1, kvar: 1e3, mvar: 1e6 },
  apparent: { va: 1, kva: 1e3, mva: 1e6 },
  impedance: { 'ω': 1, ohm: 1, ohms: 1, 'mω': 1e-3, 'kω': 1e3 },
  percent: { '%': 1 },
  length: { m: 1, km: 1e3, ft: 0.3048, mi: 1609.344, mile: 1609.344, miles: 1609.344 },
  frequency: { hz: 1 },
  ratio: { '': 1 },
};

// MV is ambiguous (megavolt vs a typo of mV); for voltage the only sensible reading is megavolt.
const ALIASES: Record<string, string> = { 'Ω': 'ω', 'kΩ': 'kω', 'mΩ': 'mω', 'MΩ': 'mω' };

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

/** Parses `text` in `dimension`, returning the value in `baseUnit` (one of the dimension's units). */
export function parseQuantity(text: string, dimension: Dimension, baseUnit: string): ParseResult<number> {
  const s = text.trim().replace(/−/g, '-').replace(/,(?=\d{3}\b)/g, '');
  if (s === '') return { ok: false, message: `Enter a value in ${UNIT_HINT[dimension]}.` };
  const m = RE.exec(s);
  if (!m) return { ok: false, message: `“${text.trim()}” is not a number with a unit (${UNIT_HINT[dimension]}).` };
  const value = Number(m[1]);
  const typed = m[2] === '' ? baseUnit : m[2];
  const key = (ALIASES[typed] ?? typed).toLowerCase();
  const table = UNITS[dimension];
  const baseKey = (ALIASES[baseUnit] ?? baseUnit).toLowerCase();
  if (!(key in table)) return { ok: false, message: `“${m[2]}” is not a unit of ${dimension === 'ratio' ? 'this field' : dimension}; use ${UNIT_HINT[dimension]}.` };
  return { ok: true, value: (value * table[key]) / table[baseKey] };
}

/** Parses a length and keeps the unit typed (the engine stores length and unit together): "30 m" → 30, "m". */
export function parseLength(text: string, defaultUnit: 'km' | 'm' | 'mi' | 'ft'): ParseResult<{ length: number; unit: 'km' | 'm' | 'mi' | 'ft' }> {
  const s = text.trim().toLowerCase();
  const m = /^([+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:e[+-]?\d+)?)\s*(km|m|mi|miles?|ft|feet)?$/.exec(s);
  if (!m) return { ok: false, message: `“${text.trim()}” is not a length; write e.g. 30 m, 0.8 km, 1.2 mile or 150 ft.` };
  const unit = m[2] === undefined ? defaultUnit : m[2].startsWith('mi') ? 'mi' : m[2] === 'feet' ? 'ft' : (m[2] as 'km' | 'm' | 'ft');
  return { ok: true, value: { length: Number(m[1]), unit } };
}

/** Writes a value in its base unit for an input ("0.208 kV"). */
export function formatQuantity(value: number | undefined, unit: string): string {
  if (value === undefined || !Number.isFinite(value)) return '';
  return `${Number(value.toPrecision(6))}${unit === '%' ? ' %' : unit ? ` ${unit}` : ''}`;
}
