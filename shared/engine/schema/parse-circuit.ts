/**
 * Validate an untrusted circuit (parsed JSON or an object) into a `Circuit`.
 * Every problem becomes an issue `{ path, message }` in plain words, gathered into one
 * `InvalidCircuitError`: non-finite numbers, unknown element types (named, with the known ones),
 * schema errors per element, duplicate ids. Primitives take a hand-checked fast path first
 * (fast-primitives.ts); anything it does not accept goes through the zod schema.
 */
import type { z } from 'zod';
import { InvalidCircuitError } from '../errors.ts';
import { fastParsePrimitive } from './fast-primitives.ts';
import { circuitSchema, ELEMENT_TYPES, elementSchemas, type Circuit, type ElementType } from './circuit.ts';

export interface CircuitIssue {
  path: string;
  message: string;
}

/** JSON-path-like rendering: elements[3].ohms.re */
export function formatPath(path: readonly PropertyKey[]): string {
  let s = '';
  for (const p of path) s += typeof p === 'number' ? `[${p}]` : s === '' ? String(p) : `.${String(p)}`;
  return s === '' ? '(root)' : s;
}

/** Walk a value and report every NaN or ±Infinity (zod would report them less plainly); one path stack, no copies. */
function nonFinite(value: unknown, path: PropertyKey[], out: CircuitIssue[]): void {
  if (typeof value === 'number') {
    if (!Number.isFinite(value)) out.push({ path: formatPath(path), message: `must be a finite number (got ${String(value)})` });
  } else if (Array.isArray(value)) {
    for (let i = 0; i < value.length; i++) {
      const v = value[i];
      if (typeof v === 'number' && Number.isFinite(v)) continue;
      if (typeof v === 'string' || typeof v === 'boolean') continue;
      path.push(i);
      nonFinite(v, path, out);
      path.pop();
    }
  } else if (value !== null && typeof value === 'object') {
    for (const k in value) {
      const v = (value as Record<string, unknown>)[k];
      if (typeof v === 'number' && Number.isFinite(v)) continue;
      if (typeof v === 'string' || typeof v === 'boolean') continue;
      path.push(k);
      nonFinite(v, path, out);
      path.pop();
    }
  }
}

function zodIssues(error: z.ZodError, prefix: PropertyKey[]): CircuitIssue[] {
  return error.issues.map((iss) => ({ path: formatPath([...prefix, ...iss.path]), message: iss.message }));
}

const topSchema = circuitSchema.omit({ elements: true });

/** Validate `input` against the circuit format; throws InvalidCircuitError listing every issue. */
export function parseCircuit(input: unknown): Circuit {
  const issues: CircuitIssue[] = [];
  if (input === null || typeof input !== 'object' || Array.isArray(input)) {
    throw new InvalidCircuitError('a circuit must be a JSON object with "format": "wyeward-circuit"', [{ path: '(root)', message: 'expected a JSON object' }]);
  }
  nonFinite(input, [], issues);
  if (issues.length > 0) throw invalid(issues);
  const raw = input as Record<string, unknown>;
  const { elements: rawElements, ...rest } = raw;
  const top = topSchema.safeParse(rest);
  if (!top.success) issues.push(...zodIssues(top.error, []));
  const elements: Circuit['elements'] = [];
  const elementIds: string[] = [];
  if (!Array.isArray(rawElements)) {
    issues.push({ path: 'elements', message: 'expected an array of elements' });
  } else {
    rawElements.forEach((el, i) => {
      if (el === null || typeof el !== 'object' || Array.isArray(el)) {
        issues.push({ path: `elements[${i}]`, message: 'expected an element object with a "type"' });
        return;
      }
      const type = (el as { type?: unknown }).type;
      const id = (el as { id?: unknown }).id;
      const label = typeof id === 'string' ? ` (id "${id}")` : '';
      if (typeof type !== 'string') {
        issues.push({ path: `elements[${i}].type`, message: `missing element type${label}` });
        return;
      }
      if (!(ELEMENT_TYPES as string[]).includes(type)) {
        issues.push({ path: `elements[${i}].type`, message: `unknown element type "${type}"${label}; known types: ${ELEMENT_TYPES.join(', ')}` });
        if (typeof id === 'string') elementIds.push(id);
        return;
      }
      const fast = fastParsePrimitive(el as Record<string, unknown>);
      if (fast) {
        elements.push(fast as Circuit['elements'][number]);
        elementIds.push(fast.id as string);
        return;
      }
      const parsed = elementSchemas[type as ElementType].safeParse(el);
      if (!parsed.success) {
        issues.push(...zodIssues(parsed.error, ['elements', i]).map((x) => ({ ...x, message: `${x.message}${label}` })));
        if (typeof id === 'string') elementIds.push(id);
        return;
      }
      elements.push(parsed.data as Circuit['elements'][number]);
      elementIds.push(parsed.data.id);
    });
  }
  const seen = new Set<string>();
  elementIds.forEach((id) => {
    if (seen.has(id)) issues.push({ path: 'elements', message: `duplicate element id "${id}"` });
    seen.add(id);
  });
  if (issues.length > 0) throw invalid(issues);
  return { ...(top.data as Omit<Circuit, 'elements'>), elements };
}

/**
 * One element as `parseCircuit` validates it inside a circuit (finite numbers, a known type, the
 * primitives' fast path, else its zod schema): the parsed element, or null when it has any issue
 * (the caller then validates the whole circuit for the issues' wording and paths).
 */
export function parseElement(el: unknown): Circuit['elements'][number] | null {
  if (el === null || typeof el !== 'object' || Array.isArray(el)) return null;
  const issues: CircuitIssue[] = [];
  nonFinite(el, [], issues);
  if (issues.length > 0) return null;
  const type = (el as { type?: unknown }).type;
  if (typeof type !== 'string' || !(ELEMENT_TYPES as string[]).includes(type)) return null;
  const fast = fastParsePrimitive(el as Record<string, unknown>);
  if (fast) return fast as Circuit['elements'][number];
  const parsed = elementSchemas[type as ElementType].safeParse(el);
  return parsed.success ? (parsed.data as Circuit['elements'][number]) : null;
}

function invalid(issues: CircuitIssue[]): InvalidCircuitError {
  const first = issues[0];
  const more = issues.length > 1 ? ` (and ${issues.length - 1} more problem${issues.length > 2 ? 's' : ''})` : '';
  return new InvalidCircuitError(`invalid circuit: ${first.path}: ${first.message}${more}`, issues);
}
