/**
 * A content summary of a study's circuit (wyeward-circuit JSON): what it holds, without solving it.
 * Pure and defensive: the circuit arrives as stored JSON, so every field is checked before use,
 * and anything the summary cannot read is reported in `problems` instead of throwing.
 *
 * How buses and voltages are found (the circuit format names buses and ratings on its elements):
 * - a field named `bus`, or ending in `Bus`, holds a bus name; `buses` / `…Buses` hold lists of them;
 * - `from`, `to`, `plus`, `minus` and `nodes` hold node names; a conductor node `B1.a` belongs to bus `B1`;
 * - a circuit-level `buses` list of objects contributes each entry's `id` or `name`;
 * - a numeric field whose name contains `kV` (but not `kVA`/`kvar`) is a voltage in kilovolts, and one
 *   ending in `Volts`/`volts` a voltage in volts; both become the distinct nominal voltages, in volts.
 * The reference node `earth` is not a bus.
 *
 * It speaks of what the user drew: the hidden switch behind an opened connection is not counted,
 * an element's private terminal bus counts as the bus it was drawn on, and types read in words
 * ("transformer bank", "switch") as in the palette (shared/review/user-names.ts).
 */
import { circuitNames, isPrivateName, typeWord } from '../../../../shared/review/user-names.ts';

/** The numbers a study page shows about its circuit. */
export interface ContentSummary {
  /** System frequency in Hz, or null when missing or invalid. */
  frequencyHz: number | null;
  /** Number of elements drawn (hidden switches of opened connections are not elements). */
  elementCount: number;
  /** Element counts by type in words, most frequent first, ties by name. */
  byType: { type: string; count: number }[];
  /** Distinct bus names, in natural order (B2 before B10). */
  buses: string[];
  /** Distinct nominal voltages named in the circuit, in volts, ascending. */
  nominalVolts: number[];
  /** Phase rotation the circuit states (`sequence`); null when it states none (the format's default is ABC). */
  sequence: 'ABC' | 'ACB' | null;
  /** Limit set named in the circuit's `limits.set`, or null. */
  limitSet: string | null;
  /** What could not be read, in plain words. */
  problems: string[];
}

const EARTH = 'earth';
const NODE_KEYS = new Set(['from', 'to', 'plus', 'minus', 'nodes']);
/** Nested objects deeper than this are not searched (ratings sit on the element or one level down). */
const MAX_DEPTH = 3;

function isRecord(v: unknown): v is Record<string, unknown> {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}

function strings(v: unknown): string[] {
  if (typeof v === 'string') return [v];
  if (Array.isArray(v)) return v.filter((x): x is string => typeof x === 'string');
  return [];
}

/** Bus of a node name: the part before the last dot for a conductor node (`B1.a` → `B1`), else the name. */
export function busOfNode(node: string): string {
  const dot = node.lastIndexOf('.');
  return dot > 0 ? node.slice(0, dot) : node;
}

function isBusKey(key: string): boolean {
  return key === 'bus' || key === 'buses' || /[a-z0-9]Bus(es)?$/.test(key);
}

/** Voltage in volts carried by a numeric field, judged by its name; null when the field is not a voltage. */
function voltsOfField(key: string, value: number): number | null {
  if (!Number.isFinite(value) || value <= 0) return null;
  const k = key.toLowerCase();
  if (/kv(?!a)/.test(k)) return value * 1000; // kV, kvLL, hvKv … but not kVA / kvar
  if (/volts(ll|ln)?$/.test(k)) return value;
  return null;
}

function walk(value: unknown, depth: number, buses: Set<string>, volts: Set<number>, drawn: (bus: string) => string = (b) => b): void {
  if (depth > MAX_DEPTH) return;
  if (Array.isArray(value)) {
    for (const item of value) if (isRecord(item)) walk(item, depth + 1, buses, volts, drawn);
    return;
  }
  if (!isRecord(value)) return;
  for (const [key, v] of Object.entries(value)) {
    if (isBusKey(key)) {
      for (const name of strings(v)) buses.add(drawn(name));
    } else if (NODE_KEYS.has(key) || key === 'node') {
      for (const node of strings(v)) buses.add(drawn(busOfNode(node)));
    } else if (typeof v === 'number') {
      const vv = voltsOfField(key, v);
      // Round to the millivolt so 0.208 kV and 208 V are one value despite float noise.
      if (vv !== null) volts.add(Math.round(vv * 1000) / 1000);
    } else if (typeof v === 'object' && v !== null) {
      walk(v, depth + 1, buses, volts, drawn);
    }
  }
}

const natural = new Intl.Collator('en', { numeric: true, sensitivity: 'base' });

/** Summarises a circuit: element counts by type, buses, nominal voltages (V) and frequency (Hz). */
export function summarizeCircuit(circuit: unknown): ContentSummary {
  const problems: string[] = [];
  if (!isRecord(circuit)) {
    return { frequencyHz: null, elementCount: 0, byType: [], buses: [], nominalVolts: [], sequence: null, limitSet: null, problems: ['The study holds no circuit object.'] };
  }

  let frequencyHz: number | null = null;
  if (typeof circuit.frequencyHz === 'number' && Number.isFinite(circuit.frequencyHz) && circuit.frequencyHz > 0) {
    frequencyHz = circuit.frequencyHz;
  } else {
    problems.push('The circuit has no valid frequency.');
  }

  const elements = Array.isArray(circuit.elements) ? circuit.elements : null;
  if (!elements) problems.push('The circuit has no element list.');

  const names = circuitNames(circuit);
  const counts = new Map<string, number>();
  const buses = new Set<string>();
  const volts = new Set<number>();
  let unreadable = 0;
  let drawnCount = 0;
  for (const element of elements ?? []) {
    if (!isRecord(element)) {
      unreadable += 1;
      continue;
    }
    if (typeof element.id === 'string' && isPrivateName(element.id)) continue;
    drawnCount += 1;
    const type = typeof element.type === 'string' && element.type !== '' ? typeWord(element.type) : 'untyped';
    counts.set(type, (counts.get(type) ?? 0) + 1);
    walk(element, 0, buses, volts, names.drawnBus);
  }
  if (unreadable > 0) problems.push(`${unreadable} element${unreadable === 1 ? ' is' : 's are'} not objects and were skipped.`);

  if (Array.isArray(circuit.buses)) {
    for (const bus of circuit.buses) {
      if (typeof bus === 'string') buses.add(bus);
      else if (isRecord(bus)) {
        const name = typeof bus.id === 'string' ? bus.id : typeof bus.name === 'string' ? bus.name : null;
        if (name) buses.add(name);
        walk(bus, 1, buses, volts);
      }
    }
  }
  buses.delete(EARTH);
  buses.delete('');

  const byType = [...counts.entries()]
    .map(([type, count]) => ({ type, count }))
    .sort((a, b) => b.count - a.count || natural.compare(a.type, b.type));

  const sequence = circuit.sequence === 'ABC' || circuit.sequence === 'ACB' ? circuit.sequence : null;
  const limitSet = isRecord(circuit.limits) && typeof circuit.limits.set === 'string' ? circuit.limits.set : null;

  return {
    frequencyHz,
    elementCount: drawnCount + unreadable,
    byType,
    buses: [...buses].sort(natural.compare),
    nominalVolts: [...volts].sort((a, b) => a - b),
    sequence,
    limitSet,
    problems,
  };
}
