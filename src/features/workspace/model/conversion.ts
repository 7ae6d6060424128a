/**
 * The document as the engine sees it: the circuit of a workspace document (cached while only
 * positions change, so a drag costs no conversion per frame), what saving would store, and the
 * element-level differences shown when someone else saved first.
 */
import type { StudyDetail } from '../../../../shared/api/studies.ts';
import { circuitSchema, type CircuitElementInput, type CircuitInput } from '../../../../shared/engine/index.ts';
import { PRIVATE_SEP, canvasToCircuit, type ElementConversionCache } from './canvas-to-circuit.ts';
import { canvasLayout, circuitToCanvas } from './circuit-to-canvas.ts';
import type { WorkspaceDoc } from './document.ts';
import { readLayout, type StudySettings } from './layout.ts';
import { isElementNode, type WorkspaceEdge } from './types.ts';

/** The differences of element sets between two circuits, by element. */
export interface CircuitDifferences {
  added: string[];
  removed: string[];
  changed: string[];
}

/** The workspace document of a stored study. */
export function docOf(study: StudyDetail): WorkspaceDoc {
  const { nodes, edges, settings } = circuitToCanvas(study.content.circuit, readLayout(study.content.layout));
  return { nodes, edges, settings };
}

/** Differences of element sets between two circuits (for the conflict dialog), compared with the engine's defaults applied. */
export function compareCircuits(mine: CircuitInput, theirs: CircuitInput): CircuitDifferences {
  const canon = (c: CircuitInput) => {
    const parsed = circuitSchema.safeParse(c);
    const elements = (parsed.success ? parsed.data.elements : c.elements) as { id: string }[];
    const out = new Map<string, string>();
    for (const e of elements) {
      // An opened connection is a generated switch: it counts as a change of its element.
      const owner = e.id.includes(PRIVATE_SEP) ? e.id.split(PRIVATE_SEP)[0] : e.id;
      out.set(owner, (out.get(owner) ?? '') + JSON.stringify(e));
    }
    return out;
  };
  const a = canon(mine);
  const b = canon(theirs);
  return {
    added: [...b.keys()].filter((k) => !a.has(k)),
    removed: [...a.keys()].filter((k) => !b.has(k)),
    changed: [...b.keys()].filter((k) => a.has(k) && a.get(k) !== b.get(k)),
  };
}

/** A document's circuit with the maps between canvas and engine names. */
export type Conversion = ReturnType<typeof canvasToCircuit> & {
  ids: string[];
  /** Canvas element node id → its element as stored in the node (for wires that read their ports). */
  elementOf: Record<string, CircuitElementInput>;
  /** Element id → the element as wired into the circuit (phases a load sits on, buses): what labels show. */
  wiredOf: Record<string, CircuitElementInput>;
};

/**
 * canvasToCircuit depends on node data and edges, not on positions: while a node is dragged its data
 * object is kept, so the last conversion is reused.
 */
const conversionCache = new WeakMap<WorkspaceEdge[], { data: unknown[]; settings: StudySettings; result: Conversion }>();
const jsonCache = new WeakMap<object, string>();
/** Element nodes converted earlier, by data object: an edit re-converts only the elements whose data or wires it changed. */
const elementCache: ElementConversionCache = new WeakMap();

/** JSON of an object that is never mutated, computed once. */
export function json(o: object): string {
  let j = jsonCache.get(o);
  if (j === undefined) jsonCache.set(o, (j = JSON.stringify(o)));
  return j;
}

/**
 * The circuit of a document (cached per wires, node data and settings). Element objects are shared
 * with earlier conversions where node data and wiring did not change: never mutate them.
 */
export function convert(d: WorkspaceDoc): Conversion {
  const data = d.nodes.map((n) => n.data);
  const hit = conversionCache.get(d.edges);
  if (hit && hit.settings === d.settings && hit.data.length === data.length && hit.data.every((x, i) => x === data[i]) && d.nodes.every((n, i) => n.id === hit.result.ids[i])) return hit.result;
  const elementOf: Record<string, CircuitElementInput> = {};
  for (const n of d.nodes) if (isElementNode(n)) elementOf[n.id] = n.data.element;
  const converted = canvasToCircuit(d.nodes, d.edges, d.settings, elementCache);
  const wiredOf: Record<string, CircuitElementInput> = {};
  for (const e of converted.circuit.elements) if (e.id in elementOf) wiredOf[e.id] = e;
  const result: Conversion = { ...converted, ids: d.nodes.map((n) => n.id), elementOf, wiredOf };
  conversionCache.set(d.edges, { data, settings: d.settings, result });
  return result;
}

/** What saving would store, as a string (node positions rounded as the layout stores them). */
export function docKey(d: WorkspaceDoc): string {
  return json(convert(d).circuit) + JSON.stringify(canvasLayout(d.nodes, d.edges, d.settings));
}

/** The content to save for a document. */
export function contentOf(d: WorkspaceDoc, viewport?: { x: number; y: number; zoom: number }): StudyDetail['content'] {
  return { circuit: canvasToCircuit(d.nodes, d.edges, d.settings).circuit, layout: canvasLayout(d.nodes, d.edges, d.settings, viewport) };
}
