/**
 * Automatic placement for circuits saved without a layout (the demo studies): a top-down single-line
 * arrangement. Sources sit above their bus; loads, capacitor banks, faults and electrodes hang in a
 * row below it; a line, switch or transformer sits in that row too and its far bus one tier lower.
 * Nodes that already have a stored position keep it.
 */
import { elementPorts } from './ports.ts';
import { isBusNode, isElementNode, type WorkspaceEdge, type WorkspaceNode } from './types.ts';

export const TIER_PX = 250;
export const SLOT_PX = 130;
const BUS_MIN_PX = 280;

/** Returns the nodes with positions: stored ones from `positions` (keyed by `positionKey`), the rest laid out. */
export function autoLayout(nodes: WorkspaceNode[], edges: WorkspaceEdge[], positions: Record<string, { x: number; y: number }>): WorkspaceNode[] {
  const key = (n: WorkspaceNode) => (isBusNode(n) ? `bus:${n.data.name}` : n.id);
  const byId = new Map(nodes.map((n) => [n.id, n] as const));
  // element id → port id → bus node id
  const wires = new Map<string, Map<string, string>>();
  for (const e of edges) {
    const s = byId.get(e.source);
    const t = byId.get(e.target);
    if (!s || !t) continue;
    const [el, port, bus] = isElementNode(s) && isBusNode(t) ? [s, e.sourceHandle ?? '', t] : isBusNode(s) && isElementNode(t) ? [t, e.targetHandle ?? '', s] : [null, '', null];
    if (!el || !bus) continue;
    const m = wires.get(el.id) ?? new Map<string, string>();
    m.set(port, bus.id);
    wires.set(el.id, m);
  }

  const above = new Map<string, string[]>(); // bus → element ids drawn above it
  const below = new Map<string, string[]>(); // bus → element ids drawn below it
  const downstream = new Map<string, { element: string; bus: string }[]>();
  const push = (m: Map<string, string[]>, k: string, v: string) => m.set(k, [...(m.get(k) ?? []), v]);
  const placedUnder = new Set<string>();
  for (const n of nodes) {
    if (!isElementNode(n)) continue;
    const ports = elementPorts(n.data.element);
    const w = wires.get(n.id);
    if (!w) continue;
    const topPort = ports.find((p) => p.side === 'top' && w.has(p.id));
    const bottomPort = ports.find((p) => p.side === 'bottom' && w.has(p.id));
    if (topPort && bottomPort) {
      const up = w.get(topPort.id)!;
      push(below, up, n.id);
      downstream.set(up, [...(downstream.get(up) ?? []), { element: n.id, bus: w.get(bottomPort.id)! }]);
      placedUnder.add(n.id);
    } else if (topPort) {
      push(below, w.get(topPort.id)!, n.id);
      placedUnder.add(n.id);
    } else if (bottomPort) {
      push(above, w.get(bottomPort.id)!, n.id);
      placedUnder.add(n.id);
    }
  }

  // Tiers of buses, breadth first from the buses that have sources above them.
  const buses = nodes.filter(isBusNode);
  const tier = new Map<string, number>();
  const roots = buses.filter((b) => (above.get(b.id) ?? []).some((id) => !downstream.has(id)) || !hasUpstream(b.id, downstream));
  const queue = roots.map((b) => b.id);
  for (const r of queue) tier.set(r, 0);
  while (queue.length > 0) {
    const b = queue.shift()!;
    for (const d of downstream.get(b) ?? []) {
      if (!tier.has(d.bus)) {
        tier.set(d.bus, tier.get(b)! + 1);
        queue.push(d.bus);
      }
    }
  }
  for (const b of buses) if (!tier.has(b.id)) tier.set(b.id, 0);

  const pos = new Map<string, { x: number; y: number }>();
  const rowCursor = new Map<number, number>();
  const place = (busId: string, wantX: number) => {
    if (pos.has(busId)) return;
    const t = tier.get(busId) ?? 0;
    const x = Math.max(wantX, rowCursor.get(t) ?? 0);
    const y = 150 + t * TIER_PX;
    pos.set(busId, { x, y });
    const hanging = below.get(busId) ?? [];
    const width = Math.max(BUS_MIN_PX, hanging.length * SLOT_PX + 40, (above.get(busId) ?? []).length * SLOT_PX + 40);
    rowCursor.set(t, x + width + 60);
    (above.get(busId) ?? []).forEach((id, i) => pos.set(id, { x: x + 20 + i * SLOT_PX, y: y - 120 }));
    // Series elements last in the row, so their far buses line up under them.
    const sorted = [...hanging].sort((a, b) => Number(downstream.get(busId)?.some((d) => d.element === a) ?? false) - Number(downstream.get(busId)?.some((d) => d.element === b) ?? false));
    sorted.forEach((id, i) => pos.set(id, { x: x + 20 + i * SLOT_PX, y: y + 105 }));
    for (const d of downstream.get(busId) ?? []) {
      const ex = pos.get(d.element)?.x ?? x;
      if ((tier.get(d.bus) ?? 0) > t) place(d.bus, ex - 20);
    }
  };
  for (const b of [...buses].sort((a, b) => (tier.get(a.id) ?? 0) - (tier.get(b.id) ?? 0))) place(b.id, 0);

  let spare = 0;
  return nodes.map((n) => {
    const stored = positions[key(n)];
    if (stored) return { ...n, position: { x: stored.x, y: stored.y } };
    const p = pos.get(n.id) ?? (placedUnder.has(n.id) ? undefined : { x: spare++ * SLOT_PX, y: 0 });
    return { ...n, position: p ?? { x: spare++ * SLOT_PX, y: 0 } };
  });
}

function hasUpstream(busId: string, downstream: Map<string, { element: string; bus: string }[]>): boolean {
  for (const list of downstream.values()) if (list.some((d) => d.bus === busId)) return true;
  return false;
}
