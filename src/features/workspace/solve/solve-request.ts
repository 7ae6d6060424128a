/**
 * What goes to the solve worker: after the first request, only the elements that differ from the
 * previous request's circuit. The workspace's conversion reuses the element objects of nodes an
 * edit did not touch (and keeps a circuit it did not change), so a changed element is one whose
 * object is not the previous one; other fields are compared by value. The worker keeps the circuit
 * it was sent and applies the changes (solve-handler.ts), so it validates and expands only those.
 */
import type { CircuitInput, LimitsInput } from '../../../../shared/engine/index.ts';
import type { SolveRequest } from './solve-protocol.ts';

/** Plain-data equality (JSON values). */
export function sameValue(a: unknown, b: unknown): boolean {
  if (a === b) return true;
  if (typeof a !== 'object' || typeof b !== 'object' || a === null || b === null) return false;
  if (Array.isArray(a)) {
    if (!Array.isArray(b) || a.length !== b.length) return false;
    for (let i = 0; i < a.length; i++) if (!sameValue(a[i], b[i])) return false;
    return true;
  }
  if (Array.isArray(b)) return false;
  const ka = Object.keys(a);
  if (ka.length !== Object.keys(b).length) return false;
  for (const k of ka) if (!Object.prototype.hasOwnProperty.call(b, k) || !sameValue((a as Record<string, unknown>)[k], (b as Record<string, unknown>)[k])) return false;
  return true;
}

/** Past this share of the elements changed, the whole circuit is sent (a case switched, a paste). */
const MAX_CHANGED_SHARE = 0.5;

/** The elements that differ (by object) between two circuits with the same other fields; null when more differs. */
export function changedElements(prev: CircuitInput, next: CircuitInput): number[] | null {
  const a = prev.elements as unknown[];
  const b = next.elements as unknown[];
  if (a.length !== b.length) return null;
  const keys = new Set([...Object.keys(prev), ...Object.keys(next)]);
  for (const k of keys) if (k !== 'elements' && !sameValue((prev as Record<string, unknown>)[k], (next as Record<string, unknown>)[k])) return null;
  const at: number[] = [];
  for (let i = 0; i < b.length; i++) if (a[i] !== b[i] && !sameValue(a[i], b[i])) at.push(i);
  return at.length > Math.max(4, MAX_CHANGED_SHARE * b.length) ? null : at;
}

/** Requests for one worker, in order: each but the first names only what changed since the one before. */
export function createRequestEncoder(): (req: { id: number; circuit: CircuitInput; limits?: LimitsInput }) => SolveRequest {
  let last: CircuitInput | null = null;
  return ({ id, circuit, limits }) => {
    const at = last === null ? null : changedElements(last, circuit);
    last = circuit;
    if (at === null) return { id, circuit, limits };
    const els = circuit.elements as unknown[];
    return { id, changes: { at, elements: at.map((i) => els[i]) }, limits };
  };
}
