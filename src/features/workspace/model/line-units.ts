/**
 * A line's two units, kept independent: the unit of its length and the unit its per-length data
 * are given per. Changing the length unit converts the length (800 m ↔ 0.8 km ↔ 2624.67 ft) and
 * never reinterprets the per-length data; changing the per-length unit converts the per-length
 * values (0.19 Ω/km ↔ 0.00019 Ω/m). Pure functions over the engine's line element.
 */
import { METRES_PER, type CircuitElementInput, type ComplexInput, type LengthUnit, type PerLengthUnit } from '../../../../shared/engine/index.ts';

export type LineInput = Extract<CircuitElementInput, { type: 'line' }>;

/** Words for each per-length unit, as the form offers them. */
export const PER_LENGTH_WORDS: Record<PerLengthUnit, string> = { km: 'per km', m: 'per m', mi: 'per mile', ft: 'per ft', kft: 'per 1000 ft' };
/** Words for each length unit. */
export const LENGTH_WORDS: Record<LengthUnit, string> = { km: 'km', m: 'm', mi: 'mile', ft: 'ft' };

/** The unit the line's length is in (the format's default is km). */
export function lengthUnitOf(line: LineInput): LengthUnit {
  return line.lengthUnit ?? 'km';
}

/** The unit the line's per-length data are given per (the format's default is the length unit). */
export function perLengthUnitOf(line: LineInput): PerLengthUnit {
  return line.perLengthUnit ?? lengthUnitOf(line);
}

/** True when the line's impedance data are per-length values in `perLengthUnit` (Carson data have their own units). */
export function hasPerLengthData(line: LineInput): boolean {
  return line.impedance.kind !== 'carson' || line.shunt !== undefined;
}

/** A complex value times a positive real, in the same form it was given. */
export function scaleComplex(v: ComplexInput, k: number): ComplexInput {
  if (typeof v === 'number') return v * k;
  if ('re' in v) return { re: v.re * k, im: v.im * k };
  return { mag: v.mag * k, angleDeg: v.angleDeg };
}

/**
 * The line with its length given in `unit`: the value is converted, and the per-length data keep
 * their unit (written out, so the file no longer depends on the length unit to mean it).
 */
export function withLengthUnit(line: LineInput, unit: LengthUnit): LineInput {
  const from = lengthUnitOf(line);
  if (from === unit) return line;
  return { ...line, length: (line.length * METRES_PER[from]) / METRES_PER[unit], lengthUnit: unit, perLengthUnit: perLengthUnitOf(line) };
}

/** The line with a new length typed in `unit` (the per-length data keep their unit). */
export function withLength(line: LineInput, length: number, unit: LengthUnit): LineInput {
  const per = perLengthUnitOf(line);
  return { ...line, length, lengthUnit: unit, perLengthUnit: per };
}

/** The line with its per-length data given per `unit`: every per-length value converts (Ω/km → Ω/m divides by 1000). */
export function withPerLengthUnit(line: LineInput, unit: PerLengthUnit): LineInput {
  const from = perLengthUnitOf(line);
  if (from === unit) return line;
  // Ω per `from` → Ω per `unit`: times (metres per `unit`) / (metres per `from`).
  const k = METRES_PER[unit] / METRES_PER[from];
  const s = (v: ComplexInput) => scaleComplex(v, k);
  const imp = line.impedance;
  let impedance: LineInput['impedance'];
  switch (imp.kind) {
    case 'perConductor':
      impedance = { ...imp, ohmsPerLength: Object.fromEntries(Object.entries(imp.ohmsPerLength).map(([c, v]) => [c, s(v as ComplexInput)])) };
      break;
    case 'matrix':
      impedance = { ...imp, ohmsPerLength: imp.ohmsPerLength.map((r) => r.map(s)) };
      break;
    case 'sequence':
      impedance = { ...imp, z1PerLength: s(imp.z1PerLength), z0PerLength: s(imp.z0PerLength), ...(imp.neutralOhmsPerLength !== undefined ? { neutralOhmsPerLength: s(imp.neutralOhmsPerLength) } : {}) };
      break;
    case 'carson':
      impedance = imp;
      break;
  }
  return { ...line, impedance, ...(line.shunt ? { shunt: { siemensPerLength: line.shunt.siemensPerLength.map((r) => r.map(s)) } } : {}), perLengthUnit: unit };
}
