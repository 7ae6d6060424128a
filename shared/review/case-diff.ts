/**
 * The study cases part of a revision diff, in words: cases added, removed, renamed, and each change
 * inside a case ("case "Neutral lost": DROP open n added", "case "Peak": KITCHEN each.kw 3 → 4").
 * Cases are matched by id and named by their name (their id when they have none). Pure.
 */
import { typeWord } from './user-names.ts';

type Json = unknown;
const isObject = (v: Json): v is Record<string, Json> => typeof v === 'object' && v !== null && !Array.isArray(v);
const isScalar = (v: Json) => v === null || ['string', 'number', 'boolean'].includes(typeof v);

/** One line of the cases diff: the case it is about and the sentence. */
export interface CaseDiffLine {
  caseId: string;
  kind: 'case-added' | 'case-removed' | 'case-renamed' | 'change-added' | 'change-removed' | 'change-changed';
  text: string;
}

interface RawCase {
  id: string;
  name?: string;
  changes: Json[];
}

function casesOf(circuit: Json): Map<string, RawCase> {
  const m = new Map<string, RawCase>();
  const list = isObject(circuit) && Array.isArray(circuit.cases) ? circuit.cases : [];
  for (const c of list) {
    if (!isObject(c) || typeof c.id !== 'string') continue;
    m.set(c.id, { id: c.id, name: typeof c.name === 'string' ? c.name : undefined, changes: Array.isArray(c.changes) ? c.changes : [] });
  }
  return m;
}

const label = (c: RawCase) => `case "${c.name && c.name.trim() ? c.name : c.id}"`;
const show = (v: Json) => (typeof v === 'string' ? v : v === null ? 'nothing' : String(v));

/** Flattens a value into `path → scalar`; lists of scalars become one presence statement per item (`open n`). */
function statements(value: Json, prefix: string, out: Map<string, Json>, presence: Set<string>): void {
  if (Array.isArray(value) && value.length > 0 && value.every(isScalar)) {
    for (const item of value) presence.add(`${prefix} ${show(item)}`);
  } else if (Array.isArray(value) && value.length > 0) {
    value.forEach((v, i) => statements(v, `${prefix}.${i}`, out, presence));
  } else if (isObject(value) && Object.keys(value).length > 0) {
    for (const [k, v] of Object.entries(value)) statements(v, prefix ? `${prefix}.${k}` : k, out, presence);
  } else out.set(prefix, value);
}

/** What a case does, as comparable statements: valued (`KITCHEN each.kw` → 3) and present (`DROP open n`, `F1 (fault) added`). */
function caseStatements(c: RawCase): { valued: Map<string, Json>; present: Set<string> } {
  const valued = new Map<string, Json>();
  const present = new Set<string>();
  for (const ch of c.changes) {
    if (!isObject(ch)) continue;
    if (typeof ch.element === 'string' && isObject(ch.set)) {
      for (const [field, v] of Object.entries(ch.set)) {
        if (Array.isArray(v) && v.length === 0) present.add(`${ch.element} ${field} cleared`);
        else statements(v, `${ch.element} ${field}`, valued, present);
      }
    } else if (isObject(ch.add) && typeof ch.add.id === 'string') {
      const id = ch.add.id;
      present.add(`adds ${id}${typeof ch.add.type === 'string' ? ` (${typeWord(ch.add.type)})` : ''}`);
      for (const [field, v] of Object.entries(ch.add)) if (field !== 'id' && field !== 'type') statements(v, `new ${id} ${field}`, valued, present);
    } else if (typeof ch.remove === 'string') present.add(`removes ${ch.remove}`);
  }
  return { valued, present };
}

/** The cases diff between two circuits, in words, cases in the newer revision's order then removed ones. */
export function caseDiff(from: Json, to: Json): CaseDiffLine[] {
  const a = casesOf(from);
  const b = casesOf(to);
  const out: CaseDiffLine[] = [];
  const line = (c: RawCase, kind: CaseDiffLine['kind'], text: string) => out.push({ caseId: c.id, kind, text: `${label(c)}: ${text}` });
  for (const [id, nc] of b) {
    const oc = a.get(id);
    const before = oc ? caseStatements(oc) : { valued: new Map<string, Json>(), present: new Set<string>() };
    const after = caseStatements(nc);
    if (!oc) out.push({ caseId: id, kind: 'case-added', text: `${label(nc)} added (${nc.changes.length} change${nc.changes.length === 1 ? '' : 's'})` });
    else if ((oc.name ?? '') !== (nc.name ?? '')) out.push({ caseId: id, kind: 'case-renamed', text: `${label(oc)} renamed ${label(nc).slice('case '.length)}` });
    for (const s of after.present) if (!before.present.has(s)) line(nc, 'change-added', `${s} added`);
    for (const s of before.present) if (!after.present.has(s)) line(nc, 'change-removed', `${s} removed`);
    for (const [p, v] of after.valued) {
      if (!before.valued.has(p)) line(nc, 'change-added', `${p} ${show(v)} added`);
      else if (before.valued.get(p) !== v) line(nc, 'change-changed', `${p} ${show(before.valued.get(p))} → ${show(v)}`);
    }
    for (const [p, v] of before.valued) if (!after.valued.has(p)) line(nc, 'change-removed', `${p} ${show(v)} removed`);
  }
  for (const [id, oc] of a) if (!b.has(id)) out.push({ caseId: id, kind: 'case-removed', text: `${label(oc)} removed` });
  return out;
}
