/**
 * Engine circuit (+ optional stored layout) → canvas nodes and edges. The inverse of
 * `canvasToCircuit`: the private switches that carry an opened connection become the open state
 * of that connection again, a line's `open` list sits on its sending-end wire, and circuits
 * without a layout (the demo studies) are laid out automatically.
 */
import type { CircuitElementInput, CircuitInput } from '../../../../shared/engine/index.ts';
import { autoLayout } from './auto-layout.ts';
import { PRIVATE_SEP, privateBusName, privateSwitchId } from './canvas-to-circuit.ts';
import { defaultSettings, type StudySettings, type WorkspaceLayout } from './layout.ts';
import { elementPorts } from './ports.ts';
import type { BusNode, Conductor, ElementNode, WorkspaceEdge, WorkspaceNode } from './types.ts';

/** Canvas node id of a bus. */
export function busNodeId(name: string): string {
  return `bus:${name}`;
}

/** Key of a node's position in the stored layout (buses by name, so a renamed bus keeps nothing stale). */
export function positionKey(n: WorkspaceNode): string {
  return n.data.kind === 'bus' ? busNodeId(n.data.name) : n.id;
}

/** Edge id of an element port's wire. */
export function wireId(elementId: string, port: string): string {
  return `${elementId}:${port}`;
}

/** Accessible name of a wire, from the names in force when it is drawn. */
export function wireLabel(elementId: string, busName: string): string {
  return `Connection ${elementId} to bus ${busName}`;
}

export interface CircuitToCanvasResult {
  nodes: WorkspaceNode[];
  edges: WorkspaceEdge[];
  settings: StudySettings;
}

interface Opened {
  bus: string;
  open: Conductor[];
}

/** Splits `B.c` into a bus and a conductor, or null for a free-form node. */
function splitNode(node: string): { bus: string; conductor: Conductor } | null {
  const m = /^([^.\s]+)\.(a|b|c|n|1|2)$/.exec(node);
  return m ? { bus: m[1], conductor: m[2] as Conductor } : null;
}

/** Buses on which something says "split-phase" (legs 1 and 2), spread across lines and switches. */
function splitPhaseBuses(elements: CircuitElementInput[], resolve: (bus: string) => string): Set<string> {
  const split = new Set<string>();
  for (const el of elements) {
    if (el.type === 'splitPhaseSource') split.add(resolve(el.bus));
    if (el.type === 'splitPhaseTransformer') split.add(resolve(el.to));
    if (el.type === 'load' && el.between?.some((c) => c === '1' || c === '2')) split.add(resolve(el.bus));
    if (el.type === 'earthing') {
      const s = splitNode(el.node);
      if (s && (s.conductor === '1' || s.conductor === '2')) split.add(resolve(s.bus));
    }
  }
  for (let changed = true; changed; ) {
    changed = false;
    for (const el of elements) {
      if (el.type !== 'line' && el.type !== 'switch3') continue;
      const a = resolve(el.from);
      const b = resolve(el.to);
      if (split.has(a) !== split.has(b)) {
        split.add(a);
        split.add(b);
        changed = true;
      }
    }
  }
  return split;
}

/** Builds canvas nodes and edges for a circuit, placing nodes from `layout` or automatically. */
export function circuitToCanvas(circuit: CircuitInput, layout?: WorkspaceLayout | null): CircuitToCanvasResult {
  const all = circuit.elements;
  const ids = new Set(all.map((e) => e.id));

  // Private switches (an opened connection of an element) fold back into their wire.
  const opened = new Map<string, Opened>();
  const hidden = new Set<string>();
  for (const el of all) {
    if (el.type !== 'switch3' || !el.id.includes(PRIVATE_SEP)) continue;
    const parts = el.id.split(PRIVATE_SEP);
    if (parts.length !== 3 || parts[2] !== 'sw') continue;
    const [owner, field] = parts;
    if (!ids.has(owner) || el.id !== privateSwitchId(owner, field) || el.to !== privateBusName(owner, field)) continue;
    const conds = (el.conductors ?? ['a', 'b', 'c', 'n']) as Conductor[];
    const open = el.closed === false ? conds : ((el.open ?? []) as Conductor[]);
    opened.set(`${owner}${PRIVATE_SEP}${field}`, { bus: el.from, open });
    hidden.add(el.id);
  }
  const resolve = (bus: string) => opened.get(bus)?.bus ?? bus;
  const elements = all.filter((e) => !hidden.has(e.id));

  // Buses: every bus an element names, plus the circuit's bus list.
  const busNames: string[] = [];
  const addBus = (name: string | undefined) => {
    if (!name) return;
    const r = resolve(name);
    if (!busNames.includes(r)) busNames.push(r);
  };
  for (const el of elements) {
    const e = el as Record<string, unknown>;
    for (const f of ['bus', 'from', 'to'] as const) if (typeof e[f] === 'string' && elementPorts(el).some((p) => p.field === f)) addBus(e[f] as string);
    if (el.type === 'earthing') addBus(splitNode(el.node)?.bus);
  }
  for (const b of circuit.buses ?? []) addBus(b.name);
  const split = splitPhaseBuses(elements, resolve);
  const info = new Map((circuit.buses ?? []).map((b) => [b.name, b] as const));

  const nodes: WorkspaceNode[] = busNames.map<BusNode>((name) => ({
    id: busNodeId(name),
    type: 'bus',
    position: { x: 0, y: 0 },
    data: {
      kind: 'bus',
      name,
      splitPhase: split.has(name),
      ...(info.get(name)?.kvLL !== undefined ? { kvLL: info.get(name)!.kvLL } : {}),
      ...(info.get(name)?.label ? { label: info.get(name)!.label } : {}),
    },
  }));

  const edges: WorkspaceEdge[] = [];
  const stored = layout?.edges ?? {};
  for (const el of elements) {
    const data = structuredClone(el) as CircuitElementInput;
    const lineOpen = el.type === 'line' ? ((el.open ?? []) as Conductor[]) : [];
    if (data.type === 'line') delete data.open;
    nodes.push({ id: el.id, type: 'element', position: { x: 0, y: 0 }, data: { kind: 'element', element: data } } satisfies ElementNode);
    for (const port of elementPorts(el)) {
      const raw = port.field === 'node' ? (el as { node: string }).node : ((el as Record<string, unknown>)[port.field] as string);
      let bus: string;
      let conductor: Conductor | null = null;
      if (port.field === 'node') {
        const s = splitNode(raw);
        if (!s) continue;
        bus = s.bus;
        conductor = s.conductor;
      } else {
        bus = raw;
        if (port.terminal !== undefined) {
          const pair = el.type === 'load' ? el.between : el.type === 'splitPhaseTransformer' ? el.primary : undefined;
          conductor = (pair?.[port.terminal] as Conductor | undefined) ?? null;
        }
      }
      const priv = opened.get(bus);
      const realBus = resolve(bus);
      if (!busNames.includes(realBus)) continue;
      let open: Conductor[] = priv ? priv.open.filter((c) => conductor === null || c === conductor) : [];
      if (el.type === 'line' && port.id === 'from') open = lineOpen;
      const id = wireId(el.id, port.id);
      const handle = conductor ?? stored[id]?.busHandle ?? (port.side === 'bottom' ? 'all' : 'allb');
      edges.push({ id, type: 'wire', source: el.id, sourceHandle: port.id, target: busNodeId(realBus), targetHandle: handle, data: { open } });
    }
  }

  const positioned = autoLayout(nodes, edges, layout?.positions ?? {});
  const settings: StudySettings = {
    ...defaultSettings(),
    frequencyHz: circuit.frequencyHz,
    sequence: circuit.sequence ?? 'ABC',
    ...(circuit.limits ? { limits: { set: circuit.limits.set ?? 'ansi-c84.1', ...circuit.limits } } : {}),
    ...(circuit.name ? { name: circuit.name } : {}),
    ...(circuit.description ? { description: circuit.description } : {}),
    ...(circuit.cases ? { cases: circuit.cases } : {}),
    ...(layout ? { shiftConvention: layout.shiftConvention, wiringStandard: layout.wiringStandard } : inferConvention(elements)),
    ...(layout?.perUnit ? { perUnit: layout.perUnit } : {}),
  };
  return { nodes: positioned, edges, settings };
}

/** With no stored layout, state the convention the circuit's transformers use. */
function inferConvention(elements: CircuitElementInput[]): Partial<StudySettings> {
  const t = elements.find((e) => e.type === 'transformer');
  if (t && t.type === 'transformer' && t.vectorGroup) return { shiftConvention: 'iec', wiringStandard: 'iec-60445' };
  return {};
}

/** The layout to store beside the circuit for the current canvas. */
export function canvasLayout(nodes: WorkspaceNode[], edges: WorkspaceEdge[], settings: StudySettings, viewport?: { x: number; y: number; zoom: number }): WorkspaceLayout {
  const positions: WorkspaceLayout['positions'] = {};
  for (const n of nodes) positions[positionKey(n)] = { x: Math.round(n.position.x), y: Math.round(n.position.y) };
  const edgeInfo: WorkspaceLayout['edges'] = {};
  for (const e of edges) {
    edgeInfo[e.id] = { ...(e.targetHandle ? { busHandle: e.targetHandle } : {}), ...(e.data?.open?.length ? { open: e.data.open } : {}) };
  }
  return {
    kind: 'wyeward-layout',
    version: 1,
    positions,
    edges: edgeInfo,
    ...(viewport ? { viewport } : {}),
    shiftConvention: settings.shiftConvention,
    wiringStandard: settings.wiringStandard,
    ...(settings.perUnit ? { perUnit: settings.perUnit } : {}),
  };
}
