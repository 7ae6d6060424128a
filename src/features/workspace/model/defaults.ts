/**
 * What the palette adds: each building block with sensible starting values (a 208Y/120 V world
 * unless the block says otherwise) and a fresh id. Values are starting points to edit, not data.
 */
import type { CircuitElementInput } from '../../../../shared/engine/index.ts';
import type { ShiftConvention } from './layout.ts';

export type PaletteItem =
  | { key: string; kind: 'bus'; name: string; hint: string }
  | { key: string; kind: 'element'; name: string; hint: string; prefix: string; sample: CircuitElementInput };

const UNWIRED = '?';

/** A new element of a palette item, with `id`; bus fields are placeholders until wired. */
export function newElement(item: Extract<PaletteItem, { kind: 'element' }>, id: string, convention: ShiftConvention): CircuitElementInput {
  const el = structuredClone(item.sample) as CircuitElementInput;
  el.id = id;
  if (el.type === 'transformer' && convention === 'iec') {
    delete el.connection;
    el.vectorGroup = 'Dyn1';
  }
  return el;
}

const perMetre = { re: 0.00054, im: 0.0003 };

export const PALETTE: PaletteItem[] = [
  { key: 'bus', kind: 'bus', name: 'Bus', hint: 'A bus with conductors A, B, C, N' },
  { key: 'source', kind: 'element', name: 'Source', prefix: 'SRC', hint: 'Three-phase source (wye, solidly earthed)', sample: { type: 'source', id: '', bus: UNWIRED, kvLL: 0.208, impedance: { ohms: { re: 0.004, im: 0.012 } } } },
  { key: 'splitPhaseSource', kind: 'element', name: 'Split-phase source', prefix: 'SPS', hint: '120/240 V service source', sample: { type: 'splitPhaseSource', id: '', bus: UNWIRED, voltsLN: 120 } },
  {
    key: 'line',
    kind: 'element',
    name: 'Line',
    prefix: 'LINE',
    hint: 'Line or cable (per-conductor impedance per length)',
    sample: { type: 'line', id: '', from: UNWIRED, to: UNWIRED, length: 30, lengthUnit: 'm', impedance: { kind: 'perConductor', ohmsPerLength: { a: perMetre, b: perMetre, c: perMetre, n: perMetre } } },
  },
  { key: 'transformer', kind: 'element', name: 'Transformer bank', prefix: 'TX', hint: 'Three-phase bank, 12.47 kV / 208Y/120 V', sample: { type: 'transformer', id: '', from: UNWIRED, to: UNWIRED, kva: 300, kvHigh: 12.47, kvLow: 0.208, connection: 'D-Yg', percentZ: 5, xOverR: 4 } },
  {
    key: 'splitPhaseTransformer',
    kind: 'element',
    name: 'Single-phase transformer',
    prefix: 'SPT',
    hint: 'Centre-tapped 120/240 V transformer; primary between two conductors',
    sample: { type: 'splitPhaseTransformer', id: '', from: UNWIRED, primary: ['a', 'n'], to: UNWIRED, kva: 25, kvHigh: 7.2, lowVolts: 240, percentR: 1.1, percentX: 1.6 },
  },
  { key: 'load', kind: 'element', name: 'Load', prefix: 'LOAD', hint: 'Three-phase wye load (kW, kvar per phase)', sample: { type: 'load', id: '', bus: UNWIRED, connection: 'wye', phases: { a: { kw: 10, kvar: 2 }, b: { kw: 10, kvar: 2 }, c: { kw: 10, kvar: 2 } } } },
  { key: 'singleLoad', kind: 'element', name: 'Single-phase load', prefix: 'LOAD', hint: 'Load between any two conductors', sample: { type: 'load', id: '', bus: UNWIRED, connection: 'single', between: ['a', 'n'], each: { kw: 1, kvar: 0 } } },
  { key: 'capacitorBank', kind: 'element', name: 'Capacitor bank', prefix: 'CAP', hint: 'Shunt capacitor bank (kvar at rated voltage)', sample: { type: 'capacitorBank', id: '', bus: UNWIRED, kvar: 30, connection: 'wye' } },
  { key: 'switch3', kind: 'element', name: 'Switch', prefix: 'SW', hint: 'Multi-conductor switch or bus tie', sample: { type: 'switch3', id: '', from: UNWIRED, to: UNWIRED, closed: true } },
  { key: 'earthing', kind: 'element', name: 'Earth electrode', prefix: 'ROD', hint: 'Electrode from one conductor to earth', sample: { type: 'earthing', id: '', node: `${UNWIRED}.n`, ohms: 25 } },
  { key: 'fault', kind: 'element', name: 'Fault', prefix: 'FLT', hint: 'Line-to-earth, line-to-line or three-phase fault', sample: { type: 'fault', id: '', bus: UNWIRED, kind: 'lineEarth', phases: ['a'] } },
];

/** The first `<prefix><n>` not in `taken`. */
export function freshId(prefix: string, taken: ReadonlySet<string>): string {
  for (let i = 1; ; i++) if (!taken.has(`${prefix}${i}`)) return `${prefix}${i}`;
}
