/**
 * The workspace document and its commands: pure functions from a document (canvas nodes, wires,
 * study settings) to the next one. The page only dispatches them; each is unit-tested on its own
 * (tests/src/features/workspace/model/document.test.ts). Positions come in flow coordinates; the
 * visible part of the canvas is passed in, so new and pasted nodes land where the user looks.
 */
import type { CircuitElementInput } from '../../../../shared/engine/index.ts';
import { busNodeId, wireId } from './circuit-to-canvas.ts';
import { freshId, newElement, type PaletteItem } from './defaults.ts';
import type { StudySettings } from './layout.ts';
import { elementPorts, isBundleHandle } from './ports.ts';
import { isBusNode, isElementNode, type BusNodeData, type Conductor, type WorkspaceEdge, type WorkspaceNode } from './types.ts';

export interface WorkspaceDoc {
  nodes: WorkspaceNode[];
  edges: WorkspaceEdge[];
  settings: StudySettings;
}

/** A rectangle in flow coordinates. */
export interface Rect {
  x: number;
  y: number;
  w: number;
  h: number;
}

/**
 * What the user sees of the canvas, in flow coordinates: the view, and the parts of it covered by
 * overlays (the minimap) where nothing new should land.
 */
export interface Viewport {
  view: Rect;
  covered: Rect[];
}

/** Footprint of a node with its labels (flow units): a bus bar and its voltages, an element and the text beside it. */
export function footprint(n: WorkspaceNode): Rect {
  return isBusNode(n) ? { x: n.position.x, y: n.position.y, w: 270, h: 70 } : { x: n.position.x, y: n.position.y, w: 220, h: 100 };
}

const BUS_SIZE = { w: 270, h: 70 };
const ELEMENT_SIZE = { w: 220, h: 100 };

function overlaps(a: Rect, b: Rect): boolean {
  return a.x < b.x + b.w && a.x + a.w > b.x && a.y < b.y + b.h && a.y + a.h > b.y;
}

function inside(a: Rect, v: Rect): boolean {
  return a.x >= v.x && a.y >= v.y && a.x + a.w <= v.x + v.w && a.y + a.h <= v.y + v.h;
}

const snap = (v: number) => Math.round(v / 10) * 10;

/**
 * A free spot of `w`×`h` for a new node: beside the bus in use when asked (sources above it, loads
 * and feeders below), else the first free cell of a grid over the visible area, never under an
 * overlay; with no free cell in view, the free cell nearest the view's middle.
 */
export function freeSpot(doc: WorkspaceDoc, w: number, h: number, vp: Viewport | null, near?: 'above' | 'below'): { x: number; y: number } {
  const boxes = doc.nodes.map(footprint);
  const view = vp?.view ?? { x: 0, y: 0, w: 1200, h: 600 };
  const covered = vp?.covered ?? [];
  const ok = (r: Rect) => inside(r, view) && !boxes.some((b) => overlaps(r, b)) && !covered.some((c) => overlaps(r, c));
  const buses = doc.nodes.filter(isBusNode);
  const anchor = buses.find((b) => b.selected) ?? buses[buses.length - 1];
  if (near && anchor) {
    const y = anchor.position.y + (near === 'above' ? -120 : 105);
    for (let k = 0; k < 12; k++) {
      const r = { x: snap(anchor.position.x + 20 + k * 130), y: snap(y), w, h };
      if (ok(r)) return { x: r.x, y: r.y };
    }
  }
  return firstFree({ w, h }, view, (r) => !boxes.some((b) => overlaps(r, b)) && !covered.some((c) => overlaps(r, c)));
}

/**
 * Top-left of the first free `size` box: a grid over the view first (top-left to bottom-right),
 * then rings around the view's middle, so a full view never makes nodes stack on one spot (the page
 * then pans to show where it landed).
 */
function firstFree(size: { w: number; h: number }, view: Rect, free: (r: Rect) => boolean): { x: number; y: number } {
  const margin = 20;
  for (let y = view.y + margin; y + size.h <= view.y + view.h; y += 40) {
    for (let x = view.x + margin; x + size.w <= view.x + view.w; x += 40) {
      const r = { x: snap(x), y: snap(y), w: size.w, h: size.h };
      if (free(r)) return { x: r.x, y: r.y };
    }
  }
  const cx = view.x + view.w / 2 - size.w / 2;
  const cy = view.y + view.h / 2 - size.h / 2;
  for (let ring = 1; ring < 200; ring++) {
    for (let i = -ring; i <= ring; i++) {
      for (const [dx, dy] of [[i, -ring], [i, ring], [-ring, i], [ring, i]]) {
        const r = { x: snap(cx + dx * 60), y: snap(cy + dy * 60), w: size.w, h: size.h };
        if (free(r)) return { x: r.x, y: r.y };
      }
    }
  }
  return { x: snap(cx), y: snap(cy) };
}

/** Names and node ids in use (bus names and element ids share one namespace with node ids). */
export function takenNames(d: WorkspaceDoc): Set<string> {
  return new Set(d.nodes.flatMap((n) => (isBusNode(n) ? [n.data.name, n.id] : [n.id])));
}

const deselectAll = (d: WorkspaceDoc): WorkspaceDoc => ({
  ...d,
  nodes: d.nodes.map((n) => (n.selected ? { ...n, selected: false } : n)),
  edges: d.edges.map((e) => (e.selected ? { ...e, selected: false } : e)),
});

/** Adds a palette item, selected, at a free visible spot. */
export function addItem(doc: WorkspaceDoc, item: PaletteItem, vp: Viewport | null): WorkspaceDoc {
  const ids = takenNames(doc);
  const base = deselectAll(doc);
  if (item.kind === 'bus') {
    const name = freshId('B', ids);
    const node: WorkspaceNode = { id: busNodeId(name), type: 'bus', position: freeSpot(doc, BUS_SIZE.w, BUS_SIZE.h, vp), selected: true, data: { kind: 'bus', name, splitPhase: false } };
    return { ...base, nodes: [...base.nodes, node] };
  }
  const id = freshId(item.prefix, ids);
  const element = newElement(item, id, doc.settings.shiftConvention);
  const ports = elementPorts(element);
  const near = ports.length === 0 ? undefined : ports.every((p) => p.side === 'bottom') ? 'above' : 'below';
  const node: WorkspaceNode = { id, type: 'element', position: freeSpot(doc, ELEMENT_SIZE.w, ELEMENT_SIZE.h, vp, near), selected: true, data: { kind: 'element', element } };
  return { ...base, nodes: [...base.nodes, node] };
}

/** A connection from an element port to a bus handle (`handle`: a conductor or a bundled handle). */
export interface ConnectionEnds {
  elementId: string;
  port: string;
  busNodeId: string;
  handle: string;
}

/**
 * The element end, port and bus end of a proposed connection drawn either way, or null when it
 * cannot be made (element to element, a bundled port on one conductor, a terminal on the bundle).
 */
export function resolveConnection(doc: WorkspaceDoc, c: { source: string; target: string; sourceHandle?: string | null; targetHandle?: string | null }): ConnectionEnds | null {
  const s = doc.nodes.find((n) => n.id === c.source);
  const t = doc.nodes.find((n) => n.id === c.target);
  if (!s || !t) return null;
  const [el, port, bus, handle] = isElementNode(s) && isBusNode(t) ? [s, c.sourceHandle, t, c.targetHandle] : isBusNode(s) && isElementNode(t) ? [t, c.targetHandle, s, c.sourceHandle] : [null, null, null, null];
  if (!el || !bus || !port) return null;
  const spec = elementPorts(el.data.element).find((p) => p.id === port);
  if (!spec) return null;
  const bundle = isBundleHandle(handle);
  if (spec.mode === 'bundle' && !bundle) return null;
  if (spec.mode === 'conductor' && bundle && spec.field !== 'node') return null;
  return { elementId: el.id, port, busNodeId: bus.id, handle: handle ?? 'all' };
}

/** Wires an element port to a bus (replacing that port's wire); a split-phase source or secondary makes its bus split-phase. */
export function connect(doc: WorkspaceDoc, ends: ConnectionEnds): WorkspaceDoc {
  const elNode = doc.nodes.find((n) => n.id === ends.elementId);
  const bus = doc.nodes.find((n) => n.id === ends.busNodeId);
  if (!elNode || !isElementNode(elNode) || !bus || !isBusNode(bus)) return doc;
  const el = elNode.data.element;
  const id = wireId(ends.elementId, ends.port);
  const makesSplit = el.type === 'splitPhaseSource' || (el.type === 'splitPhaseTransformer' && ends.port === 'to');
  const nodes = makesSplit && !bus.data.splitPhase ? doc.nodes.map((n) => (n.id === bus.id && isBusNode(n) ? { ...n, data: { ...n.data, splitPhase: true } } : n)) : doc.nodes;
  const edge: WorkspaceEdge = { id, type: 'wire', source: ends.elementId, sourceHandle: ends.port, target: bus.id, targetHandle: ends.handle, data: { open: [] } };
  return { ...doc, nodes, edges: [...doc.edges.filter((e) => e.id !== id), edge] };
}

/** Replaces an element's parameters; wires to ports the element no longer has go. */
export function updateElement(doc: WorkspaceDoc, id: string, next: CircuitElementInput): WorkspaceDoc {
  const ports = new Set(elementPorts(next).map((p) => p.id));
  return {
    ...doc,
    nodes: doc.nodes.map((n) => (n.id === id && isElementNode(n) ? { ...n, data: { ...n.data, element: next } } : n)),
    edges: doc.edges.filter((e) => e.source !== id || ports.has(e.sourceHandle ?? '')),
  };
}

/** Replaces a bus's data; wires to conductors the bus no longer has go. */
export function updateBus(doc: WorkspaceDoc, id: string, next: BusNodeData): WorkspaceDoc {
  const conds = new Set(next.splitPhase ? ['1', '2', 'n', 'all', 'allb'] : ['a', 'b', 'c', 'n', 'all', 'allb']);
  return {
    ...doc,
    nodes: doc.nodes.map((n) => (n.id === id && isBusNode(n) ? { ...n, data: next } : n)),
    edges: doc.edges.filter((e) => e.target !== id || conds.has(e.targetHandle ?? 'all')),
  };
}

/** Opens a closed conductor of one wire, or closes an open one. */
export function toggleOpen(doc: WorkspaceDoc, edgeId: string, c: Conductor): WorkspaceDoc {
  return {
    ...doc,
    edges: doc.edges.map((e) => {
      if (e.id !== edgeId) return e;
      const open = e.data?.open ?? [];
      return { ...e, data: { open: open.includes(c) ? open.filter((x) => x !== c) : [...open, c] } };
    }),
  };
}

/** Deletes the selected nodes (with their wires) and the selected wires. */
export function deleteSelection(doc: WorkspaceDoc): WorkspaceDoc {
  const gone = new Set(doc.nodes.filter((n) => n.selected).map((n) => n.id));
  const edges = doc.edges.filter((e) => !e.selected && !gone.has(e.source) && !gone.has(e.target));
  if (gone.size === 0 && edges.length === doc.edges.length) return doc;
  return { ...doc, nodes: doc.nodes.filter((n) => !gone.has(n.id)), edges };
}

/** What copy keeps: the selected nodes and the wires between them. */
export interface Clip {
  nodes: WorkspaceNode[];
  edges: WorkspaceEdge[];
}

/** The selection as a clip. */
export function copySelection(doc: WorkspaceDoc): Clip {
  const nodes = doc.nodes.filter((n) => n.selected);
  const ids = new Set(nodes.map((n) => n.id));
  return { nodes, edges: doc.edges.filter((e) => ids.has(e.source) && ids.has(e.target)) };
}

/**
 * Pastes a clip under fresh names, selected: offset from the originals step by step until it
 * covers no node already there (so repeated pastes never stack on one spot), and kept in view when
 * the view is known.
 */
export function paste(doc: WorkspaceDoc, clip: Clip, vp: Viewport | null): WorkspaceDoc {
  if (clip.nodes.length === 0) return doc;
  const ids = takenNames(doc);
  const boxes = doc.nodes.map(footprint);
  const clipBoxes = clip.nodes.map(footprint);
  const minX = Math.min(...clipBoxes.map((b) => b.x));
  const minY = Math.min(...clipBoxes.map((b) => b.y));
  const free = (dx: number, dy: number) => clipBoxes.every((b) => !boxes.some((o) => overlaps({ ...b, x: b.x + dx, y: b.y + dy }, o)));
  let dx = 40;
  let dy = 40;
  for (let k = 1; k <= 200; k++) {
    dx = 40 * k;
    dy = 40 * k;
    if (vp) {
      // Walk a grid over the view, starting near the originals' offset, when the diagonal leaves the view.
      const x = minX + dx;
      const y = minY + dy;
      if (x > vp.view.x + vp.view.w - 100 || y > vp.view.y + vp.view.h - 60) {
        const spot = freeSpotForClip(clipBoxes, boxes, vp);
        dx = spot.x - minX;
        dy = spot.y - minY;
        break;
      }
    }
    if (free(dx, dy)) break;
  }
  const rename = new Map<string, string>();
  const pasted: WorkspaceNode[] = clip.nodes.map((n) => {
    const position = { x: n.position.x + dx, y: n.position.y + dy };
    if (isBusNode(n)) {
      const name = freshId(`${n.data.name.replace(/\d+$/, '')}`, ids);
      ids.add(name);
      const id = busNodeId(name);
      ids.add(id);
      rename.set(n.id, id);
      return { ...n, id, position, selected: true, data: { ...n.data, name } };
    }
    const id = freshId(n.id.replace(/\d+$/, ''), ids);
    ids.add(id);
    rename.set(n.id, id);
    return { ...n, id, position, selected: true, data: { ...n.data, element: { ...n.data.element, id } } };
  });
  const edges = clip.edges.map((e) => {
    const source = rename.get(e.source)!;
    return { ...e, id: wireId(source, e.sourceHandle ?? ''), source, target: rename.get(e.target)!, selected: false };
  });
  const base = deselectAll(doc);
  return { ...base, nodes: [...base.nodes, ...pasted], edges: [...base.edges, ...edges] };
}

/** Top-left of a free place for a whole clip (its bounding box): in view when there is room, else nearest the view's middle. */
function freeSpotForClip(clipBoxes: Rect[], boxes: Rect[], vp: Viewport): { x: number; y: number } {
  const minX = Math.min(...clipBoxes.map((b) => b.x));
  const minY = Math.min(...clipBoxes.map((b) => b.y));
  const w = Math.max(...clipBoxes.map((b) => b.x + b.w)) - minX;
  const h = Math.max(...clipBoxes.map((b) => b.y + b.h)) - minY;
  const taken = [...boxes, ...vp.covered];
  return firstFree({ w, h }, vp.view, (r) => !taken.some((o) => overlaps(r, o)));
}

/** Study settings and per-bus nominal voltages (`kv`: bus node id → kV, undefined clears it). */
export function applySettings(doc: WorkspaceDoc, settings: StudySettings, kv: Record<string, number | undefined>): WorkspaceDoc {
  return {
    ...doc,
    settings,
    nodes: doc.nodes.map((n) => {
      if (!isBusNode(n) || !(n.id in kv) || kv[n.id] === n.data.kvLL) return n;
      const data = { ...n.data };
      if (kv[n.id] === undefined) delete data.kvLL;
      else data.kvLL = kv[n.id];
      return { ...n, data };
    }),
  };
}

/** Selects one node (by canvas id) and nothing else. */
export function selectOnly(doc: WorkspaceDoc, nodeId: string): WorkspaceDoc {
  return {
    ...doc,
    nodes: doc.nodes.map((n) => (n.id === nodeId ? (n.selected ? n : { ...n, selected: true }) : n.selected ? { ...n, selected: false } : n)),
    edges: doc.edges.map((e) => (e.selected ? { ...e, selected: false } : e)),
  };
}

/** Clears the selection. */
export function deselect(doc: WorkspaceDoc): WorkspaceDoc {
  return deselectAll(doc);
}
