/**
 * Canvas → engine circuit. Pure: the same nodes, edges and settings always give the same circuit.
 * Each element port wired to a bus sets that element field; a wire with opened conductors becomes
 * an engine `switch3` (with `open`) between the bus and a private terminal bus of the element
 * (`<id>~<field>`), or the line's own `open` list for a line, so one click opens a neutral.
 * Element ids equal canvas node ids, so results and errors naming an id find their node.
 */
import type { CircuitElementInput, CircuitInput } from '../../../../shared/engine/index.ts';
import type { StudySettings } from './layout.ts';
import { elementPorts, isBundleHandle, type PortSpec } from './ports.ts';
import { busConductors, isBusNode, isElementNode, type BusNode, type Conductor, type ElementNode, type WorkspaceEdge, type WorkspaceNode } from './types.ts';

/** Separator of generated names; bus names and ids the user types never contain it. */
export const PRIVATE_SEP = '~';

/** Name of an element's private terminal bus behind an opened connection. */
export function privateBusName(elementId: string, field: string): string {
  return `${elementId}${PRIVATE_SEP}${field}`;
}

/** Id of the switch that carries an opened connection. */
export function privateSwitchId(elementId: string, field: string): string {
  return `${elementId}${PRIVATE_SEP}${field}${PRIVATE_SEP}sw`;
}

/** Something on the canvas that keeps an element out of the circuit, said in plain words. */
export interface ConversionProblem {
  nodeId: string;
  message: string;
}

/** Relates canvas ids and engine names both ways. */
export interface CanvasMap {
  /** Bus name (including private terminal buses) → canvas node id (a private bus maps to its element). */
  busToNode: Record<string, string>;
  /** Canvas bus node id → bus name. */
  nodeToBus: Record<string, string>;
  /** Engine element id (including generated switches) → canvas node id. */
  elementToNode: Record<string, string>;
  /** Generated switch id → the edge it stands for. */
  switchToEdge: Record<string, string>;
}

export interface CanvasToCircuitResult {
  circuit: CircuitInput;
  map: CanvasMap;
  problems: ConversionProblem[];
}

interface Landing {
  edge: WorkspaceEdge;
  bus: BusNode;
  /** Conductor for a single-conductor bus handle; null for a bundled handle. */
  conductor: Conductor | null;
}

/** The element-side node id, element port, bus-side node and bus handle of an edge, whatever way it was drawn. */
export function edgeEnds(edge: WorkspaceEdge, nodesById: Map<string, WorkspaceNode>) {
  const s = nodesById.get(edge.source);
  const t = nodesById.get(edge.target);
  if (!s || !t) return null;
  if (isElementNode(s) && isBusNode(t)) return { element: s, port: edge.sourceHandle ?? '', bus: t, busHandle: edge.targetHandle ?? 'all' };
  if (isBusNode(s) && isElementNode(t)) return { element: t, port: edge.targetHandle ?? '', bus: s, busHandle: edge.sourceHandle ?? 'all' };
  return null;
}

function sortConductors(cs: Iterable<Conductor>): Conductor[] {
  const order: Conductor[] = ['a', 'b', 'c', 'n', '1', '2'];
  const set = new Set(cs);
  return order.filter((c) => set.has(c));
}

/** What one element node contributes to the circuit: its element(s), map entries and problems, in order. */
export interface ElementConversion {
  /** The element as wired, then any generated switches; empty when a port is unwired. */
  elements: CircuitElementInput[];
  busToNode: [string, string][];
  elementToNode: [string, string][];
  switchToEdge: [string, string][];
  problems: ConversionProblem[];
}

/**
 * Reuses the conversion of element nodes whose data object and wiring did not change (see
 * `canvasToCircuit`'s `cache`). Keyed by the node's data object (documents are never mutated), so
 * entries go with the nodes that held them.
 */
export type ElementConversionCache = WeakMap<object, { id: string; wiring: string; out: ElementConversion }>;

/** Everything an element node's conversion reads besides its own data: its wires, the buses they land on, what is open. */
function wiringKey(perPort: Map<string, Landing[]> | undefined): string {
  if (!perPort) return '';
  const parts: string[] = [];
  for (const [port, list] of perPort) {
    for (const l of list) parts.push(`${port}\u0001${l.edge.id}\u0001${l.bus.id}\u0001${l.bus.data.name}\u0001${l.bus.data.splitPhase ? 1 : 0}\u0001${l.conductor ?? ''}\u0001${(l.edge.data?.open ?? []).join(',')}`);
  }
  return parts.join('\u0002');
}

/**
 * Builds the engine circuit from the canvas; elements with an unwired port are left out and reported.
 * With a `cache`, an element node whose data object and wiring are those of an earlier call gives
 * back the same (unmutated) element objects as then, so an edit converts only what it touched; the
 * result is equal to a conversion without the cache (tests/src/features/workspace/model/
 * incremental-conversion.test.ts). Without one, every element is a fresh copy.
 */
export function canvasToCircuit(nodes: WorkspaceNode[], edges: WorkspaceEdge[], settings: StudySettings, cache?: ElementConversionCache): CanvasToCircuitResult {
  const nodesById = new Map(nodes.map((n) => [n.id, n] as const));
  const map: CanvasMap = { busToNode: {}, nodeToBus: {}, elementToNode: {}, switchToEdge: {} };
  const problems: ConversionProblem[] = [];
  const elements: CircuitElementInput[] = [];

  for (const n of nodes) {
    if (isBusNode(n)) {
      map.busToNode[n.data.name] = n.id;
      map.nodeToBus[n.id] = n.data.name;
    }
  }

  // Landings per element port.
  const landings = new Map<string, Map<string, Landing[]>>();
  for (const edge of edges) {
    const ends = edgeEnds(edge, nodesById);
    if (!ends) continue;
    const perPort = landings.get(ends.element.id) ?? new Map<string, Landing[]>();
    const list = perPort.get(ends.port) ?? [];
    list.push({ edge, bus: ends.bus, conductor: isBundleHandle(ends.busHandle) ? null : (ends.busHandle as Conductor) });
    perPort.set(ends.port, list);
    landings.set(ends.element.id, perPort);
  }

  for (const n of nodes) {
    if (!isElementNode(n)) continue;
    const perPort = landings.get(n.id);
    let out: ElementConversion;
    if (cache) {
      const wiring = wiringKey(perPort);
      const hit = cache.get(n.data);
      if (hit && hit.id === n.id && hit.wiring === wiring) out = hit.out;
      else cache.set(n.data, { id: n.id, wiring, out: (out = convertElement(n, perPort)) });
    } else out = convertElement(n, perPort);
    elements.push(...out.elements);
    for (const [k, v] of out.busToNode) map.busToNode[k] = v;
    for (const [k, v] of out.elementToNode) map.elementToNode[k] = v;
    for (const [k, v] of out.switchToEdge) map.switchToEdge[k] = v;
    problems.push(...out.problems);
  }

  const buses = nodes
    .filter(isBusNode)
    .filter((b) => b.data.kvLL !== undefined || b.data.label)
    .map((b) => ({ name: b.data.name, ...(b.data.kvLL !== undefined ? { kvLL: b.data.kvLL } : {}), ...(b.data.label ? { label: b.data.label } : {}) }));

  const circuit: CircuitInput = {
    format: 'wyeward-circuit',
    version: 1,
    frequencyHz: settings.frequencyHz,
    ...(settings.name ? { name: settings.name } : {}),
    ...(settings.description ? { description: settings.description } : {}),
    sequence: settings.sequence,
    ...(buses.length > 0 ? { buses } : {}),
    ...(settings.limits ? { limits: settings.limits as CircuitInput['limits'] } : {}),
    elements,
    ...(settings.cases ? { cases: settings.cases as CircuitInput['cases'] } : {}),
  };
  return { circuit, map, problems };
}

/** One element node as wired (`perPort`: the wires landed on each of its ports). */
function convertElement(n: ElementNode, perPort: Map<string, Landing[]> = new Map()): ElementConversion {
  const out: ElementConversion = { elements: [], busToNode: [], elementToNode: [], switchToEdge: [], problems: [] };
  const problems = out.problems;
  const el = structuredClone(n.data.element) as Record<string, unknown> & CircuitElementInput;
  el.id = n.id;
  const ports = elementPorts(el);
  if (ports.length === 0) {
    // A primitive: its node names are its own.
    out.elements.push(el);
    out.elementToNode.push([n.id, n.id]);
    return out;
  }
  const extra: CircuitElementInput[] = [];
  let ok = true;
  const lineOpen = new Set<Conductor>();

  // Group ports by element field (two terminals of a pair share one field).
  const byField = new Map<string, PortSpec[]>();
  for (const p of ports) byField.set(p.field, [...(byField.get(p.field) ?? []), p]);

  for (const [field, fieldPorts] of byField) {
    const landed: Landing[] = [];
    for (const p of fieldPorts) {
      const list = perPort.get(p.id) ?? [];
      if (list.length === 0) {
        problems.push({ nodeId: n.id, message: `${n.id} is not connected: wire its ${describePort(el, p)} to a bus.` });
        ok = false;
        continue;
      }
      if (list.length > 1) {
        problems.push({ nodeId: n.id, message: `${n.id}: its ${describePort(el, p)} has more than one wire; keep one.` });
        ok = false;
        continue;
      }
      landed.push(list[0]);
    }
    if (!ok || landed.length !== fieldPorts.length) continue;
    const bus = landed[0].bus;
    if (landed.some((l) => l.bus.id !== bus.id)) {
      problems.push({ nodeId: n.id, message: `${n.id}: both terminals must land on the same bus.` });
      ok = false;
      continue;
    }
    const busConds = busConductors(bus.data.splitPhase);
    let used: Conductor[];
    if (fieldPorts[0].mode === 'conductor') {
      const conds = landed.map((l) => l.conductor ?? (field === 'node' ? 'n' : null));
      if (conds.some((c) => c === null)) {
        problems.push({ nodeId: n.id, message: `${n.id}: wire each terminal to one conductor of the bus (A, B, C or N), not to the bundled port.` });
        ok = false;
        continue;
      }
      used = conds as Conductor[];
      if (fieldPorts.length === 2 && used[0] === used[1]) {
        problems.push({ nodeId: n.id, message: `${n.id}: its two terminals are on the same conductor; move one to another conductor.` });
        ok = false;
        continue;
      }
      if (el.type === 'load') (el as { between?: Conductor[] }).between = used;
      if (el.type === 'splitPhaseTransformer') (el as { primary?: Conductor[] }).primary = used;
    } else {
      used = busConds;
    }
    const open = sortConductors(landed.flatMap((l) => l.edge.data?.open ?? []).filter((c) => used.includes(c)));
    let busName = bus.data.name;
    if (open.length > 0) {
      if (el.type === 'line') {
        for (const c of open) lineOpen.add(c);
      } else {
        const priv = privateBusName(n.id, field);
        const swId = privateSwitchId(n.id, field);
        extra.push({ type: 'switch3', id: swId, from: bus.data.name, to: priv, conductors: sortConductors(used), closed: true, open });
        out.busToNode.push([priv, n.id]);
        out.elementToNode.push([swId, n.id]);
        out.switchToEdge.push([swId, landed.find((l) => (l.edge.data?.open ?? []).length > 0)!.edge.id]);
        busName = priv;
      }
    }
    if (field === 'node') (el as { node?: string }).node = `${busName}.${used[0]}`;
    else (el as Record<string, unknown>)[field] = busName;
  }
  if (!ok) return out;
  if (el.type === 'line') {
    const own = ((el as { open?: Conductor[] }).open ?? []) as Conductor[];
    const all = sortConductors([...own, ...lineOpen]);
    if (all.length > 0) (el as { open?: Conductor[] }).open = all;
    else delete (el as { open?: Conductor[] }).open;
  }
  out.elements.push(el, ...extra);
  out.elementToNode.push([n.id, n.id]);
  return out;
}

function describePort(el: CircuitElementInput, p: PortSpec): string {
  if (p.mode === 'conductor' && p.terminal !== undefined) return `terminal ${p.label}`;
  if (el.type === 'transformer') return p.id === 'from' ? 'HV side' : 'LV side';
  if (p.id === 'from') return 'sending end';
  if (p.id === 'to') return el.type === 'splitPhaseTransformer' ? 'secondary' : 'receiving end';
  return 'port';
}
