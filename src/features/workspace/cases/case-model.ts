/**
 * The case editor as data: study cases (the circuit file's `cases`) built from parameter overrides
 * picked on the elements as drawn. An override of `KITCHEN.each.kw` becomes a `set` of the
 * element's top-level field `each` (the format's `set` replaces a whole top-level field, so the
 * field is copied from the case, else the base, and the one value written in it). Pure functions
 * from cases to cases; the page keeps the list in the study settings so it is saved with the study.
 * Everything here speaks in element names as drawn: generated names (with "~") are never offered.
 */
import type { CaseChange, StudyCase } from '../../../../shared/engine/index.ts';
import { parameterWords, valueWords } from '../../../../shared/review/parameter-words.ts';
import { isPrivateName, typeWord } from '../../../../shared/review/user-names.ts';
import type { WorkspaceDoc } from '../model/document.ts';

type Obj = Record<string, unknown>;
const isObject = (v: unknown): v is Obj => typeof v === 'object' && v !== null && !Array.isArray(v);

/** A numeric value of an element that a case or a sweep may change: its dotted path inside the element, in words, and its value. */
export interface NumericParameter {
  /** Path inside the element, e.g. `each.kw`, `impedance.ohms.re`. */
  path: string;
  label: string;
  value: number;
}

/** Fields never offered as parameters (they say what the element is, not how big). */
const SKIP = new Set(['id', 'type', 'version']);

/** Every numeric leaf of an element (lists excepted), in the element's field order. */
export function numericParameters(element: unknown): NumericParameter[] {
  const out: NumericParameter[] = [];
  const walk = (v: unknown, path: string[]) => {
    if (typeof v === 'number' && Number.isFinite(v)) {
      const p = path.join('.');
      out.push({ path: p, label: parameterWords(p), value: v });
    } else if (isObject(v)) {
      for (const [k, x] of Object.entries(v)) if (!(path.length === 0 && SKIP.has(k))) walk(x, [...path, k]);
    }
  };
  walk(element, []);
  return out;
}

/** Elements a case may change: those drawn (no generated names), by id = the name the user gave. */
export function drawnElementsOf(circuit: unknown): Obj[] {
  const els = isObject(circuit) && Array.isArray(circuit.elements) ? (circuit.elements as unknown[]) : [];
  return els.filter((e): e is Obj => isObject(e) && typeof e.id === 'string' && !isPrivateName(e.id));
}

/** Conductors an element's own `open` list may name (lines and three-pole switches), else null. */
export function openableConductors(element: Obj): string[] | null {
  if (element.type !== 'line' && element.type !== 'switch3') return null;
  const cs = Array.isArray(element.conductors) ? (element.conductors as string[]) : ['a', 'b', 'c', 'n'];
  return cs;
}

/** The cases of a study (settings.cases), as a typed list (entries that are not cases are dropped). */
export function casesOf(raw: unknown): StudyCase[] {
  return Array.isArray(raw) ? (raw.filter((c) => isObject(c) && typeof c.id === 'string' && Array.isArray(c.changes)) as StudyCase[]) : [];
}

/** A fresh case id (never shown: screens name cases by their name). */
export function newCaseId(cases: readonly StudyCase[]): string {
  const used = new Set(cases.map((c) => c.id));
  let k = cases.length + 1;
  while (used.has(`case-${k}`)) k++;
  return `case-${k}`;
}

/** Problem with a case name, or null: it must be non-empty and not used by another case. */
export function caseNameProblem(cases: readonly StudyCase[], name: string, ownId?: string): string | null {
  const n = name.trim();
  if (!n) return 'Give the case a name.';
  if (n.toLowerCase() === 'base') return '"Base" is the circuit as drawn; choose another name.';
  if (cases.some((c) => c.id !== ownId && (c.name ?? c.id).trim().toLowerCase() === n.toLowerCase())) return `A case named "${n}" already exists.`;
  return null;
}

export function addCase(cases: readonly StudyCase[], name: string, changes: CaseChange[] = []): StudyCase[] {
  return [...cases, { id: newCaseId(cases), name: name.trim(), changes }];
}

export function renameCase(cases: readonly StudyCase[], id: string, name: string): StudyCase[] {
  return cases.map((c) => (c.id === id ? { ...c, name: name.trim() } : c));
}

export function deleteCase(cases: readonly StudyCase[], id: string): StudyCase[] {
  return cases.filter((c) => c.id !== id);
}

const clone = <T>(v: T): T => (v === undefined ? v : (JSON.parse(JSON.stringify(v)) as T));

/** `value` written at `fields` inside a copy of `node` (objects created where missing). */
function deepSet(node: unknown, fields: string[], value: unknown): unknown {
  if (fields.length === 0) return value;
  const copy: Obj = isObject(node) ? { ...node } : {};
  copy[fields[0]] = deepSet(copy[fields[0]], fields.slice(1), value);
  return copy;
}

/**
 * Cases with one override set in case `caseId`: `path` (inside element `elementId`) = `value`.
 * The element's top-level field is taken from the case's own set, else from the base element.
 */
export function setOverride(cases: readonly StudyCase[], caseId: string, base: unknown, elementId: string, path: string, value: unknown): StudyCase[] {
  const fields = path.split('.');
  const top = fields[0];
  const baseEl = drawnElementsOf(base).find((e) => e.id === elementId);
  return cases.map((c) => {
    if (c.id !== caseId) return c;
    const changes = c.changes.slice();
    const k = changes.findIndex((ch) => 'set' in ch && ch.element === elementId);
    const current = k >= 0 && 'set' in changes[k] && top in (changes[k] as { set: Obj }).set ? (changes[k] as { set: Obj }).set[top] : clone(baseEl?.[top]);
    const next = deepSet(current, fields.slice(1), value);
    if (k >= 0) {
      const ch = changes[k] as { element: string; set: Obj };
      changes[k] = { element: ch.element, set: { ...ch.set, [top]: next } };
    } else changes.push({ element: elementId, set: { [top]: next } });
    return { ...c, changes };
  });
}

/** Cases with one row of the editor removed: a top-level field of a `set`, or a whole change (add/remove). */
export function removeOverride(cases: readonly StudyCase[], caseId: string, changeIndex: number, field?: string): StudyCase[] {
  return cases.map((c) => {
    if (c.id !== caseId) return c;
    const changes = c.changes.slice();
    const ch = changes[changeIndex];
    if (!ch) return c;
    if (field !== undefined && 'set' in ch) {
      const { [field]: _gone, ...rest } = ch.set;
      if (Object.keys(rest).length === 0) changes.splice(changeIndex, 1);
      else changes[changeIndex] = { element: ch.element, set: rest };
    } else changes.splice(changeIndex, 1);
    return { ...c, changes };
  });
}

/** One row of a case as the editor and the canvas overlay show it. */
export interface OverrideRow {
  changeIndex: number;
  /** Top-level field of a `set` (absent for an add or a remove). */
  field?: string;
  elementId: string;
  text: string;
}

/** Numeric and other leaves of a value, keyed by dotted path. */
function leaves(v: unknown, path: string, out: Map<string, unknown>): Map<string, unknown> {
  if (isObject(v) && !('re' in v && 'im' in v) && !('mag' in v && 'angleDeg' in v)) for (const [k, x] of Object.entries(v)) leaves(x, path ? `${path}.${k}` : k, out);
  else out.set(path, v);
  return out;
}

/** A case's changes in words against the base, one row per changed top-level field (or per add/remove). */
export function overrideRows(c: StudyCase, base: unknown): OverrideRow[] {
  const els = new Map(drawnElementsOf(base).map((e) => [e.id as string, e]));
  const rows: OverrideRow[] = [];
  c.changes.forEach((ch, changeIndex) => {
    if ('set' in ch) {
      const baseEl = els.get(ch.element);
      for (const [field, v] of Object.entries(ch.set)) {
        const now = leaves(v, field, new Map());
        const was = leaves(baseEl?.[field], field, new Map());
        const parts: string[] = [];
        for (const [p, x] of now) {
          // an absent list (no conductor open) reads as an empty one
          const before = was.get(p) === undefined && Array.isArray(x) ? [] : was.get(p);
          if (JSON.stringify(before) === JSON.stringify(x)) continue;
          parts.push(`${parameterWords(p)} ${valueWords(p, before)} → ${valueWords(p, x)}`);
        }
        if (parts.length === 0) parts.push(`${parameterWords(field)} ${valueWords(field, v)} (as the base)`);
        rows.push({ changeIndex, field, elementId: ch.element, text: `${ch.element}: ${parts.join('; ')}` });
      }
    } else if ('add' in ch) {
      rows.push({ changeIndex, elementId: ch.add.id, text: `adds ${typeWord(ch.add.type)} ${ch.add.id}` });
    } else {
      rows.push({ changeIndex, elementId: ch.remove, text: `removes ${ch.remove}` });
    }
  });
  return rows;
}

/** Ids of the elements a case changes, adds or removes (what the canvas marks). */
export function changedElements(c: StudyCase | undefined): Set<string> {
  const out = new Set<string>();
  for (const ch of c?.changes ?? []) out.add('set' in ch ? ch.element : 'add' in ch ? ch.add.id : ch.remove);
  return out;
}

/**
 * A new case from a sweep point: the changes of the case the sweep ran on (none for the base),
 * then each swept parameter (`<element>.<path>`) set to the point's value.
 */
export function caseFromPoint(cases: readonly StudyCase[], base: unknown, onCase: string | null, parameters: readonly { elementId: string; path: string }[], values: readonly number[], name: string): StudyCase[] {
  const from = onCase ? cases.find((c) => c.id === onCase) : undefined;
  let next = addCase(cases, name, clone(from?.changes ?? []));
  const id = next[next.length - 1].id;
  parameters.forEach((p, i) => {
    next = setOverride(next, id, base, p.elementId, p.path, values[i]);
  });
  return next;
}

/** Document command: the study's case list replaced (an undoable edit; saved with the study). */
export function setStudyCases(doc: WorkspaceDoc, cases: StudyCase[]): WorkspaceDoc {
  const { cases: _old, ...settings } = doc.settings;
  return { ...doc, settings: cases.length > 0 ? { ...settings, cases } : settings };
}
