/**
 * `applyCase(circuit, caseId)`: the base circuit with one study case's changes applied in order,
 * as a new circuit file without `cases` (the input is not modified). `set` replaces the named
 * top-level fields of an element (no merge), `add` appends an element, `remove` deletes one.
 * A change naming an unknown element, or leaving an element that does not follow the format, is
 * an `InvalidCircuitError` naming the case and the element. The whole circuit is validated later
 * by whoever solves it (parseCircuit), exactly as a hand-edited file would be.
 */
import { InvalidCircuitError } from '../errors.ts';
import type { CircuitInput } from '../schema/circuit.ts';
import { ELEMENT_TYPES, elementSchemas, type ElementType } from '../schema/circuit.ts';
import { BASE_CASE_ID, casesSchema, type StudyCase } from '../schema/cases.ts';
import { formatPath } from '../schema/parse-circuit.ts';

type RawElement = Record<string, unknown>;
type RawCircuit = Record<string, unknown> & { elements?: unknown; cases?: unknown };

/** How messages name a case: its name in words when it has one, else its id. */
export function caseLabel(c: Pick<StudyCase, 'id' | 'name'>): string {
  return `case "${c.name && c.name.trim() ? c.name : c.id}"`;
}

/** The validated cases of a circuit file (empty when it has none). Throws InvalidCircuitError on a malformed `cases`. */
export function circuitCases(circuit: unknown): StudyCase[] {
  const raw = isObject(circuit) ? (circuit as RawCircuit).cases : undefined;
  if (raw === undefined) return [];
  const parsed = casesSchema.safeParse(raw);
  if (!parsed.success) {
    const issues = parsed.error.issues.map((i) => ({ path: formatPath(['cases', ...i.path]), message: i.message }));
    throw new InvalidCircuitError(`invalid circuit: ${issues[0].path}: ${issues[0].message}`, issues);
  }
  return parsed.data;
}

/** The base circuit (`caseId` "base") or the named case applied to it, without `cases`. Pure. */
export function applyCase(circuit: CircuitInput | Record<string, unknown>, caseId: string): CircuitInput {
  if (!isObject(circuit)) throw new InvalidCircuitError('a circuit must be a JSON object with "format": "wyeward-circuit"', [{ path: '(root)', message: 'expected a JSON object' }]);
  const { cases: _cases, ...base } = circuit as RawCircuit;
  if (caseId === BASE_CASE_ID) return base as unknown as CircuitInput;
  const cases = circuitCases(circuit);
  const found = cases.find((c) => c.id === caseId);
  if (!found) {
    const known = cases.length ? `; the cases are: ${cases.map((c) => c.id).join(', ')}` : '; this circuit has no cases';
    throw new InvalidCircuitError(`no case "${caseId}" in this circuit${known}`, [{ path: 'cases', message: `no case with id "${caseId}"` }]);
  }
  const caseIndex = cases.indexOf(found);
  const elements: RawElement[] = Array.isArray(base.elements) ? (base.elements as RawElement[]).slice() : [];
  const indexOf = (id: string) => elements.findIndex((e) => isObject(e) && e.id === id);
  const touched = new Set<string>();
  const where = (k: number) => `cases[${caseIndex}].changes[${k}]`;
  const fail = (k: number, id: string, message: string, field = ''): never => {
    throw new InvalidCircuitError(`${caseLabel(found)}: element "${id}": ${message}`, [{ path: `${where(k)}${field}`, message }], { elementIds: [id] });
  };

  found.changes.forEach((change, k) => {
    if ('set' in change) {
      const i = indexOf(change.element);
      if (i < 0) fail(k, change.element, 'no such element in the circuit', '.element');
      for (const field of ['id', 'type']) if (field in change.set) fail(k, change.element, `its ${field} cannot be changed by a case (remove it and add another)`, `.set.${field}`);
      elements[i] = { ...elements[i], ...change.set };
      touched.add(change.element);
    } else if ('add' in change) {
      const id = change.add.id;
      if (indexOf(id) >= 0) fail(k, id, 'an element with this id already exists', '.add.id');
      elements.push({ ...change.add });
      touched.add(id);
    } else {
      const i = indexOf(change.remove);
      if (i < 0) fail(k, change.remove, 'no such element in the circuit', '.remove');
      elements.splice(i, 1);
      touched.delete(change.remove);
    }
  });

  // every element a change touched must still follow the format (named by case and element)
  for (const id of touched) {
    const el = elements[indexOf(id)];
    const type = el.type;
    if (typeof type !== 'string' || !(ELEMENT_TYPES as string[]).includes(type)) {
      throw new InvalidCircuitError(`${caseLabel(found)}: element "${id}": unknown element type "${String(type)}"; known types: ${ELEMENT_TYPES.join(', ')}`, [{ path: `cases[${caseIndex}]`, message: `unknown element type "${String(type)}"` }], { elementIds: [id] });
    }
    const parsed = elementSchemas[type as ElementType].safeParse(el);
    if (!parsed.success) {
      const issues = parsed.error.issues.map((iss) => ({ path: formatPath(iss.path), message: iss.message }));
      const first = issues[0];
      const field = first.path === '(root)' ? '' : `${first.path}: `;
      throw new InvalidCircuitError(`${caseLabel(found)}: element "${id}": ${field}${first.message}`, issues.map((x) => ({ path: `cases[${caseIndex}] ${id}.${x.path}`, message: x.message })), { elementIds: [id] });
    }
  }
  return { ...base, elements } as unknown as CircuitInput;
}

function isObject(v: unknown): v is Record<string, unknown> {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}
