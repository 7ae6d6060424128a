/**
 * Preparing a circuit that differs from an already prepared one in a few elements, without
 * validating and expanding the whole circuit again: a live edit (one load's kW) or a sweep point.
 *
 * The changed elements are validated one by one (the format validates element by element, so this
 * finds what validating the whole file would; an id that changes is checked against the others)
 * and re-expanded; their primitives are swapped into the prepared list when the new expansion has
 * the same shape (same primitive ids, kinds, nodes, roles and switch states: then the earth-bond
 * merge, the id check and the switch-node check come out as for the base) and no changed element
 * sets bus nominals (sources and transformers, whose values every other element's expansion may
 * read). Otherwise the circuit is expanded whole (still without re-validating the unchanged
 * elements); where a changed element does not pass, the whole raw circuit goes through
 * `prepareCircuit`, whose error names the element and field as it always does.
 */
import type { ExpandContext, Expansion } from './blocks/expansion.ts';
import { expandElement } from './blocks/expand.ts';
import { primitiveNodes } from './results/terminal-currents.ts';
import type { Circuit, CircuitInput, ElementType } from './schema/circuit.ts';
import { parseElement } from './schema/parse-circuit.ts';
import { prepareCircuit, prepareParsedCircuit, type PreparedCircuit } from './solve-circuit.ts';

/** A prepared circuit; `changed`: the positions in `primitives` that differ from the base's (undefined: any may, the list was built afresh). */
export interface PreparedChange extends PreparedCircuit {
  changed?: number[];
}

/** Elements whose values set bus nominals (expandContext): a change to one expands the circuit whole. */
export const SETS_NOMINALS: ReadonlySet<ElementType> = new Set<ElementType>(['source', 'splitPhaseSource', 'transformer', 'splitPhaseTransformer']);

/** What decides the earth-bond merge, the id check and the switch-node check of an expansion: per primitive its kind, id, role, nodes and switch state. */
export function expansionShape(e: Expansion): string {
  let s = '';
  for (const t of e.primitives) s += `${t.prim.type}|${t.prim.id}|${t.role ?? ''}|${primitiveNodes(t.prim).join(',')}|${t.prim.type === 'switch' ? t.prim.closed : ''};`;
  return s;
}

/** Per expansion, where each of its primitives sits in the prepared list (-1: merged into an earlier earth bond, not solved). */
export function primitivePositions(expansions: readonly Expansion[]): number[][] {
  let p = 0;
  return expansions.map((e) => e.primitives.map((t) => (t.mergedInto === undefined ? p++ : -1)));
}

/**
 * `circuit` (the base's circuit with the elements at `at` replaced by parsed ones) with those
 * elements re-expanded and their primitives swapped into the base's list; null when that cannot
 * be done (an element sets nominals, does not expand, or its expansion changed shape) and the
 * circuit must be expanded whole. `positions(i)` and `shapeOf(i)`: the base's, of element i.
 */
export function swapExpanded(base: PreparedCircuit, circuit: Circuit, at: readonly number[], positions: (i: number) => readonly number[], shapeOf: (i: number) => string): PreparedChange | null {
  for (const i of at) if (SETS_NOMINALS.has(base.circuit.elements[i].type) || SETS_NOMINALS.has(circuit.elements[i].type)) return null;
  const context: ExpandContext = { ...base.context, circuit };
  const expansions = base.expansions.slice();
  const primitives = base.primitives.slice();
  const changed: number[] = [];
  for (const i of at) {
    let e: Expansion;
    try {
      e = expandElement(circuit.elements[i], context);
    } catch {
      return null; // its error, as the whole circuit's expansion words it
    }
    if (expansionShape(e) !== shapeOf(i)) return null;
    const was = base.expansions[i].primitives;
    const pos = positions(i);
    e.primitives.forEach((t, j) => {
      if (was[j].mergedInto !== undefined) t.mergedInto = was[j].mergedInto;
      else {
        primitives[pos[j]] = t.prim;
        changed.push(pos[j]);
      }
    });
    expansions[i] = e;
  }
  return { circuit, context, expansions, primitives, changed };
}

/**
 * `prepareCircuit(raw)`, given `base`, the prepared circuit of a raw circuit that differs from `raw`
 * only in the elements at positions `at` (same number of elements, every other field the same).
 * Same result, same errors; `changed` says which primitives differ from the base's when only
 * those were swapped.
 */
export function prepareChanged(base: PreparedCircuit, raw: CircuitInput, changedAt: readonly number[]): PreparedChange {
  const at = [...new Set(changedAt)];
  if (at.length === 0) return { ...base, changed: [] };
  const rawEls = raw.elements as unknown[];
  if (rawEls.length !== base.circuit.elements.length) return prepareCircuit(raw);
  const elements = base.circuit.elements.slice();
  let idsChanged = false;
  for (const i of at) {
    const el = parseElement(rawEls[i]);
    if (!el) return prepareCircuit(raw); // the whole circuit's issues, worded and placed as always
    if (el.id !== elements[i].id) idsChanged = true;
    elements[i] = el;
  }
  if (idsChanged) {
    const seen = new Set<string>();
    for (const el of elements) {
      if (seen.has(el.id)) return prepareCircuit(raw); // a duplicate id, reported as always
      seen.add(el.id);
    }
  }
  const circuit: Circuit = { ...base.circuit, elements };
  let positions: number[][] | null = null;
  const swapped = swapExpanded(base, circuit, at, (i) => (positions ??= primitivePositions(base.expansions))[i], (i) => expansionShape(base.expansions[i]));
  return swapped ?? prepareParsedCircuit(circuit);
}
