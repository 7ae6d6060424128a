/**
 * The editable fields of each element kind: what to show, in which unit, and where the value lives
 * in the engine element (a dotted path). Forms are built from these; the engine's own schema then
 * checks the whole element, so a rule lives in one place.
 */
import type { CircuitElementInput, ComplexInput } from '../../../../shared/engine/index.ts';
import type { Dimension } from './unit-input.ts';
import { LENGTH_WORDS, PER_LENGTH_WORDS, hasPerLengthData, lengthUnitOf, perLengthUnitOf, withLengthUnit, withPerLengthUnit, type LineInput } from '../model/line-units.ts';
import type { LengthUnit, PerLengthUnit } from '../../../../shared/engine/index.ts';

export type FieldSpec =
  | { kind: 'quantity'; path: string; label: string; dimension: Dimension; unit: string; optional?: boolean }
  | { kind: 'complex'; path: string; label: string; unit: string; optional?: boolean; perLength?: PerLengthUnit }
  | { kind: 'length'; path: 'length'; label: string }
  | { kind: 'phases'; path: string; label: string }
  | { kind: 'text'; path: string; label: string; optional?: boolean }
  | {
      kind: 'select';
      path: string;
      label: string;
      options: { value: string; label: string }[];
      choose?: (el: CircuitElementInput, value: string) => CircuitElementInput;
      /** The option in force, when it is not simply the value at `path`. */
      current?: (el: CircuitElementInput) => string;
    };

/** Form key of a path (react-hook-form treats dots as nesting). */
export function fieldKey(path: string): string {
  return path.replaceAll('.', '__');
}

/** Reads a dotted path. */
export function getPath(obj: unknown, path: string): unknown {
  let cur: unknown = obj;
  for (const k of path.split('.')) {
    if (cur === null || typeof cur !== 'object') return undefined;
    cur = (cur as Record<string, unknown>)[k];
  }
  return cur;
}

/** Writes a dotted path in place (creating objects on the way); `undefined` deletes the key and any object it leaves empty. */
export function setPath(obj: Record<string, unknown>, path: string, value: unknown): void {
  const keys = path.split('.');
  const last = keys[keys.length - 1];
  if (value === undefined) {
    const chain: Record<string, unknown>[] = [obj];
    for (const k of keys.slice(0, -1)) {
      const next = chain[chain.length - 1][k];
      if (next === null || typeof next !== 'object') return;
      chain.push(next as Record<string, unknown>);
    }
    delete chain[chain.length - 1][last];
    for (let i = chain.length - 1; i > 0; i--) {
      if (Object.keys(chain[i]).length > 0) break;
      delete chain[i - 1][keys[i - 1]];
    }
    return;
  }
  let cur = obj;
  for (const k of keys.slice(0, -1)) {
    if (cur[k] === null || typeof cur[k] !== 'object') cur[k] = {};
    cur = cur[k] as Record<string, unknown>;
  }
  cur[last] = value;
}

const THREE = ['a', 'b', 'c'] as const;
const DELTA = ['ab', 'bc', 'ca'] as const;

type LoadEl = Extract<CircuitElementInput, { type: 'load' }>;
type Spec = NonNullable<LoadEl['each']>;

/** A load with its values per branch written out (`each` for single-phase, `phases` otherwise). */
export function normaliseLoad(el: LoadEl): LoadEl {
  const out = structuredClone(el);
  if (el.connection === 'single') {
    const spec = el.each ?? Object.values(el.phases ?? {})[0] ?? el.total;
    delete out.phases;
    delete out.total;
    out.each = spec ?? { kw: 1, kvar: 0 };
    return out;
  }
  const keys = el.connection === 'delta' ? DELTA : THREE;
  const per = (k: string): Spec => {
    const p = (el.phases as Record<string, Spec> | undefined)?.[k];
    if (p) return p;
    if (el.each) return el.each;
    if (el.total && 'kw' in el.total) return { ...el.total, kw: el.total.kw / 3, kvar: (el.total.kvar ?? 0) / 3 };
    return { kw: 1, kvar: 0 };
  };
  delete out.each;
  delete out.total;
  out.phases = Object.fromEntries(keys.map((k) => [k, per(k)]));
  return out;
}

function loadMode(el: LoadEl): 'power' | 'impedance' | 'rlc' {
  const first = el.each ?? Object.values(el.phases ?? {})[0];
  if (!first) return 'power';
  if ('kw' in first) return 'power';
  if ('ohms' in first) return 'impedance';
  return 'rlc';
}

const LOAD_CONNECTIONS = [
  { value: 'wye', label: 'Wye (star on the neutral)' },
  { value: 'wyeFloating', label: 'Wye, floating star' },
  { value: 'delta', label: 'Delta' },
  { value: 'single', label: 'Single-phase (two conductors)' },
];

function branchWord(k: string): string {
  return k === 'each' ? '' : ` ${k.toUpperCase().split('').join('–')}`;
}

function loadFields(raw: LoadEl): FieldSpec[] {
  const el = normaliseLoad(raw);
  const fields: FieldSpec[] = [
    {
      kind: 'select',
      path: 'connection',
      label: 'Connection',
      options: LOAD_CONNECTIONS,
      choose: (cur, value) => {
        const l = { ...(cur as LoadEl), connection: value as LoadEl['connection'] };
        if (value === 'single') l.between = l.between ?? ['a', 'n'];
        else delete l.between;
        return normaliseLoad(l);
      },
    },
    {
      kind: 'select',
      path: '__mode',
      label: 'Given as',
      options: [
        { value: 'power', label: 'P and Q at rated voltage' },
        { value: 'impedance', label: 'Impedance (Ω)' },
      ],
      choose: (cur, value) => {
        const l = normaliseLoad(cur as LoadEl);
        const spec = (s: Spec): Spec => (value === 'power' ? ('kw' in s ? s : { kw: 1, kvar: 0 }) : 'ohms' in s ? s : { ohms: 14.4 });
        if (l.each) l.each = spec(l.each);
        if (l.phases) l.phases = Object.fromEntries(Object.entries(l.phases).map(([k, s]) => [k, spec(s as Spec)]));
        return l;
      },
    },
  ];
  fields.push({
    kind: 'select',
    path: 'generation',
    label: 'Role',
    options: [
      { value: 'load', label: 'Load (takes power)' },
      { value: 'generation', label: 'Generation (negative kW allowed)' },
    ],
    current: (cur) => ((cur as LoadEl).generation ? 'generation' : 'load'),
    choose: (cur, value) => {
      const l = { ...(cur as LoadEl) };
      if (value === 'generation') l.generation = true;
      else delete l.generation;
      return l;
    },
  });
  const mode = loadMode(el);
  const branches = el.connection === 'single' ? ['each'] : Object.keys(el.phases ?? {});
  for (const b of branches) {
    const base = b === 'each' ? 'each' : `phases.${b}`;
    if (mode === 'power') {
      fields.push({ kind: 'quantity', path: `${base}.kw`, label: `P${branchWord(b)}`, dimension: 'power', unit: 'kW' });
      fields.push({ kind: 'quantity', path: `${base}.kvar`, label: `Q${branchWord(b)}`, dimension: 'reactive', unit: 'kvar', optional: true });
    } else if (mode === 'impedance') {
      fields.push({ kind: 'complex', path: `${base}.ohms`, label: `Z${branchWord(b)}`, unit: 'Ω' });
    } else {
      fields.push({ kind: 'quantity', path: `${base}.rOhms`, label: `R${branchWord(b)}`, dimension: 'impedance', unit: 'Ω', optional: true });
    }
  }
  if (el.connection === 'single') fields.push({ kind: 'quantity', path: 'ratedVolts', label: 'Rated voltage', dimension: 'voltage', unit: 'V', optional: true });
  else fields.push({ kind: 'quantity', path: 'kvLL', label: 'Rated voltage (line to line)', dimension: 'voltage', unit: 'kV', optional: true });
  return fields;
}

function leakage(el: { percentZ?: number; xOverR?: number; percentR?: number; percentX?: number }): FieldSpec[] {
  if (el.percentZ !== undefined || el.xOverR !== undefined) {
    return [
      { kind: 'quantity', path: 'percentZ', label: 'Impedance', dimension: 'percent', unit: '%' },
      { kind: 'quantity', path: 'xOverR', label: 'X/R', dimension: 'ratio', unit: '' },
    ];
  }
  return [
    { kind: 'quantity', path: 'percentR', label: 'Resistance', dimension: 'percent', unit: '%' },
    { kind: 'quantity', path: 'percentX', label: 'Reactance', dimension: 'percent', unit: '%' },
  ];
}

/** A star point earthed through an impedance (`{ ohms }`), not "solid" or "unearthed". */
function isEarthingImpedance(v: unknown): v is { ohms: ComplexInput } {
  return v !== null && typeof v === 'object' && 'ohms' in v;
}

/**
 * Star-point earthing select: solid, unearthed or through an impedance. Choosing the impedance
 * starts from 5 Ω resistive (P: a low-resistance earthing value to be edited) and keeps an impedance
 * already given.
 */
function earthingSelect(path: string, label: string): Extract<FieldSpec, { kind: 'select' }> {
  return {
    kind: 'select',
    path,
    label,
    options: [
      { value: 'solid', label: 'Solid' },
      { value: 'unearthed', label: 'Unearthed' },
      { value: 'impedance', label: 'Through an impedance' },
    ],
    choose: (cur, value) => {
      const next = structuredClone(cur) as Record<string, unknown>;
      const was = getPath(cur, path);
      setPath(next, path, value === 'impedance' ? (isEarthingImpedance(was) ? was : { ohms: 5 }) : value);
      return next as CircuitElementInput;
    },
  };
}

const NA_CONNECTIONS = ['Yg-Yg', 'Y-Y', 'D-Yg', 'Yg-D', 'Y-D', 'D-D', 'D-Y', 'Yg-Y', 'Y-Yg'];

/** The fields of an element. */
export function elementFields(el: CircuitElementInput): FieldSpec[] {
  switch (el.type) {
    case 'source': {
      const f: FieldSpec[] = [
        { kind: 'quantity', path: 'kvLL', label: 'Nominal voltage (line to line)', dimension: 'voltage', unit: 'kV' },
        { kind: 'select', path: 'connection', label: 'Connection', options: [{ value: 'wye', label: 'Wye' }, { value: 'delta', label: 'Delta' }] },
        { kind: 'quantity', path: 'angleDeg', label: 'Angle of phase A EMF (°)', dimension: 'ratio', unit: '', optional: true },
      ];
      if ((el.connection ?? 'wye') === 'wye') {
        f.push(earthingSelect('earthing', 'Star-point earthing'));
        if (isEarthingImpedance(el.earthing)) f.push({ kind: 'complex', path: 'earthing.ohms', label: 'Star-point earthing impedance', unit: 'Ω' });
      }
      const imp = el.impedance;
      if (imp && 'z1' in imp) f.push({ kind: 'complex', path: 'impedance.z1', label: 'Z1 (positive sequence)', unit: 'Ω' }, { kind: 'complex', path: 'impedance.z0', label: 'Z0 (zero sequence)', unit: 'Ω', optional: true });
      else if (imp && 'shortCircuitMva' in imp)
        f.push(
          { kind: 'quantity', path: 'impedance.shortCircuitMva', label: 'Short-circuit level', dimension: 'apparent', unit: 'MVA' },
          { kind: 'quantity', path: 'impedance.xOverR', label: 'X/R', dimension: 'ratio', unit: '' },
          { kind: 'quantity', path: 'impedance.z0OverZ1', label: 'Z0/Z1', dimension: 'ratio', unit: '', optional: true },
        );
      else f.push({ kind: 'complex', path: 'impedance.ohms', label: 'Internal impedance per phase', unit: 'Ω', optional: true });
      return f;
    }
    case 'splitPhaseSource':
      return [
        { kind: 'quantity', path: 'voltsLN', label: 'Leg-to-neutral voltage', dimension: 'voltage', unit: 'V' },
        { kind: 'quantity', path: 'angleDeg', label: 'Angle (°)', dimension: 'ratio', unit: '', optional: true },
        { kind: 'complex', path: 'ohms', label: 'Internal impedance per leg', unit: 'Ω', optional: true },
      ];
    case 'line': {
      const per = perLengthUnitOf(el);
      const unit = PER_LENGTH_WORDS[per];
      const f: FieldSpec[] = [
        { kind: 'length', path: 'length', label: 'Length' },
        {
          kind: 'select',
          path: 'lengthUnit',
          label: 'Length unit',
          options: (Object.keys(LENGTH_WORDS) as LengthUnit[]).map((u) => ({ value: u, label: LENGTH_WORDS[u] })),
          current: (cur) => lengthUnitOf(cur as LineInput),
          choose: (cur, value) => withLengthUnit(cur as LineInput, value as LengthUnit),
        },
      ];
      if (hasPerLengthData(el))
        f.push({
          kind: 'select',
          path: 'perLengthUnit',
          label: 'Impedance data given',
          options: (Object.keys(PER_LENGTH_WORDS) as PerLengthUnit[]).map((u) => ({ value: u, label: PER_LENGTH_WORDS[u] })),
          current: (cur) => perLengthUnitOf(cur as LineInput),
          choose: (cur, value) => withPerLengthUnit(cur as LineInput, value as PerLengthUnit),
        });
      const imp = el.impedance;
      if (imp.kind === 'perConductor') {
        for (const c of Object.keys(imp.ohmsPerLength)) f.push({ kind: 'complex', path: `impedance.ohmsPerLength.${c}`, label: `Z ${c.toUpperCase()} ${unit}`, unit: 'Ω', perLength: per });
      } else if (imp.kind === 'sequence') {
        f.push(
          { kind: 'complex', path: 'impedance.z1PerLength', label: `Z1 ${unit}`, unit: 'Ω', perLength: per },
          { kind: 'complex', path: 'impedance.z0PerLength', label: `Z0 ${unit}`, unit: 'Ω', perLength: per },
          { kind: 'complex', path: 'impedance.neutralOhmsPerLength', label: `Z neutral ${unit}`, unit: 'Ω', optional: true, perLength: per },
        );
      }
      return f;
    }
    case 'transformer': {
      const f: FieldSpec[] = [
        { kind: 'quantity', path: 'kva', label: 'Rating (three-phase)', dimension: 'apparent', unit: 'kVA' },
        { kind: 'quantity', path: 'kvHigh', label: 'HV rated voltage (line to line)', dimension: 'voltage', unit: 'kV' },
        { kind: 'quantity', path: 'kvLow', label: 'LV rated voltage (line to line)', dimension: 'voltage', unit: 'kV' },
      ];
      if (el.connection !== undefined) f.push({ kind: 'select', path: 'connection', label: 'Connection (North American rule)', options: NA_CONNECTIONS.map((c) => ({ value: c, label: c })) });
      else f.push({ kind: 'text', path: 'vectorGroup', label: 'Vector group (IEC clock)' });
      // Off-load tap on the HV winding: the ratio changes by (1 + steps·step/100); + lowers the LV voltage.
      f.push(
        { kind: 'quantity', path: 'tap.steps', label: 'Tap position, HV winding (steps; + lowers LV)', dimension: 'ratio', unit: '', optional: true },
        { kind: 'quantity', path: 'tap.stepPercent', label: 'Tap step', dimension: 'percent', unit: '%', optional: true },
      );
      return [...f, ...leakage(el)];
    }
    case 'splitPhaseTransformer':
      return [
        { kind: 'quantity', path: 'kva', label: 'Rating', dimension: 'apparent', unit: 'kVA' },
        { kind: 'quantity', path: 'kvHigh', label: 'Primary winding voltage', dimension: 'voltage', unit: 'kV' },
        { kind: 'quantity', path: 'lowVolts', label: 'Secondary voltage (leg to leg)', dimension: 'voltage', unit: 'V' },
        ...leakage(el),
      ];
    case 'load':
      return loadFields(el);
    case 'capacitorBank':
      return [
        { kind: 'quantity', path: 'kvar', label: 'Rating (three-phase)', dimension: 'reactive', unit: 'kvar' },
        { kind: 'quantity', path: 'kvLL', label: 'Rated voltage (line to line)', dimension: 'voltage', unit: 'kV', optional: true },
        { kind: 'select', path: 'connection', label: 'Connection', options: [{ value: 'wye', label: 'Wye' }, { value: 'wyeFloating', label: 'Wye, floating star' }, { value: 'delta', label: 'Delta' }] },
      ];
    case 'switch3':
      return [
        {
          kind: 'select',
          path: 'closed',
          label: 'State',
          options: [{ value: 'true', label: 'Closed' }, { value: 'false', label: 'Open' }],
          choose: (cur, value) => ({ ...cur, closed: value === 'true' }) as CircuitElementInput,
        },
      ];
    case 'earthing':
      return [{ kind: 'complex', path: 'ohms', label: 'Electrode resistance', unit: 'Ω' }];
    case 'fault':
      return [
        {
          kind: 'select',
          path: 'kind',
          label: 'Kind',
          options: [
            { value: 'lineEarth', label: 'Line to earth' },
            { value: 'lineLine', label: 'Line to line' },
            { value: 'doubleLineEarth', label: 'Double line to earth' },
            { value: 'threePhase', label: 'Three-phase' },
            { value: 'threePhaseEarth', label: 'Three-phase to earth' },
          ],
          choose: (cur, value) => {
            const f = { ...cur, kind: value } as Record<string, unknown>;
            delete f.phases;
            return f as CircuitElementInput;
          },
        },
        { kind: 'phases', path: 'phases', label: 'Faulted phases (e.g. a or b, c)' },
        { kind: 'complex', path: 'ohms', label: 'Fault impedance per phase', unit: 'Ω', optional: true },
        { kind: 'complex', path: 'earthOhms', label: 'Impedance to earth', unit: 'Ω', optional: true },
      ];
    default:
      return [];
  }
}

/** The current value of a select field as its option value. */
export function selectValue(el: CircuitElementInput, f: Extract<FieldSpec, { kind: 'select' }>): string {
  if (f.path === '__mode') {
    const l = normaliseLoad(el as LoadEl);
    return loadMode(l) === 'impedance' ? 'impedance' : 'power';
  }
  if (f.current) return f.current(el);
  const v = getPath(el, f.path);
  if (isEarthingImpedance(v) && f.options.some((o) => o.value === 'impedance')) return 'impedance';
  if (f.path === 'closed') return v === false ? 'false' : 'true';
  if (v === undefined) return f.options[0]?.value ?? '';
  return typeof v === 'string' ? v : f.options[0]?.value ?? '';
}

export type { ComplexInput };
