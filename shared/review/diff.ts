/**
 * The comparison of two revisions a reviewer reads first: elements added, removed and changed
 * (parameter by parameter), circuit-level changes, and the change in key results with units
 * ("neutral current at HOUSE (DROP): 12.1 A → 83.3 A"), flags added and removed.
 * Pure TypeScript (no Node or DOM APIs): used by the server and the browser alike.
 */
import type { FlagSummary, ResultsSummary } from './summary.ts';

/** What a revision holds, as far as the diff is concerned. */
export interface DiffSide {
  number: number;
  content: { circuit: unknown; layout?: unknown; settings?: unknown };
  summary: ResultsSummary;
}

/** One changed value at a dotted path (`each.kw`, `impedance.ohms.re`, `open.0`). Absent values are `undefined` → null in JSON. */
export interface ValueChange {
  path: string;
  from: unknown;
  to: unknown;
}

export interface ElementRef {
  id: string;
  type: string;
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
  /** Changes outside `elements` (frequency, sequence, buses, limits, name…). */
  circuit: ValueChange[];
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

/** Flattens a JSON value to `path → leaf` (empty objects and arrays are leaves). */
export function flatten(value: Json, prefix = '', out: Map<string, Json> = new Map()): Map<string, Json> {
  if (Array.isArray(value) && value.length > 0) {
    value.forEach((v, i) => flatten(v, prefix ? `${prefix}.${i}` : String(i), out));
  } else if (isPlainObject(value) && Object.keys(value).length > 0) {
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

/** Parameter-by-parameter changes between two JSON values, sorted by path. */
export function valueChanges(a: Json, b: Json): ValueChange[] {
  const fa = flatten(a);
  const fb = flatten(b);
  const paths = [...new Set([...fa.keys(), ...fb.keys()])].sort();
  const out: ValueChange[] = [];
  for (const p of paths) {
    const x = fa.get(p);
    const y = fb.get(p);
    if (!jsonEqual(x, y)) out.push({ path: p, from: x ?? null, to: y ?? null });
  }
  return out;
}

function elementsOf(circuit: Json): Map<string, Record<string, Json>> {
  const m = new Map<string, Record<string, Json>>();
  const els = isPlainObject(circuit) && Array.isArray(circuit.elements) ? circuit.elements : [];
  els.forEach((e, i) => {
    if (!isPlainObject(e)) return;
    const id = typeof e.id === 'string' ? e.id : `#${i}`;
    m.set(id, e);
  });
  return m;
}

const typeOf = (e: Record<string, Json>) => (typeof e.type === 'string' ? e.type : 'unknown');

/** Formats a value with its unit: volts and amperes to 0.1, percentages to 0.01. */
export function formatValue(v: number | null, unit: ResultDelta['unit']): string {
  if (v === null) return '—';
  return unit === '%' ? `${v.toFixed(2)} %` : `${v.toFixed(1)} ${unit}`;
}

/** The comparable result rows of a summary: key → row without the other side. */
function resultRows(s: ResultsSummary): Map<string, { kind: ResultKind; label: string; unit: ResultDelta['unit']; value: number }> {
  const rows = new Map<string, { kind: ResultKind; label: string; unit: ResultDelta['unit']; value: number }>();
  if (!s.ok) return rows;
  for (const b of s.buses) {
    for (const [c, v] of Object.entries(b.phaseVolts)) {
      rows.set(`bus-voltage:${b.bus}:${c}`, { kind: 'bus-voltage', label: `voltage ${c}-n at ${b.bus}`, unit: 'V', value: v });
    }
    if (b.neutralShiftVolts !== undefined) {
      rows.set(`neutral-shift:${b.bus}`, { kind: 'neutral-shift', label: `neutral shift at ${b.bus}`, unit: 'V', value: b.neutralShiftVolts });
    }
    if (b.iecUnbalancePercent !== undefined) {
      rows.set(`unbalance:${b.bus}`, { kind: 'unbalance', label: `voltage unbalance (IEC) at ${b.bus}`, unit: '%', value: b.iecUnbalancePercent });
    }
  }
  for (const n of s.neutralCurrents) {
    rows.set(`neutral-current:${n.key}`, { kind: 'neutral-current', label: `neutral current at ${n.bus} (${n.elementId})`, unit: 'A', value: n.amps });
  }
  return rows;
}

const KIND_ORDER: ResultKind[] = ['neutral-current', 'neutral-shift', 'bus-voltage', 'unbalance'];

/** Result deltas between two summaries, neutral currents first (what a lost-neutral review looks at). */
export function resultDeltas(from: ResultsSummary, to: ResultsSummary): ResultDelta[] {
  const a = resultRows(from);
  const b = resultRows(to);
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
  return out.sort((p, q) => KIND_ORDER.indexOf(p.kind) - KIND_ORDER.indexOf(q.kind) || p.key.localeCompare(q.key));
}

function flagsOf(s: ResultsSummary): FlagSummary[] {
  return s.ok ? s.flags : [];
}

/** Compares two revisions. */
export function diffRevisions(from: DiffSide, to: DiffSide): RevisionDiff {
  const ea = elementsOf(from.content.circuit);
  const eb = elementsOf(to.content.circuit);
  const added: ElementRef[] = [];
  const removed: ElementRef[] = [];
  const changed: ElementChange[] = [];
  for (const [id, e] of eb) if (!ea.has(id)) added.push({ id, type: typeOf(e) });
  for (const [id, e] of ea) {
    const other = eb.get(id);
    if (!other) {
      removed.push({ id, type: typeOf(e) });
      continue;
    }
    const changes = valueChanges(e, other);
    if (changes.length > 0) changed.push({ id, type: typeOf(other), changes });
  }

  const withoutElements = (c: Json) => (isPlainObject(c) ? Object.fromEntries(Object.entries(c).filter(([k]) => k !== 'elements')) : {});
  const circuit = valueChanges(withoutElements(from.content.circuit), withoutElements(to.content.circuit));

  const fa = flagsOf(from.summary);
  const fb = flagsOf(to.summary);
  const keysA = new Set(fa.map((f) => f.key));
  const keysB = new Set(fb.map((f) => f.key));
  const flagsAdded = fb.filter((f) => !keysA.has(f.key)).map((f) => ({ ...f, text: `flag added: ${f.message}` }));
  const flagsRemoved = fa.filter((f) => !keysB.has(f.key)).map((f) => ({ ...f, text: `flag removed: ${f.message}` }));

  return {
    from: from.number,
    to: to.number,
    elements: { added, removed, changed },
    circuit,
    layoutChanged: !jsonEqual(from.content.layout ?? null, to.content.layout ?? null),
    settingsChanged: !jsonEqual(from.content.settings ?? null, to.content.settings ?? null),
    results: resultDeltas(from.summary, to.summary),
    flags: { added: flagsAdded, removed: flagsRemoved },
    solve: {
      from: from.summary.ok ? 'ok' : 'error',
      to: to.summary.ok ? 'ok' : 'error',
      ...(!from.summary.ok ? { fromError: from.summary.error.message } : {}),
      ...(!to.summary.ok ? { toError: to.summary.error.message } : {}),
    },
  };
}
