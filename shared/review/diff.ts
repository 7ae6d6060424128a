/**
 * The comparison of two revisions a reviewer reads first: elements added, removed and changed
 * (parameter by parameter), circuit-level changes, and the change in key results with units
 * ("neutral current at HOUSE (DROP): 12.1 A → 83.3 A"), flags added and removed.
 * Pure TypeScript (no Node or DOM APIs): used by the server and the browser alike.
 */
import { complexText, parameterWords, valueWords } from './parameter-words.ts';
import type { FlagSummary, ResultsSummary } from './summary.ts';
import { circuitNames, conductorWords, drawnElements, typeWord, type CircuitNames } from './user-names.ts';
import { caseDiff, type CaseDiffLine } from './case-diff.ts';

/** What a revision holds, as far as the diff is concerned. */
export interface DiffSide {
  number: number;
  content: { circuit: unknown; layout?: unknown; settings?: unknown };
  summary: ResultsSummary;
}

/**
 * One changed value at a dotted path (`each.kw`, `impedance.ohms`, `open`). Absent values are
 * `undefined` → null in JSON. `label`, `fromText` and `toText` are what people read: the parameter
 * and its values in words, with the names the user drew.
 */
export interface ValueChange {
  path: string;
  from: unknown;
  to: unknown;
  label: string;
  fromText: string;
  toText: string;
}

/** An element as drawn: its name (id) and its kind in words (`typeLabel`, e.g. "transformer bank"). */
export interface ElementRef {
  id: string;
  type: string;
  typeLabel: string;
}

export interface ElementChange extends ElementRef {
  changes: ValueChange[];
}

export type ResultKind = 'bus-voltage' | 'neutral-current' | 'neutral-shift' | 'unbalance';

/** One result that changed between the revisions. */
export interface ResultDelta {
  kind: ResultKind;
  key: string;
  label: string;
  unit: 'V' | 'A' | '%';
  from: number | null;
  to: number | null;
  delta: number | null;
  text: string;
}

export interface FlagDelta extends FlagSummary {
  text: string;
}

export interface RevisionDiff {
  from: number;
  to: number;
  elements: { added: ElementRef[]; removed: ElementRef[]; changed: ElementChange[] };
  /** Changes outside `elements` and `cases` (frequency, sequence, buses, limits, name…). */
  circuit: ValueChange[];
  /** Study cases added, removed, renamed and changed, in words (see case-diff.ts). */
  cases: CaseDiffLine[];
  layoutChanged: boolean;
  settingsChanged: boolean;
  results: ResultDelta[];
  flags: { added: FlagDelta[]; removed: FlagDelta[] };
  solve: { from: 'ok' | 'error'; to: 'ok' | 'error'; fromError?: string; toError?: string };
}

/** A result row is listed when it changed by more than this (in its own unit: V, A or %). */
export const RESULT_CHANGE_THRESHOLD = 0.05;

type Json = unknown;

function isPlainObject(v: Json): v is Record<string, Json> {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}

/** An array of plain values (a conductor list, a pair of numbers): compared and shown as one value. */
function isScalarArray(v: Json): boolean {
  return Array.isArray(v) && v.every((x) => x === null || typeof x !== 'object');
}

/**
 * Flattens a JSON value to `path → leaf`. Leaves: empty objects and arrays, arrays of plain values
 * (`open: ["n"]`), and complex values (`{ re, im }`, `{ mag, angleDeg }`), each read as one value.
 */
export function flatten(value: Json, prefix = '', out: Map<string, Json> = new Map()): Map<string, Json> {
  if (Array.isArray(value) && value.length > 0 && !isScalarArray(value)) {
    value.forEach((v, i) => flatten(v, prefix ? `${prefix}.${i}` : String(i), out));
  } else if (isPlainObject(value) && Object.keys(value).length > 0 && complexText(value) === null) {
    for (const [k, v] of Object.entries(value)) flatten(v, prefix ? `${prefix}.${k}` : k, out);
  } else {
    out.set(prefix, value);
  }
  return out;
}

/** Deep equality of JSON values (key order does not matter). */
export function jsonEqual(a: Json, b: Json): boolean {
  if (a === b) return true;
  if (Array.isArray(a) || Array.isArray(b)) {
    if (!Array.isArray(a) || !Array.isArray(b) || a.length !== b.length) return false;
    return a.every((v, i) => jsonEqual(v, b[i]));
  }
  if (isPlainObject(a) && isPlainObject(b)) {
    const ka = Object.keys(a).filter((k) => a[k] !== undefined);
    const kb = Object.keys(b).filter((k) => b[k] !== undefined);
    return ka.length === kb.length && ka.every((k) => jsonEqual(a[k], b[k]));
  }
  return false;
}

/**
 * Parameter-by-parameter changes between two JSON values, sorted by path, each in words; bus names
 * and messages are read with the names of each side's circuit.
 */
export function valueChanges(a: Json, b: Json, names?: { from: CircuitNames; to: CircuitNames }): ValueChange[] {
  const fa = flatten(a);
  const fb = flatten(b);
  const paths = [...new Set([...fa.keys(), ...fb.keys()])].sort();
  const out: ValueChange[] = [];
  for (const p of paths) {
    const x = fa.get(p);
    const y = fb.get(p);
    if (jsonEqual(x, y)) continue;
    const opened = p.startsWith('opened.');
    out.push({
      path: p,
      from: x ?? null,
      to: y ?? null,
      label: parameterWords(p),
      fromText: opened && x === undefined ? 'none' : valueWords(p, x, names?.from),
      toText: opened && y === undefined ? 'none' : valueWords(p, y, names?.to),
    });
  }
  return out;
}

/** The connection an `opened.<field>` change is about, in words ("opened conductors of the connection KITCHEN–HOUSE"). */
function openedLabel(id: string, field: string, a: Record<string, Json> | undefined, b: Record<string, Json>): string {
  const raw = b[field] ?? a?.[field];
  const value = typeof raw === 'string' ? raw : '';
  const bus = field === 'node' && value.lastIndexOf('.') > 0 ? value.slice(0, value.lastIndexOf('.')) : value;
  return `opened conductors of the connection ${id}–${bus || 'its bus'}`;
}

const typeOf = (e: Record<string, Json>) => (typeof e.type === 'string' ? e.type : 'unknown');
const refOf = (id: string, e: Record<string, Json>): ElementRef => ({ id, type: typeOf(e), typeLabel: typeWord(e.type) });

/** The circuit without its elements, its bus list keyed by bus name (so a bus reads "bus HOUSE", not "item 2"). */
function circuitLevel(c: Json): Record<string, Json> {
  if (!isPlainObject(c)) return {};
  const rest = Object.fromEntries(Object.entries(c).filter(([k]) => k !== 'elements' && k !== 'cases'));
  if (Array.isArray(rest.buses)) {
    rest.buses = Object.fromEntries(
      rest.buses.map((b, i) => {
        if (!isPlainObject(b)) return [String(i), b];
        const { name, ...info } = b;
        return [typeof name === 'string' ? name : String(i), info];
      }),
    );
  }
  return rest;
}

/** Formats a value with its unit: volts and amperes to 0.1, percentages to 0.01. */
export function formatValue(v: number | null, unit: ResultDelta['unit']): string {
  if (v === null) return '—';
  return unit === '%' ? `${v.toFixed(2)} %` : `${v.toFixed(1)} ${unit}`;
}

/**
 * The comparable result rows of a summary: key → row without the other side, labelled with the
 * names the user drew. A hidden switch's neutral current is the same current as its element's, so
 * only the element's row is kept, keyed by the bus it was drawn on (the key then matches the same
 * element in a revision without the opening).
 */
function resultRows(s: ResultsSummary, names: CircuitNames = circuitNames(null)): Map<string, { kind: ResultKind; label: string; unit: ResultDelta['unit']; value: number }> {
  const rows = new Map<string, { kind: ResultKind; label: string; unit: ResultDelta['unit']; value: number }>();
  if (!s.ok) return rows;
  for (const b of s.buses) {
    const at = names.bus(b.bus);
    for (const [c, v] of Object.entries(b.phaseVolts)) {
      rows.set(`bus-voltage:${b.bus}:${c}`, { kind: 'bus-voltage', label: `voltage ${conductorLabel(c)}-N at ${at}`, unit: 'V', value: v });
    }
    if (b.neutralShiftVolts !== undefined) {
      rows.set(`neutral-shift:${b.bus}`, { kind: 'neutral-shift', label: `neutral shift at ${at}`, unit: 'V', value: b.neutralShiftVolts });
    }
    if (b.iecUnbalancePercent !== undefined) {
      rows.set(`unbalance:${b.bus}`, { kind: 'unbalance', label: `voltage unbalance (IEC) at ${at}`, unit: '%', value: b.iecUnbalancePercent });
    }
  }
  for (const n of s.neutralCurrents) {
    if (names.isHidden(n.elementId)) continue;
    const bus = names.drawnBus(n.bus);
    rows.set(`neutral-current:${n.elementId}@${bus}`, { kind: 'neutral-current', label: `neutral current at ${bus} (${n.elementId})`, unit: 'A', value: n.amps });
  }
  return rows;
}

/** A conductor key of a summary in capitals (a → A, 1 → 1). */
function conductorLabel(c: string): string {
  return c.toUpperCase();
}

const KIND_ORDER: ResultKind[] = ['neutral-current', 'neutral-shift', 'bus-voltage', 'unbalance'];

/** Result deltas between two summaries, neutral currents first (what a lost-neutral review looks at). */
export function resultDeltas(from: ResultsSummary, to: ResultsSummary, names?: { from: CircuitNames; to: CircuitNames }): ResultDelta[] {
  const a = resultRows(from, names?.from);
  const b = resultRows(to, names?.to);
  const out: ResultDelta[] = [];
  for (const key of new Set([...a.keys(), ...b.keys()])) {
    const x = a.get(key);
    const y = b.get(key);
    const row = (y ?? x)!;
    const fv = x ? x.value : null;
    const tv = y ? y.value : null;
    const delta = fv !== null && tv !== null ? tv - fv : null;
    if (delta !== null && Math.abs(delta) <= RESULT_CHANGE_THRESHOLD) continue;
    out.push({
      kind: row.kind,
      key,
      label: row.label,
      unit: row.unit,
      from: fv,
      to: tv,
      delta: delta === null ? null : Math.round(delta * 1e4) / 1e4,
      text: `${row.label}: ${formatValue(fv, row.unit)} → ${formatValue(tv, row.unit)}`,
    });
  }
  // numbers in names in their order: No 2 before No 10
  return out.sort((p, q) => KIND_ORDER.indexOf(p.kind) - KIND_ORDER.indexOf(q.kind) || p.key.localeCompare(q.key, 'en', { numeric: true }));
}

function flagsOf(s: ResultsSummary): FlagSummary[] {
  return s.ok ? s.flags : [];
}

/**
 * Compares two revisions as the user drew them: the hidden switch behind an opened connection is
 * never an element of its own; its opening reads as a change of the element it belongs to
 * ("opened conductors of the connection KITCHEN–HOUSE: none → neutral").
 */
export function diffRevisions(from: DiffSide, to: DiffSide): RevisionDiff {
  const names = { from: circuitNames(from.content.circuit), to: circuitNames(to.content.circuit) };
  const ea = drawnElements(from.content.circuit);
  const eb = drawnElements(to.content.circuit);
  const added: ElementRef[] = [];
  const removed: ElementRef[] = [];
  const changed: ElementChange[] = [];
  for (const [id, e] of eb) if (!ea.has(id)) added.push(refOf(id, e));
  for (const [id, e] of ea) {
    const other = eb.get(id);
    if (!other) {
      removed.push(refOf(id, e));
      continue;
    }
    const changes = valueChanges(e, other, names).map((c) =>
      c.path.startsWith('opened.') ? { ...c, label: openedLabel(id, c.path.slice('opened.'.length), e, other) } : c,
    );
    if (changes.length > 0) changed.push({ ...refOf(id, other), changes });
  }

  const circuit = valueChanges(circuitLevel(from.content.circuit), circuitLevel(to.content.circuit), names);

  const fa = flagsOf(from.summary);
  const fb = flagsOf(to.summary);
  const keysA = new Set(fa.map((f) => f.key));
  const keysB = new Set(fb.map((f) => f.key));
  const flagsAdded = fb.filter((f) => !keysA.has(f.key)).map((f) => ({ ...f, message: names.to.text(f.message), text: `flag added: ${names.to.text(f.message)}` }));
  const flagsRemoved = fa.filter((f) => !keysB.has(f.key)).map((f) => ({ ...f, message: names.from.text(f.message), text: `flag removed: ${names.from.text(f.message)}` }));

  return {
    from: from.number,
    to: to.number,
    elements: { added, removed, changed },
    circuit,
    cases: caseDiff(from.content.circuit, to.content.circuit),
    layoutChanged: !jsonEqual(from.content.layout ?? null, to.content.layout ?? null),
    settingsChanged: !jsonEqual(from.content.settings ?? null, to.content.settings ?? null),
    results: resultDeltas(from.summary, to.summary, names),
    flags: { added: flagsAdded, removed: flagsRemoved },
    solve: {
      from: from.summary.ok ? 'ok' : 'error',
      to: to.summary.ok ? 'ok' : 'error',
      ...(!from.summary.ok ? { fromError: names.from.text(from.summary.error.message) } : {}),
      ...(!to.summary.ok ? { toError: names.to.text(to.summary.error.message) } : {}),
    },
  };
}
